/**
 * Models and AC sweeps whose netlists are simulated by SPICE in netlist-spice.test.ts.
 * The decks are committed under test/fixtures/spice/ (regenerate with
 * `npx tsx test/fixtures/spice/generate.ts`); the test checks they equal what the code writes now.
 *
 * Parts: X1, TF1 and OT100 are invented reference resonators (not real parts; values below).
 * OT3 adds to OT100 a fundamental (f3/(3f1) = 1.0028, a piezoelectric stiffening estimate from
 * memory; C1 ≈ 9·C1,3, from C1n = 8k²C0/(nπ)², QCM review, Sensors 21(10):3490, 2021) and a spurious
 * mode 150 kHz above the main mode (synthetic). ODD has non-round, extraction-like values so that
 * rounding its element values visibly moves the resonance.
 */
import { type BvdModel, type MotionalBranch } from '../../../src/lib/models/bvd.ts';
import {
  formatNetlist,
  type BranchLabel,
  type FormatNetlistOptions,
  type NetlistInfo,
} from '../../../src/lib/models/netlist-spice.ts';
import { impedanceDeck, type AcSweep } from '../../support/spice.ts';

/** Branch from L1, C1, R1 (the reference resonators are given by L1 and C1). */
export function branchLc(l1H: number, c1F: number, r1Ohm: number): MotionalBranch {
  return { fsHz: 1 / (2 * Math.PI * Math.sqrt(l1H * c1F)), r1Ohm, c1F };
}

export interface SpiceCase {
  id: string;
  model: BvdModel;
  info: NetlistInfo;
  options?: FormatNetlistOptions;
  sweeps: Array<{ name: string; sweep: AcSweep }>;
}

/** fs/Q, the half-power width of a branch, Hz. */
export function widthHz(b: MotionalBranch): number {
  return 2 * Math.PI * b.fsHz * b.fsHz * b.r1Ohm * b.c1F;
}

/** Lossless parallel resonance of a single branch with C0. */
export function fpHz(b: MotionalBranch, c0F: number): number {
  return b.fsHz * Math.sqrt(1 + b.c1F / c0F);
}

const around = (f: number, half: number, points = 2001): AcSweep => ({ startHz: f - half, stopHz: f + half, points });

// Reference resonator X1 (invented): 10 mH, 10 fF, 20 Ω, 3 pF (ωs = 1e8 rad/s exactly).
export const X1: BvdModel = { c0F: 3e-12, branches: [{ fsHz: 1e8 / (2 * Math.PI), r1Ohm: 20, c1F: 10e-15 }] };
// Reference tuning fork TF1 (invented): 7 863.559 H, 3 fF, 35 kΩ, 1.2 pF; fs = 32 768 Hz (we use fs and C1).
export const TF1: BvdModel = { c0F: 1.2e-12, branches: [{ fsHz: 32768, r1Ohm: 35e3, c1F: 3e-15 }] };
// Reference overtone resonator OT100 (invented): 2.533030 mH, 1 fF, 60 Ω, 3 pF; fs = 100 MHz.
const OT100_MAIN: MotionalBranch = { fsHz: 100e6, r1Ohm: 60, c1F: 1e-15 };
export const OT3: BvdModel = {
  c0F: 3e-12,
  branches: [
    { fsHz: 100e6 / (3 * 1.0028), r1Ohm: 25, c1F: 9e-15 },
    OT100_MAIN,
    { fsHz: 100.15e6, r1Ohm: 300, c1F: 0.15e-15 },
  ],
};
export const OT3_LABELS: BranchLabel[] = [
  { overtone: 1, spurious: false },
  { overtone: 3, spurious: false, main: true },
  { overtone: 3, spurious: true },
];
export const ODD: BvdModel = { c0F: 3.02718e-12, branches: [{ fsHz: 12003456.789, r1Ohm: 24.8137, c1F: 17.8349e-15 }] };

const info = (partId: string, title: string, extra: Partial<NetlistInfo> = {}): NetlistInfo => ({
  partId,
  title,
  sample: 'ref',
  method: 'synthetic reference values',
  ...extra,
});

const x1 = X1.branches[0];
const tf1 = TF1.branches[0];
const odd = ODD.branches[0];

