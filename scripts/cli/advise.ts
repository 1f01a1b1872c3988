/**
 * `motional advise PART [--sample ID | --lot-median] [--circuit NAME] [--circuits FILE]
 *                       [--gm 5mA/V --pin-in 3pF --pin-out 3pF --stray 2pF ...] [--cl 8pF] [--json]`
 * `motional advise --all [CONTENT] [--circuit NAME] [--circuits FILE] [--format text|csv|json]`
 *
 * Pierce load-capacitor and start-up advice for one part and one or more oscillator circuits:
 * a named circuit of the circuits file (content/oscillators.yaml by default), that circuit with
 * some values replaced by flags, a circuit given entirely by flags, or — with neither — every
 * circuit of the file whose frequency range holds the part. Exit: 0 done, 1 bad input (or a
 * circuit for which no advice is possible, e.g. strays above the load capacitance), 2 usage.
 */
import { readFile } from 'node:fs/promises';
import { formatIssue } from '../../src/lib/issues.ts';
import { readdir } from 'node:fs/promises';
import { join } from 'node:path';
import { advisePierce, type CapacitorPair, type PierceAdvice } from '../../src/lib/osc/pierce.ts';
import { parseOscillatorsYaml } from '../../src/lib/osc/oscillators-yaml.ts';
import { circuitCovers, offerFrequencyHz } from '../../src/lib/osc/circuit-offer.ts';
import { circuitFit, fitsCsv, FIT_VERDICT_LABEL, type CircuitFit } from '../../src/lib/report/fits.ts';
import {
  CIRCUIT_OUTPUT_NAME,
  OscillatorCircuitInput,
  OscillatorCircuitSchema,
  type CircuitRecordKey,
  type OscillatorCircuit,
} from '../../src/lib/schema/oscillators.ts';
import { formatSi, parseQuantity } from '../../src/lib/units/si.ts';
import { EXIT_BAD_INPUT, EXIT_OK, EXIT_USAGE, parseCommandArgs, processIo, type CliIo } from './io.ts';
import { loadChosenModel } from './netlist.ts';

const DEFAULT_CIRCUITS = 'content/oscillators.yaml';

/** Circuit flags and the record key each sets (the circuits file's spelling). */
const CIRCUIT_FLAGS: Record<string, CircuitRecordKey> = {
  gm: 'gm',
  'pin-in': 'inputCapacitance',
  'pin-out': 'outputCapacitance',
  stray: 'boardStray',
  'stray-uncertainty': 'boardStrayUncertainty',
  'pin-to-pin': 'pinToPinStray',
  'pin-to-pin-uncertainty': 'pinToPinStrayUncertainty',
  supply: 'supply',
  swing: 'swing',
  'max-drive': 'maxDrive',
  tolerance: 'capacitorTolerance',
  series: 'series',
  requirement: 'frequencyRequirement',
  'startup-max': 'startupTimeMax',
  'current-limit': 'currentLimit',
};

const USAGE = `usage: motional advise PART [options]

Suggest Pierce-oscillator load capacitors for a part (preferred values), with the frequency
offset they leave, its band, the gain margin, negative resistance and drive level.
PART is a part.yaml or its folder.

part:
  --sample ID                 sample to use (default: the first)
  --lot-median                the lot's median part instead of one sample
  --cl C                      target load capacitance (default: the datasheet's), e.g. 8pF
circuit (default: every circuit in ${DEFAULT_CIRCUITS} suited to the part's frequency):
  --circuits FILE             circuits file (default ${DEFAULT_CIRCUITS})
  --circuit NAME              one circuit of that file; the flags below replace its values
  --gm G                      amplifier transconductance, e.g. 5mA/V or 5mS
  --pin-in C, --pin-out C     amplifier pin capacitances to ground, e.g. 3pF
  --stray C                   board stray of each crystal pin to ground, e.g. 1.5pF
  --stray-uncertainty C       ± on the board stray (default 0)
  --pin-to-pin C              stray across the crystal (default 0)
  --pin-to-pin-uncertainty C  ± on it (default 0)
  --supply V                  supply voltage, e.g. 3.3V
  --swing V                   peak-to-peak voltage across the crystal (default: the supply)
  --max-drive P               the circuit's own drive budget, e.g. 100uW
  --tolerance T               load capacitor tolerance (default 5%)
  --series E6|E12|E24         preferred-value series (default E12)
  --requirement PPM           allowed frequency deviation, all causes, e.g. 50ppm
  --startup-max T             longest acceptable start-up time, e.g. 2ms
  --current-limit I           amplifier output current limit, e.g. 200uA
  (a value starting with '-' needs the --flag=VALUE form, e.g. --pin-out=-1pF)
output:
  --json                      the advice as JSON
  -h, --help                  this text

every part:
  motional advise --all [CONTENT] [--circuit NAME] [--circuits FILE] [--format text|csv|json]
  One row per part (first sample) and circuit: recommended pair, offset, gain margin, start-up
  time and a verdict (fits / check / does not fit / outside range). CONTENT is the content
  folder (default content; parts in CONTENT/parts/*/part.yaml, circuits in
  CONTENT/oscillators.yaml unless --circuits is given).
`;

