/**
 * Pierce oscillator advice for one part and one circuit: the two external load capacitors as
 * preferred values, the frequency offset they leave, its band over tolerances, the gain margin,
 * the negative resistance and the drive level — each with a pass/warn verdict and its reason.
 *
 * Load network (the usual Pierce load formula, from memory; derived from the circuit):
 * Ca = Cext,in + Cin + Cboard, Cb = Cext,out + Cout + Cboard
 * (all to ground), CL = CaCb/(Ca + Cb) + Cpin-pin. The crystal's own C0 is not part of CL.
 *
 * Target: the datasheet nominal frequency when given; otherwise the part's own lossless load
 * resonance at the datasheet CL (then the offset measures only the error in CL). The capacitors
 * minimise |offset| of the extracted sample's lossless load resonance fL (main branch; see load.ts)
 * from that target. R1 raises fL by about fs/(2QM) — 0.08 ppm for a 16 MHz AT part — which the
 * advice neglects. Equal pair: floor and ceiling of the ideal equal value; best pair: every
 * ordered pair within {@link PAIR_STEPS} preferred values of the ideal and at most
 * {@link MAX_PAIR_RATIO} apart, which may be equal.
 * Band: worst-case corners of capacitor tolerance, each pin's board stray ± its uncertainty and
 * the pin-to-pin stray ± its uncertainty (CL is monotonic in each, so corners bound it).
 */
import type { BvdModel } from '../models/bvd.ts';
import type { Datasheet } from '../schema/part.ts';
import type { OscillatorCircuit } from '../schema/oscillators.ts';
import { driveFromCrystalVoltageW } from './drive-level.ts';
import { preferredNeighbours, preferredRange } from './e-series.ts';
import { criticalGmS, MIN_GAIN_MARGIN, negativeResistanceOhm } from './gain.ts';
import { loadCapacitanceForHz, loadFrequencyHz } from './load.ts';

/** How many preferred values below the floor and above the ceiling the pair search visits. */
export const PAIR_STEPS = 2;
/**
 * Largest ratio between the two capacitors of a pair the search accepts (project choice: it
 * keeps pairs near-symmetric, since unequal capacitors raise gm,crit by (Ca + Cb)²/(4CaCb)).
 */
export const MAX_PAIR_RATIO = 2;

export type AdviceVerdict = 'pass' | 'warn';

export interface AdviceCheck {
  verdict: AdviceVerdict;
  reason: string;
}

/** One capacitor pair and what it does. */
export interface CapacitorPair {
  /** External capacitor on the amplifier input pin, F. */
  inputCapF: number;
  /** External capacitor on the amplifier output pin, F. */
  outputCapF: number;
  /** Total pin-to-ground capacitances Ca (input) and Cb (output), F. */
  caF: number;
  cbF: number;
  /** Resulting load capacitance, F. */
  clF: number;
  /** Lossless load-resonance frequency of the sample, Hz. */
  freqHz: number;
  /** Offset from the target frequency, ppm. */
  offsetPpm: number;
  /** Offset band over capacitor tolerance and stray uncertainty (worst-case corners), ppm. */
  bandPpm: { min: number; max: number };
  /** Load-resonance resistance with the pin-to-pin stray lumped into C0: R1(1 + C0'/Cs)², Ω. */
  rlOhm: number;
  /** Critical transconductance with the extracted R1, S. */
  gmCritS: number;
  /** gm / gm,crit with the extracted R1. */
  gainMargin: number;
  /** The same with the datasheet maximum ESR in place of R1 (worst conforming part). */
  gmCritDatasheetS?: number;
  gainMarginDatasheet?: number;
  /** Small-signal negative resistance at the crystal terminals, Ω (negative). */
  negativeResistanceOhm: number;
  /** Estimated drive level, W. */
  driveW: number;
  checks: { frequency: AdviceCheck; gainMargin: AdviceCheck; negativeResistance: AdviceCheck; drive: AdviceCheck };
}

export interface PierceAdviceInput {
  partId: string;
  datasheet?: Datasheet;
  /** The part alone (fixture parasitics are ignored). */
  model: BvdModel;
  /** Index of the main branch in `model.branches`. */
  mainBranch: number;
  circuit: OscillatorCircuit;
  /** Override of the datasheet load capacitance, F. */
  targetLoadF?: number;
}

/** What the capacitors aim at. */
export interface PierceTarget {
  /** The frequency the capacitors aim at, Hz. */
  targetHz: number;
  targetBasis: 'datasheet frequency' | 'frequency at the datasheet load capacitance' | 'frequency at the given load capacitance';
  /** Load capacitance that puts this sample on the target, F. */
  idealLoadF: number;
}

