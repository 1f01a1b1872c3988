/**
 * Seeded pseudo-random numbers for the synthetic sweep generator: mulberry32 for uniforms
 * (a 32-bit state, period 2^32; common practice for small reproducible generators) and the
 * Box–Muller transform for standard normal deviates. Same seed, same sequence, on every platform:
 * only 32-bit integer arithmetic (Math.imul) and IEEE double operations are used.
 */

/** A seeded random source. */
export interface Rng {
  /** Uniform deviate in [0, 1). */
  uniform(): number;
  /** Standard normal deviate (mean 0, variance 1). */
  gaussian(): number;
}

/**
 * Make a seeded random source.
 * @param seed any number; only its low 32 bits (after truncation) matter
 */
export function createRng(seed: number): Rng {
  let state = Math.trunc(seed) >>> 0;
  let spare: number | undefined;
  const uniform = (): number => {
    state = (state + 0x6d2b79f5) >>> 0;
    let t = state;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
  const gaussian = (): number => {
    if (spare !== undefined) {
      const s = spare;
      spare = undefined;
      return s;
    }
    // 1 − u lies in (0, 1], so the logarithm is finite.
    const u1 = 1 - uniform();
    const u2 = uniform();
    const radius = Math.sqrt(-2 * Math.log(u1));
    const angle = 2 * Math.PI * u2;
    spare = radius * Math.sin(angle);
    return radius * Math.cos(angle);
  };
  return { uniform, gaussian };
}

/**
 * A 32-bit seed from a text (FNV-1a hash), so that named things (a demo sweep file) get a
 * stable seed of their own.
 */
export function seedFromText(text: string): number {
  let h = 0x811c9dc5;
  for (let i = 0; i < text.length; i++) {
    h ^= text.charCodeAt(i);
    h = Math.imul(h, 0x01000193) >>> 0;
  }
  return h >>> 0;
}
