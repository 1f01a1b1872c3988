/**
 * Extraction cache: per part, a small JSON header (id, issues, counts, index row, file list)
 * and a folder with the part's emitted catalogue files, keyed by a sha256 over everything the
 * result depends on:
 * - every file in the part folder and its sub-folders (names, link targets and bytes): this
 *   covers the record, each sweep it names and its compensation files, wherever they sit;
 * - the code that made the result (code-hash.ts: every module the build task reaches, the
 *   package lock and Node's version), so a code change can never leave stale numbers;
 * - the oscillator circuits file;
 * - build options that reach the result (the site base path).
 *
 * Layout: `<dir>/<first two hex digits>/<key>.json` and `<key>.d/`. Entries are written
 * atomically (temporary names, then rename; the header last), so parallel threads and
 * concurrent builds can share the folder. Files in an entry are never changed once written,
 * so builds may hard-link them. Only results of valid records are stored.
 */
import { createHash } from 'node:crypto';
import { cp, lstat, mkdir, readFile, readdir, readlink, rename, rm, stat, utimes, writeFile } from 'node:fs/promises';
import { dirname, join, resolve } from 'node:path';
import { threadId } from 'node:worker_threads';

/** Fingerprint of a part folder. */
export interface FolderHash {
  /** sha256, hex. */
  hash: string;
  /** Files hashed. */
  files: number;
  /** Bytes hashed. */
  bytes: number;
}

/** One file (or link) found under a part folder, with the stat facts that reveal a change. */
interface ScanEntry {
  rel: string;
  path: string;
  /** Link target text for links. */
  target?: string;
  /** False for links that lead nowhere or to a folder (only the link text is hashed). */
  readable: boolean;
  size: number;
  mtimeMs: number;
  ctimeMs: number;
  ino: number;
}

/** Every file and link under a folder, sorted; folder links are not followed. */
async function scanFolder(folder: string): Promise<ScanEntry[]> {
  const out: ScanEntry[] = [];
  const walk = async (dir: string, rel: string): Promise<void> => {
    const names = (await readdir(dir)).sort();
    for (const name of names) {
      const path = join(dir, name);
      const relPath = rel ? `${rel}/${name}` : name;
      const st = await lstat(path);
      if (st.isDirectory()) {
        await walk(path, relPath);
      } else if (st.isSymbolicLink()) {
        const target = await readlink(path);
        const to = await stat(path).catch(() => undefined);
        const readable = to?.isFile() === true;
        out.push({
          rel: relPath,
          path,
          target,
          readable,
          size: to?.size ?? 0,
          mtimeMs: to?.mtimeMs ?? 0,
          ctimeMs: Math.max(st.ctimeMs, to?.ctimeMs ?? 0),
          ino: to?.ino ?? 0,
        });
      } else if (st.isFile()) {
        out.push({
          rel: relPath,
          path,
          readable: true,
          size: st.size,
          mtimeMs: st.mtimeMs,
          ctimeMs: st.ctimeMs,
          ino: st.ino,
        });
      }
    }
  };
  await walk(folder, '');
  return out;
}

/**
 * Remembered fingerprints, so an unchanged folder is not read again: a folder whose files
 * all have the same size, times and inode as when it was hashed keeps its hash. Files changed
 * within {@link RACY_MS} before that hash are always read again (a coarse file-system clock
 * could hide a second change in the same tick).
 */
export interface FingerprintMemo {
  get(folder: string): (FolderHash & { signature: string; checkedAtMs: number }) | undefined;
  set(folder: string, entry: FolderHash & { signature: string; checkedAtMs: number }): void;
  /** Write the memo back (atomic); entries not used since it was loaded are dropped. */
  save(): Promise<void>;
}

/** See {@link FingerprintMemo}, ms. */
export const RACY_MS = 2000;

/** Load (or start) the fingerprint memo kept in `file`. */
export async function loadFingerprintMemo(file: string): Promise<FingerprintMemo> {
  type Entry = FolderHash & { signature: string; checkedAtMs: number };
  let stored: Record<string, Entry> = {};
  try {
    stored = JSON.parse(await readFile(file, 'utf8')) as Record<string, Entry>;
  } catch {
    stored = {};
  }
  const used = new Map<string, Entry>();
  return {
    get: (folder) => (Object.hasOwn(stored, folder) ? stored[folder] : undefined),
    set: (folder, entry) => void used.set(folder, entry),
    async save() {
      await mkdir(dirname(file), { recursive: true });
      const tmp = `${file}${tmpSuffix()}`;
      await writeFile(tmp, JSON.stringify(Object.fromEntries(used)));
      await rename(tmp, file);
    },
  };
}

/**
 * Hash every file under a part folder, in sorted order, following file links but not folder
 * links (a link's target text is hashed too).
 * @param memo remembered fingerprints: an unchanged folder is not read again
 */