export type PierceAdvice = {
  part: string;
  circuit: string;
  /** Voltage assumed across the crystal, V peak-to-peak. */
  swingVpp: number;
  assumptions: string[];
  cautions: string[];
  /** Target, when one could be set. */
  target?: PierceTarget;
} & (
  | {
      ok: true;
      target: PierceTarget;
      /** Equal external capacitor value that realises the ideal load capacitance, F. */
      idealEqualCapF: number;
      equal: CapacitorPair;
      best: CapacitorPair;
    }
  | { ok: false; reason: string }
);

const PPM = 1e6;

/** Cautions shown with every advice (as in README: Cautions). */
export const PIERCE_CAUTIONS: readonly string[] = [
  'load-capacitor advice depends on stray capacitance that only a board measurement settles; confirm frequency, start-up and negative-resistance margin on the real board over temperature and supply',
  'gm and negative-resistance margins are small-signal; oscillator ICs vary with process, voltage and temperature — use the IC maker\'s limits (maximum ESR, gm,crit) where given',
  'never exceed the crystal maker\'s maximum drive level; the drive estimate assumes a sinusoidal swing across the crystal',
  'extracted parameters describe one sample at one drive level, temperature and fixture; they are not a specification',
  'frequency accuracy for regulated radio bands and protocols is the product designer\'s responsibility; these are engineering estimates, not compliance evidence',
];

function fmt(x: number, digits = 4): string {
  return Number(x.toPrecision(digits)).toString();
}
function pf(f: number): string {
  return `${fmt(f * 1e12)} pF`;
}
function signed(ppm: number): string {
  return `${ppm >= 0 ? '+' : ''}${ppm.toFixed(3)} ppm`;
}

/** Everything about one pair, given the external capacitors. */
function evaluatePair(input: PierceAdviceInput, targetHz: number, swingVpp: number, inF: number, outF: number): CapacitorPair {
  const { circuit, model, datasheet } = input;
  const br = model.branches[input.mainBranch];
  const loadOf = (a: number, b: number, board: number, pp: number) => {
    const ca = a + circuit.inputCapacitance + board;
    const cb = b + circuit.outputCapacitance + board;
    return { ca, cb, cs: (ca * cb) / (ca + cb), cl: (ca * cb) / (ca + cb) + pp };
  };
  const nominal = loadOf(inF, outF, circuit.boardStray, circuit.pinToPinStray);
  const offsetOf = (clF: number) => (loadFrequencyHz(br, model.c0F, clF) / targetHz - 1) * PPM;
  const freqHz = loadFrequencyHz(br, model.c0F, nominal.cl);

  // Worst-case corners: tolerance on each capacitor, each pin's board stray, pin-to-pin stray.
  let min = Infinity;
  let max = -Infinity;
  const t = circuit.capacitorTolerance;
  const u = circuit.boardStrayUncertainty;
  const upp = circuit.pinToPinStrayUncertainty;
  for (const sa of [-1, 1]) for (const sb of [-1, 1]) for (const ba of [-1, 1]) for (const bb of [-1, 1]) for (const sp of [-1, 1]) {
    const ca = inF * (1 + sa * t) + circuit.inputCapacitance + Math.max(0, circuit.boardStray + ba * u);
    const cb = outF * (1 + sb * t) + circuit.outputCapacitance + Math.max(0, circuit.boardStray + bb * u);
    const cl = (ca * cb) / (ca + cb) + Math.max(0, circuit.pinToPinStray + sp * upp);
    const off = offsetOf(cl);
    min = Math.min(min, off);
    max = Math.max(max, off);
  }

  const c0Eff = model.c0F + circuit.pinToPinStray;
  const rl = br.r1Ohm * (1 + c0Eff / nominal.cs) ** 2;
  const gmCrit = criticalGmS(br.r1Ohm, c0Eff, nominal.ca, nominal.cb, freqHz);
  const gainMargin = circuit.gm / gmCrit;
  const esrMax = datasheet?.esrMaxOhm;
  const gmCritDs = esrMax !== undefined ? criticalGmS(esrMax, c0Eff, nominal.ca, nominal.cb, freqHz) : undefined;
  const marginDs = gmCritDs !== undefined ? circuit.gm / gmCritDs : undefined;
  const rneg = negativeResistanceOhm(circuit.gm, nominal.ca, nominal.cb, freqHz);
  const driveW = driveFromCrystalVoltageW(br.r1Ohm, model.c0F, nominal.cl, freqHz, swingVpp);
  const offsetPpm = offsetOf(nominal.cl);

  return {
    inputCapF: inF,
    outputCapF: outF,
    caF: nominal.ca,
    cbF: nominal.cb,
    clF: nominal.cl,
    freqHz,
    offsetPpm,
    bandPpm: { min, max },
    rlOhm: rl,
    gmCritS: gmCrit,
    gainMargin,
    gmCritDatasheetS: gmCritDs,
    gainMarginDatasheet: marginDs,
    negativeResistanceOhm: rneg,
    driveW,
    checks: {
      frequency: frequencyCheck(offsetPpm, min, max, datasheet?.tolerancePpm, circuit),
      gainMargin: gainCheck(gainMargin, marginDs),
      negativeResistance: negativeResistanceCheck(rneg, rl, br.r1Ohm),
      drive: driveCheck(driveW, datasheet?.driveMaxW, circuit.maxDrive),
    },
  };
}

