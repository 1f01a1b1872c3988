/**
 * `motional netlist PART [--sample ID | --lot-median] [--main-only] [--no-spurious]
 *                        [--format spice|touchstone|csv|json] [--start F --stop F --points N]`
 *
 * Prints the SPICE subcircuit of one sample of a part (the first unless --sample) on stdout
 * (README: Commands), or the lot's median part, or — with --format — the model as a Touchstone
 * `.s1p`, or the parameters as CSV / JSON. Exit: 0 done, 1 bad input, 2 usage.
 * The header's date is the sample's `measured` date (never the clock).
 */
import { formatIssue } from '../../src/lib/issues.ts';
import type { SampleResult } from '../../src/lib/extract/types.ts';
import { extractPart } from '../../src/lib/extract/extract-part.ts';
import { formatModelTouchstone } from '../../src/lib/models/model-touchstone.ts';
import { formatNetlist, type NetlistInfo } from '../../src/lib/models/netlist-spice.ts';
import { medianModel, modelFromResult, type ModelWithLabels } from '../../src/lib/report/netlist-model.ts';
import {
  formatParametersCsv,
  formatParametersJson,
  type ExportSample,
} from '../../src/lib/report/parameters-export.ts';
import type { Part } from '../../src/lib/schema/part.ts';
import { parseQuantity } from '../../src/lib/units/si.ts';
import { netlistInfoOf } from '../../src/lib/report/netlist-info.ts';
import { inductanceOf, qualityOf } from '../../src/lib/models/bvd.ts';
import { loadPart } from '../../src/pipeline/load-part.ts';
import type { MainModeResult } from '../../src/lib/extract/main-mode.ts';
import { EXIT_BAD_INPUT, EXIT_OK, EXIT_USAGE, parseCommandArgs, processIo, type CliIo } from './io.ts';

const USAGE = `usage: motional netlist PART [options]

Print a SPICE subcircuit of a part: C0 and one R-L-C branch per measured mode.
PART is a part.yaml or its folder.

options:
  --sample ID        sample to model (default: the first)
  --lot-median       the lot's median part: median of each parameter per mode over the samples
  --main-only        only the main mode's branch
  --no-spurious      leave out spurious modes
  --format FORMAT    spice (default) | touchstone (.s1p of the model) | csv | json (parameters)
  --start F, --stop F, --points N
                     Touchstone span and points (default: the measured span, 2001 points)
  -h, --help         this text
`;

/** What both `netlist` and `advise` need: the part, its extraction and the chosen model. */
export interface ChosenModel {
  part: Part;
  /** The chosen sample, absent for the lot median. */
  sample?: SampleResult;
  samples: SampleResult[];
  model: ModelWithLabels;
  info: NetlistInfo;
}

export interface ChooseOptions {
  sampleId?: string;
  lotMedian?: boolean;
}

/**
 * Load a part, extract it and pick one sample (or the lot median). Prints problems on `io.err`;
 * returns an exit status instead of a model when it cannot go on.
 */
export async function loadChosenModel(path: string, opts: ChooseOptions, io: CliIo): Promise<ChosenModel | number> {
  const loaded = await loadPart(path);
  for (const issue of loaded.issues) io.err(`${formatIssue(issue)}\n`);
  if (!loaded.part || loaded.issues.some((i) => i.severity === 'error')) return EXIT_BAD_INPUT;
  const part = loaded.part;
  const result = extractPart(part, loaded.sweeps);
  const hints = { frequencyHz: part.datasheet?.frequencyHz, overtone: part.datasheet?.overtone };

  if (opts.lotMedian) {
    const med = medianModel(result.samples, hints);
    if (med.n === 0 || med.model.branches.length === 0) {
      io.err(`${loaded.yamlFile}: no sample of ${part.id} has a measured mode; no median part\n`);
      return EXIT_BAD_INPUT;
    }
    const dates = part.samples
      .map((s) => s.measured)
      .filter((d): d is string => d !== undefined)
      .sort();
    const spans = result.samples.filter((s) => s.spanHz.max > 0).map((s) => s.spanHz);
    const info: NetlistInfo = {
      partId: part.id,
      title: part.title,
      kind: part.kind,
      lotMedianOf: med.n,
      labels: med.labels,
      date: dates.length
        ? dates[0] === dates[dates.length - 1]
          ? dates[0]
          : `${dates[0]} to ${dates[dates.length - 1]}`
        : undefined,
      method: `median over ${med.n} samples of their extracted parameters`,
      validSpanHz: spans.length
        ? { min: Math.max(...spans.map((s) => s.min)), max: Math.min(...spans.map((s) => s.max)) }
        : undefined,
    };
    if (info.validSpanHz && !(info.validSpanHz.max > info.validSpanHz.min)) info.validSpanHz = undefined;
    return { part, samples: result.samples, model: med, info };
  }

  const sample =
    opts.sampleId === undefined ? result.samples[0] : result.samples.find((s) => s.sample === opts.sampleId);
  if (!sample) {
    io.err(
      `${loaded.yamlFile}: no sample "${opts.sampleId}" in ${part.id} (samples: ${part.samples.map((s) => s.id).join(', ')})\n`,
    );
    return EXIT_BAD_INPUT;
  }
  for (const w of sample.warnings) io.err(`${loaded.yamlFile}: warning: sample ${sample.sample}: ${w}\n`);
  if (sample.modes.length === 0) {
    io.err(`${loaded.yamlFile}: sample ${sample.sample} of ${part.id}: no mode could be extracted, no model\n`);
    return EXIT_BAD_INPUT;
  }
  const model = modelFromResult(sample);
  const info = netlistInfoOf(part, sample, model.labels);
  return { part, sample, samples: result.samples, model, info };
}

