/**
 * The part page calculator, DOM-free: form values (engineering notation) → `advisePierce`
 * inputs → result rows. The client script only reads the form and prints the rows, so the
 * page gives the same answer as the `advise` command for the same circuit values.
 */
import { advisePierce, type PierceAdvice } from '../lib/osc/pierce.ts';
import type { OscillatorCircuit } from '../lib/schema/oscillators.ts';
import { parseEngValue } from './filters.ts';
import { formatHz, formatNumber, formatPpm, formatQty } from './format.ts';
import type { CalculatorData } from './types.ts';

/** The calculator form as text. */
export interface CalculatorForm {
  circuit: string;
  /** Board stray per pin, pF unless a unit is given. */
  stray: string;
  /** Amplifier input / output pin capacitance, pF unless a unit is given. */
  pinIn: string;
  pinOut: string;
  /** Pin-to-pin stray, pF unless a unit is given. */
  pinToPin: string;
  /** Transconductance in mA/V (= mS). */
  gm: string;
  /** Target frequency, Hz (engineering notation, "12M"). */
  target: string;
}

export type CalculatorOutcome =
  | {
      ok: true;
      advice: Extract<PierceAdvice, { ok: true }>;
      rows: Array<{ label: string; value: string; state?: string }>;
    }
  | {
      ok: false;
      message: string;
      advice?: PierceAdvice;
      /** The form field that did not parse, when one did not. */ field?: keyof CalculatorForm;
    };

/** Initial form values from a circuit and the datasheet target. */
export function formFromCircuit(data: CalculatorData, circuit: OscillatorCircuit): CalculatorForm {
  const pf = (f: number) => String(Number((f * 1e12).toPrecision(6)));
  const main = data.model.branches[data.mainBranch];
  return {
    circuit: circuit.name,
    stray: pf(circuit.boardStrayF),
    pinIn: pf(circuit.inputCapacitanceF),
    pinOut: pf(circuit.outputCapacitanceF),
    pinToPin: pf(circuit.pinToPinStrayF),
    gm: String(Number((circuit.gmS * 1e3).toPrecision(6))),
    target: String(data.datasheet?.frequencyHz ?? main?.fsHz ?? ''),
  };
}

function capacitance(text: string, what: string): number | string {
  const v = parseEngValue(text, 'F');
  return v.ok ? v.value : `${what}: ${v.message}`;
}

/** Evaluate the form. Messages name the field that did not parse; `field` says which input it was. */
export function runCalculator(data: CalculatorData, form: CalculatorForm): CalculatorOutcome {
  const circuit = data.circuits.find((c) => c.name === form.circuit) ?? data.circuits[0];
  if (!circuit) return { ok: false, message: 'no oscillator circuit defined' };
  const stray = capacitance(form.stray, 'board stray');
  const pinIn = capacitance(form.pinIn, 'input pin capacitance');
  const pinOut = capacitance(form.pinOut, 'output pin capacitance');
  const pinToPin = capacitance(form.pinToPin, 'pin-to-pin stray');
  const gmText = form.gm.trim();
  // `\d+(?:\.\d*)?`, not `\d+\.?\d*`: the latter backtracks quadratically on a long run of digits
  const gm = /^(\d+(?:\.\d*)?|\.\d+)(e[+-]?\d+)?$/i.test(gmText)
    ? { ok: true as const, value: Number(gmText) }
    : { ok: false as const };
  const target = parseEngValue(form.target, 'Hz');
  const fields = [
    ['stray', stray],
    ['pinIn', pinIn],
    ['pinOut', pinOut],
    ['pinToPin', pinToPin],
  ] as const;
  const bad = fields.find(([, v]) => typeof v === 'string');
  if (bad) return { ok: false, message: bad[1] as string, field: bad[0] };
  if (!gm.ok || !(gm.value > 0))
    return { ok: false, message: `transconductance: expected a positive value in mA/V, got "${form.gm}"`, field: 'gm' };
  if (!target.ok || !(target.value > 0))
    return {
      ok: false,
      message: `target frequency: expected a frequency such as "12M", got "${form.target}"`,
      field: 'target',
    };
  const c: OscillatorCircuit = {
    ...circuit,
    boardStrayF: stray as number,
    inputCapacitanceF: pinIn as number,
    outputCapacitanceF: pinOut as number,
    pinToPinStrayF: pinToPin as number,
    gmS: gm.value * 1e-3,
  };
  const advice = advisePierce({
    partId: data.partId,
    datasheet: { ...(data.datasheet ?? {}), frequencyHz: target.value },
    model: data.model,
    mainBranch: data.mainBranch,
    circuit: c,
  });
  if (!advice.ok) return { ok: false, message: advice.reason, advice };
  const b = advice.best;
  const e = advice.equal;
  return {
    ok: true,
    advice,
    rows: [
      { label: 'Load capacitance for the target', value: formatQty(advice.target.idealLoadF, 'F', 4) },
      {
        label: 'Closest pair (input / output)',
        value: `${formatQty(b.inputCapF, 'F', 3)} / ${formatQty(b.outputCapF, 'F', 3)} (${circuit.series})`,
      },
      { label: 'Frequency offset', value: formatPpm(b.offsetPpm, 3), state: b.checks.frequency.verdict },
      {
        label: 'Offset band over tolerances',
        value: `${formatPpm(b.bandPpm.min, 2)} … ${formatPpm(b.bandPpm.max, 2)}`,
      },
      { label: 'Gain margin gm/gm,crit', value: formatNumber(b.gainMargin, 3), state: b.checks.gainMargin.verdict },
      {
        label: 'Resistance seen by the crystal pins',
        value: formatQty(b.pinsResistanceOhm, 'Ω', 4),
        state: b.checks.negativeResistance.verdict,
      },
      { label: 'Resistance seen by the motional branch', value: formatQty(b.motionalResistanceOhm, 'Ω', 4) },
      {
        label: 'Start-up time constant / time',
        value: Number.isFinite(b.startupTauS)
          ? `${formatQty(b.startupTauS, 's', 3)} / ${formatQty(b.startupTimeS, 's', 3)}`
          : 'does not start',
        state: b.checks.startup.verdict,
      },
      { label: 'Estimated drive', value: formatQty(b.driveW, 'W', 3), state: b.checks.drive.verdict },
      {
        label: 'Equal pair',
        value: `2 × ${formatQty(e.inputCapF, 'F', 3)}: ${formatPpm(e.offsetPpm, 3)}, gain margin ${formatNumber(e.gainMargin, 3)}`,
      },
      { label: 'Frequency with the closest pair', value: formatHz(b.freqHz, 10) },
    ],
  };
}
