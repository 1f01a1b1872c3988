/**
 * What a catalogue build reports: its stages, the summary of counts, times and memory, and the
 * summary and issue lines the commands print.
 */
import { relative } from 'node:path';
import { formatIssue, type Issue } from '../lib/issues.ts';

export type BuildStage = 'discover' | 'records' | 'emit' | 'site' | 'swap';

export interface BuildSummary {
  /** 0 built, 1 invalid records or a failed build. */
  exitCode: 0 | 1;
  /** Why the build stopped, when it did. */
  failure?: string;
  recordsFound: number;
  recordsValid: number;
  recordsInvalid: number;
  partsPublished: number;
  samples: number;
  modes: number;
  /** Record warnings (issues) plus extraction warnings. */
  warnings: number;
  /** Error issues. */
  errors: number;
  cache: { enabled: boolean; hits: number; misses: number };
  /** Worker threads requested. */
  jobs: number;
  /** Worker threads started besides the main thread, which takes tasks too (0: main thread only). */
  threads: number;
  /** Wall time per stage and in all, ms. */
  stageMs: Partial<Record<BuildStage, number>> & { total: number };
  /**
   * Time per step summed over records, ms: fingerprint + cache, load + validate, extract, page
   * data, writing. Tasks in one thread overlap (one computes while another waits for the
   * disk), so these add up to more than the wall time; see cpuSeconds for the real cost.
   */
  recordMs: { hash: number; load: number; extract: number; data: number; emit: number };
  /** How the site was rendered: every page, or only the changed parts' pages over the previous site. */
  site?: {
    mode: 'full' | 'partial';
    pagesRendered: number;
    partsRemoved: number;
    /** Who rendered the pages: the site generator, or page-renderer.ts from its kept chunks. */
    renderer?: 'generator' | 'pages';
  };
  /** Peak resident memory, bytes: this process (all threads) and the Astro build process. */
  peakRssBytes: { build: number; site: number };
  /** Bytes the build process (all threads) and the site generator's process wrote to disk (their I/O accounting). */
  diskWrittenBytes?: { build: number; site: number };
  /**
   * CPU time, seconds: this process (all threads, from its start) and the Astro process. Unlike
   * wall time it hardly depends on what else the machine is doing.
   */
  cpuSeconds: { build: number; site: number };
  issues: Issue[];
  outDir: string;
}

/** Human-readable summary lines of a build. */
export function formatSummary(s: BuildSummary): string {
  const sec = (ms: number | undefined) => (ms === undefined ? '-' : `${(ms / 1000).toFixed(1)} s`);
  const mb = (b: number) => `${Math.round(b / 1e6)} MB`;
  const stages = (['discover', 'records', 'emit', 'site', 'swap'] as const)
    .filter((k) => s.stageMs[k] !== undefined)
    .map((k) => `${k} ${sec(s.stageMs[k])}`)
    .join(', ');
  const lines = [
    `records found: ${s.recordsFound} (${s.recordsValid} valid, ${s.recordsInvalid} invalid)`,
    `parts published: ${s.partsPublished}`,
    `samples: ${s.samples}, modes: ${s.modes}, warnings: ${s.warnings}, errors: ${s.errors}`,
    `cache: ${s.cache.enabled ? `${s.cache.hits} hits, ${s.cache.misses} misses` : 'off'}; worker threads: ${s.threads}`,
    ...(s.site
      ? [
          `site: ${s.site.mode === 'full' ? `all ${s.site.pagesRendered} part pages rendered` : `${s.site.pagesRendered} changed part pages rendered, ${s.site.partsRemoved} removed, the rest kept from the previous build${s.site.renderer === 'pages' ? ' (without starting the site generator)' : ''}`}`,
        ]
      : []),
    `time: ${stages}; total ${sec(s.stageMs.total)}`,
    `record steps (summed over records; tasks overlap): fingerprint ${sec(s.recordMs.hash)}, load ${sec(s.recordMs.load)}, extract ${sec(s.recordMs.extract)}, page data ${sec(s.recordMs.data)}, write ${sec(s.recordMs.emit)}`,
    `peak memory: build ${mb(s.peakRssBytes.build)}${s.peakRssBytes.site ? `, site ${mb(s.peakRssBytes.site)}` : ''}; CPU time: build ${s.cpuSeconds.build.toFixed(1)} s${s.cpuSeconds.site ? `, site ${s.cpuSeconds.site.toFixed(1)} s` : ''}`,
  ];
  if (s.exitCode === 0) lines.push(`built ${relative(process.cwd(), s.outDir) || '.'}`);
  else
    lines.push(`build failed: ${s.failure ?? 'unknown'}; ${relative(process.cwd(), s.outDir) || '.'} left unchanged`);
  return `${lines.join('\n')}\n`;
}

/** Every issue as `FILE:LINE: message`, one per line. */
export function formatIssues(issues: Issue[]): string {
  return issues.map((i) => `${formatIssue(i)}\n`).join('');
}
