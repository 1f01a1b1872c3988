/**
 * Small seeded random numbers for deterministic tests: mulberry32 (uniform) and Box–Muller
 * (standard normal). Common practice; not for cryptography.
 */

/** Uniform generator on [0, 1) from a 32-bit seed (mulberry32). */
export function mulberry32(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/** Standard normal generator (Box–Muller on mulberry32), seeded. */
export function gaussian(seed: number): () => number {
  const u = mulberry32(seed);
  let spare: number | null = null;
  return () => {
    if (spare !== null) {
      const s = spare;
      spare = null;
      return s;
    }
    let u1 = u();
    while (u1 === 0) u1 = u();
    const u2 = u();
    const rad = Math.sqrt(-2 * Math.log(u1));
    spare = rad * Math.sin(2 * Math.PI * u2);
    return rad * Math.cos(2 * Math.PI * u2);
  };
}
