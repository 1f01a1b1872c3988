/**
 * Find and load the part records under the paths given to `check` (or `build`): each path may
 * be a part.yaml, a part folder, or a folder of part folders (searched to any depth up to
 * {@link MAX_SEARCH_DEPTH}; a folder holding part.yaml is a part and is not searched further).
 * Hidden folders (`.x`) and `node_modules` are skipped. Links to folders are followed; a folder
 * already searched (by its real path) is not searched again, and a link back to a folder on the
 * way down (a loop) is not followed. A folder at the depth limit that still has sub-folders is
 * reported as an error, so no record is left out silently. {@link findPartFiles} is the one
 * search, used by `check` and by the build. Part ids must be unique across all records found.
 * The order of parts and issues is deterministic (sorted by path).
 */
import { join, resolve, sep } from 'node:path';
import type { Issue } from '../lib/issues.ts';
import { nodeFileSource, type FileSource } from './file-source.ts';
import { loadPart, type LoadedPart } from './load-part.ts';

/**
 * How deep folders of part folders are searched, in folder levels below the path given; a part
 * folder at this depth is still found. A catalogue needs 2 or 3 levels (parts/<group>/<part>).
 */
export const MAX_SEARCH_DEPTH = 16;
/** Parts loaded at the same time (each reads its sweep files one after another). */
const CONCURRENCY = 8;

export interface CheckPathsResult {
  /** Every part found, sorted by the path of its part.yaml. */
  parts: LoadedPart[];
  /**
   * Every issue, in print order: each part's own issues (including a duplicate id, which is
   * also in that part's `issues`), then problems with the paths themselves.
   */
  issues: Issue[];
}

/**
 * Load every part record under the given paths.
 * @param paths part.yaml files, part folders or folders of part folders
 * @param fs file access (default node:fs)
 */
export async function checkPaths(paths: string[], fs: FileSource = nodeFileSource): Promise<CheckPathsResult> {
  const pathIssues: Issue[] = [];
  const found = new Map<string, string>(); // real path → path as found
  for (const p of paths) {
    const st = await fs.stat(p);
    if (!st) {
      pathIssues.push({ severity: 'error', file: p, message: 'no such file or folder', code: 'missing' });
    } else if (st.kind === 'file') {
      if (!/\.ya?ml$/i.test(p))
        pathIssues.push({
          severity: 'error',
          file: p,
          message: 'expected a part.yaml or a folder of parts, got another file',
          code: 'not-part',
        });
      else await addUnique(fs, found, p);
    } else if (st.kind === 'directory') {
      const search = await findPartFiles(fs, p);
      if (search.files.length === 0)
        pathIssues.push({
          severity: 'error',
          file: p,
          message: 'no part.yaml in this folder or its subfolders',
          code: 'no-parts',
        });
      pathIssues.push(...search.issues);
      for (const y of search.files) await addUnique(fs, found, y);
    } else {
      pathIssues.push({
        severity: 'error',
        file: p,
        message: 'expected a part.yaml or a folder, got a special file',
        code: 'not-part',
      });
    }
  }

  const yamlFiles = [...found.values()].sort(byPath);
  const parts = await mapLimited(yamlFiles, CONCURRENCY, (y) => loadPart(y, fs));
  const byId = new Map<string, LoadedPart>();
  for (const part of parts) {
    if (part.id === undefined) continue;
    const first = byId.get(part.id);
    if (!first) {
      byId.set(part.id, part);
      continue;
    }
    part.issues.unshift({
      severity: 'error',
      file: part.yamlFile,
      ...part.locate(['id']),
      path: 'id',
      message: `duplicate part id "${part.id}" (also in ${first.yamlFile})`,
      code: 'duplicate-id',
    });
  }
  return { parts, issues: [...parts.flatMap((p) => p.issues), ...pathIssues] };
}

function byPath(a: string, b: string): number {
  return a < b ? -1 : a > b ? 1 : 0;
}

