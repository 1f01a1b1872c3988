/**
 * An uncertainty is a promise: over many seeded trials spread across every fixture
 * (instrument-trials.ts: reflection, series- and shunt-through, impedance records as Z and as
 * Touchstone Z files, samples mixing a through fixture with an impedance analyser, coarse
 * sweeps; floors −80 … −55 dB, 1e-4 trace noise, Z0 50 or 75 Ω, spurious modes, fixture stray
 * capacitance), the true error of each published quantity must lie within its stated
 * standard uncertainty u as often as a Gaussian error does.
 *
 * For a normal error, |e| ≤ 1u holds with probability 68.3 % and |e| ≤ 3u with 99.73 %
 * (ISO/IEC Guide 98-3, GUM G.1.3, table G.1). Required here, per quantity over all trials:
 * |e| ≤ 3u in at least 97 % (honest tails) and |e| ≤ 1u in 55–85 % (neither too small nor
 * inflated). The table is printed with the test output and copied into the README
 * ("Accuracy and uncertainty").
 */
import { describe, expect, it } from 'vitest';
import { extractPart } from '../../../src/lib/extract/extract-part.ts';
import { COMPARED, makeTrial, TRIAL_SETUPS, type Compared } from './instrument-trials.ts';

const TRIALS_PER_SETUP = 45;

interface Tally {
  n: number;
  within1: number;
  within3: number;
}

describe('uncertainty coverage over seeded bench-like trials', () => {
  it(`${TRIALS_PER_SETUP * TRIAL_SETUPS.length} trials: |error| ≤ 3u in ≥ 97 % and ≤ 1u in 55–85 % for every quantity`, () => {
    const all = Object.fromEntries(COMPARED.map((q) => [q, { n: 0, within1: 0, within3: 0 }])) as Record<
      Compared,
      Tally
    >;
    const bySetup = new Map<string, Record<Compared, Tally>>();
    let missing = 0;
    TRIAL_SETUPS.forEach((setup, si) => {
      const row = Object.fromEntries(COMPARED.map((q) => [q, { n: 0, within1: 0, within3: 0 }])) as Record<
        Compared,
        Tally
      >;
      bySetup.set(setup, row);
      for (let s = 0; s < TRIALS_PER_SETUP; s++) {
        const t = makeTrial(20000 + 1000 * si + s, setup);
        const r = extractPart(t.record, t.inputs).samples[0];
        const m = r.modes
          .filter((x) => !x.spurious)
          .sort((a, b) => Math.abs(a.fsHz - t.truth.fsHz) - Math.abs(b.fsHz - t.truth.fsHz))[0];
        if (!m) {
          missing++;
          continue;
        }
        for (const q of COMPARED) {
          const value = q === 'c0F' ? r.c0F : m[q];
          const u = m.uncertainty[q];
          const z = Math.abs(value - t.truth[q]) / u;
          for (const tally of [all[q], row[q]]) {
            tally.n++;
            if (z <= 1) tally.within1++;
            if (z <= 3) tally.within3++;
          }
        }
      }
    });
    const pct = (a: number, n: number) => `${((100 * a) / n).toFixed(1)} %`.padStart(7);
    const lines = [
      `| set-up | ${COMPARED.map((q) => `${q} ≤1u / ≤3u`).join(' | ')} |`,
      `| --- | ${COMPARED.map(() => '---').join(' | ')} |`,
      ...[...bySetup].map(
        ([setup, row]) =>
          `| ${setup} | ${COMPARED.map((q) => `${pct(row[q].within1, row[q].n)} / ${pct(row[q].within3, row[q].n)}`).join(' | ')} |`,
      ),
      `| **all** | ${COMPARED.map((q) => `${pct(all[q].within1, all[q].n)} / ${pct(all[q].within3, all[q].n)}`).join(' | ')} |`,
    ];
    console.log(`Uncertainty coverage, ${TRIALS_PER_SETUP} trials per set-up:\n${lines.join('\n')}`);
    expect(missing).toBe(0);
    for (const q of COMPARED) {
      const t = all[q];
      expect(t.n).toBeGreaterThanOrEqual(300);
      expect(t.within3 / t.n, `${q} within 3u`).toBeGreaterThanOrEqual(0.97);
      expect(t.within1 / t.n, `${q} within 1u`).toBeGreaterThanOrEqual(0.55);
      expect(t.within1 / t.n, `${q} within 1u`).toBeLessThanOrEqual(0.85);
    }
  });
});
