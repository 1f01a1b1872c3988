/**
 * Write a labelled synthetic sweep file from a known BVD model (seeded, reproducible).
 *
 *   npx tsx scripts/synth.ts --model "fs=16MHz r1=20 c1=10f c0=3p" --fixture series-thru \
 *     --format s2p --points 1601 --span 2kHz --noise -70 --seed 1 --out a1.s2p
 *
 * Run with --help for every option. The file's first comment line says it is synthetic.
 */
import { writeFileSync } from 'node:fs';
import { parseArgs } from 'node:util';
import { parseLooseQuantity, parseModelSpec } from '../src/lib/synth/model-spec.ts';
import { synthesizeSweep } from '../src/lib/synth/synth-sweep.ts';
import { synthesizeCompensation } from '../src/lib/synth/synth-compensation.ts';
import { formatSynthFile, type SynthFileFormat } from '../src/lib/synth/synth-file.ts';
import type { FreqGridSpec } from '../src/lib/synth/freq-grid.ts';
import { FIXTURES, type Fixture } from '../src/lib/schema/part.ts';
import type { UnitKind } from '../src/lib/units/si.ts';

const HELP = `usage: npx tsx scripts/synth.ts --model "fs=16MHz r1=20 c1=10f c0=3p" [options]

model     --model TEXT        branches "fs= r1= c1=|l1=", separated by ';'; c0= (required), rs= ls= cp=
grid      --points N          frequency points (default 801)
          --center F          centre of a linear sweep (default: fs of the first branch)
          --span F            span of a linear sweep around the centre (default 10 half-power bandwidths)
          --start F --stop F  linear (or --log) sweep between two frequencies
          --log               logarithmic spacing (needs --start and --stop)
          --resolution F      round frequencies to this power of ten (default 1mHz)
fixture   --fixture NAME      ${FIXTURES.join(' | ')} (default reflection)
          --z0 R              reference impedance (default 50 ohm)
          --rs R --ls L --cp C        fixture residuals (series toward the instrument, stray across the part)
          --add-cap C [--add-connection parallel|series]   a known added capacitor (default parallel)
          --noise DB          relative complex Gaussian noise, e.g. -70 (default: none)
          --seed N            noise seed (default 1)
file      --format EXT        s1p | s2p | ts | csv | tsv | ssv (';'-separated); default from --out, else s1p
          --data FORM         touchstone: ri | ma | db (default ri); csv: rx | magphase (default rx)
          --freq-unit U       Hz | kHz | MHz | GHz (default Hz)
          --parameter P       impedance fixture in Touchstone: Z (default) or Y
          --digits N          significant digits of data values (default: full precision)
          --compensation      also write <out>-open and <out>-short standards of the same fixture
          --out FILE          output file (default: standard output)`;

function fail(message: string): never {
  process.stderr.write(`synth: ${message}\n`);
  process.exit(2);
}

function quantity(text: string | undefined, kind: UnitKind, unit: string, name: string): number | undefined {
  if (text === undefined) return undefined;
  const v = parseLooseQuantity(text, kind, unit);
  if (typeof v === 'string') fail(`--${name}: ${v}`);
  return v;
}

// `--noise -70`: let a negative number be an option's value.
const args = process.argv
  .slice(2)
  .flatMap((a, i, all) =>
    /^-\d/.test(a) && all[i - 1]?.startsWith('--')
      ? []
      : /^--/.test(a) && /^-\d/.test(all[i + 1] ?? '')
        ? [`${a}=${all[i + 1]}`]
        : [a],
  );
