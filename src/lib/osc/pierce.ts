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
 *
 * Resistances (pierce-network.ts, the full small-signal network): the one seen by the crystal pins
 * (circuit with the pin-to-pin stray), compared with RL = R1(1 + C0/CL,eff)²; and the one seen by
 * the motional branch (circuit, pin-to-pin stray and C0), which sets the start-up envelope
 * τ = 2L1/(|Rm| − R1) (startup.ts). Frequency budget per pair: frequency-budget.ts.
 */
import type { TemperatureFit } from '../extract/types.ts';
import type { BvdModel } from '../models/bvd.ts';
import type { Datasheet } from '../schema/part.ts';
import type { OscillatorCircuit } from '../schema/oscillators.ts';
import { driveFromCrystalVoltageW } from './drive-level.ts';
import { preferredNeighbours, preferredRange } from './e-series.ts';
import { frequencyBudget, type FrequencyBudget } from './frequency-budget.ts';
import { criticalGmS, MIN_GAIN_MARGIN } from './gain.ts';
import { loadCapacitanceForHz, loadFrequencyHz, loadResistanceOhm } from './load.ts';
import { criticalGmFullS, negativeResistance, type PierceNetwork } from './pierce-network.ts';
import { estimateStartup, limitedSwingVpp, MIN_MOTIONAL_RATIO } from './startup.ts';

/** How many preferred values below the floor and above the ceiling the pair search visits. */
export const PAIR_STEPS = 2;
/**
 * Largest ratio between the two capacitors of a pair the search accepts (project choice: it
 * keeps pairs near-symmetric, since unequal capacitors raise gm,crit by (Ca + Cb)²/(4CaCb)).
 */
export const MAX_PAIR_RATIO = 2;

export type AdviceVerdict = 'pass' | 'warn' | 'fail';

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
  /** Effective load capacitance the circuit presents at the crystal pins (pin-to-pin stray included), F. */
  effectiveLoadF: number;
  /** Load-resonance resistance of the crystal, R1(1 + C0/CL,eff)², Ω. */
  rlOhm: number;
  /** Critical transconductance with the extracted R1, S. */
  gmCritS: number;
  /** gm / gm,crit with the extracted R1. */
  gainMargin: number;
  /** The same with the datasheet maximum ESR in place of R1 (worst conforming part). */
  gmCritDatasheetS?: number;
  gainMarginDatasheet?: number;
  /** Small-signal resistance seen by the crystal pins (circuit with the pin-to-pin stray), Ω (negative: gain). */
  pinsResistanceOhm: number;
  /** Small-signal resistance seen by the motional branch (circuit, pin-to-pin stray and C0), Ω. */
  motionalResistanceOhm: number;
  /** gm at which the motional branch sees exactly −R1 (full network), S; absent when none does. */
  gmCritFullS?: number;
  /** Start-up envelope time constant 2L1/(|Rm| − R1), s (null in JSON when it does not start). */
  startupTauS: number;
  /** Time from the noise level to the steady amplitude, s. */
  startupTimeS: number;
  /** Steady peak-to-peak voltage across the crystal assumed for drive and start-up, V. */
  swingVpp: number;
  /** Estimated drive level, W. */
  driveW: number;
  /** Frequency budget against the circuit's requirement. */
  budget: FrequencyBudget;
  checks: {
    frequency: AdviceCheck;
    gainMargin: AdviceCheck;
    negativeResistance: AdviceCheck;
    startup: AdviceCheck;
    budget: AdviceCheck;
    drive: AdviceCheck;
  };
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
  /** The sample's measured f(T), for the frequency budget. */
  temperatureFit?: TemperatureFit;
}

/** What the capacitors aim at. */
export interface PierceTarget {
  /** The frequency the capacitors aim at, Hz. */
  targetHz: number;
  targetBasis:
    'datasheet frequency' | 'frequency at the datasheet load capacitance' | 'frequency at the given load capacitance';
  /** Load capacitance that puts this sample on the target, F. */
  idealLoadF: number;
}

