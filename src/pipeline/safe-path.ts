/**
 * Path safety for the files a part record names (README: The part record, and Limits and
 * robustness: a record may only reference files inside its own folder — no absolute paths, no
 * `..`, no links that leave the folder).
 *
 * Two stages: {@link checkPartFileName} looks at the name alone (pure, no file access), then
 * {@link resolveInPartFolder} opens nothing but asks the FileSource where the name really leads.
 *
 * Rules, each an error:
 * - absolute paths (`/x`), drive letters or any `:` (`C:x`, Windows streams), backslashes;
 * - `..` segments, even ones that would come back (`a/../b`): records stay readable by eye;
 * - NUL and other control characters; invisible or direction-changing characters
 *   (bidi overrides U+202A–U+202E, isolates U+2066–U+2069, marks U+200E/U+200F/U+061C,
 *   zero-width U+200B–U+200D, U+2060–U+2064, U+FEFF), which can make a name read differently
 *   from what it opens; leading or trailing spaces;
 * - a name that does not lead to a regular file (missing, a folder, a FIFO or device);
 * - a link (the file itself or any folder on the way) whose real path leaves the part folder;
 * - a name whose letter case differs from the entry on disk (works on a case-insensitive
 *   file system, fails on Linux).
 * Names that differ only by letter case or Unicode normalisation (NFC `é` vs NFD `e`+U+0301)
 * within one record are also an error (see {@link findCaseCollisions}): they are one file on
 * some systems and two on others.
 */
import { basename, dirname, join, sep } from 'node:path';
import { nodeFileSource, type FileSource } from './file-source.ts';

/** How a sweep file is read, chosen by its name ending (case-insensitive). */
export type SweepFileFormat = 'touchstone' | 'csv';

/** Accepted sweep file endings: Touchstone v1 `.s1p`/`.s2p`, v2 `.ts`; CSV/TSV (`.txt` read as CSV/TSV). */
export const SWEEP_EXTENSIONS: Readonly<Record<string, SweepFileFormat>> = {
  '.s1p': 'touchstone',
  '.s2p': 'touchstone',
  '.ts': 'touchstone',
  '.csv': 'csv',
  '.tsv': 'csv',
  '.txt': 'csv',
};

/** The reader for a sweep file name, or undefined when its ending is not accepted. */
export function sweepFormatOf(name: string): SweepFileFormat | undefined {
  const dot = name.lastIndexOf('.');
  return dot < 0 ? undefined : SWEEP_EXTENSIONS[name.slice(dot).toLowerCase()];
}

/** Message for a name whose ending is not accepted. */
export function badExtensionMessage(name: string): string {
  return `expected a sweep file ending in ${Object.keys(SWEEP_EXTENSIONS).join(', ')}, got "${name}"`;
}

export type NameCheck = { ok: true; name: string } | { ok: false; message: string; code: string };
export type SafePathResult =
  { ok: true; path: string; sizeBytes: number } | { ok: false; message: string; code: string };

// Characters that render as nothing or reorder the text around them.
const INVISIBLE = /[\u061c\u200b-\u200f\u202a-\u202e\u2060-\u2064\u2066-\u2069\ufeff]/u;
// C0 and C1 controls and DEL (NUL included).
const CONTROL = /[\u0000-\u001f\u007f-\u009f]/u;

function codePoint(ch: string): string {
  return `U+${ch.codePointAt(0)!.toString(16).toUpperCase().padStart(4, '0')}`;
}

/** Printable form of a name for messages: odd characters shown as U+XXXX. */
export function showName(name: string): string {
  const shown = [...name].map((ch) => (CONTROL.test(ch) || INVISIBLE.test(ch) ? `<${codePoint(ch)}>` : ch)).join('');
  return JSON.stringify(shown.length > 120 ? `${shown.slice(0, 120)}…` : shown);
}

/**
 * Check a file name from a record without touching the disk.
 * @returns the name normalised (`./a.s2p` → `a.s2p`, `raw//a.s2p` → `raw/a.s2p`) or why it is refused
 */