export async function hashPartFolder(folder: string, memo?: FingerprintMemo): Promise<FolderHash> {
  const entries = await scanFolder(folder);
  const signature = entries
    .map((e) => `${e.rel}\0${e.target ?? ''}\0${e.size}\0${e.mtimeMs}\0${e.ctimeMs}\0${e.ino}`)
    .join('\n');
  const newest = entries.reduce((t, e) => Math.max(t, e.mtimeMs, e.ctimeMs), 0);
  const memoKey = resolve(folder);
  const known = memo?.get(memoKey);
  if (known && known.signature === signature && known.checkedAtMs - newest > RACY_MS) {
    memo!.set(memoKey, known);
    return { hash: known.hash, files: known.files, bytes: known.bytes };
  }
  const checkedAtMs = Date.now();
  const h = createHash('sha256');
  let files = 0;
  let bytes = 0;
  for (const e of entries) {
    if (e.target !== undefined) h.update(`link\0${e.rel}\0${e.target}\0`);
    if (!e.readable) continue;
    const data = await readFile(e.path);
    h.update(`file\0${e.rel}\0${data.length}\0`);
    h.update(data);
    files++;
    bytes += data.length;
  }
  const result = { hash: h.digest('hex'), files, bytes };
  memo?.set(memoKey, { ...result, signature, checkedAtMs });
  return result;
}

/** sha256 of a text or bytes, hex. */
export function sha256(data: string | Uint8Array): string {
  return createHash('sha256').update(data).digest('hex');
}

/** Everything a cached result depends on. */
export interface CacheKeyInputs {
  folderHash: string;
  /** Fingerprint of the code that makes the result (code-hash.ts). */
  codeHash: string;
  /** sha256 of the oscillator circuits file ('' when none). */
  oscillatorsHash: string;
  /** Build options that change the result, as a stable string. */
  options: string;
}

/** The cache key of a part: sha256 over its inputs. */
export function cacheKey(inputs: CacheKeyInputs): string {
  return sha256(
    ['motional-cache-2', inputs.folderHash, inputs.codeHash, inputs.oscillatorsHash, inputs.options].join('\0'),
  );
}

/** A folder of cache entries: a header text per key, optionally with a folder of files. */
export interface BuildCache {
  readonly dir: string;
  /** The stored text for a key, or undefined. Marks the entry as used (mtime). */
  get(key: string): Promise<string | undefined>;
  /**
   * Store a text under a key (atomic). With `filesDir`, that folder is moved into the entry
   * first (renamed, or copied across file systems), and {@link BuildCache.filesOf} names it.
   */
  put(key: string, text: string, filesDir?: string): Promise<void>;
  /** The folder of files stored with an entry. */
  filesOf(key: string): string;
}

function entryPath(dir: string, key: string): string {
  return join(dir, key.slice(0, 2), `${key}.json`);
}

function filesPath(dir: string, key: string): string {
  return join(dir, key.slice(0, 2), `${key}.d`);
}

function tmpSuffix(): string {
  return `.${process.pid}-${threadId}.tmp`;
}

/** Open (create lazily) a cache folder. */
export function openCache(dir: string): BuildCache {
  return {
    dir,
    filesOf: (key) => filesPath(dir, key),
    async get(key) {
      const path = entryPath(dir, key);
      try {
        const text = await readFile(path, 'utf8');
        const now = new Date();
        await utimes(path, now, now).catch(() => undefined);
        return text;
      } catch {
        return undefined;
      }
    },
    async put(key, text, filesDir) {
      const path = entryPath(dir, key);
      await mkdir(dirname(path), { recursive: true });
      if (filesDir !== undefined) {
        const target = filesPath(dir, key);
        const tmp = `${target}${tmpSuffix()}`;
        await rename(filesDir, tmp).catch(async (err: NodeJS.ErrnoException) => {
          if (err.code !== 'EXDEV') throw err;
          await cp(filesDir, tmp, { recursive: true });
          await rm(filesDir, { recursive: true, force: true });
        });
        // a folder left by an entry whose header is gone is replaced; a concurrent writer's
        // identical folder is kept
        if (!(await stat(path).catch(() => undefined))) await rm(target, { recursive: true, force: true });
        await rename(tmp, target).catch(async () => rm(tmp, { recursive: true, force: true }));
      }
      const tmp = `${path}${tmpSuffix()}`;
      await writeFile(tmp, text);
      await rename(tmp, path);
    },
  };
}

/** Cache entries unused for this long are removed by {@link pruneCache}. */
export const CACHE_MAX_AGE_DAYS = 30;

/** Temporary files and orphaned file folders older than this are removed, ms. */
const STRAY_AGE_MS = 3_600_000;

/**
 * Remove entries not used for {@link CACHE_MAX_AGE_DAYS} days, and stray temporary files.
 * @returns number of entries and stray items removed
 */
export async function pruneCache(dir: string, nowMs = Date.now()): Promise<number> {
  let removed = 0;
  let buckets: string[];
  try {
    buckets = await readdir(dir);
  } catch {
    return 0;
  }
  const limit = nowMs - CACHE_MAX_AGE_DAYS * 86_400_000;
  for (const bucket of buckets) {
    const names = await readdir(join(dir, bucket)).catch(() => [] as string[]);
    const headers = new Set(names.filter((n) => n.endsWith('.json')));
    for (const name of names) {
      const path = join(dir, bucket, name);
      const st = await stat(path).catch(() => undefined);
      if (!st) continue;
      let stale: boolean;
      if (name.endsWith('.tmp')) stale = st.mtimeMs < nowMs - STRAY_AGE_MS;
      else if (name.endsWith('.json')) stale = st.mtimeMs < limit;
      else if (name.endsWith('.d'))
        stale = !headers.has(`${name.slice(0, -2)}.json`) && st.mtimeMs < nowMs - STRAY_AGE_MS;
      else continue;
      if (stale) {
        await rm(path, { recursive: true, force: true });
        if (name.endsWith('.json'))
          await rm(join(dir, bucket, `${name.slice(0, -5)}.d`), { recursive: true, force: true });
        removed++;
      }
    }
  }
  return removed;
}
