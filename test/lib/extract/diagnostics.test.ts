import { describe, expect, it } from 'vitest';
import {
  instrumentRangeDiagnostic,
  minimumCapacitanceRatio,
  noiseDiagnostic,
  plausibilityDiagnostics,
  resolutionDiagnostic,
} from '../../../src/lib/extract/diagnostics.ts';

describe('diagnostics', () => {
  it('uses the minimum AT capacitance ratio 159.31 (n = 1) and 1433.8 (n = 3)', () => {
    // r ≥ n²π²/(8k²), k = 8.8 % (J. R. Vig's tutorial), C1n = 8k²C0/(nπ)² (Sensors 21(10):3490)
    expect(minimumCapacitanceRatio(1)).toBeCloseTo(159.31, 2);
    expect(minimumCapacitanceRatio(3)).toBeCloseTo(1433.8, 1);
  });

  it('words the instrument-range warning as the extract JSON example does', () => {
    // example warning of the `extract --json` interface
    expect(instrumentRangeDiagnostic('a1-wide.csv', 12e6, 10e6)!.message).toBe(
      'sweep a1-wide.csv: above instrumentMaxFrequency from 10 MHz; modes there are flagged',
    );
    expect(instrumentRangeDiagnostic('a1-wide.csv', 9e6, 10e6)).toBeUndefined();
    expect(instrumentRangeDiagnostic('a1-wide.csv', 9e6, undefined)).toBeUndefined();
  });

  it('warns below 10 points per bandwidth and says which step to use', () => {
    // ≥ 10–20 points inside Δf (common practice); X1 Δf = 318.31 Hz
    const d = resolutionDiagnostic({
      source: 'w.s1p',
      fsHz: 15_915_494.3,
      bandwidthHz: 318.31,
      stepHz: 80,
      pointsPerBandwidth: 3.98,
    })!;
    expect(d.severity).toBe('warning');
    expect(d.message).toBe(
      'mode near 15.915494 MHz: only 4.0 points per resonance bandwidth (318 Hz) in the best sweep w.s1p; use a step of at most 32 Hz',
    );
    expect(
      resolutionDiagnostic({ source: 'n', fsHz: 1e7, bandwidthHz: 300, stepHz: 2, pointsPerBandwidth: 150 }),
    ).toBeUndefined();
  });

  it('turns the fit residual into a signal-to-noise figure and warns above −40 dB', () => {
    expect(noiseDiagnostic('joint fit', 1e-3)!.message).toBe(
      'joint fit: signal-to-noise about 60.0 dB (from the fit residual)',
    );
    expect(noiseDiagnostic('joint fit', 0.03)!.severity).toBe('warning');
  });

  it('flags low M and AT values outside physics, but not OT100-like parts', () => {
    // M < 4 flagged (IEC 60444-11 limit); OT100 (M = 8.84, r = 3000 at n = 3) is plausible
    expect(
      plausibilityDiagnostics(
        { fsHz: 100e6, q: 26_525.82, r: 3000, m: 8.84, overtone: 3, spurious: false },
        'quartz-at',
      ),
    ).toEqual([]);
    const low = plausibilityDiagnostics(
      { fsHz: 100e6, q: 9000, r: 3000, m: 3, overtone: 3, spurious: false },
      'quartz-at',
    );
    expect(low.map((d) => d.code)).toEqual(['low-m']);
    const odd = plausibilityDiagnostics(
      { fsHz: 16e6, q: 2e6, r: 100, m: 2e4, overtone: 1, spurious: false },
      'quartz-at',
    );
    expect(odd.map((d) => d.code)).toEqual(['implausible', 'implausible']);
    expect(
      plausibilityDiagnostics({ fsHz: 4e6, q: 1200, r: 5, m: 240, overtone: 1, spurious: false }, 'ceramic'),
    ).toEqual([]);
  });
});
