/**
 * Emit the generated catalogue data that the site is built from:
 *
 *   <out>/index.json                 search index: IndexEntry[] sorted by id
 *   <out>/parts/<id>.json            PartData of each part (read by the pages at build time)
 *   <out>/compare/<id>.json          CompareData of each part (fetched by the compare page)
 *   <out>/export/<id>.json           the part's rows of the catalogue export (catalogue-export.ts)
 *   <out>/catalogue.csv, .json       the whole export, written by writeCatalogueExport
 *   <out>/downloads/<id>/<name>      the downloads: netlists, model Touchstone, parameters,
 *                                    and the raw record and sweeps under raw/
 *
 * `makeDownloads` adds the raw record to the model downloads of src/lib/report/downloads.ts
 * (the netlists come from the same function the `netlist` command prints with).
 */
import { readFileSync } from 'node:fs';
import { mkdir, writeFile } from 'node:fs/promises';
import { dirname, join, posix } from 'node:path';
import type { PartResult } from '../lib/extract/types.ts';
import { modelDownloads, type DownloadFile } from '../lib/report/downloads.ts';
import type { LoadedPart } from './load-part.ts';
import { makeCompareData, makeIndexEntry } from '../lib/report/catalogue-entries.ts';
import type { IndexEntry, PartData } from '../lib/report/types.ts';
import { sortById } from '../lib/report/index-order.ts';
import { catalogueCsv, catalogueExportOf, catalogueRows, type CatalogueRow } from '../lib/report/catalogue-export.ts';

export type { DownloadFile } from '../lib/report/downloads.ts';

/** What `writeCatalogueData` takes per part. */
export interface EmitPart {
  data: PartData;
  downloads: Array<{ name: string; label?: string; content: string | Uint8Array }>;
}

/** Files of the record itself (part.yaml, sweeps, compensation sweeps), relative to its folder. */
function recordFiles(loaded: LoadedPart): Array<{ rel: string; path: string }> {
  const part = loaded.part!;
  const seen = new Map<string, string>();
  seen.set('part.yaml', loaded.yamlFile);
  for (const s of part.samples) {
    const names = [
      ...s.sweeps.map((w) => w.file),
      s.compensation?.open,
      s.compensation?.short,
      s.compensation?.load,
    ].filter((x): x is string => !!x);
    for (const n of names) {
      const rel = posix.normalize(n.replace(/\\/g, '/'));
      if (rel.startsWith('..') || posix.isAbsolute(rel)) continue;
      if (!seen.has(rel)) seen.set(rel, join(loaded.folder, rel));
    }
  }
  return [...seen].map(([rel, path]) => ({ rel, path }));
}

export interface MakeDownloadsOptions {
  /** Read a record file as text (default node:fs, UTF-8). */
  readText?: (path: string) => string;
}

/**
 * The download files of one part: netlist with all modes, main mode only, model Touchstone,
 * parameters JSON and CSV (default sample), the same per extra sample, and the raw record.
 */
export function makeDownloads(
  loaded: LoadedPart,
  result: PartResult,
  options: MakeDownloadsOptions = {},
): DownloadFile[] {
  const part = loaded.part;
  if (!part) return [];
  const read = options.readText ?? ((p: string) => readFileSync(p, 'utf8'));
  const files: DownloadFile[] = [];
  files.push(...modelDownloads(part, result));
  for (const f of recordFiles(loaded)) {
    let content: string;
    try {
      content = read(f.path);
    } catch {
      continue;
    }
    files.push({
      name: `raw/${f.rel}`,
      label: f.rel === 'part.yaml' ? 'Part record (part.yaml)' : `Raw sweep ${f.rel}`,
      content,
    });
  }
  return files;
}

/** Most files written at once. */
const WRITE_CONCURRENCY = 32;

async function writeAll(jobs: Array<{ path: string; content: string | Uint8Array }>): Promise<void> {
  const dirs = new Set(jobs.map((j) => dirname(j.path)));
  for (const d of [...dirs].sort()) await mkdir(d, { recursive: true });
  let next = 0;
  const worker = async () => {
    while (next < jobs.length) {
      const j = jobs[next++];
      await writeFile(j.path, j.content);
    }
  };
  await Promise.all(Array.from({ length: Math.min(WRITE_CONCURRENCY, jobs.length) }, worker));
}

/** A download name must stay inside downloads/<id>/. */
function checkedName(name: string): string {
  const n = posix.normalize(name);
  if (n.startsWith('..') || posix.isAbsolute(n) || n.includes('\0'))
    throw new Error(`emit: download name leaves its folder: ${JSON.stringify(name)}`);
  return n;
}

/**
 * Write the catalogue data for the site (see module doc). `outDir` is created; existing files
 * of the same names are replaced (the build writes into a fresh staging folder).
 */
export async function writeCatalogueData(outDir: string, parts: EmitPart[]): Promise<void> {
  const jobs: Array<{ path: string; content: string | Uint8Array }> = [];
  const index: IndexEntry[] = [];
  for (const p of parts) {
    const id = p.data.id;
    jobs.push({ path: join(outDir, 'parts', `${id}.json`), content: JSON.stringify(p.data) });
    jobs.push({ path: join(outDir, 'compare', `${id}.json`), content: JSON.stringify(makeCompareData(p.data)) });
    for (const d of p.downloads)
      jobs.push({ path: join(outDir, 'downloads', id, ...checkedName(d.name).split('/')), content: d.content });
    jobs.push({ path: join(outDir, 'export', `${id}.json`), content: JSON.stringify(catalogueRows(p.data)) });
    index.push(makeIndexEntry(p.data));
  }
  await mkdir(outDir, { recursive: true });
  await writeAll(jobs);
  await writeFile(join(outDir, 'index.json'), JSON.stringify(sortById(index)));
}

/**
 * Write `<data>/catalogue.json` and `.csv` from the parts' `export/<id>.json`, in the order of `ids`.
 * @param filesDirOf the folder holding a part's files (its cache entry, or the data folder)
 */
export async function writeCatalogueExport(
  dataDir: string,
  ids: string[],
  filesDirOf: (id: string) => string = () => dataDir,
): Promise<void> {
  const rows = ids.map(
    (id) => JSON.parse(readFileSync(join(filesDirOf(id), 'export', `${id}.json`), 'utf8')) as CatalogueRow[],
  );
  const data = catalogueExportOf(rows);
  await writeFile(join(dataDir, 'catalogue.json'), JSON.stringify(data));
  await writeFile(join(dataDir, 'catalogue.csv'), catalogueCsv(data));
}