function pfText(f: number): string {
  return formatSi(f, 'F', 4);
}

function ppmText(x: number): string {
  return `${x >= 0 ? '+' : ''}${x.toFixed(3)} ppm`;
}

function budgetRange(p: CapacitorPair): string {
  const r = (a: { min: number; max: number }) => `${ppmText(a.min)} … ${ppmText(a.max)}`;
  return `${r(p.budget.worstCasePpm)}; ${r(p.budget.rssPpm)}`;
}

function pairColumn(p: CapacitorPair): string[] {
  const ppm = (x: number) => `${x >= 0 ? '+' : ''}${x.toFixed(3)} ppm`;
  return [
    `${pfText(p.inputCapF)} / ${pfText(p.outputCapF)}`,
    pfText(p.clF),
    ppm(p.offsetPpm),
    `${ppm(p.bandPpm.min)} … ${ppm(p.bandPpm.max)}`,
    `${p.gainMargin.toFixed(2)}${p.gainMarginDatasheet !== undefined ? ` (${p.gainMarginDatasheet.toFixed(2)} at max ESR)` : ''}`,
    `${formatSi(p.pinsResistanceOhm, 'Ω', 4)} (RL ${formatSi(p.rlOhm, 'Ω', 4)})`,
    formatSi(p.motionalResistanceOhm, 'Ω', 4),
    Number.isFinite(p.startupTauS)
      ? `τ ${formatSi(p.startupTauS, 's', 3)}, ${formatSi(p.startupTimeS, 's', 3)}`
      : 'does not start',
    budgetRange(p),
    formatSi(p.driveW, 'W', 3),
  ];
}

/** Plain-text report of one advice. */
export function formatAdvice(a: PierceAdvice, sampleText: string): string {
  const out: string[] = [`${a.part} (${sampleText}) in circuit ${a.circuit}`];
  if (a.target) {
    out.push(
      `target ${formatSi(a.target.targetHz, 'Hz', 10)} (${a.target.targetBasis}); this sample needs CL ${pfText(a.target.idealLoadF)}`,
    );
  }
  if (!a.ok) {
    out.push(`no advice: ${a.reason}`);
  } else {
    out.push(`ideal equal capacitors ${pfText(a.idealEqualCapF)}`);
    const labels = [
      'capacitors in / out',
      'load capacitance',
      'offset from target',
      'band (tolerances)',
      'gain margin gm/gm,crit',
      'resistance at crystal pins',
      'resistance at motional branch',
      'start-up',
      'budget (worst, rss)',
      'drive level',
    ];
    const eq = pairColumn(a.equal);
    const best = pairColumn(a.best);
    const w0 = Math.max(...labels.map((l) => l.length));
    const w1 = Math.max(10, ...eq.map((s) => s.length));
    out.push('', `${''.padEnd(w0)}  ${'equal pair'.padEnd(w1)}  best pair`);
    labels.forEach((l, i) => out.push(`${l.padEnd(w0)}  ${eq[i].padEnd(w1)}  ${best[i]}`));
    for (const [name, p] of [
      ['equal pair', a.equal],
      ['best pair', a.best],
    ] as const) {
      out.push('', `${name}:`);
      const names: Record<string, string> = {
        frequency: 'frequency',
        gainMargin: 'gain margin',
        negativeResistance: 'negative resistance',
        startup: 'start-up',
        budget: 'frequency budget',
        drive: 'drive level',
      };
      for (const [what, c] of Object.entries(p.checks))
        out.push(`  [${c.verdict}] ${names[what] ?? what}: ${c.reason}`);
      out.push('  frequency budget terms:');
      for (const t of p.budget.terms)
        out.push(`    ${t.name} (${t.source}): ${ppmText(t.minPpm)} … ${ppmText(t.maxPpm)}`);
    }
  }
  out.push('', 'assumptions:', ...a.assumptions.map((s) => `  - ${s}`));
  out.push('cautions:', ...a.cautions.map((s) => `  - ${s}`));
  return `${out.join('\n')}\n`;
}

