/**
 * Our Touchstone reader against files written by an independent implementation: scikit-rf 0.15
 * Network.write_touchstone (S data; 1-/2-port; RI, MA, DB; Hz, kHz, MHz, GHz), plus Z/Y files
 * written per the Touchstone spec from scikit-rf's s2z/s2y (skrf 0.15 writes S only).
 * Generator and outputs: test/fixtures/touchstone-skrf/ (make.py, values.json).
 * The committed outputs are checked always; when Debian's scikit-rf is installed the generator
 * is re-run and must reproduce them exactly.
 */
import { execFileSync } from 'node:child_process';
import { mkdtempSync, readdirSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { parseTouchstone } from '../../../src/lib/io/touchstone.ts';
import { DEBIAN_PYTHON, requireTool } from '../../support/tools.ts';

const dir = fileURLToPath(new URL('../../fixtures/touchstone-skrf/', import.meta.url));

interface Expected {
  parameter: 'S' | 'Z' | 'Y';
  ports: 1 | 2;
  z0: number[];
  f: number[];
  re: number[][];
  im: number[][];
}
const values = JSON.parse(readFileSync(join(dir, 'values.json'), 'utf8')) as Record<string, Expected>;

/** Largest |ours − reference| / |reference| over all complex entries. */
function worstRelative(d: ReturnType<typeof parseTouchstone>, want: Expected): number {
  let worst = 0;
  for (let k = 0; k < want.re.length; k++) {
    for (let i = 0; i < want.f.length; i++) {
      const err = Math.hypot(d.re[k][i] - want.re[k][i], d.im[k][i] - want.im[k][i]);
      worst = Math.max(worst, err / Math.hypot(want.re[k][i], want.im[k][i]));
    }
  }
  return worst;
}

describe('parseTouchstone reads scikit-rf 0.15 output back to the values it wrote', () => {
  it('has the reference files of every kind', () => {
    const names = Object.keys(values);
    for (const form of ['ri', 'ma', 'db']) expect(names.some((n) => n.includes(`-${form}-`))).toBe(true);
    for (const unit of ['hz', 'khz', 'mhz', 'ghz'])
      expect(names.some((n) => n.endsWith(`-${unit}.s1p`) || n.endsWith(`-${unit}.s2p`))).toBe(true);
    expect(names.filter((n) => values[n].parameter !== 'S').length).toBeGreaterThanOrEqual(4);
  });

  for (const [name, want] of Object.entries(values)) {
    it(`${name}: ${want.ports}-port ${want.parameter} within 1e-9 relative`, () => {
      const d = parseTouchstone(readFileSync(join(dir, name), 'utf8'), name);
      expect(d.parameter).toBe(want.parameter);
      expect(d.ports).toBe(want.ports);
      expect(d.z0Ohm).toEqual(want.z0);
      expect(d.freqHz.length).toBe(want.f.length);
      for (let i = 0; i < want.f.length; i++) expect(Math.abs(d.freqHz[i] / want.f[i] - 1)).toBeLessThan(1e-15);
      // skrf writes repr() digits; MA/DB conversions cost a few ulps
      expect(worstRelative(d, want)).toBeLessThan(1e-9);
    });
  }
});

describe.skipIf(!requireTool('scikit-rf'))('the scikit-rf generator, re-run live', () => {
  it('reproduces the committed files and values exactly', () => {
    const out = mkdtempSync(join(tmpdir(), 'motional-skrf-'));
    try {
      execFileSync(DEBIAN_PYTHON, [join(dir, 'make.py'), out], { stdio: 'pipe', timeout: 120_000 });
      const made = readdirSync(out).sort();
      const committed = readdirSync(dir)
        .filter((n) => n !== 'make.py')
        .sort();
      expect(made).toEqual(committed);
      for (const name of made) {
        expect(readFileSync(join(out, name), 'utf8'), name).toBe(readFileSync(join(dir, name), 'utf8'));
      }
    } finally {
      rmSync(out, { recursive: true, force: true });
    }
  });
});