export function checkPartFileName(name: string): NameCheck {
  const bad = (message: string, code = 'path-unsafe'): NameCheck => ({ ok: false, message, code });
  if (name.length === 0) return bad('expected a file name, got an empty text', 'path-empty');
  const control = CONTROL.exec(name);
  if (control) return bad(`file name ${showName(name)} contains control character ${codePoint(control[0])}`);
  const invisible = INVISIBLE.exec(name);
  if (invisible)
    return bad(
      `file name ${showName(name)} contains invisible or direction-changing character ${codePoint(invisible[0])}`,
    );
  if (name.trim() !== name) return bad(`file name ${showName(name)} has leading or trailing spaces`);
  if (name.includes('\\')) return bad(`file name ${showName(name)} contains a backslash; use '/' between folders`);
  if (name.startsWith('/'))
    return bad(`absolute path ${showName(name)} not allowed; name a file inside the part folder`, 'path-escape');
  if (/^[A-Za-z]:/.test(name))
    return bad(`drive letter in ${showName(name)} not allowed; name a file inside the part folder`, 'path-escape');
  if (name.includes(':')) return bad(`file name ${showName(name)} contains ':'`);
  const segments = name.split('/');
  if (segments.includes('..'))
    return bad(
      `'..' in ${showName(name)} not allowed; a record may only name files inside its own folder`,
      'path-escape',
    );
  if (segments[segments.length - 1] === '' || segments[segments.length - 1] === '.') {
    return bad(`${showName(name)} names a folder, expected a file`);
  }
  return { ok: true, name: segments.filter((s) => s !== '' && s !== '.').join('/') };
}

/**
 * Resolve a record's file name inside its part folder, following links only as far as the
 * folder reaches.
 * @param folder the part folder, as the user gave it (the returned path starts with it)
 * @param name the file name as written in the record
 * @param fs file access (default node:fs)
 */
export async function resolveInPartFolder(
  folder: string,
  name: string,
  fs: FileSource = nodeFileSource,
): Promise<SafePathResult> {
  const checked = checkPartFileName(name);
  if (!checked.ok) return checked;
  const path = join(folder, checked.name);
  const st = await fs.stat(path);
  if (!st) return { ok: false, message: await missingMessage(fs, path, name), code: 'missing' };
  if (st.kind !== 'file')
    return {
      ok: false,
      message: `${showName(name)} is ${st.kind === 'directory' ? 'a folder' : 'not a regular file'}, expected a file`,
      code: 'not-file',
    };
  let realFolder: string;
  let realFile: string;
  try {
    [realFolder, realFile] = await Promise.all([fs.realPath(folder), fs.realPath(path)]);
  } catch {
    return { ok: false, message: `file ${showName(name)} not found in the part folder`, code: 'missing' };
  }
  if (!realFile.startsWith(realFolder.endsWith(sep) ? realFolder : realFolder + sep)) {
    return {
      ok: false,
      message: `${showName(name)} is a link that leads outside the part folder`,
      code: 'path-escape',
    };
  }
  const entries = await fs.list(dirname(path)).catch(() => [] as string[]);
  const base = basename(path);
  if (!entries.includes(base)) {
    const onDisk = entries.find((e) => e.toLowerCase() === base.toLowerCase());
    if (onDisk)
      return {
        ok: false,
        message: `letter case of ${showName(name)} differs from the file on disk "${onDisk}"`,
        code: 'path-case',
      };
  }
  return { ok: true, path, sizeBytes: st.sizeBytes };
}

async function missingMessage(fs: FileSource, path: string, name: string): Promise<string> {
  const entries = await fs.list(dirname(path)).catch(() => [] as string[]);
  const base = basename(path).toLowerCase();
  const near = entries.find((e) => e.toLowerCase() === base);
  return `file ${showName(name)} not found in the part folder${near ? ` (did you mean "${near}"?)` : ''}`;
}

/**
 * Names in one record that differ only by letter case or Unicode normalisation (compared as
 * `name.normalize('NFC').toLowerCase()`), as pairs [first seen, later one]. Exact repeats are
 * fine (the same file named twice).
 */
export function findCaseCollisions(names: readonly string[]): Array<[string, string]> {
  const first = new Map<string, string>();
  const pairs: Array<[string, string]> = [];
  for (const raw of names) {
    const checked = checkPartFileName(raw);
    const name = checked.ok ? checked.name : raw;
    // NFC first: macOS file systems treat NFC and NFD spellings as one name, Linux as two
    const key = name.normalize('NFC').toLowerCase();
    const seen = first.get(key);
    if (seen === undefined) first.set(key, name);
    else if (seen !== name) pairs.push([seen, raw]);
  }
  return pairs;
}
