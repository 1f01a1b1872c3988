/**
 * Find and load the part records under the paths given to `check` (or `build`): each path may
 * be a part.yaml, a part folder, or a folder of part folders (searched to any depth up to
 * {@link MAX_SEARCH_DEPTH}; a folder holding part.yaml is a part and is not searched further).
 * Hidden folders (`.x`) and `node_modules` are skipped. Part ids must be unique across all
 * records found. The order of parts and issues is deterministic (sorted by path).
 */
import { join } from 'node:path';
import type { Issue } from '../lib/issues.ts';
import { nodeFileSource, type FileSource } from './file-source.ts';
import { loadPart, type LoadedPart } from './load-part.ts';

/** How deep folders of part folders are searched. */
export const MAX_SEARCH_DEPTH = 8;
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
      if (!/\.ya?ml$/i.test(p)) pathIssues.push({ severity: 'error', file: p, message: 'expected a part.yaml or a folder of parts, got another file', code: 'not-part' });
      else await addUnique(fs, found, p);
    } else if (st.kind === 'directory') {
      const yamls = await findPartFiles(fs, p, 0);
      if (yamls.length === 0) pathIssues.push({ severity: 'error', file: p, message: 'no part.yaml in this folder or its subfolders', code: 'no-parts' });
      for (const y of yamls) await addUnique(fs, found, y);
    } else {
      pathIssues.push({ severity: 'error', file: p, message: 'expected a part.yaml or a folder, got a special file', code: 'not-part' });
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
      severity: 'error', file: part.yamlFile, ...part.locate(['id']), path: 'id',
      message: `duplicate part id "${part.id}" (also in ${first.yamlFile})`, code: 'duplicate-id',
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

/** part.yaml files under a folder: the folder's own, else those of its subfolders. */
async function findPartFiles(fs: FileSource, dir: string, depth: number): Promise<string[]> {
  const own = join(dir, 'part.yaml');
  if ((await fs.stat(own))?.kind === 'file') return [own];
  if (depth >= MAX_SEARCH_DEPTH) return [];
  const names = (await fs.list(dir).catch(() => [] as string[])).filter((n) => !n.startsWith('.') && n !== 'node_modules').sort(byPath);
  const out: string[] = [];
  for (const name of names) {
    const sub = join(dir, name);
    const st = await fs.stat(sub);
    // Links to folders are not followed here, so a link loop cannot recurse.
    if (st?.kind === 'directory' && !st.isSymlink) out.push(...(await findPartFiles(fs, sub, depth + 1)));
  }
  return out;
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