const { values } = parseArgs({
  args,
  options: {
    model: { type: 'string' },
    points: { type: 'string' },
    center: { type: 'string' },
    span: { type: 'string' },
    start: { type: 'string' },
    stop: { type: 'string' },
    log: { type: 'boolean' },
    resolution: { type: 'string' },
    fixture: { type: 'string' },
    z0: { type: 'string' },
    rs: { type: 'string' },
    ls: { type: 'string' },
    cp: { type: 'string' },
    'add-cap': { type: 'string' },
    'add-connection': { type: 'string' },
    noise: { type: 'string' },
    seed: { type: 'string' },
    format: { type: 'string' },
    data: { type: 'string' },
    'freq-unit': { type: 'string' },
    parameter: { type: 'string' },
    digits: { type: 'string' },
    compensation: { type: 'boolean' },
    out: { type: 'string' },
    help: { type: 'boolean', short: 'h' },
  },
  strict: true,
});
if (values.help) {
  process.stdout.write(`${HELP}\n`);
  process.exit(0);
}
if (!values.model) fail('--model is required (see --help)');
const parsed = parseModelSpec(values.model);
if (!parsed.ok) fail(`--model: ${parsed.message}`);
const model = parsed.model;

const fixture = (values.fixture ?? 'reflection') as Fixture;
if (!FIXTURES.includes(fixture)) fail(`--fixture: expected one of ${FIXTURES.join(', ')}, got "${values.fixture}"`);
const points = Number(values.points ?? 801);
if (!Number.isInteger(points) || points < 2) fail(`--points: expected a whole number ≥ 2, got "${values.points}"`);

const first = model.branches[0];
const bandwidthHz = first.fsHz * 2 * Math.PI * first.fsHz * first.r1Ohm * first.c1F; // fs/Q, the half-power bandwidth of the BVD model
const start = quantity(values.start, 'frequency', 'Hz', 'start');
const stop = quantity(values.stop, 'frequency', 'Hz', 'stop');
let grid: FreqGridSpec;
if (start !== undefined || stop !== undefined) {
  if (start === undefined || stop === undefined) fail('--start and --stop go together');
  grid = { kind: values.log ? 'log' : 'linear', startHz: start, stopHz: stop, points };
} else {
  if (values.log) fail('--log needs --start and --stop');
  grid = {
    kind: 'centered',
    centerHz: quantity(values.center, 'frequency', 'Hz', 'center') ?? first.fsHz,
    spanHz: quantity(values.span, 'frequency', 'Hz', 'span') ?? 10 * bandwidthHz,
    points,
  };
}

const ext = (values.format ?? values.out?.split('.').pop() ?? 's1p').toLowerCase();
const dataForm = values.data?.toLowerCase();
const freqUnit = (values['freq-unit'] ?? 'Hz') as 'Hz' | 'kHz' | 'MHz' | 'GHz';
if (!['Hz', 'kHz', 'MHz', 'GHz'].includes(freqUnit))
  fail(`--freq-unit: expected Hz, kHz, MHz or GHz, got "${freqUnit}"`);
let format: SynthFileFormat;
let ports: 1 | 2 | undefined;
if (ext === 's1p' || ext === 's2p' || ext === 'ts') {
  const f = (dataForm ?? 'ri').toUpperCase();
  if (f !== 'RI' && f !== 'MA' && f !== 'DB') fail(`--data: expected ri, ma or db for Touchstone, got "${dataForm}"`);
  format = { kind: 'touchstone', version: ext === 'ts' ? 2 : 1, format: f, freqUnit };
  if (ext === 's1p' && (fixture === 'series-thru' || fixture === 'shunt-thru'))
    fail(`--format s1p: a ${fixture} fixture records 2 ports; use s2p or ts`);
  if (ext === 's2p' && fixture === 'impedance')
    fail('--format s2p: the impedance fixture writes a 1-port Z (or Y) file; use s1p or ts');
  ports = ext === 's2p' ? 2 : fixture === 'reflection' ? 1 : undefined;
} else if (ext === 'csv' || ext === 'tsv' || ext === 'ssv') {
  const f = dataForm ?? 'rx';
  if (f !== 'rx' && f !== 'magphase') fail(`--data: expected rx or magphase for CSV, got "${dataForm}"`);
  if (fixture !== 'impedance') fail(`--format ${ext}: CSV holds an impedance sweep; use --fixture impedance`);
  format = { kind: 'csv', form: f, delimiter: ext === 'tsv' ? '\t' : ext === 'ssv' ? ';' : ',', freqUnit };
} else {
  fail(`--format: expected s1p, s2p, ts, csv, tsv or ssv, got "${ext}"`);
}

