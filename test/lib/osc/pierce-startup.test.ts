/**
 * The advice's resistances, start-up estimate and frequency budget, each against the module that
 * is checked against SPICE (pierce-network-spice.test.ts) or a worked example
 * (frequency-budget.test.ts), and the circuit offer by nominal frequency.
 */
import { describe, expect, it } from 'vitest';
import { advisePierce, type PierceAdvice } from '../../../src/lib/osc/pierce.ts';
import {
  criticalGmFullS,
  impedanceAtPins,
  impedanceSeenByMotionalBranch,
} from '../../../src/lib/osc/pierce-network.ts';
import { limitedSwingVpp, noiseCurrentA, steadyMotionalCurrentA } from '../../../src/lib/osc/startup.ts';
import { circuitsFor, offerFrequencyHz } from '../../../src/lib/report/advice.ts';
import { circuitFit } from '../../../src/lib/report/fits.ts';
import { DEMO_CIRCUIT, X1 } from '../../site/fixture.ts';

function ok(a: PierceAdvice): Extract<PierceAdvice, { ok: true }> {
  if (!a.ok) throw new Error(a.reason);
  return a;
}

const datasheet = { loadCapacitanceF: 10e-12, esrMaxOhm: 60, tolerancePpm: 20, stabilityPpm: 30 };
const x1 = X1.branches[0];
const l1H = 1 / ((2 * Math.PI * x1.fsHz) ** 2 * x1.c1F);

describe('resistances named for what they are', () => {
  const a = ok(advisePierce({ partId: 'X1', datasheet, model: X1, mainBranch: 0, circuit: DEMO_CIRCUIT }));
  const p = a.best;
  const net = { gmS: DEMO_CIRCUIT.gmS, caF: p.caF, cbF: p.cbF, pinToPinF: DEMO_CIRCUIT.pinToPinStrayF };

  it('seen by the crystal pins: the circuit with the pin-to-pin stray', () => {
    expect(p.pinsResistanceOhm).toBeCloseTo(impedanceAtPins(net, p.freqHz).reOhm, 9);
    // the C0-free shortcut −gm/(ω²CaCb) leaves the 0.3 pF pin-to-pin stray out: several % off
    const w = 2 * Math.PI * p.freqHz;
    const shortcut = -DEMO_CIRCUIT.gmS / (w * w * p.caF * p.cbF);
    expect(Math.abs(shortcut / p.pinsResistanceOhm - 1)).toBeGreaterThan(0.02);
  });

  it('seen by the motional branch: circuit, pin-to-pin stray and C0 together', () => {
    expect(p.motionalResistanceOhm).toBeCloseTo(impedanceSeenByMotionalBranch(net, X1.c0F, p.freqHz).reOhm, 9);
    expect(-p.motionalResistanceOhm).toBeLessThan(-p.pinsResistanceOhm);
  });

  it('start-up τ = 2L1/(|Rm| − R1) at the chosen capacitors, time = τ·ln(steady/noise)', () => {
    expect(p.startupTauS).toBeCloseTo((2 * l1H) / (-p.motionalResistanceOhm - x1.r1Ohm), 15);
    const n = Math.log(steadyMotionalCurrentA(X1.c0F, p.clF, p.freqHz, p.swingVpp) / noiseCurrentA(l1H));
    expect(p.startupTimeS / p.startupTauS).toBeCloseTo(n, 9);
    // thermal noise √(kT/L1) at 300 K for L1 = 10 mH: √(1.380649e-23·300/0.01) = √(4.141947e-19) = 6.43580e-10 A
    expect(noiseCurrentA(0.01) / 1e-10).toBeCloseTo(6.4358, 3);
    expect(a.assumptions.join(' ')).toMatch(/noise/);
    expect(a.cautions.join(' ')).toMatch(/start-up/);
  });
});

