/**
 * Extraction cache: one JSON file per part result, keyed by a sha256 over everything the
 * result depends on:
 * - every file in the part folder and its sub-folders (names, link targets and bytes): this
 *   covers the record, each sweep it names and its compensation files, wherever they sit;
 * - the extractor version ({@link EXTRACTOR_VERSION}, raised whenever results change);
 * - the oscillator circuits file;
 * - build options that reach the result (the site base path).
 *
 * Entries are written atomically (temporary file, then rename), so parallel threads and
 * concurrent builds can share the folder. Only results of valid records are stored.
 */
import { createHash } from 'node:crypto';
import { mkdir, readFile, readdir, readlink, rename, rm, stat, utimes, writeFile, lstat } from 'node:fs/promises';
import { join } from 'node:path';
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

/**
 * Hash every file under a part folder, in sorted order, following file links but not folder
 * links (a folder link's target path is hashed instead).
 */
export async function hashPartFolder(folder: string): Promise<FolderHash> {
  const h = createHash('sha256');
  let files = 0;
  let bytes = 0;
  const walk = async (dir: string, rel: string): Promise<void> => {
    const names = (await readdir(dir)).sort();
    for (const name of names) {
      const path = join(dir, name);
      const relPath = rel ? `${rel}/${name}` : name;
      const link = await lstat(path);
      if (link.isSymbolicLink()) {
        h.update(`link\0${relPath}\0${await readlink(path)}\0`);
        const target = await stat(path).catch(() => undefined);
        if (!target?.isFile()) continue;
      } else if (link.isDirectory()) {
        await walk(path, relPath);
        continue;
      } else if (!link.isFile()) {
        continue;
      }
      const data = await readFile(path);
      h.update(`file\0${relPath}\0${data.length}\0`);
      h.update(data);
      files++;
      bytes += data.length;
    }
  };
  await walk(folder, '');
  return { hash: h.digest('hex'), files, bytes };
}

/** sha256 of a text or bytes, hex. */
export function sha256(data: string | Uint8Array): string {
  return createHash('sha256').update(data).digest('hex');
}

/** Everything a cached result depends on. */
export interface CacheKeyInputs {
  folderHash: string;
  extractorVersion: string;
  /** sha256 of the oscillator circuits file ('' when none). */
  oscillatorsHash: string;
  /** Build options that change the result, as a stable string. */
  options: string;
}

/** The cache key of a part: sha256 over its inputs. */
export function cacheKey(inputs: CacheKeyInputs): string {
  return sha256(['motional-cache-1', inputs.folderHash, inputs.extractorVersion, inputs.oscillatorsHash, inputs.options].join('\0'));
}

/** A folder of cache entries. */
export interface BuildCache {
  readonly dir: string;
  /** The stored text for a key, or undefined. Marks the entry as used (mtime). */
  get(key: string): Promise<string | undefined>;
  /** Store a text under a key (atomic). */
  put(key: string, text: string): Promise<void>;
}

function entryPath(dir: string, key: string): string {
  return join(dir, key.slice(0, 2), `${key}.json`);
}

/** Open (create lazily) a cache folder. */
export function openCache(dir: string): BuildCache {
  return {
    dir,
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
    async put(key, text) {
      const path = entryPath(dir, key);
      await mkdir(join(dir, key.slice(0, 2)), { recursive: true });
      const tmp = `${path}.${process.pid}-${threadId}.tmp`;
      await writeFile(tmp, text);
      await rename(tmp, path);
    },
  };
}

/** Cache entries unused for this long are removed by {@link pruneCache}. */
export const CACHE_MAX_AGE_DAYS = 30;

/**
 * Remove entries not used for {@link CACHE_MAX_AGE_DAYS} days, and stray temporary files.
 * @returns number of files removed
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
    for (const name of names) {
      const path = join(dir, bucket, name);
      const st = await stat(path).catch(() => undefined);
      if (!st) continue;
      const stale = name.endsWith('.tmp') ? st.mtimeMs < nowMs - 3_600_000 : st.mtimeMs < limit;
      if (stale) {
        await rm(path, { force: true });
        removed++;
      }
    }
  }
  return removed;
}
