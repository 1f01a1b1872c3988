/**
 * Comparison of an extraction result with the documented model values of a demo sample
 * (the tolerances of the extraction issue: fs 0.1 ppm, fp 1 ppm, R1 1 %, C1 and L1 0.5 %, C0 1 %).
 * Shared by the demo recovery test and the fixture recovery test.
 */
import { inductanceOf, type BvdModel } from '../../src/lib/models/bvd.ts';
import type { ModeResult, SampleResult } from '../../src/lib/extract/types.ts';
import { antiResonanceHz } from '../../scripts/demo/demo-physics.ts';
import type { DemoMode } from '../../scripts/demo/demo-types.ts';

/** Relative tolerances of the extraction issue (fs and fp in ppm of the frequency). */
export const TOLERANCE = { fsPpm: 0.1, fpPpm: 1, r1: 0.01, c1: 0.005, l1: 0.005, c0: 0.01 } as const;

/** One out-of-tolerance quantity, as text (empty list: all within tolerance). */
export function compareSample(result: SampleResult, model: BvdModel, modes: readonly DemoMode[]): string[] {
  const problems: string[] = [];
  const rel = (got: number, want: number) => (got - want) / want;
  const c0Err = rel(result.c0F, model.c0F);
  if (!(Math.abs(c0Err) <= TOLERANCE.c0))
    problems.push(`c0F ${result.c0F} vs ${model.c0F} (${(c0Err * 100).toFixed(3)} %)`);
  for (const m of modes) {
    const b = model.branches[m.branch];
    const label = `mode ${m.overtone}${m.spurious ? ' spurious' : ''} @${(b.fsHz / 1e6).toFixed(6)} MHz`;
    const candidates = result.modes.filter((x) => x.overtone === m.overtone && x.spurious === m.spurious);
    if (candidates.length === 0) {
      problems.push(`${label}: not found (extracted: ${result.modes.map(describe).join(', ') || 'none'})`);
      continue;
    }
    const got: ModeResult = candidates.reduce((a, x) =>
      Math.abs(x.fsHz - b.fsHz) < Math.abs(a.fsHz - b.fsHz) ? x : a,
    );
    if (m.aboveInstrumentRange) {
      if (got.flagged !== true) problems.push(`${label}: above the instrument range but not flagged`);
      continue;
    }
    const fp = antiResonanceHz(model, m.branch);
    const checks: Array<[string, number, number, number, number]> = [
      ['fsHz', got.fsHz, b.fsHz, rel(got.fsHz, b.fsHz) * 1e6, TOLERANCE.fsPpm],
      ['fpHz', got.fpHz, fp, rel(got.fpHz, fp) * 1e6, TOLERANCE.fpPpm],
      ['r1Ohm', got.r1Ohm, b.r1Ohm, rel(got.r1Ohm, b.r1Ohm) * 100, TOLERANCE.r1 * 100],
      ['c1F', got.c1F, b.c1F, rel(got.c1F, b.c1F) * 100, TOLERANCE.c1 * 100],
      ['l1H', got.l1H, inductanceOf(b), rel(got.l1H, inductanceOf(b)) * 100, TOLERANCE.l1 * 100],
    ];
    for (const [name, g, w, err, tol] of checks) {
      if (!(Math.abs(err) <= tol))
        problems.push(`${label}: ${name} ${g} vs ${w} (${err.toFixed(4)} ${name.startsWith('f') ? 'ppm' : '%'})`);
    }
  }
  return problems;
}

function describe(m: ModeResult): string {
  return `${m.overtone}${m.spurious ? 's' : ''}@${(m.fsHz / 1e6).toFixed(6)}MHz`;
}