const parameter = (values.parameter ?? 'Z').toUpperCase();
if (parameter !== 'Z' && parameter !== 'Y') fail(`--parameter: expected Z or Y, got "${values.parameter}"`);
const connection = values['add-connection'] ?? 'parallel';
if (connection !== 'parallel' && connection !== 'series')
  fail(`--add-connection: expected parallel or series, got "${connection}"`);
const addCap = quantity(values['add-cap'], 'capacitance', 'F', 'add-cap');
const noiseDb = values.noise === undefined ? undefined : Number(values.noise);
if (noiseDb !== undefined && !(Number.isFinite(noiseDb) && noiseDb < 0))
  fail(`--noise: expected a negative number of dB such as -70, got "${values.noise}"`);
const seed = Number(values.seed ?? 1);
if (!Number.isInteger(seed)) fail(`--seed: expected a whole number, got "${values.seed}"`);
const digits = values.digits === undefined ? undefined : Number(values.digits);
if (digits !== undefined && !(Number.isInteger(digits) && digits >= 1 && digits <= 17))
  fail(`--digits: expected 1 to 17, got "${values.digits}"`);
const parasitics = {
  rsOhm: quantity(values.rs, 'resistance', 'ohm', 'rs'),
  lsH: quantity(values.ls, 'inductance', 'H', 'ls'),
  cpF: quantity(values.cp, 'capacitance', 'F', 'cp'),
};
const common = {
  fixture,
  ports,
  parameter: parameter as 'Z' | 'Y',
  z0Ohm: quantity(values.z0, 'resistance', 'ohm', 'z0') ?? 50,
  noiseDb,
  seed,
  freqResolutionHz: quantity(values.resolution, 'frequency', 'Hz', 'resolution') ?? 0.001,
};
const describeModel = (): string[] => [
  `model: ${values.model}`,
  `fixture: ${fixture}, reference ${common.z0Ohm} ohm${parasitics.rsOhm || parasitics.lsH || parasitics.cpF ? `, residuals rs=${parasitics.rsOhm ?? 0} ohm ls=${parasitics.lsH ?? 0} H cp=${parasitics.cpF ?? 0} F` : ''}`,
  `noise: ${noiseDb === undefined ? 'none' : `${noiseDb} dB relative`}${addCap ? `; added capacitor ${addCap} F (${connection})` : ''}`,
];

try {
  const sweep = synthesizeSweep({
    model,
    grid,
    ...common,
    parasitics,
    added: addCap ? { capacitanceF: addCap, connection } : undefined,
  });
  const text = formatSynthFile(sweep, format, { digits, comments: describeModel() });
  if (values.out) writeFileSync(values.out, text);
  else process.stdout.write(text);
  if (values.compensation) {
    if (!values.out) fail('--compensation needs --out (the standards go next to it)');
    const comp = synthesizeCompensation({ ...common, parasitics, grid, seed: seed + 1000 });
    const dot = values.out.lastIndexOf('.');
    const [base, suffix] = dot > 0 ? [values.out.slice(0, dot), values.out.slice(dot)] : [values.out, ''];
    for (const [name, rec] of [
      ['open', comp.open],
      ['short', comp.short],
    ] as const) {
      writeFileSync(
        `${base}-${name}${suffix}`,
        formatSynthFile(rec, format, {
          digits,
          comments: [`${name} standard of the fixture`, ...describeModel().slice(1)],
        }),
      );
    }
  }
} catch (e) {
  fail((e as Error).message);
}
