import { describe, expect, it } from 'vitest';
import {
  driveFromCrystalVoltageW,
  driveFromPinVoltageW,
  driveFromTerminalCurrentW,
} from '../../../src/lib/osc/drive-level.ts';
import { criticalGmS, negativeResistanceOhm } from '../../../src/lib/osc/gain.ts';
import { loadFrequencyHz } from '../../../src/lib/osc/load.ts';
import { advisePierce, type PierceAdvice } from '../../../src/lib/osc/pierce.ts';
import type { OscillatorCircuit } from '../../../src/lib/schema/oscillators.ts';
import { TF1, X1 } from '../models/spice-cases.ts';

const pF = 1e-12;
const x1 = X1.branches[0];
const tf1 = TF1.branches[0];
const fL12 = loadFrequencyHz(x1, X1.c0F, 12 * pF);

/** A circuit with the lumped stray of the usual Pierce load formula (CL = CaCb/(Ca + Cb) + Cstray) as pin-to-pin stray. */
function circuit(extra: Partial<OscillatorCircuit> = {}): OscillatorCircuit {
  return {
    name: 'bench-pierce',
    gmS: 5e-3,
    inputCapacitanceF: 0,
    outputCapacitanceF: 0,
    boardStrayF: 0,
    boardStrayUncertaintyF: 0,
    pinToPinStrayF: 2.5 * pF,
    pinToPinStrayUncertaintyF: 0,
    supplyV: 3.3,
    capacitorToleranceFraction: 0.05,
    series: 'E12',
    ...extra,
  };
}

function ok(a: PierceAdvice): Extract<PierceAdvice, { ok: true }> {
  if (!a.ok) throw new Error(`advice failed: ${a.reason}`);
  return a;
}

describe('critical transconductance and negative resistance', () => {
  // Derived from the BVD model; matches Vittoz, Degrauwe & Bitz, IEEE J. Solid-State Circuits 1988.
  // X1, Ca = Cb = 24 pF; check values by mpmath.
  it('gives 1.800000e-4 S for X1 with 24/24 pF at ωs', () => {
    expect(criticalGmS(20, X1.c0F, 24 * pF, 24 * pF, x1.fsHz)).toBeCloseTo(1.8e-4, 10);
  });
  it('gives 1.801200e-4 S at the load resonance fL(12 pF)', () => {
    expect(criticalGmS(20, X1.c0F, 24 * pF, 24 * pF, fL12) / 1e-4).toBeCloseTo(1.8012, 6);
  });
  it('gives 2.026350e-4 S for the unequal 18/36 pF pair (same CL), 11 % above the simplified form', () => {
    const g = criticalGmS(20, X1.c0F, 18 * pF, 36 * pF, fL12);
    expect(g / 1e-4).toBeCloseTo(2.02635, 5);
    // Unequal capacitors raise gm,crit by (Ca + Cb)²/(4CaCb) = 1.125.
    expect(g / criticalGmS(20, X1.c0F, 24 * pF, 24 * pF, fL12)).toBeCloseTo(54 ** 2 / (4 * 18 * 36), 12);
  });
  it('gives 1.11386e-6 S for TF1 at 12.5 pF (25/25 pF, ωs)', () => {
    expect(criticalGmS(35e3, TF1.c0F, 25 * pF, 25 * pF, tf1.fsHz) / 1e-6).toBeCloseTo(1.11386, 5);
  });
  it('gives Rneg = −173.611 Ω for X1, gm = 1 mS, 24/24 pF, ω = 1e8 (5.56 × RL, 8.68 × R1)', () => {
    const r = negativeResistanceOhm(1e-3, 24 * pF, 24 * pF, x1.fsHz);
    expect(r).toBeCloseTo(-173.611, 3);
    expect(-r / 31.25).toBeCloseTo(5.56, 2);
    expect(-r / 20).toBeCloseTo(8.68, 2);
  });
  it('makes gm/gm,crit equal |Rneg|/RL exactly (one rule in the linear model)', () => {
    const gm = 1e-3;
    const ratio = gm / criticalGmS(20, X1.c0F, 24 * pF, 24 * pF, fL12);
    const rl = 20 * (1 + X1.c0F / (12 * pF)) ** 2;
    expect(-negativeResistanceOhm(gm, 24 * pF, 24 * pF, fL12) / rl).toBeCloseTo(ratio, 12);
  });
});