/** Run `advise` with the arguments after the command name. */
export async function run(args: string[], io: CliIo = processIo): Promise<number> {
  const flagOptions = Object.fromEntries(Object.keys(CIRCUIT_FLAGS).map((k) => [k, { type: 'string' as const }]));
  const parsed = parseCommandArgs(
    'advise',
    args,
    {
      sample: { type: 'string' },
      'lot-median': { type: 'boolean' },
      cl: { type: 'string' },
      circuits: { type: 'string' },
      circuit: { type: 'string' },
      json: { type: 'boolean' },
      all: { type: 'boolean' },
      format: { type: 'string' },
      help: { type: 'boolean', short: 'h' },
      ...flagOptions,
    },
    USAGE,
    io,
  );
  if (typeof parsed === 'number') return parsed;
  const { values: v, positionals } = parsed;
  const flags = v as Record<string, string | boolean | undefined>;
  const usageError = (message: string) => (io.err(`motional advise: ${message}\n\n${USAGE}`), EXIT_USAGE);
  if (v.all) return runAll(positionals, flags, io, usageError);
  if (v.format !== undefined) return usageError('--format goes with --all (use --json for one part)');
  if (positionals.length !== 1) return usageError(`expected one PART, got ${positionals.length}`);
  if (v.sample !== undefined && v['lot-median']) return usageError('--sample and --lot-median exclude each other');
  let targetLoadF: number | undefined;
  if (v.cl !== undefined) {
    const q = parseQuantity(v.cl, 'capacitance');
    if (!q.ok || !(q.value > 0))
      return usageError(`--cl: ${q.ok ? `expected a positive capacitance, got "${v.cl}"` : q.message}`);
    targetLoadF = q.value;
  }

  // Circuits: from the file (named or all), then flags on top.
  const given = Object.keys(CIRCUIT_FLAGS).filter((k) => flags[k] !== undefined);
  let circuits: OscillatorCircuit[] = [];
  let fromFile = false;
  if (v.circuit !== undefined || given.length === 0) {
    const file = v.circuits ?? DEFAULT_CIRCUITS;
    let text: string;
    try {
      text = await readFile(file, 'utf8');
    } catch {
      io.err(`${file}:1: cannot read the circuits file\n`);
      return EXIT_BAD_INPUT;
    }
    const read = parseOscillatorsYaml(text, file);
    for (const issue of read.issues) io.err(`${formatIssue(issue)}\n`);
    if (read.issues.some((i) => i.severity === 'error')) return EXIT_BAD_INPUT;
    circuits = read.circuits;
    fromFile = true;
    if (v.circuit !== undefined) {
      const c = circuits.find((x) => x.name === v.circuit);
      if (!c)
        return usageError(
          `--circuit: no circuit "${v.circuit}" in ${file} (circuits: ${circuits.map((x) => x.name).join(', ')})`,
        );
      circuits = [c];
    }
  }
  if (given.length) {
    const byField = Object.fromEntries(Object.entries(CIRCUIT_FLAGS).map(([flag, field]) => [field, flag]));
    if (v.circuit !== undefined) {
      // Replace single values of the named circuit, each checked by its own field schema.
      const circuit: Record<string, unknown> = { ...circuits[0] };
      const problems: string[] = [];
      for (const k of given) {
        const field = CIRCUIT_FLAGS[k];
        const one = OscillatorCircuitInput.shape[field].safeParse(flags[k]);
        if (one.success) circuit[CIRCUIT_OUTPUT_NAME[field]] = one.data;
        else problems.push(`--${k}: ${one.error.issues[0].message}`);
      }
      if (problems.length) return usageError(problems.join('\n'));
      circuits = [circuit as unknown as OscillatorCircuit];
    } else {
      const base: Record<string, unknown> = { name: 'command-line', capacitorTolerance: '5 %', series: 'E12' };
      for (const k of given) base[CIRCUIT_FLAGS[k]] = flags[k];
      const checked = OscillatorCircuitSchema.safeParse(base);
      if (!checked.success) {
        const lines = checked.error.issues.map((i) => {
          const field = String(i.path[0]);
          return base[field] === undefined
            ? `--${byField[field] ?? field}: missing (needed without --circuit)`
            : `--${byField[field] ?? field}: ${i.message}`;
        });
        return usageError(lines.join('\n'));
      }
      circuits = [checked.data];
    }
  }

  const chosen = await loadChosenModel(positionals[0], { sampleId: v.sample, lotMedian: v['lot-median'] }, io);
  if (typeof chosen === 'number') return chosen;
  const { model, mainIndex } = chosen.model;
  if (mainIndex < 0) {
    io.err(`${chosen.part.id}: no main mode to advise on\n`);
    return EXIT_BAD_INPUT;
  }
  // Circuits are offered by the part's nominal (or load-resonance) frequency, not the measured fs.
  const offerHz = offerFrequencyHz(chosen.part.datasheet, model, mainIndex);
  if (fromFile && v.circuit === undefined) {
    circuits = circuits.filter((c) => circuitCovers(c, offerHz));
    if (!circuits.length) {
      io.err(
        `${chosen.part.id}: no circuit in the circuits file covers ${formatSi(offerHz, 'Hz', 6)}; name one with --circuit or give its values\n`,
      );
      return EXIT_BAD_INPUT;
    }
  }
  const sampleText = chosen.sample
    ? `sample ${chosen.sample.sample}`
    : `lot median of ${chosen.info.lotMedianOf} samples`;
  const temperatureFit = chosen.sample?.temperature;
  const advice = circuits.map((circuit) =>
    advisePierce({
      partId: chosen.part.id,
      datasheet: chosen.part.datasheet,
      model,
      mainBranch: mainIndex,
      circuit,
      targetLoadF,
      temperatureFit,
    }),
  );
  if (v.json) io.out(`${JSON.stringify(advice, null, 2)}\n`);
  else io.out(advice.map((a) => formatAdvice(a, sampleText)).join('\n'));
  return advice.every((a) => a.ok) ? EXIT_OK : EXIT_BAD_INPUT;
}

