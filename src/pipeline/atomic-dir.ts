/**
 * Replace an output folder all at once: build into a staging folder next to it (same file
 * system, so `rename` is atomic), then swap.
 *
 * Layout for an output folder `/x/dist`:
 * - `/x/.dist.staging-<pid>/`  the build's working folder (data, site, scratch);
 * - `/x/.dist.old-<pid>-<n>/`  the previous output during the swap, removed right after
 *                              (`…-<n>s`: the staging folder's remains).
 *
 * The swap is two renames: `dist → .dist.old-<pid>-<n>`, then `staging/site → dist`. Between them
 * (microseconds) `dist` does not exist; it is never half-written. A build killed at any point
 * leaves either the old or the new folder in place plus leftovers that {@link cleanStale}
 * removes on the next start (only those whose process is gone, so a concurrent build keeps its own).
 */
import { spawn } from 'node:child_process';
import { mkdir, readdir, rename, rm, stat, writeFile } from 'node:fs/promises';
import { basename, dirname, join, relative, resolve, isAbsolute } from 'node:path';

/**
 * File written into every output folder; a non-empty folder without it is never replaced
 * (a mistyped `--out` must not delete someone's folder).
 */
export const OUTPUT_MARKER = '.motional-output';

/** True when `inner` is `outer` or lies inside it (both absolute). */
export function isInside(inner: string, outer: string): boolean {
  const rel = relative(outer, inner);
  return rel === '' || (!rel.startsWith('..') && !isAbsolute(rel));
}

/**
 * Why the output folder may not be replaced, or undefined when it may: it must not contain
 * any of `protect` (the content, the project, the working folder), and when it exists and is
 * not empty it must carry {@link OUTPUT_MARKER} (or be a site built by Astro itself).
 */
export async function refuseReplace(outDir: string, protect: string[]): Promise<string | undefined> {
  const abs = resolve(outDir);
  const hit = protect.map((p) => resolve(p)).find((p) => isInside(p, abs));
  if (hit) return `the output folder ${outDir} contains ${hit}; choose a folder of its own`;
  const st = await stat(abs).catch(() => undefined);
  if (!st) return undefined;
  if (!st.isDirectory()) return `the output ${outDir} is not a folder`;
  const names = await readdir(abs);
  // a site built by Astro directly (`astro build`) may be replaced too
  const astroSite = names.includes('index.html') && names.includes('_astro');
  if (names.length > 0 && !names.includes(OUTPUT_MARKER) && !astroSite) {
    return `the output folder ${outDir} is not empty and was not written by a build (no ${OUTPUT_MARKER}); remove it or choose another folder`;
  }
  return undefined;
}

/** Paths of one build's staging area. */
export interface StagingDir {
  /** The output folder that will be replaced, absolute. */
  outDir: string;
  /** The staging root, absolute: `<parent>/.<name>.staging-<pid>`. */
  root: string;
}

const STAGING = 'staging';
const OLD = 'old';

function leftoverName(outDir: string, what: string, pid: number): string {
  return join(dirname(outDir), `.${basename(outDir)}.${what}-${pid}`);
}

/** True when a process with this id exists (signal 0 probes without sending anything). */
export function isProcessAlive(pid: number): boolean {
  try {
    process.kill(pid, 0);
    return true;
  } catch (err) {
    return (err as NodeJS.ErrnoException).code === 'EPERM';
  }
}

/**
 * Remove staging and old folders left next to `outDir` by builds that were killed.
 * Folders of live processes (a concurrent build) are kept.
 * @returns the folders removed
 */
export async function cleanStale(outDir: string): Promise<string[]> {
  const abs = resolve(outDir);
  const parent = dirname(abs);
  const prefix = `.${basename(abs)}.`;
  let entries: string[];
  try {
    entries = await readdir(parent);
  } catch {
    return [];
  }
  const removed: string[] = [];
  for (const name of entries.sort()) {
    if (!name.startsWith(prefix)) continue;
    const m = /^(staging|old)-(\d+)(-\d+s?)?$/.exec(name.slice(prefix.length));
    if (!m) continue;
    const pid = Number(m[2]);
    if (pid !== process.pid && isProcessAlive(pid)) continue;
    await rm(join(parent, name), { recursive: true, force: true });
    removed.push(join(parent, name));
  }
  return removed;
}

/** Create this process's staging root next to `outDir` (emptied if it exists). */
export async function createStaging(outDir: string): Promise<StagingDir> {
  const abs = resolve(outDir);
  await mkdir(dirname(abs), { recursive: true });
  const root = leftoverName(abs, STAGING, process.pid);
  await rm(root, { recursive: true, force: true });
  await mkdir(root, { recursive: true });
  return { outDir: abs, root };
}

/** Options of {@link swapInto}. */
export interface SwapOptions {
  /** Text of the {@link OUTPUT_MARKER} file (default: a note). */
  marker?: string;
  /**
   * Remove the previous output and the staging leftovers in a detached process instead of
   * waiting (a large site takes seconds to delete). They are renamed to unique names first, so
   * nothing a later build creates is touched; {@link cleanStale} removes any that survive.
   */
  background?: boolean;
}

let swaps = 0;

/**
 * Put `builtDir` (a folder inside the staging root) in place of the output folder, then remove
 * the previous output and the staging root.
 */
export async function swapInto(staging: StagingDir, builtDir: string, options: SwapOptions = {}): Promise<void> {
  await writeFile(
    join(builtDir, OUTPUT_MARKER),
    options.marker ?? 'written by motional build; the whole folder is replaced on the next build\n',
  );
  const seq = ++swaps;
  const old = `${leftoverName(staging.outDir, OLD, process.pid)}-${seq}`;
  let hadOld = false;
  try {
    await stat(staging.outDir);
    hadOld = true;
  } catch {
    hadOld = false;
  }
  if (hadOld) await rename(staging.outDir, old);
  try {
    await rename(builtDir, staging.outDir);
  } catch (err) {
    // put the previous output back so a failed swap changes nothing
    if (hadOld) await rename(old, staging.outDir).catch(() => undefined);
    throw err;
  }
  if (!options.background) {
    await rm(old, { recursive: true, force: true });
    await discardStaging(staging);
    return;
  }
  const trash = `${leftoverName(staging.outDir, OLD, process.pid)}-${seq}s`;
  await rename(staging.root, trash);
  removeDetached(hadOld ? [old, trash] : [trash]);
}

/** Delete folders in a detached child process that outlives this one. */
export function removeDetached(paths: string[]): void {
  const script =
    'for (const p of process.argv.slice(1)) require("node:fs").rmSync(p, { recursive: true, force: true })';
  try {
    const child = spawn(process.execPath, ['-e', script, ...paths], { detached: true, stdio: 'ignore' });
    child.on('error', () => undefined);
    child.unref();
  } catch {
    // cleanStale removes them on the next build
  }
}

/** Remove the staging root (after a failure, or after the swap). */
export async function discardStaging(staging: StagingDir): Promise<void> {
  await rm(staging.root, { recursive: true, force: true });
}
