import { it } from 'vitest';
import { engineImpedance, impedanceDeck } from '/work/main/test/support/spice.ts';
import { impedanceAt } from '/work/main/src/lib/models/bvd.ts';
it('x', async () => {
  const m = { c0F: 1.2e-12, branches: [{ fsHz: 32768, r1Ohm: 35e3, c1F: 3e-15 }] };
  const e = (x: number) => x.toExponential(16);
  const l = 1 / ((2 * Math.PI * 32768) ** 2 * 3e-15);
  const c = [`C0 in 0 ${e(1.2e-12)}`, `RM0 in m0 ${e(35e3)}`, `LM0 m0 n0 ${e(l)}`, `CM0 n0 0 ${e(3e-15)}`, `RB0 n0 0 1e15`].join('\n');
  const rows = await engineImpedance(impedanceDeck('t', c, { startHz: 32600, stopHz: 32900, points: 7 }));
  for (const [f, r, x] of rows) { const [mr, mx] = impedanceAt(m, f); console.log(f, r, x, mr, mx); }
});