/** The median model as an export sample (no uncertainties, derived L1 and Q). */
function medianExport(chosen: ChosenModel): ExportSample & { mainMode: MainModeResult } {
  const { model, labels, mainIndex, mainRule } = chosen.model;
  return {
    sample: 'lot-median',
    c0F: model.c0F,
    mainMode: { index: mainIndex, rule: mainRule },
    modes: model.branches.map((b, i) => ({
      overtone: labels[i].overtone,
      spurious: labels[i].spurious,
      fsHz: b.fsHz,
      r1Ohm: b.r1Ohm,
      c1F: b.c1F,
      l1H: inductanceOf(b),
      q: qualityOf(b),
    })),
  };
}

const FORMATS = ['spice', 'touchstone', 'csv', 'json'] as const;

/** Run `netlist` with the arguments after the command name. */
export async function run(args: string[], io: CliIo = processIo): Promise<number> {
  const parsed = parseCommandArgs(
    'netlist',
    args,
    {
      sample: { type: 'string' },
      'lot-median': { type: 'boolean' },
      'main-only': { type: 'boolean' },
      'no-spurious': { type: 'boolean' },
      format: { type: 'string' },
      start: { type: 'string' },
      stop: { type: 'string' },
      points: { type: 'string' },
      help: { type: 'boolean', short: 'h' },
    },
    USAGE,
    io,
  );
  if (typeof parsed === 'number') return parsed;
  const { values: v, positionals } = parsed;
  const usageError = (message: string) => (io.err(`motional netlist: ${message}\n\n${USAGE}`), EXIT_USAGE);
  if (positionals.length !== 1) return usageError(`expected one PART, got ${positionals.length}`);
  if (v.sample !== undefined && v['lot-median']) return usageError('--sample and --lot-median exclude each other');
  const format = (v.format ?? 'spice') as (typeof FORMATS)[number];
  if (!FORMATS.includes(format))
    return usageError(`--format: expected one of ${FORMATS.join(', ')}, got "${v.format}"`);
  const freq = (name: 'start' | 'stop'): number | undefined | string => {
    if (v[name] === undefined) return undefined;
    const q = parseQuantity(v[name]!, 'frequency');
    return q.ok ? q.value : `--${name}: ${q.message}`;
  };
  const startHz = freq('start');
  const stopHz = freq('stop');
  if (typeof startHz === 'string') return usageError(startHz);
  if (typeof stopHz === 'string') return usageError(stopHz);
  const points = v.points === undefined ? undefined : Number(v.points);
  if (points !== undefined && !Number.isInteger(points))
    return usageError(`--points: expected a whole number, got "${v.points}"`);

  const chosen = await loadChosenModel(positionals[0], { sampleId: v.sample, lotMedian: v['lot-median'] }, io);
  if (typeof chosen === 'number') return chosen;
  const selection = { mainModeOnly: v['main-only'], includeSpurious: !v['no-spurious'] };

  switch (format) {
    case 'spice':
      io.out(formatNetlist(chosen.model.model, chosen.info, selection));
      return EXIT_OK;
    case 'touchstone': {
      const picked = modelFromResult(chosen.sample ?? medianExport(chosen), selection);
      const r = formatModelTouchstone(picked.model, chosen.info, { startHz, stopHz, points });
      if (!r.ok) return usageError(r.reason);
      io.out(r.text);
      return EXIT_OK;
    }
    case 'csv':
      io.out(formatParametersCsv(chosen.sample ?? medianExport(chosen)));
      return EXIT_OK;
    case 'json':
      io.out(
        formatParametersJson(chosen.sample ?? medianExport(chosen), { partId: chosen.part.id, date: chosen.info.date }),
      );
      return EXIT_OK;
  }
}