describe('start-up verdicts', () => {
  it('fails when the motional branch sees less than R1 (too little gm)', () => {
    const a = ok(
      advisePierce({ partId: 'X1', datasheet, model: X1, mainBranch: 0, circuit: { ...DEMO_CIRCUIT, gmS: 20e-6 } }),
    );
    expect(a.best.startupTauS).toBe(Number.POSITIVE_INFINITY);
    expect(a.best.checks.startup.verdict).toBe('fail');
    expect(a.best.checks.startup.reason).toMatch(/does not start/);
    expect(circuitFit(a, true).verdict).toBe('no');
  });
  it('warns when |Rm| barely exceeds R1', () => {
    // find a gm where |Rm|/R1 is between 1 and 2
    const base = ok(advisePierce({ partId: 'X1', datasheet, model: X1, mainBranch: 0, circuit: DEMO_CIRCUIT }));
    const ratio = -base.best.motionalResistanceOhm / x1.r1Ohm;
    const a = ok(
      advisePierce({
        partId: 'X1',
        datasheet,
        model: X1,
        mainBranch: 0,
        circuit: { ...DEMO_CIRCUIT, gmS: (DEMO_CIRCUIT.gmS * 1.5) / ratio },
      }),
    );
    expect(-a.best.motionalResistanceOhm / x1.r1Ohm).toBeGreaterThan(1);
    expect(-a.best.motionalResistanceOhm / x1.r1Ohm).toBeLessThan(2);
    expect(a.best.checks.startup.verdict).toBe('warn');
    expect(a.best.checks.startup.reason).toMatch(/barely exceeds R1/);
  });
  it('warns when the start-up time misses the circuit requirement', () => {
    const a = ok(
      advisePierce({
        partId: 'X1',
        datasheet,
        model: X1,
        mainBranch: 0,
        circuit: { ...DEMO_CIRCUIT, startupTimeMaxS: 1e-6 },
      }),
    );
    expect(a.best.checks.startup.verdict).toBe('warn');
    expect(a.best.checks.startup.reason).toMatch(/exceeds the circuit's start-up requirement/);
  });
});

describe('frequency budget in the advice', () => {
  it('uses the pair offset and band, the datasheet stability and tolerance, against the requirement', () => {
    const a = ok(
      advisePierce({
        partId: 'X1',
        datasheet,
        model: X1,
        mainBranch: 0,
        circuit: { ...DEMO_CIRCUIT, frequencyRequirementPpm: 100 },
      }),
    );
    const b = a.best.budget;
    expect(b.terms[0].minPpm).toBe(a.best.offsetPpm);
    expect(b.terms[1].minPpm).toBeCloseTo(a.best.bandPpm.min - a.best.offsetPpm, 12);
    expect(b.terms.find((t) => t.name === 'temperature')).toMatchObject({
      source: 'datasheet',
      minPpm: -30,
      maxPpm: 30,
    });
    expect(b.requirementPpm).toBe(100);
    expect(a.best.checks.budget.verdict).toBe(b.verdict);
  });
});

describe('circuits are offered by the nominal frequency', () => {
  // A 16 MHz part whose sample measures fs = 15.996 MHz belongs to a 16–52 MHz circuit.
  const model = { c0F: 3e-12, branches: [{ fsHz: 15.996e6, r1Ohm: 30, c1F: 5e-15 }] };
  const wide = { ...DEMO_CIRCUIT, name: 'wide', frequencyRangeHz: { min: 16e6, max: 52e6 } };
  const low = { ...DEMO_CIRCUIT, name: 'low', frequencyRangeHz: { min: 4e6, max: 15.999e6 } };
  it('datasheet nominal first', () => {
    expect(offerFrequencyHz({ frequencyHz: 16e6 }, model, 0)).toBe(16e6);
    expect(circuitsFor([wide, low], offerFrequencyHz({ frequencyHz: 16e6 }, model, 0)).map((c) => c.name)).toEqual([
      'wide',
    ]);
  });
  it('else the load resonance at the datasheet CL, else fs', () => {
    const f = offerFrequencyHz({ loadCapacitanceF: 8e-12 }, model, 0);
    // fs·√(1 + C1/(C0 + CL)) = 15.996 MHz · √(1 + 5e-15/11e-12) = 15.999635 MHz
    expect(f).toBeCloseTo(15.996e6 * Math.sqrt(1 + 5e-15 / 11e-12), 3);
    expect(offerFrequencyHz(undefined, model, 0)).toBe(15.996e6);
  });
});

describe('steady swing from the amplifier current limit', () => {
  it('describing-function estimate, worked out', () => {
    // Imax 100 µA, gm,crit 1 mS: v1 = 4·100e-6/(π·1e-3) = 0.127324 V peak; Ca = Cb: the crystal
    // sees v1·(1 + 1) = 0.254648 V peak = 0.509296 V peak-to-peak; a 0.3 V supply caps it.
    expect(limitedSwingVpp(100e-6, 1e-3, 10e-12, 10e-12, 3.3)).toBeCloseTo(0.509296, 6);
    expect(limitedSwingVpp(100e-6, 1e-3, 10e-12, 10e-12, 0.3)).toBe(0.3);
  });
  it('the advice uses it when the circuit gives a current limit and no swing', () => {
    const c = { ...DEMO_CIRCUIT, currentLimitA: 20e-6 };
    const a = ok(advisePierce({ partId: 'X1', datasheet, model: X1, mainBranch: 0, circuit: c }));
    const p = a.best;
    const net = { gmS: c.gmS, caF: p.caF, cbF: p.cbF, pinToPinF: c.pinToPinStrayF };
    const gmCrit = criticalGmFullS(net, X1.c0F, x1.r1Ohm, p.freqHz)!;
    // at gm,crit of the full network the motional branch sees exactly −R1
    expect(impedanceSeenByMotionalBranch({ ...net, gmS: gmCrit }, X1.c0F, p.freqHz).reOhm).toBeCloseTo(-x1.r1Ohm, 6);
    expect(p.gmCritFullS).toBeCloseTo(gmCrit, 12);
    expect(p.swingVpp).toBeCloseTo(limitedSwingVpp(20e-6, gmCrit, p.caF, p.cbF, c.supplyV), 12);
    expect(p.swingVpp).toBeLessThan(c.supplyV);
    expect(a.assumptions[0]).toMatch(/current limit/);
  });
});