const ALL_FORMATS = ['text', 'csv', 'json'] as const;

/** `advise --all`: every part of a content folder against every circuit (or one). */
async function runAll(
  positionals: string[],
  flags: Record<string, string | boolean | undefined>,
  io: CliIo,
  usageError: (m: string) => number,
): Promise<number> {
  const format = (flags.format ?? (flags.json ? 'json' : 'text')) as string;
  if (!(ALL_FORMATS as readonly string[]).includes(format))
    return usageError(`--format: expected one of ${ALL_FORMATS.join(', ')}, got "${format}"`);
  if (positionals.length > 1) return usageError(`--all takes at most one CONTENT folder, got ${positionals.length}`);
  const other = ['sample', 'lot-median', 'cl', ...Object.keys(CIRCUIT_FLAGS)].filter((k) => flags[k] !== undefined);
  if (other.length)
    return usageError(`--all takes only --circuit, --circuits and --format (not --${other.join(', --')})`);
  const content = positionals[0] ?? 'content';
  const file = (flags.circuits as string | undefined) ?? join(content, 'oscillators.yaml');
  let text: string;
  try {
    text = await readFile(file, 'utf8');
  } catch {
    io.err(`${file}:1: cannot read the circuits file\n`);
    return EXIT_BAD_INPUT;
  }
  const read = parseOscillatorsYaml(text, file);
  for (const issue of read.issues) io.err(`${formatIssue(issue)}\n`);
  if (read.issues.some((i) => i.severity === 'error')) return EXIT_BAD_INPUT;
  let circuits = read.circuits;
  if (flags.circuit !== undefined) {
    circuits = circuits.filter((c) => c.name === flags.circuit);
    if (!circuits.length)
      return usageError(
        `--circuit: no circuit "${flags.circuit}" in ${file} (circuits: ${read.circuits.map((x) => x.name).join(', ')})`,
      );
  }
  const partsDir = join(content, 'parts');
  let folders: string[];
  try {
    folders = (await readdir(partsDir, { withFileTypes: true }))
      .filter((d) => d.isDirectory())
      .map((d) => d.name)
      .sort();
  } catch {
    io.err(`${partsDir}: cannot read the parts folder\n`);
    return EXIT_BAD_INPUT;
  }
  const rows: Array<{ part: string } & CircuitFit> = [];
  let failed = 0;
  const quiet: CliIo = { out: () => {}, err: (t) => io.err(t) };
  for (const folder of folders) {
    const chosen = await loadChosenModel(join(partsDir, folder), {}, quiet);
    if (typeof chosen === 'number' || chosen.model.mainIndex < 0) {
      failed++;
      if (typeof chosen !== 'number') io.err(`${chosen.part.id}: no main mode to advise on\n`);
      for (const c of circuits)
        rows.push({ part: folder, circuit: c.name, verdict: 'no', reason: 'no model (see the messages above)' });
      continue;
    }
    const { model, mainIndex } = chosen.model;
    const offerHz = offerFrequencyHz(chosen.part.datasheet, model, mainIndex);
    for (const circuit of circuits) {
      const covers = circuitCovers(circuit, offerHz);
      const a = advisePierce({
        partId: chosen.part.id,
        datasheet: chosen.part.datasheet,
        model,
        mainBranch: mainIndex,
        circuit,
        temperatureFit: chosen.sample?.temperature,
      });
      rows.push({ part: chosen.part.id, ...circuitFit(a, covers) });
    }
  }
  if (format === 'json') io.out(`${JSON.stringify(rows, null, 2)}\n`);
  else if (format === 'csv') io.out(fitsCsv(rows));
  else io.out(fitsText(rows));
  return failed ? EXIT_BAD_INPUT : EXIT_OK;
}