function frequencyCheck(offsetPpm: number, min: number, max: number, tolPpm: number | undefined, c: OscillatorCircuit): AdviceCheck {
  const band = `offset ${signed(offsetPpm)}, band ${signed(min)} … ${signed(max)} over ${fmt(c.capacitorTolerance * 100)} % capacitors and ±${pf(c.boardStrayUncertainty)} board stray per pin`;
  if (tolPpm === undefined) return { verdict: 'warn', reason: `${band}; no datasheet tolerance to compare against` };
  const inside = Math.max(Math.abs(min), Math.abs(max)) <= tolPpm;
  return inside
    ? { verdict: 'pass', reason: `${band}: within the datasheet tolerance ±${fmt(tolPpm)} ppm` }
    : { verdict: 'warn', reason: `${band}: exceeds the datasheet tolerance ±${fmt(tolPpm)} ppm` };
}

function gainCheck(margin: number, marginDs: number | undefined): AdviceCheck {
  const worst = marginDs !== undefined ? Math.min(margin, marginDs) : margin;
  const which = marginDs !== undefined ? `${fmt(margin, 3)} with the extracted R1, ${fmt(marginDs, 3)} with the datasheet maximum ESR` : `${fmt(margin, 3)} with the extracted R1 (no datasheet maximum ESR)`;
  const rule = `common-practice minimum ${MIN_GAIN_MARGIN} (engineering margin used in semiconductor vendors' Pierce notes, not a standard)`;
  return worst >= MIN_GAIN_MARGIN
    ? { verdict: 'pass', reason: `gain margin gm/gm,crit ${which}: at least the ${rule}` }
    : { verdict: 'warn', reason: `gain margin gm/gm,crit ${which}: below the ${rule}` };
}

function negativeResistanceCheck(rnegOhm: number, rlOhm: number, r1Ohm: number): AdviceCheck {
  const ratio = Math.abs(rnegOhm) / rlOhm;
  const text = `negative resistance ${fmt(rnegOhm)} Ω = ${fmt(ratio, 3)} × RL (${fmt(rlOhm)} Ω), ${fmt(Math.abs(rnegOhm) / r1Ohm, 3)} × R1; compared against RL`;
  return ratio >= MIN_GAIN_MARGIN
    ? { verdict: 'pass', reason: `${text}: at least ${MIN_GAIN_MARGIN} × RL` }
    : { verdict: 'warn', reason: `${text}: below ${MIN_GAIN_MARGIN} × RL` };
}

function driveCheck(driveW: number, dsMaxW: number | undefined, circuitMaxW: number | undefined): AdviceCheck {
  const uw = (w: number) => `${fmt(w * 1e6, 3)} µW`;
  const limits: string[] = [];
  if (dsMaxW !== undefined) limits.push(`datasheet maximum ${uw(dsMaxW)}`);
  if (circuitMaxW !== undefined) limits.push(`circuit budget ${uw(circuitMaxW)}`);
  const text = `estimated drive ${uw(driveW)}`;
  if (!limits.length) return { verdict: 'warn', reason: `${text}; no datasheet maximum drive or circuit budget to compare against — check with the crystal maker` };
  const limit = Math.min(dsMaxW ?? Infinity, circuitMaxW ?? Infinity);
  return driveW <= limit
    ? { verdict: 'pass', reason: `${text} within the ${limits.join(' and ')}` }
    : { verdict: 'warn', reason: `${text} exceeds the ${limits.join(' / ')}: add a series resistor or reduce the swing` };
}

/** Equal external capacitor x that gives series capacitance cs: (a+x)(b+x)/(a+b+2x) = cs. */
function equalCapFor(csF: number, aF: number, bF: number): number {
  const p = aF + bF - 2 * csF;
  const q = aF * bF - csF * (aF + bF);
  return (-p + Math.sqrt(p * p - 4 * q)) / 2;
}

