/**
 * `motional advise PART [--sample ID | --lot-median] [--circuit NAME] [--circuits FILE]
 *                       [--gm 5mA/V --pin-in 3pF --pin-out 3pF --stray 2pF ...] [--cl 8pF] [--json]`
 *
 * Pierce load-capacitor and start-up advice for one part and one or more oscillator circuits:
 * a named circuit of the circuits file (content/oscillators.yaml by default), that circuit with
 * some values replaced by flags, a circuit given entirely by flags, or — with neither — every
 * circuit of the file whose frequency range holds the part. Exit: 0 done, 1 bad input (or a
 * circuit for which no advice is possible, e.g. strays above the load capacitance), 2 usage.
 */
import { readFile } from 'node:fs/promises';
import { parseArgs } from 'node:util';
import { formatIssue } from '../../src/lib/issues.ts';
import { advisePierce, type CapacitorPair, type PierceAdvice } from '../../src/lib/osc/pierce.ts';
import { parseOscillatorsYaml } from '../../src/lib/osc/oscillators-yaml.ts';
import { OscillatorCircuitSchema, type OscillatorCircuit } from '../../src/lib/schema/oscillators.ts';
import { formatSi, parseQuantity } from '../../src/lib/units/si.ts';
import { EXIT_BAD_INPUT, EXIT_OK, EXIT_USAGE, processIo, type CliIo } from './io.ts';
import { loadChosenModel } from './netlist.ts';

const DEFAULT_CIRCUITS = 'content/oscillators.yaml';