export type PierceAdvice = {
  part: string;
  circuit: string;
  /** Voltage across the crystal the circuit states (or its supply), V peak-to-peak; each pair's own is `pair.swingVpp`. */
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
  "gm and negative-resistance margins are small-signal; oscillator ICs vary with process, voltage and temperature — use the IC maker's limits (maximum ESR, gm,crit) where given",
  "never exceed the crystal maker's maximum drive level; the drive estimate assumes a sinusoidal swing across the crystal",
  "start-up times are small-signal envelope estimates from the noise level; confirm start-up on the real board at the lowest supply, the hottest and coldest temperature and the largest crystal resistance, and defer to the crystal maker's and IC maker's qualification",
  'extracted parameters describe one sample at one drive level, temperature and fixture; they are not a specification',
  "frequency accuracy for regulated radio bands and protocols is the product designer's responsibility; these are engineering estimates, not compliance evidence",
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
function evaluatePair(input: PierceAdviceInput, targetHz: number, inF: number, outF: number): CapacitorPair {
  const { circuit, model, datasheet } = input;
  const br = model.branches[input.mainBranch];
  const loadOf = (a: number, b: number, board: number, pp: number) => {
    const ca = a + circuit.inputCapacitanceF + board;
    const cb = b + circuit.outputCapacitanceF + board;
    return { ca, cb, cs: (ca * cb) / (ca + cb), cl: (ca * cb) / (ca + cb) + pp };
  };
  const nominal = loadOf(inF, outF, circuit.boardStrayF, circuit.pinToPinStrayF);
  const offsetOf = (clF: number) => (loadFrequencyHz(br, model.c0F, clF) / targetHz - 1) * PPM;
  const freqHz = loadFrequencyHz(br, model.c0F, nominal.cl);

  // Worst-case corners: tolerance on each capacitor, each pin's board stray, pin-to-pin stray.
  let min = Infinity;
  let max = -Infinity;
  const t = circuit.capacitorToleranceFraction;
  const u = circuit.boardStrayUncertaintyF;
  const upp = circuit.pinToPinStrayUncertaintyF;
  for (const sa of [-1, 1])
    for (const sb of [-1, 1])
      for (const ba of [-1, 1])
        for (const bb of [-1, 1])
          for (const sp of [-1, 1]) {
            const ca = inF * (1 + sa * t) + circuit.inputCapacitanceF + Math.max(0, circuit.boardStrayF + ba * u);
            const cb = outF * (1 + sb * t) + circuit.outputCapacitanceF + Math.max(0, circuit.boardStrayF + bb * u);
            const cl = (ca * cb) / (ca + cb) + Math.max(0, circuit.pinToPinStrayF + sp * upp);
            const off = offsetOf(cl);
            min = Math.min(min, off);
            max = Math.max(max, off);
          }

  // gm,crit of the closed form lumps the pin-to-pin stray into C0 (exact for its purpose).
  const c0Eff = model.c0F + circuit.pinToPinStrayF;
  const gmCrit = criticalGmS(br.r1Ohm, c0Eff, nominal.ca, nominal.cb, freqHz);
  const gainMargin = circuit.gmS / gmCrit;
  const esrMax = datasheet?.esrMaxOhm;
  const gmCritDs = esrMax !== undefined ? criticalGmS(esrMax, c0Eff, nominal.ca, nominal.cb, freqHz) : undefined;
  const marginDs = gmCritDs !== undefined ? circuit.gmS / gmCritDs : undefined;

  // The full network: resistances seen by the pins and by the motional branch.
  const net: PierceNetwork = { gmS: circuit.gmS, caF: nominal.ca, cbF: nominal.cb, pinToPinF: circuit.pinToPinStrayF };
  const nr = negativeResistance(net, model.c0F, freqHz);
  const rl = loadResistanceOhm(br.r1Ohm, model.c0F, nr.loadCapacitanceF);
  const gmCritFull = criticalGmFullS(net, model.c0F, br.r1Ohm, freqHz);
  const swingVpp =
    circuit.swingVpp ??
    (circuit.currentLimitA !== undefined && gmCritFull !== undefined
      ? limitedSwingVpp(circuit.currentLimitA, gmCritFull, nominal.ca, nominal.cb, circuit.supplyV)
      : circuit.supplyV);
  const l1H = 1 / ((2 * Math.PI * br.fsHz) ** 2 * br.c1F);
  const startup = estimateStartup({
    l1H,
    r1Ohm: br.r1Ohm,
    motionalOhm: nr.motionalOhm,
    c0F: model.c0F,
    clF: nominal.cl,
    freqHz,
    swingVpp,
  });
  const driveW = driveFromCrystalVoltageW(br.r1Ohm, model.c0F, nominal.cl, freqHz, swingVpp);
  const offsetPpm = offsetOf(nominal.cl);
  const budget = frequencyBudget({
    offsetPpm,
    bandPpm: { min, max },
    capacitorToleranceFraction: t,
    temperature: input.temperatureFit,
    operatingRangeC: datasheet?.operatingRangeC,
    stabilityPpm: datasheet?.stabilityPpm,
    tolerancePpm: datasheet?.tolerancePpm,
    requirementPpm: circuit.frequencyRequirementPpm,
  });

  return {
    inputCapF: inF,
    outputCapF: outF,
    caF: nominal.ca,
    cbF: nominal.cb,
    clF: nominal.cl,
    freqHz,
    offsetPpm,
    bandPpm: { min, max },
    effectiveLoadF: nr.loadCapacitanceF,
    rlOhm: rl,
    gmCritS: gmCrit,
    gainMargin,
    gmCritDatasheetS: gmCritDs,
    gainMarginDatasheet: marginDs,
    pinsResistanceOhm: nr.atPinsOhm,
    motionalResistanceOhm: nr.motionalOhm,
    gmCritFullS: gmCritFull,
    startupTauS: startup.tauS,
    startupTimeS: startup.timeS,
    swingVpp,
    driveW,
    budget,
    checks: {
      frequency: frequencyCheck(offsetPpm, min, max, datasheet?.tolerancePpm, circuit),
      gainMargin: gainCheck(gainMargin, marginDs),
      negativeResistance: negativeResistanceCheck(nr.atPinsOhm, rl, nr.motionalOhm, br.r1Ohm),
      startup: startupCheck(startup, br.r1Ohm, nr.motionalOhm, circuit.startupTimeMaxS),
      budget: { verdict: budget.verdict === 'unknown' ? 'warn' : budget.verdict, reason: budget.reason },
      drive: driveCheck(driveW, datasheet?.driveMaxW, circuit.maxDriveW),
    },
  };
}

function timeText(s: number): string {
  if (!Number.isFinite(s)) return 'never';
  if (s >= 1) return `${fmt(s, 3)} s`;
  if (s >= 1e-3) return `${fmt(s * 1e3, 3)} ms`;
  return `${fmt(s * 1e6, 3)} µs`;
}

function startupCheck(
  st: { tauS: number; timeS: number; timeConstants: number; motionalRatio: number },
  r1Ohm: number,
  rmOhm: number,
  maxS: number | undefined,
): AdviceCheck {
  const seen = `resistance seen by the motional branch ${fmt(rmOhm)} Ω = ${fmt(st.motionalRatio, 3)} × R1 (${fmt(r1Ohm)} Ω)`;
  if (!Number.isFinite(st.tauS))
    return { verdict: 'fail', reason: `${seen}: the losses are not overcome, the oscillator does not start` };
  const text = `${seen}; envelope time constant ${timeText(st.tauS)}, start-up about ${timeText(st.timeS)} (${fmt(st.timeConstants, 3)} time constants from the noise level)`;
  if (maxS !== undefined && st.timeS > maxS)
    return { verdict: 'warn', reason: `${text}: exceeds the circuit's start-up requirement ${timeText(maxS)}` };
  if (st.motionalRatio < MIN_MOTIONAL_RATIO)
    return {
      verdict: 'warn',
      reason: `${text}: |Rm| barely exceeds R1 (below ${MIN_MOTIONAL_RATIO} × R1) — a small rise of R1 or fall of gm stops it`,
    };
  return {
    verdict: 'pass',
    reason: `${text}${maxS !== undefined ? `: within the requirement ${timeText(maxS)}` : ''}`,
  };
}

function frequencyCheck(
  offsetPpm: number,
  min: number,
  max: number,
  tolPpm: number | undefined,
  c: OscillatorCircuit,
): AdviceCheck {
  const band = `offset ${signed(offsetPpm)}, band ${signed(min)} … ${signed(max)} over ${fmt(c.capacitorToleranceFraction * 100)} % capacitors and ±${pf(c.boardStrayUncertaintyF)} board stray per pin`;
  if (tolPpm === undefined) return { verdict: 'warn', reason: `${band}; no datasheet tolerance to compare against` };
  const inside = Math.max(Math.abs(min), Math.abs(max)) <= tolPpm;
  return inside
    ? { verdict: 'pass', reason: `${band}: within the datasheet tolerance ±${fmt(tolPpm)} ppm` }
    : { verdict: 'warn', reason: `${band}: exceeds the datasheet tolerance ±${fmt(tolPpm)} ppm` };
}

function gainCheck(margin: number, marginDs: number | undefined): AdviceCheck {
  const worst = marginDs !== undefined ? Math.min(margin, marginDs) : margin;
  const which =
    marginDs !== undefined
      ? `${fmt(margin, 3)} with the extracted R1, ${fmt(marginDs, 3)} with the datasheet maximum ESR`
      : `${fmt(margin, 3)} with the extracted R1 (no datasheet maximum ESR)`;
  const rule = `common-practice minimum ${MIN_GAIN_MARGIN} (engineering margin used in semiconductor vendors' Pierce notes, not a standard)`;
  return worst >= MIN_GAIN_MARGIN
    ? { verdict: 'pass', reason: `gain margin gm/gm,crit ${which}: at least the ${rule}` }
    : { verdict: 'warn', reason: `gain margin gm/gm,crit ${which}: below the ${rule}` };
}

function negativeResistanceCheck(pinsOhm: number, rlOhm: number, motionalOhm: number, r1Ohm: number): AdviceCheck {
  const ratio = -pinsOhm / rlOhm;
  const text = `resistance seen by the crystal pins ${fmt(pinsOhm)} Ω = ${fmt(ratio, 3)} × RL (${fmt(rlOhm)} Ω); seen by the motional branch ${fmt(motionalOhm)} Ω = ${fmt(-motionalOhm / r1Ohm, 3)} × R1`;
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
  if (!limits.length)
    return {
      verdict: 'warn',
      reason: `${text}; no datasheet maximum drive or circuit budget to compare against — check with the crystal maker`,
    };
  const limit = Math.min(dsMaxW ?? Infinity, circuitMaxW ?? Infinity);
  return driveW <= limit
    ? { verdict: 'pass', reason: `${text} within the ${limits.join(' and ')}` }
    : {
        verdict: 'warn',
        reason: `${text} exceeds the ${limits.join(' / ')}: add a series resistor or reduce the swing`,
      };
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
  const swingVpp = circuit.swingVpp ?? circuit.supplyV;
  const swingText =
    circuit.swingVpp !== undefined
      ? `${fmt(swingVpp)} V peak-to-peak (the circuit's stated swing)`
      : circuit.currentLimitA !== undefined
        ? `from the amplifier's ${fmt(circuit.currentLimitA * 1e6, 3)} µA current limit (fundamental 4·Imax/π = gm,crit·v1, crystal voltage v1·(1 + Ca/Cb), at most the supply ${fmt(circuit.supplyV)} V)`
        : `${fmt(swingVpp)} V peak-to-peak (assumed equal to the supply: over-estimates drive and start-up time)`;
  const assumptions = [
    `voltage across the crystal ${swingText}; drive P = R1·(ω(C0 + CL)·Vpp/2)²/2 with the extracted R1`,
    'frequencies are the lossless load resonance of the extracted main mode (R1 shifts them by under 0.1 ppm for typical quartz)',
    `board stray ${pf(circuit.boardStrayF)} on each pin to ground; pin-to-pin stray ${pf(circuit.pinToPinStrayF)} adds to CL and counts as crystal C0 in gm,crit`,
    'gm,crit = ω²R1·CaCb·(1 + C0/Cs)² with Ca, Cb the total pin capacitances (external capacitor, amplifier pin, board stray)',
    'resistances from the full small-signal network (ideal transconductance, no output conductance): seen by the crystal pins = circuit with the pin-to-pin stray; seen by the motional branch = circuit, pin-to-pin stray and C0 together',
    'start-up: envelope τ = 2L1/(|Rm| − R1) at the chosen capacitors; time = τ·ln(steady motional current / thermal-noise current √(kT/L1) at 300 K), assuming the small-signal growth holds up to the steady amplitude (real circuits slow down near limiting)',
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
      const why =
        datasheet.loadCapacitanceF === 'series'
          ? 'the datasheet calibrates this part at series resonance, which a Pierce circuit never reaches; order the part for a load capacitance'
          : cl.reason;
      return fail(`this sample cannot reach the datasheet frequency in a Pierce circuit: ${why}`);
    }
    idealLoadF = cl.clF;
  } else if (givenLoad !== undefined) {
    targetHz = loadFrequencyHz(br, model.c0F, givenLoad);
    targetBasis =
      input.targetLoadF !== undefined
        ? 'frequency at the given load capacitance'
        : 'frequency at the datasheet load capacitance';
    idealLoadF = givenLoad;
  } else {
    return fail('no datasheet frequency or load capacitance: give a target load capacitance');
  }
  if (datasheet?.frequencyHz === undefined) {
    assumptions.push(
      "no datasheet frequency: offsets are from the sample's own frequency at the load capacitance, so they measure only the error in CL",
    );
  }

  const a = circuit.inputCapacitanceF + circuit.boardStrayF;
  const b = circuit.outputCapacitanceF + circuit.boardStrayF;
  const csF = idealLoadF - circuit.pinToPinStrayF;
  const target: PierceTarget = { targetHz, targetBasis, idealLoadF };
  const cs0 = a + b > 0 ? (a * b) / (a + b) : 0;
  if (!(csF > cs0)) {
    return fail(
      `pin and stray capacitances alone (${pf(cs0 + circuit.pinToPinStrayF)}) already reach the load capacitance ${pf(idealLoadF)}: no external capacitors can realise it`,
      target,
    );
  }
  const idealEqualCapF = equalCapFor(csF, a, b);
  const n = preferredNeighbours(idealEqualCapF, circuit.series);
  if (!n) return fail(`no preferred value near ${idealEqualCapF} F`, target);

  const evaluate = (inF: number, outF: number) => evaluatePair(input, targetHz, inF, outF);
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
  for (const x of values)
    for (const y of values) {
      if (Math.max(x / y, y / x) > MAX_PAIR_RATIO * (1 + 1e-9)) continue;
      const p = evaluate(x, y);
      if (better(p, best)) best = p;
    }
  return { ...base, target, idealEqualCapF, ok: true, equal: equal!, best: best! };
}