async function addUnique(fs: FileSource, found: Map<string, string>, path: string): Promise<void> {
  const real = await fs.realPath(path).catch(() => path);
  if (!found.has(real)) found.set(real, path);
}

export interface FindPartFilesOptions {
  /** Folders not searched, as absolute paths (the build's own output and cache). */
  exclude?: ReadonlySet<string>;
  /** Deepest folder level searched below `dir`; default {@link MAX_SEARCH_DEPTH}. */
  maxDepth?: number;
}

export interface FindPartFilesResult {
  /** part.yaml paths (joined onto `dir` as given), sorted by name at each folder level. */
  files: string[];
  /** Folders the search did not go into (depth limit), one error each naming the folder. */
  issues: Issue[];
}

/**
 * part.yaml files under a folder: the folder's own, else those of its sub-folders, to
 * {@link MAX_SEARCH_DEPTH} levels. Hidden folders and `node_modules` are skipped; links to
 * folders are followed, each real folder searched once, and a link to a folder that holds the
 * folders on the way down to it (a loop) is not followed.
 * @param fs file access
 * @param dir folder to search
 */
export async function findPartFiles(
  fs: FileSource,
  dir: string,
  opts: FindPartFilesOptions = {},
): Promise<FindPartFilesResult> {
  const maxDepth = opts.maxDepth ?? MAX_SEARCH_DEPTH;
  const exclude = opts.exclude ?? new Set<string>();
  const files: string[] = [];
  const issues: Issue[] = [];
  const searched = new Set<string>();
  const realOf = (path: string) => fs.realPath(path).catch(() => resolve(path));
  /** `chain`: real paths of the folders from `dir` down to this one. */
  const walk = async (folder: string, real: string, depth: number, chain: readonly string[]): Promise<void> => {
    searched.add(real);
    const own = join(folder, 'part.yaml');
    if ((await fs.stat(own))?.kind === 'file') {
      files.push(own);
      return;
    }
    const names = (await fs.list(folder).catch(() => [] as string[]))
      .filter((n) => !n.startsWith('.') && n !== 'node_modules')
      .sort(byPath);
    const subs: Array<{ path: string; real: string }> = [];
    for (const name of names) {
      const path = join(folder, name);
      if ((await fs.stat(path))?.kind !== 'directory') continue;
      const subReal = await realOf(path);
      if (exclude.has(resolve(path)) || exclude.has(subReal) || searched.has(subReal)) continue;
      // a link up to a folder that holds this one: everything below it is searched already (or was not asked for)
      if ([...chain, real].some((c) => c === subReal || c.startsWith(subReal.endsWith(sep) ? subReal : subReal + sep)))
        continue;
      subs.push({ path, real: subReal });
    }
    if (subs.length === 0) return;
    if (depth >= maxDepth) {
      const shown = subs
        .slice(0, 3)
        .map((s) => JSON.stringify(s.path.slice(folder.length + 1)))
        .join(', ');
      issues.push({
        severity: 'error',
        file: folder,
        code: 'too-deep',
        message: `sub-folders not searched for part records, deeper than ${maxDepth} folder levels: ${shown}${subs.length > 3 ? ` and ${subs.length - 3} more` : ''}; move the part folders up`,
      });
      return;
    }
    for (const sub of subs) {
      // a folder reached twice on one level (two links to it) is searched once
      if (!searched.has(sub.real)) await walk(sub.path, sub.real, depth + 1, [...chain, real]);
    }
  };
  await walk(dir, await realOf(dir), 0, []);
  return { files, issues };
}

async function mapLimited<T, R>(items: T[], limit: number, f: (item: T) => Promise<R>): Promise<R[]> {
  const out = new Array<R>(items.length);
  let next = 0;
  const worker = async () => {
    while (next < items.length) {
      const i = next++;
      out[i] = await f(items[i]);
    }
  };
  await Promise.all(Array.from({ length: Math.min(limit, items.length) }, worker));
  return out;
}