/** The fits as an aligned text table. */
function fitsText(rows: Array<{ part: string } & CircuitFit>): string {
  const head = ['part', 'circuit', 'verdict', 'pair in / out', 'offset', 'gain margin', 'start-up', 'note'];
  const body = rows.map((r) => [
    r.part,
    r.circuit,
    FIT_VERDICT_LABEL[r.verdict],
    r.inputCapF !== undefined ? `${pfText(r.inputCapF)} / ${pfText(r.outputCapF!)}` : '',
    r.offsetPpm !== undefined ? ppmText(r.offsetPpm) : '',
    r.gainMargin !== undefined ? r.gainMargin.toFixed(2) : '',
    r.startupTimeS !== undefined
      ? formatSi(r.startupTimeS, 's', 3)
      : r.verdict === 'outside'
        ? ''
        : r.inputCapF !== undefined
          ? 'never'
          : '',
    r.verdict === 'fits' ? '' : r.reason,
  ]);
  const widths = head.map((h, i) => Math.max(h.length, ...body.map((b) => b[i].length)));
  const line = (cells: string[]) =>
    cells
      .map((c, i) => (i === cells.length - 1 ? c : c.padEnd(widths[i])))
      .join('  ')
      .trimEnd();
  return `${[line(head), ...body.map(line)].join('\n')}\n`;
}
