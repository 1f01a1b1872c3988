import { describe, expect, it } from 'vitest';
import { checkCompliance, type ComplianceSample } from '../../../src/lib/osc/compliance.ts';
import { mainMode } from '../../../src/lib/extract/main-mode.ts';
import type { Datasheet } from '../../../src/lib/schema/part.ts';
import { OT3, X1 } from '../models/spice-cases.ts';
import { modeOf, sampleOf } from './sample-fixtures.ts';

const pF = 1e-12;

/** Compliance as the extraction leaves it: the main mode picked once with the datasheet's hints. */
function check(sample: ComplianceSample, datasheet: Datasheet) {
  return checkCompliance(
    {
      ...sample,
      mainMode: mainMode(sample.modes, { frequencyHz: datasheet.frequencyHz, overtone: datasheet.overtone }),
    },
    datasheet,
  );
}
const x1 = X1.branches[0];
// Check value (mpmath, BVD model): X1's load resonance with R1 at 8 pF is 15 922 728.295 Hz.
const FL8_WITH_R1 = 15922728.295;

describe('datasheet compliance of one sample', () => {
  it('compares the load resonance with R1 at the datasheet CL against nominal ± tolerance, with margin', () => {
    const nominal = FL8_WITH_R1 / (1 - 4e-6); // the sample runs 4 ppm low
    const r = check(sampleOf('A1', X1), { frequencyHz: nominal, tolerancePpm: 10, loadCapacitanceF: 8 * pF });
    const f = r.items.find((i) => i.check === 'frequency')!;
    expect(r.frequencyHz).toBeCloseTo(FL8_WITH_R1, 3);
    expect(f.value).toBeCloseTo(-4, 4);
    expect(f.margin).toBeCloseTo(6, 4);
    expect(f.verdict).toBe('pass');
    const tight = check(sampleOf('A1', X1), { frequencyHz: nominal, tolerancePpm: 3, loadCapacitanceF: 8 * pF });
    expect(tight.items[0].verdict).toBe('fail');
    expect(tight.items[0].margin).toBeCloseTo(-1, 4);
  });

  it('uses fr for a series-calibrated part, and says so', () => {
    // Check value (mpmath; fr as IEEE Std 177 names it): X1 fr − fs = +0.954964 Hz.
    const fr = x1.fsHz + 0.954964;
    const s = sampleOf('A1', X1, [modeOf(x1, X1.c0F, 1, false, { frHz: fr, rrOhm: 20.00072 })]);
    const r = check(s, { frequencyHz: x1.fsHz, tolerancePpm: 1, loadCapacitanceF: 'series' });
    expect(r.frequencyBasis).toMatch(/fr/);
    expect(r.items[0].value).toBeCloseTo((0.954964 / x1.fsHz) * 1e6, 6);
    expect(r.items[0].verdict).toBe('pass');
  });

  it('judges ESR on Rr when the extraction gives it (X1 Rr = 20.000720 Ω by mpmath), else on R1', () => {
    const withRr = sampleOf('A1', X1, [modeOf(x1, X1.c0F, 1, false, { rrOhm: 20.00072 })]);
    const a = check(withRr, { esrMaxOhm: 20 }).items.find((i) => i.check === 'esr')!;
    expect(a.value).toBe(20.00072);
    expect(a.verdict).toBe('fail');
    expect(a.reason).toMatch(/resistance at fr/);
    const b = check(sampleOf('A1', X1), { esrMaxOhm: 25 }).items.find((i) => i.check === 'esr')!;
    expect(b.value).toBe(20);
    expect(b.margin).toBeCloseTo(20, 9);
    expect(b.verdict).toBe('pass');
    expect(b.reason).toMatch(/R1 \(Rr not available/);
  });

  it('checks C0 against c0Max with a margin in percent', () => {
    const c0 = check(sampleOf('A1', X1), { c0MaxF: 2.5 * pF }).items.find((i) => i.check === 'c0')!;
    expect(c0.verdict).toBe('fail');
    expect(c0.margin).toBeCloseTo(-20, 9);
  });

  it('checks the physical overtone order of the mode at the datasheet frequency', () => {
    const labels: Array<[number, boolean]> = [
      [1, false],
      [3, false],
      [3, true],
    ];
    const s = sampleOf(
      'B1',
      OT3,
      OT3.branches.map((b, i) => modeOf(b, OT3.c0F, labels[i][0], labels[i][1])),
    );
    const ok = check(s, { frequencyHz: 100e6, overtone: 3 }).items.find((i) => i.check === 'overtone')!;
    expect(ok.verdict).toBe('pass');
    const wrong = check(s, { frequencyHz: 100e6, overtone: 1 }).items.find((i) => i.check === 'overtone')!;
    expect(wrong.verdict).toBe('fail');
    const fundamental = check(s, { frequencyHz: 33.24e6, overtone: 3 }).items.find((i) => i.check === 'overtone')!;
    expect(fundamental.verdict).toBe('fail');
    expect(fundamental.value).toBe(1);
  });

  it('judges the main mode the extraction recorded, never picking again', () => {
    const labels: Array<[number, boolean]> = [
      [1, false],
      [3, false],
      [3, true],
    ];
    const s = sampleOf(
      'B1',
      OT3,
      OT3.branches.map((b, i) => modeOf(b, OT3.c0F, labels[i][0], labels[i][1])),
    );
    // The picker would take the fundamental (lowest R1); the record says the third overtone.
    const r = checkCompliance({ ...s, mainMode: { index: 1, rule: 'recorded' } }, { esrMaxOhm: 1000 });
    expect(r.mainMode).toBe(1);
    expect(r.mainModeRule).toBe('recorded');
    expect(r.items.find((i) => i.check === 'esr')!.value).toBe(OT3.branches[1].r1Ohm);
  });

  it('says unknown, with the reason, for every check the datasheet does not cover', () => {
    const r = check(sampleOf('A1', X1), {});
    expect(r.items.map((i) => i.verdict)).toEqual(['unknown', 'unknown', 'unknown', 'unknown']);
    expect(r.items[0].reason).toBe('no datasheet load capacitance');
    for (const i of r.items) expect(i.reason.length).toBeGreaterThan(5);
  });
});