/** Pierce advice for one part (its extracted model) and one circuit. */
export function advisePierce(input: PierceAdviceInput): PierceAdvice {
  const { circuit, model, datasheet } = input;
  const br = model.branches[input.mainBranch];
  const swingVpp = circuit.swing ?? circuit.supply;
  const assumptions = [
    `voltage across the crystal ${fmt(swingVpp)} V peak-to-peak (${circuit.swing !== undefined ? 'the circuit\'s stated swing' : 'assumed equal to the supply'}); drive P = R1·(ω(C0 + CL)·Vpp/2)²/2 with the extracted R1`,
    'frequencies are the lossless load resonance of the extracted main mode (R1 shifts them by under 0.1 ppm for typical quartz)',
    `board stray ${pf(circuit.boardStray)} on each pin to ground; pin-to-pin stray ${pf(circuit.pinToPinStray)} adds to CL and counts as crystal C0 in gm,crit`,
    'gm,crit = ω²R1·CaCb·(1 + C0/Cs)² with Ca, Cb the total pin capacitances (external capacitor, amplifier pin, board stray)',
  ];
  const cautions = [...PIERCE_CAUTIONS];
  const base = { part: input.partId, circuit: circuit.name, swingVpp, assumptions, cautions };
  const fail = (reason: string, target?: PierceTarget): PierceAdvice => ({ ...base, ok: false, reason, target });
  if (!br) return fail('no main mode in the extracted model');

  const dsLoad = typeof datasheet?.loadCapacitanceF === 'number' ? datasheet.loadCapacitanceF : undefined;
  const givenLoad = input.targetLoadF ?? dsLoad;
  let targetHz: number;
  let targetBasis: PierceTarget['targetBasis'];
  let idealLoadF: number;
  if (datasheet?.frequencyHz !== undefined) {
    targetHz = datasheet.frequencyHz;
    targetBasis = 'datasheet frequency';
    const cl = loadCapacitanceForHz(br, model.c0F, targetHz);
    if (!cl.ok) {
      const why = datasheet.loadCapacitanceF === 'series' ? 'the datasheet calibrates this part at series resonance, which a Pierce circuit never reaches; order the part for a load capacitance' : cl.reason;
      return fail(`this sample cannot reach the datasheet frequency in a Pierce circuit: ${why}`);
    }
    idealLoadF = cl.clF;
  } else if (givenLoad !== undefined) {
    targetHz = loadFrequencyHz(br, model.c0F, givenLoad);
    targetBasis = input.targetLoadF !== undefined ? 'frequency at the given load capacitance' : 'frequency at the datasheet load capacitance';
    idealLoadF = givenLoad;
  } else {
    return fail('no datasheet frequency or load capacitance: give a target load capacitance');
  }
  if (datasheet?.frequencyHz === undefined) {
    assumptions.push('no datasheet frequency: offsets are from the sample\'s own frequency at the load capacitance, so they measure only the error in CL');
  }

  const a = circuit.inputCapacitance + circuit.boardStray;
  const b = circuit.outputCapacitance + circuit.boardStray;
  const csF = idealLoadF - circuit.pinToPinStray;
  const target: PierceTarget = { targetHz, targetBasis, idealLoadF };
  const cs0 = a + b > 0 ? (a * b) / (a + b) : 0;
  if (!(csF > cs0)) {
    return fail(`pin and stray capacitances alone (${pf(cs0 + circuit.pinToPinStray)}) already reach the load capacitance ${pf(idealLoadF)}: no external capacitors can realise it`, target);
  }
  const idealEqualCapF = equalCapFor(csF, a, b);
  const n = preferredNeighbours(idealEqualCapF, circuit.series);
  if (!n) return fail(`no preferred value near ${idealEqualCapF} F`, target);

  const evaluate = (inF: number, outF: number) => evaluatePair(input, targetHz, swingVpp, inF, outF);
  const better = (p: CapacitorPair, q: CapacitorPair | undefined) => {
    if (!q) return true;
    const dp = Math.abs(p.offsetPpm);
    const dq = Math.abs(q.offsetPpm);
    if (dp !== dq) return dp < dq;
    return Math.abs(Math.log(p.inputCapF / p.outputCapF)) < Math.abs(Math.log(q.inputCapF / q.outputCapF));
  };
  let equal: CapacitorPair | undefined;
  for (const v of new Set([n.floor, n.ceil])) {
    const p = evaluate(v, v);
    if (better(p, equal)) equal = p;
  }
  let best: CapacitorPair | undefined;
  const values = preferredRange(idealEqualCapF, circuit.series, PAIR_STEPS, PAIR_STEPS);
  for (const x of values) for (const y of values) {
    if (Math.max(x / y, y / x) > MAX_PAIR_RATIO * (1 + 1e-9)) continue;
    const p = evaluate(x, y);
    if (better(p, best)) best = p;
  }
  return { ...base, target, idealEqualCapF, ok: true, equal: equal!, best: best! };
}