export const SPICE_CASES: SpiceCase[] = [
  {
    id: 'x1',
    model: X1,
    info: info('X1', '16 MHz-class AT fundamental, synthetic reference resonator', {
      kind: 'quartz-at',
      labels: [{ overtone: 1, spurious: false, main: true }],
    }),
    sweeps: [
      { name: 'fs', sweep: around(x1.fsHz, widthHz(x1)) },
      { name: 'fp', sweep: around(fpHz(x1, X1.c0F), 3 * widthHz(x1)) },
      { name: 'wide', sweep: { startHz: 8e6, stopHz: 24e6, points: 4001 } },
    ],
  },
  {
    id: 'tf1',
    model: TF1,
    info: info('TF1', '32.768 kHz tuning fork, synthetic reference resonator', { kind: 'quartz-tuning-fork' }),
    sweeps: [
      { name: 'fs', sweep: around(tf1.fsHz, widthHz(tf1)) },
      { name: 'fp', sweep: around(fpHz(tf1, TF1.c0F), 3 * widthHz(tf1)) },
      { name: 'wide', sweep: { startHz: 16e3, stopHz: 64e3, points: 4001 } },
    ],
  },
  {
    id: 'ot3',
    model: OT3,
    info: info('OT3', '100 MHz third overtone with fundamental and a spurious mode (synthetic)', {
      kind: 'quartz-at',
      labels: OT3_LABELS,
    }),
    sweeps: [
      ...OT3.branches.map((b, i) => ({ name: `mode${i + 1}`, sweep: around(b.fsHz, widthHz(b)) })),
      { name: 'wide', sweep: { startHz: 20e6, stopHz: 120e6, points: 4001 } },
    ],
  },
  {
    id: 'odd',
    model: ODD,
    info: info('ODD', '12 MHz part with extraction-like values (synthetic)', { kind: 'quartz-at' }),
    sweeps: [{ name: 'fs', sweep: around(odd.fsHz, widthHz(odd)) }],
  },
  {
    id: 'odd-rounded',
    model: ODD,
    info: info('ODD', '12 MHz part, element values rounded to 3 digits on purpose (must miss)', { kind: 'quartz-at' }),
    options: { digits: 3 },
    // Wide enough to hold the shifted resonance (about +840 ppm).
    sweeps: [
      { name: 'fs', sweep: { startHz: odd.fsHz * (1 - 200e-6), stopHz: odd.fsHz * (1 + 2000e-6), points: 8001 } },
    ],
  },
];

/** The subcircuit name formatNetlist gives a case. */
export function subcktNameOf(c: SpiceCase): string {
  return /^\.subckt (\S+)/m.exec(formatNetlist(c.model, c.info, c.options))![1];
}

/** File name of a case's deck under test/fixtures/spice/. */
export function deckFileName(c: SpiceCase, sweepName: string): string {
  return `${c.id}-${sweepName}.cir`;
}

/** The deck of one case and sweep: the netlist, one instance between `in` and ground, the bench. */
export function deckOf(c: SpiceCase, sweepName: string): string {
  const s = c.sweeps.find((x) => x.name === sweepName)!;
  const netlist = formatNetlist(c.model, c.info, c.options);
  return impedanceDeck(
    `motional netlist check: ${c.id} ${sweepName}`,
    `${netlist}XDUT in 0 ${subcktNameOf(c)}\n`,
    s.sweep,
    `${c.id}-${sweepName}.out`,
  );
}

/** X1 in series with a load capacitor CL (fL check): node in - CL - mid - crystal - ground. */
export function seriesLoadDeck(clF: number, sweep: AcSweep): string {
  const c = SPICE_CASES[0];
  const netlist = formatNetlist(c.model, c.info);
  const cl = clF.toExponential(14);
  return impedanceDeck(
    `motional fL check: X1 + series CL ${clF * 1e12} pF`,
    // Rdc gives node mid the DC path SPICE needs (without one ngspice stops on a singular matrix);
    // 1e15 Ω changes Z by ~1e-14 relative.
    `${netlist}CL in mid ${cl}\nXDUT mid 0 ${subcktNameOf(c)}\nRdc mid 0 1e15\n`,
    sweep,
    `x1-cl${Math.round(clF * 1e12)}pf.out`,
  );
}

/**
 * Load-resonance checks: X1 + series CL, swept ±5 Hz around the load resonance with R1 (lower
 * zero-phase frequency of crystal + series CL, computed independently with mpmath from the BVD
 * model; 8/10/12/20 pF: 15 922 728.295, 15 921 615.718, 15 920 799.784, 15 918 954.922 Hz).
 */
export const LOAD_CASES: Array<{ clF: number; fieldFlWithR1Hz: number; sweep: AcSweep }> = [
  [8e-12, 15922728.295],
  [10e-12, 15921615.718],
  [12e-12, 15920799.784],
  [20e-12, 15918954.922],
].map(([clF, f]) => ({ clF, fieldFlWithR1Hz: f, sweep: around(f, 5, 2001) }));

/** Every committed deck: file name and text. */
export function allDecks(): Array<{ file: string; text: string }> {
  const out: Array<{ file: string; text: string }> = [];
  for (const c of SPICE_CASES)
    for (const s of c.sweeps) out.push({ file: deckFileName(c, s.name), text: deckOf(c, s.name) });
  for (const l of LOAD_CASES)
    out.push({ file: `x1-cl${Math.round(l.clF * 1e12)}pf.cir`, text: seriesLoadDeck(l.clF, l.sweep) });
  return out;
}
