/**
 * Emit the generated catalogue data that the site is built from:
 *
 *   <out>/index.json                 search index: IndexEntry[] sorted by id
 *   <out>/parts/<id>.json            PartData of each part (read by the pages at build time)
 *   <out>/compare/<id>.json          CompareData of each part (fetched by the compare page)
 *   <out>/downloads/<id>/<name>      the downloads: netlists, model Touchstone, parameters,
 *                                    and the raw record and sweeps under raw/
 *
 * `makeDownloads` builds the download files of one part with the model exporters of
 * src/lib/models; the netlists are produced by {@link sampleNetlist}, the same function the
 * `netlist` command should print with, so the two are byte-identical.
 */
import { readFileSync } from 'node:fs';
import { mkdir, writeFile } from 'node:fs/promises';
import { dirname, join, posix } from 'node:path';
import type { PartResult, SampleResult } from '../lib/extract/types.ts';
import type { Part } from '../lib/schema/part.ts';
import { formatNetlist, modelFromResult } from '../lib/models/netlist-spice.ts';
import { netlistInfoOf } from '../lib/models/netlist-info.ts';
import { formatModelTouchstone } from '../lib/models/model-touchstone.ts';
import { formatParametersCsv, formatParametersJson } from '../lib/models/parameters-export.ts';
import type { LoadedPart } from './load-part.ts';
import { makeCompareData, makeIndexEntry } from './part-data.ts';
import type { IndexEntry, PartData } from '../site/types.ts';

/** One download file: its name under downloads/<id>/, a label for the page, and its text. */
export interface DownloadFile {
  name: string;
  label: string;
  content: string;
}

/** What `writeCatalogueData` takes per part. */
export interface EmitPart {
  data: PartData;
  downloads: Array<{ name: string; label?: string; content: string | Uint8Array }>;
}

/**
 * The SPICE subcircuit of one sample, as `motional netlist PART [--sample ID]` prints it:
 * every mode, or the main mode only.
 */
export function sampleNetlist(part: Part, sample: SampleResult, options: { mainModeOnly?: boolean } = {}): string {
  const { model, labels } = modelFromResult(sample);
  return formatNetlist(model, netlistInfoOf(part, sample, labels), { mainModeOnly: options.mainModeOnly });
}

/**
 * The sample the downloads describe by default: the first sample, as `netlist` and `advise`
 * take it; when it has no modes, the first one that has.
 */
export function defaultSample(result: PartResult): SampleResult | undefined {
  return result.samples[0]?.modes.length ? result.samples[0] : (result.samples.find((s) => s.modes.length > 0) ?? result.samples[0]);
}

function safeName(text: string): string {
  return text.replace(/[^A-Za-z0-9._-]/g, '_');
}

/** Files of the record itself (part.yaml, sweeps, compensation sweeps), relative to its folder. */
function recordFiles(loaded: LoadedPart): Array<{ rel: string; path: string }> {
  const part = loaded.part!;
  const seen = new Map<string, string>();
  seen.set('part.yaml', loaded.yamlFile);
  for (const s of part.samples) {
    const names = [...s.sweeps.map((w) => w.file), s.compensation?.open, s.compensation?.short, s.compensation?.load].filter((x): x is string => !!x);
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
export function makeDownloads(loaded: LoadedPart, result: PartResult, options: MakeDownloadsOptions = {}): DownloadFile[] {
  const part = loaded.part;
  if (!part) return [];
  const read = options.readText ?? ((p: string) => readFileSync(p, 'utf8'));
  const id = part.id;
  const files: DownloadFile[] = [];
  const first = defaultSample(result);
  const withModes = result.samples.filter((s) => s.modes.length > 0);
  if (first && first.modes.length > 0) {
    files.push({ name: `${id}.cir`, label: `SPICE netlist, all modes (sample ${first.sample})`, content: sampleNetlist(part, first) });
    files.push({ name: `${id}-main.cir`, label: `SPICE netlist, main mode only (sample ${first.sample})`, content: sampleNetlist(part, first, { mainModeOnly: true }) });
    const { model, labels } = modelFromResult(first);
    const ts = formatModelTouchstone(model, netlistInfoOf(part, first, labels));
    if (ts.ok) files.push({ name: `${id}-model.s1p`, label: `Model as Touchstone S-parameters (sample ${first.sample})`, content: ts.text });
    const date = part.samples.find((s) => s.id === first.sample)?.measured;
    files.push({ name: `${id}-parameters.json`, label: `Parameters, JSON (sample ${first.sample})`, content: formatParametersJson(first, { partId: id, date }) });
    files.push({ name: `${id}-parameters.csv`, label: `Parameters, CSV (sample ${first.sample})`, content: formatParametersCsv(first) });
    for (const s of withModes) {
      if (s === first) continue;
      const tag = `${id}-${safeName(s.sample)}`;
      const d = part.samples.find((x) => x.id === s.sample)?.measured;
      files.push({ name: `${tag}.cir`, label: `SPICE netlist, all modes (sample ${s.sample})`, content: sampleNetlist(part, s) });
      files.push({ name: `${tag}-parameters.json`, label: `Parameters, JSON (sample ${s.sample})`, content: formatParametersJson(s, { partId: id, date: d }) });
      files.push({ name: `${tag}-parameters.csv`, label: `Parameters, CSV (sample ${s.sample})`, content: formatParametersCsv(s) });
    }
  }
  for (const f of recordFiles(loaded)) {
    let content: string;
    try {
      content = read(f.path);
    } catch {
      continue;
    }
    files.push({ name: `raw/${f.rel}`, label: f.rel === 'part.yaml' ? 'Part record (part.yaml)' : `Raw sweep ${f.rel}`, content });
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
  if (n.startsWith('..') || posix.isAbsolute(n) || n.includes('\0')) throw new Error(`emit: download name leaves its folder: ${JSON.stringify(name)}`);
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
    for (const d of p.downloads) jobs.push({ path: join(outDir, 'downloads', id, ...checkedName(d.name).split('/')), content: d.content });
    index.push(makeIndexEntry(p.data));
  }
  const collator = new Intl.Collator('en', { numeric: true });
  index.sort((a, b) => collator.compare(a.id, b.id));
  await mkdir(outDir, { recursive: true });
  await writeAll(jobs);
  await writeFile(join(outDir, 'index.json'), JSON.stringify(index));
}

