import { execFileSync } from 'node:child_process';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { impedanceAt, type BvdModel } from '../../../src/lib/models/bvd.ts';
import { formatModelTouchstone } from '../../../src/lib/models/model-touchstone.ts';
import { DEBIAN_PYTHON, requireTool, SKRF_PRELUDE } from '../../support/tools.ts';
import { fpHz, OT3, TF1, widthHz, X1 } from './spice-cases.ts';

function text(model: BvdModel, start: number, stop: number, points: number): string {
  const r = formatModelTouchstone(
    model,
    { partId: 'X1', sample: 'A1', title: 'line one\n# Hz Z RI R 1' },
    { startHz: start, stopHz: stop, points },
  );
  if (!r.ok) throw new Error(r.reason);
  return r.text;
}

describe('formatModelTouchstone', () => {
  it('writes a v1 one-port file with the canonical option line and 17 significant digits', () => {
    const t = text(X1, 15.9e6, 15.95e6, 11);
    const lines = t.trimEnd().split('\n');
    const opt = lines.filter((l) => l.startsWith('#'));
    // User text cannot forge a second option line: it stays inside its "!" comment.
    expect(opt).toEqual(['# Hz S RI R 50']);
    const data = lines.filter((l) => !l.startsWith('!') && !l.startsWith('#'));
    expect(data).toHaveLength(11);
    for (const row of data) expect(row).toMatch(/^\d\.\d{16}e\+\d+ -?\d\.\d{16}e[+-]\d+ -?\d\.\d{16}e[+-]\d+$/);
    expect(Number(data[0].split(' ')[0])).toBe(15.9e6);
    expect(Number(data[10].split(' ')[0])).toBe(15.95e6);
    expect(t).toContain('! computed from the fitted model');
  });

  it('defaults to the measured span from the info and refuses a bad span with a reason', () => {
    const r = formatModelTouchstone(X1, { partId: 'X1', validSpanHz: { min: 15.9e6, max: 15.95e6 } }, { points: 3 });
    expect(r.ok && r.text.trimEnd().split('\n').slice(-1)[0].startsWith('1.5950000000000000e+7')).toBe(true);
    const bad = formatModelTouchstone(X1, { partId: 'X1' }, { startHz: 2e7, stopHz: 1e7 });
    expect(bad).toEqual({ ok: false, reason: 'expected 0 < start < stop, got 20000000 Hz to 10000000 Hz' });
    expect(formatModelTouchstone(X1, { partId: 'X1' }).ok).toBe(false);
  });
});

const haveSkrf = requireTool('scikit-rf');

describe.skipIf(!haveSkrf)('model Touchstone files read back by scikit-rf 0.15 (Debian)', () => {
  const dir = mkdtempSync(join(tmpdir(), 'motional-ts-'));
  afterAll(() => rmSync(dir, { recursive: true, force: true }));

  /** scikit-rf's Network(file).z for each file: [f, re, im] rows. */
  function readWithSkrf(files: string[]): Array<Array<[number, number, number]>> {
    const script = `${SKRF_PRELUDE}
import json, sys
out = []
for path in sys.argv[1:]:
    n = skrf.Network(path)
    z = n.z[:, 0, 0]
    out.append([[float(f), float(v.real), float(v.imag)] for f, v in zip(n.f, z)])
print("JSON" + json.dumps(out))
`;
    const stdout = execFileSync(DEBIAN_PYTHON, ['-c', script, ...files], { encoding: 'utf8', maxBuffer: 64 << 20 });
    const line = stdout.split('\n').find((l) => l.startsWith('JSON'))!;
    return JSON.parse(line.slice(4));
  }

  const cases: Array<[string, BvdModel, number, number]> = [
    ['x1-fs', X1, X1.branches[0].fsHz - 5 * widthHz(X1.branches[0]), X1.branches[0].fsHz + 5 * widthHz(X1.branches[0])],
    ['x1-fp', X1, fpHz(X1.branches[0], X1.c0F) - 2000, fpHz(X1.branches[0], X1.c0F) + 2000],
    ['tf1', TF1, 32700, 32900],
    ['ot3', OT3, 30e6, 110e6],
  ];

  it('returns the model impedance at every frequency to 1e-9 relative (scikit-rf s2z, z0 = 50 Ω)', () => {
    const files = cases.map(([name, model, a, b]) => {
      const path = join(dir, `${name}.s1p`);
      writeFileSync(path, text(model, a, b, 2001));
      return path;
    });
    const read = readWithSkrf(files);
    cases.forEach(([name, model], k) => {
      const rows = read[k];
      expect(rows, name).toHaveLength(2001);
      let worst = 0;
      for (const [f, re, im] of rows) {
        const [mr, mi] = impedanceAt(model, f);
        worst = Math.max(worst, Math.hypot(re - mr, im - mi) / Math.hypot(mr, mi));
      }
      console.log(`${name}: worst relative difference ${worst.toExponential(2)}`);
      expect(worst, name).toBeLessThan(1e-9);
    });
  });
});
