/**
 * Fingerprint of the code behind a cached result, so that no hand-kept version number can be
 * forgotten: the TypeScript modules reachable from the entry modules through relative imports
 * (`import … from`, `export … from`, `import '…'` and `import('…')` with a literal path), each
 * hashed by its path and bytes, plus extra files (the package lock: library versions) and
 * Node's version. Any change to a module a result depends on changes the fingerprint; a change
 * to a module it does not reach (a page template, a plot) does not.
 *
 * A path that appears in an import-like text but names no file (an example in a comment) is
 * hashed as missing, so it is harmless.
 */
import { createHash } from 'node:crypto';
import { readFile } from 'node:fs/promises';
import { dirname, join, posix, relative, sep } from 'node:path';

/** Relative module paths in import and export statements and dynamic imports. */
const IMPORT_PATH = /(?:\bfrom\s*|\bimport\s*\(?\s*)['"](\.{1,2}\/[^'"\n]+)['"]/g;

/** The relative module paths a module's text imports (unresolved, as written). */
export function importedPaths(text: string): string[] {
  return [...text.matchAll(IMPORT_PATH)].map((m) => m[1]);
}

/**
 * sha256 (hex) over the modules reachable from `entries` and over `extraFiles`, all paths
 * relative to `root`, and Node's version.
 * @param root project root; paths in the hash are relative to it, so a copy of the project hashes alike
 * @param entries entry modules, relative to root
 * @param extraFiles more files hashed as they are (missing ones hashed as missing)
 */
export async function moduleClosureHash(root: string, entries: string[], extraFiles: string[] = []): Promise<string> {
  const seen = new Map<string, Buffer | undefined>();
  const pending = entries.map((e) => join(root, e));
  while (pending.length > 0) {
    const path = pending.pop()!;
    const rel = relative(root, path).split(sep).join(posix.sep);
    if (seen.has(rel)) continue;
    const bytes = await readFile(path).catch(() => undefined);
    seen.set(rel, bytes);
    if (bytes && /\.[cm]?[jt]sx?$/.test(path)) {
      for (const p of importedPaths(bytes.toString('utf8'))) pending.push(join(dirname(path), p));
    }
  }
  for (const e of extraFiles) {
    if (!seen.has(e)) seen.set(e, await readFile(join(root, e)).catch(() => undefined));
  }
  const h = createHash('sha256');
  h.update(`motional-code-1\0node ${process.version}\0`);
  for (const rel of [...seen.keys()].sort()) {
    const bytes = seen.get(rel);
    h.update(bytes ? `${rel}\0${bytes.length}\0` : `${rel}\0missing\0`);
    if (bytes) h.update(bytes);
  }
  return h.digest('hex');
}

/** Entry module of the per-part build work: every cached result is made by code it reaches. */
export const CACHED_RESULT_ENTRY = 'src/pipeline/build-task.ts';

/**
 * Fingerprint of the code that makes a part's cached catalogue files (extraction, page data,
 * downloads): {@link moduleClosureHash} from {@link CACHED_RESULT_ENTRY}, with the package lock.
 */
export function extractionCodeHash(projectRoot: string): Promise<string> {
  return moduleClosureHash(projectRoot, [CACHED_RESULT_ENTRY], ['package-lock.json']);
}
