/**
 * "Fits circuit": one short row per part and circuit — the recommended pair, its offset, gain
 * margin, start-up time and one verdict — for the catalogue's circuit columns and
 * `motional advise --all`. Made from the same Pierce advice the part page shows.
 *
 * Verdict (project rule):
 * - `no`: no advice possible, the oscillator does not start, or the frequency budget's
 *   root-sum-square misses the circuit's requirement;
 * - `check`: the gain margin, the start-up (marginal or slower than required), the negative
 *   resistance, the budget's worst case, or the drive level (above a stated limit) need a look;
 * - `fits`: none of these.
 * `outside` marks a circuit whose frequency range does not hold the part (its columns stay empty).
 */
import type { PierceAdvice } from '../osc/pierce.ts';
import type { OscillatorCircuit } from '../schema/oscillators.ts';
import { circuitCovers } from '../osc/circuit-offer.ts';

export type FitVerdict = 'fits' | 'check' | 'no' | 'outside';

export const FIT_VERDICTS: readonly FitVerdict[] = ['fits', 'check', 'no', 'outside'];

/** Words shown for each verdict. */
export const FIT_VERDICT_LABEL: Record<FitVerdict, string> = {
  fits: 'fits',
  check: 'check',
  no: 'does not fit',
  outside: 'outside range',
};

/** One part in one circuit. */
export interface CircuitFit {
  circuit: string;
  verdict: FitVerdict;
  /** Recommended (closest) pair, F. */
  inputCapF?: number;
  outputCapF?: number;
  offsetPpm?: number;
  gainMargin?: number;
  /** Start-up envelope time constant and time to steady amplitude, s (absent: does not start). */
  startupTauS?: number;
  startupTimeS?: number;
  /** Frequency budget worst case (largest |deviation|), ppm. */
  budgetWorstPpm?: number;
  /** Why the verdict is not `fits` (the first reasons). */
  reason: string;
}

function finite(x: number): number | undefined {
  return Number.isFinite(x) ? x : undefined;
}

/** The fit row of one advice; `covers` says whether the circuit's range holds the part. */
export function circuitFit(a: PierceAdvice, covers: boolean): CircuitFit {
  if (!covers)
    return { circuit: a.circuit, verdict: 'outside', reason: "the part's frequency is outside the circuit's range" };
  if (!a.ok) return { circuit: a.circuit, verdict: 'no', reason: a.reason };
  const p = a.best;
  const c = p.checks;
  const no: string[] = [];
  const check: string[] = [];
  if (c.startup.verdict === 'fail') no.push('does not start');
  if (p.budget.verdict === 'fail') no.push('frequency budget misses the requirement');
  if (c.gainMargin.verdict !== 'pass') check.push('gain margin');
  if (c.startup.verdict === 'warn') check.push('start-up');
  if (c.negativeResistance.verdict !== 'pass') check.push('negative resistance');
  if (p.budget.verdict === 'warn') check.push('frequency budget worst case');
  if (c.drive.verdict === 'warn' && /exceeds/.test(c.drive.reason)) check.push('drive level');
  const verdict: FitVerdict = no.length ? 'no' : check.length ? 'check' : 'fits';
  return {
    circuit: a.circuit,
    verdict,
    inputCapF: p.inputCapF,
    outputCapF: p.outputCapF,
    offsetPpm: p.offsetPpm,
    gainMargin: p.gainMargin,
    startupTauS: finite(p.startupTauS),
    startupTimeS: finite(p.startupTimeS),
    budgetWorstPpm: Math.max(Math.abs(p.budget.worstCasePpm.min), Math.abs(p.budget.worstCasePpm.max)),
    reason: no.length ? no.join('; ') : check.length ? `look at: ${check.join(', ')}` : 'every check passes',
  };
}

/** CSV header and rows of fits (RFC 4180 quoting, LF line ends like the other exports), SI units named in the header. */
export function fitsCsv(rows: Array<{ part: string } & CircuitFit>): string {
  const q = (v: string | number | undefined) => {
    if (v === undefined) return '';
    const t = String(v);
    return /[",\n\r]/.test(t) ? `"${t.replace(/"/g, '""')}"` : t;
  };
  const head = [
    'part',
    'circuit',
    'verdict',
    'inputCapF',
    'outputCapF',
    'offsetPpm',
    'gainMargin',
    'startupTauS',
    'startupTimeS',
    'budgetWorstPpm',
    'reason',
  ];
  const lines = rows.map((r) =>
    [
      r.part,
      r.circuit,
      r.verdict,
      r.inputCapF,
      r.outputCapF,
      r.offsetPpm,
      r.gainMargin,
      r.startupTauS,
      r.startupTimeS,
      r.budgetWorstPpm,
      r.reason,
    ]
      .map(q)
      .join(','),
  );
  return `${[head.join(','), ...lines].join('\n')}\n`;
}

/**
 * The compact fit the catalogue index carries for each circuit whose frequency range holds the
 * part (an absent circuit means `outside`), rounded for size.
 */
export interface IndexFit {
  circuit: string;
  verdict: Exclude<FitVerdict, 'outside'>;
  inputCapF?: number;
  outputCapF?: number;
  offsetPpm?: number;
  gainMargin?: number;
  startupTimeS?: number;
}

function round(x: number | undefined, digits: number): number | undefined {
  return x === undefined || !Number.isFinite(x) ? undefined : Number(x.toPrecision(digits));
}

/** Index fits of a part from its advice and the circuits it was advised for. */
export function indexFits(
  pierce: PierceAdvice[],
  circuits: OscillatorCircuit[],
  fallbackHz: number | undefined,
): IndexFit[] {
  const out: IndexFit[] = [];
  for (const a of pierce) {
    const circuit = circuits.find((c) => c.name === a.circuit);
    const hz = a.target?.targetHz ?? fallbackHz;
    if (!circuit || hz === undefined || !circuitCovers(circuit, hz)) continue;
    const f = circuitFit(a, true);
    if (f.verdict === 'outside') continue;
    out.push({
      circuit: f.circuit,
      verdict: f.verdict,
      inputCapF: round(f.inputCapF, 6),
      outputCapF: round(f.outputCapF, 6),
      offsetPpm: round(f.offsetPpm, 4),
      gainMargin: round(f.gainMargin, 3),
      startupTimeS: round(f.startupTimeS, 3),
    });
  }
  return out;
}

/** The fit of one circuit from an index entry's fits (`outside` when the circuit is not there). */
export function fitFor(
  fits: IndexFit[] | undefined,
  circuit: string,
): IndexFit | { circuit: string; verdict: 'outside' } {
  return fits?.find((f) => f.circuit === circuit) ?? { circuit, verdict: 'outside' };
}