describe('drive level (forms derived from the BVD model)', () => {
  // X1, CL = 12 pF, Vx = 1 Vpp, ω = 1e8: 5.625 µW by all three forms (pin form: Ca = 24 pF, Vpin = 0.5 Vpp).
  it('gives 5.625 µW by the motional-current, terminal-current and pin forms', () => {
    expect(driveFromCrystalVoltageW(20, X1.c0F, 12 * pF, x1.fsHz, 1) / 1e-6).toBeCloseTo(5.625, 9);
    expect(driveFromTerminalCurrentW(31.25, 12 * pF, x1.fsHz, 1) / 1e-6).toBeCloseTo(5.625, 9);
    expect(driveFromPinVoltageW(31.25, 24 * pF, x1.fsHz, 0.5) / 1e-6).toBeCloseTo(5.625, 9);
  });
  it('puts TF1 at 12.5 pF at 1 µW only with 5.36 Vpp across the crystal', () => {
    const p1 = driveFromCrystalVoltageW(35e3, TF1.c0F, 12.5 * pF, tf1.fsHz, 1);
    expect(Math.sqrt(1e-6 / p1)).toBeCloseTo(5.36, 2);
  });
});

describe('Pierce capacitor advice (example: CL 8 pF, stray 2.5 pF, E12)', () => {
  const advice = ok(
    advisePierce({
      partId: 'X1',
      datasheet: { loadCapacitanceF: 8 * pF },
      model: X1,
      mainBranch: 0,
      circuit: circuit(),
    }),
  );

  it("aims at the part's own frequency at the datasheet CL when the datasheet gives no frequency", () => {
    expect(advice.target.targetBasis).toBe('frequency at the datasheet load capacitance');
    expect(advice.target.targetHz).toBeCloseTo(15922726.981, 3);
    expect(advice.idealEqualCapF / pF).toBeCloseTo(11, 9);
  });
  it('chooses the equal 12 pF pair: CL 8.5 pF, −19.745 ppm (10 pF would give +21.625 ppm)', () => {
    expect(advice.equal.inputCapF).toBe(12 * pF);
    expect(advice.equal.outputCapF).toBe(12 * pF);
    expect(advice.equal.clF / pF).toBeCloseTo(8.5, 9);
    expect(advice.equal.offsetPpm).toBeCloseTo(-19.745, 3);
    const ten = ok(
      advisePierce({
        partId: 'X1',
        datasheet: { loadCapacitanceF: 8 * pF },
        model: X1,
        mainBranch: 0,
        circuit: circuit({ series: 'E6' }),
      }),
    );
    // E6 offers 10 and 15 around 11: 10 pF wins there, +21.625 ppm.
    expect(ten.equal.inputCapF).toBe(10 * pF);
    expect(ten.equal.offsetPpm).toBeCloseTo(21.625, 3);
  });
  it('finds the unequal 10 + 12 pF pair: CL 7.95455 pF, +1.884 ppm', () => {
    expect([advice.best.inputCapF, advice.best.outputCapF].sort((p, q) => p - q)).toEqual([10 * pF, 12 * pF]);
    expect(advice.best.clF / pF).toBeCloseTo(7.95455, 5);
    expect(advice.best.offsetPpm).toBeCloseTo(1.884, 3);
  });
  it('bands the offset over 5 % capacitors: the band holds the nominal and widens with tolerance', () => {
    const { min, max } = advice.best.bandPpm;
    expect(min).toBeLessThan(advice.best.offsetPpm);
    expect(max).toBeGreaterThan(advice.best.offsetPpm);
    // 5 % on a 5.45 pF series combination ≈ ±0.27 pF at S(8 pF) ≈ 41 ppm/pF: about ±11 ppm.
    expect(max - min).toBeGreaterThan(18);
    expect(max - min).toBeLessThan(26);
  });
  it('warns on frequency when the datasheet gives no tolerance, passes when the band is inside it', () => {
    expect(advice.best.checks.frequency.verdict).toBe('warn');
    expect(advice.best.checks.frequency.reason).toMatch(/no datasheet tolerance/);
    const tol = ok(
      advisePierce({
        partId: 'X1',
        datasheet: { loadCapacitanceF: 8 * pF, tolerancePpm: 30 },
        model: X1,
        mainBranch: 0,
        circuit: circuit(),
      }),
    );
    expect(tol.best.checks.frequency.verdict).toBe('pass');
    expect(tol.equal.checks.frequency.verdict).toBe('warn');
  });
});