/** Circuit flags and the circuit field each sets. */
const CIRCUIT_FLAGS: Record<string, keyof OscillatorCircuit> = {
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
  (a value starting with '-' needs the --flag=VALUE form, e.g. --pin-out=-1pF)
output:
  --json                      the advice as JSON
  -h, --help                  this text
`;

function pfText(f: number): string {
  return formatSi(f, 'F', 4);
}

function pairColumn(p: CapacitorPair): string[] {
  const ppm = (x: number) => `${x >= 0 ? '+' : ''}${x.toFixed(3)} ppm`;
  return [
    `${pfText(p.inputCapF)} / ${pfText(p.outputCapF)}`,
    pfText(p.clF),
    ppm(p.offsetPpm),
    `${ppm(p.bandPpm.min)} … ${ppm(p.bandPpm.max)}`,
    `${p.gainMargin.toFixed(2)}${p.gainMarginDatasheet !== undefined ? ` (${p.gainMarginDatasheet.toFixed(2)} at max ESR)` : ''}`,
    `${formatSi(p.negativeResistanceOhm, 'Ω', 4)} (RL ${formatSi(p.rlOhm, 'Ω', 4)})`,
    formatSi(p.driveW, 'W', 3),
  ];
}

/** Plain-text report of one advice. */
export function formatAdvice(a: PierceAdvice, sampleText: string): string {
  const out: string[] = [`${a.part} (${sampleText}) in circuit ${a.circuit}`];
  if (a.target) {
    out.push(`target ${formatSi(a.target.targetHz, 'Hz', 10)} (${a.target.targetBasis}); this sample needs CL ${pfText(a.target.idealLoadF)}`);
  }
  if (!a.ok) {
    out.push(`no advice: ${a.reason}`);
  } else {
    out.push(`ideal equal capacitors ${pfText(a.idealEqualCapF)}`);
    const labels = ['capacitors in / out', 'load capacitance', 'offset from target', 'band (tolerances)', 'gain margin gm/gm,crit', 'negative resistance', 'drive level'];
    const eq = pairColumn(a.equal);
    const best = pairColumn(a.best);
    const w0 = Math.max(...labels.map((l) => l.length));
    const w1 = Math.max(10, ...eq.map((s) => s.length));
    out.push('', `${''.padEnd(w0)}  ${'equal pair'.padEnd(w1)}  best pair`);
    labels.forEach((l, i) => out.push(`${l.padEnd(w0)}  ${eq[i].padEnd(w1)}  ${best[i]}`));
    for (const [name, p] of [['equal pair', a.equal], ['best pair', a.best]] as const) {
      out.push('', `${name}:`);
      const names: Record<string, string> = { frequency: 'frequency', gainMargin: 'gain margin', negativeResistance: 'negative resistance', drive: 'drive level' };
      for (const [what, c] of Object.entries(p.checks)) out.push(`  [${c.verdict}] ${names[what] ?? what}: ${c.reason}`);
    }
  }
  out.push('', 'assumptions:', ...a.assumptions.map((s) => `  - ${s}`));
  out.push('cautions:', ...a.cautions.map((s) => `  - ${s}`));
  return `${out.join('\n')}\n`;
}

/** Run `advise` with the arguments after the command name. */
export async function run(args: string[], io: CliIo = processIo): Promise<number> {
  const flagOptions = Object.fromEntries(Object.keys(CIRCUIT_FLAGS).map((k) => [k, { type: 'string' as const }]));
  let parsed;
  try {
    parsed = parseArgs({
      args,
      allowPositionals: true,
      options: {
        sample: { type: 'string' },
        'lot-median': { type: 'boolean' },
        cl: { type: 'string' },
        circuits: { type: 'string' },
        circuit: { type: 'string' },
        json: { type: 'boolean' },
        help: { type: 'boolean', short: 'h' },
        ...flagOptions,
      },
    });
  } catch (e) {
    io.err(`motional advise: ${e instanceof Error ? e.message : String(e)}\n\n${USAGE}`);
    return EXIT_USAGE;
  }
  const { values: v, positionals } = parsed;
  const flags = v as Record<string, string | boolean | undefined>;
  if (v.help) {
    io.out(USAGE);
    return EXIT_OK;
  }
  const usageError = (message: string) => (io.err(`motional advise: ${message}\n\n${USAGE}`), EXIT_USAGE);
  if (positionals.length !== 1) return usageError(`expected one PART, got ${positionals.length}`);
  if (v.sample !== undefined && v['lot-median']) return usageError('--sample and --lot-median exclude each other');
  let targetLoadF: number | undefined;
  if (v.cl !== undefined) {
    const q = parseQuantity(v.cl, 'capacitance');
    if (!q.ok || !(q.value > 0)) return usageError(`--cl: ${q.ok ? `expected a positive capacitance, got "${v.cl}"` : q.message}`);
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
      if (!c) return usageError(`--circuit: no circuit "${v.circuit}" in ${file} (circuits: ${circuits.map((x) => x.name).join(', ')})`);
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
        const one = OscillatorCircuitSchema.shape[field].safeParse(flags[k]);
        if (one.success) circuit[field] = one.data;
        else problems.push(`--${k}: ${one.error.issues[0].message}`);
      }
      if (problems.length) return usageError(problems.join('\n'));
      circuits = [circuit as OscillatorCircuit];
    } else {
      const base: Record<string, unknown> = { name: 'command-line', capacitorTolerance: '5 %', series: 'E12' };
      for (const k of given) base[CIRCUIT_FLAGS[k]] = flags[k];
      const checked = OscillatorCircuitSchema.safeParse(base);
      if (!checked.success) {
        const lines = checked.error.issues.map((i) => {
          const field = String(i.path[0]);
          return base[field] === undefined ? `--${byField[field] ?? field}: missing (needed without --circuit)` : `--${byField[field] ?? field}: ${i.message}`;
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
  const mainFs = model.branches[mainIndex].fsHz;
  if (fromFile && v.circuit === undefined) {
    circuits = circuits.filter((c) => !c.frequencyRange || (mainFs >= c.frequencyRange.min && mainFs <= c.frequencyRange.max));
    if (!circuits.length) {
      io.err(`${chosen.part.id}: no circuit in the circuits file covers ${formatSi(mainFs, 'Hz', 6)}; name one with --circuit or give its values\n`);
      return EXIT_BAD_INPUT;
    }
  }
  const sampleText = chosen.sample ? `sample ${chosen.sample.sample}` : `lot median of ${chosen.info.lotMedianOf} samples`;
  const advice = circuits.map((circuit) => advisePierce({ partId: chosen.part.id, datasheet: chosen.part.datasheet, model, mainBranch: mainIndex, circuit, targetLoadF }));
  if (v.json) io.out(`${JSON.stringify(advice, null, 2)}\n`);
  else io.out(advice.map((a) => formatAdvice(a, sampleText)).join('\n'));
  return advice.every((a) => a.ok) ? EXIT_OK : EXIT_BAD_INPUT;
}
