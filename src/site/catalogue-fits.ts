/**
 * The catalogue's "fits circuit" columns, DOM-free: headers and the cell texts of one part for
 * the chosen circuit (report/fits.ts computed the fits at build time).
 */
import { fitFor, FIT_VERDICT_LABEL, type IndexFit } from '../lib/report/fits.ts';
import { formatNumber, formatPpm, formatQty } from './format.ts';

/** Column headers added when a circuit is chosen. */
export const FIT_HEADERS = ['Pair in / out', 'Offset', 'Gain margin', 'Start-up', 'Fits circuit'] as const;

/** Class of the verdict badge (the site's state colours). */
const VERDICT_STATE = { fits: 'pass', check: 'warnings', no: 'fail', outside: 'unknown' } as const;

/** Cells of one part for one circuit: texts, and the verdict with its badge class. */
export function fitCells(
  fits: IndexFit[] | undefined,
  circuit: string,
): { texts: string[]; verdict: string; stateClass: string } {
  const f = fitFor(fits, circuit);
  if (f.verdict === 'outside')
    return {
      texts: ['—', '—', '—', '—'],
      verdict: FIT_VERDICT_LABEL.outside,
      stateClass: `state state-${VERDICT_STATE.outside}`,
    };
  const fit = f as IndexFit;
  const pair =
    fit.inputCapF !== undefined && fit.outputCapF !== undefined
      ? `${formatQty(fit.inputCapF, 'F', 3)} / ${formatQty(fit.outputCapF, 'F', 3)}`
      : '—';
  const startup =
    fit.startupTimeS !== undefined
      ? formatQty(fit.startupTimeS, 's', 3)
      : fit.inputCapF !== undefined
        ? 'does not start'
        : '—';
  return {
    texts: [
      pair,
      fit.offsetPpm !== undefined ? formatPpm(fit.offsetPpm, 2) : '—',
      fit.gainMargin !== undefined ? formatNumber(fit.gainMargin, 3) : '—',
      startup,
    ],
    verdict: FIT_VERDICT_LABEL[fit.verdict],
    stateClass: `state state-${VERDICT_STATE[fit.verdict]}`,
  };
}