describe('Pierce gain margin, negative resistance and drive verdicts', () => {
  // Ca = Cb = 24 pF: external 20 pF + 3 pF pin + 1 pF board; CL = 12 pF exactly.
  const c = circuit({
    gmS: 1e-3,
    inputCapacitanceF: 3 * pF,
    outputCapacitanceF: 3 * pF,
    boardStrayF: 1 * pF,
    pinToPinStrayF: 0,
    series: 'E24',
  });
  const a = ok(
    advisePierce({
      partId: 'X1',
      datasheet: { loadCapacitanceF: 12 * pF, esrMaxOhm: 40, driveMaxW: 10e-6 },
      model: X1,
      mainBranch: 0,
      circuit: c,
    }),
  );

  it('includes pin and board capacitance in Ca and Cb (20 pF external → 24 pF each side)', () => {
    expect(a.best.inputCapF).toBe(20 * pF);
    expect(a.best.caF / pF).toBeCloseTo(24, 9);
    expect(a.best.clF / pF).toBeCloseTo(12, 9);
    expect(a.best.gmCritS / 1e-4).toBeCloseTo(1.8012, 6);
  });
  it('compares gm against the extracted R1 and the datasheet maximum ESR and warns below 5', () => {
    expect(a.best.gainMargin).toBeCloseTo(1e-3 / 1.8012e-4, 3);
    expect(a.best.gainMarginDatasheet).toBeCloseTo(a.best.gainMargin / 2, 9);
    // 5.55 with R1 but 2.78 with the 40 Ω datasheet maximum: warn, naming both.
    expect(a.best.checks.gainMargin.verdict).toBe('warn');
    expect(a.best.checks.gainMargin.reason).toMatch(/datasheet maximum ESR/);
    expect(a.best.checks.gainMargin.reason).toMatch(/not a standard/);
    expect(a.best.checks.negativeResistance.verdict).toBe('pass');
  });
  it('estimates drive with the supply as the swing and warns above the datasheet maximum', () => {
    // 3.3 Vpp across X1 at 12 pF: 5.625 µW · 3.3² ≈ 61.3 µW (the 1 Vpp check value scaled), over 10 µW.
    expect(a.best.driveW / 1e-6).toBeCloseTo(5.625 * 3.3 ** 2 * (a.best.freqHz / x1.fsHz) ** 2, 6);
    expect(a.best.checks.drive.verdict).toBe('warn');
    expect(a.assumptions.join(' ')).toMatch(/assumed equal to the supply/);
    const low = ok(
      advisePierce({
        partId: 'X1',
        datasheet: { loadCapacitanceF: 12 * pF, driveMaxW: 100e-6 },
        model: X1,
        mainBranch: 0,
        circuit: { ...c, swingVpp: 1, gmS: 20e-3 },
      }),
    );
    expect(low.best.checks.drive.verdict).toBe('pass');
    expect(low.best.checks.gainMargin.verdict).toBe('pass');
  });
  it('fails with a reason when the strays alone exceed the load capacitance', () => {
    const r = advisePierce({
      partId: 'X1',
      datasheet: { loadCapacitanceF: 4 * pF },
      model: X1,
      mainBranch: 0,
      circuit: { ...c, inputCapacitanceF: 10 * pF, outputCapacitanceF: 10 * pF },
    });
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.reason).toMatch(/already reach the load capacitance/);
  });
  it('fails with a reason for a series-calibrated part whose frequency a Pierce circuit cannot reach', () => {
    const r = advisePierce({
      partId: 'X1',
      datasheet: { frequencyHz: x1.fsHz, loadCapacitanceF: 'series' },
      model: X1,
      mainBranch: 0,
      circuit: c,
    });
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.reason).toMatch(/series resonance/);
  });
  it('aims at the datasheet frequency when given and reports the ideal CL for this sample', () => {
    const target = loadFrequencyHz(x1, X1.c0F, 9 * pF);
    const r = ok(
      advisePierce({
        partId: 'X1',
        datasheet: { frequencyHz: target, loadCapacitanceF: 8 * pF },
        model: X1,
        mainBranch: 0,
        circuit: c,
      }),
    );
    expect(r.target.targetBasis).toBe('datasheet frequency');
    expect(r.target.idealLoadF / pF).toBeCloseTo(9, 9);
  });
});
