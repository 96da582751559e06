import { requireFinite } from './validate.ts';

/**
 * A seeded pseudo-random source, so that every simulated hit can be reproduced from its seed.
 *
 * - `uniform()` returns a float in [0, 1) with 32 bits of resolution.
 * - `gaussian()` returns a standard normal deviate (mean 0, variance 1).
 */
export interface Rng {
  readonly seed: number;
  uniform(): number;
  gaussian(): number;
}

/**
 * Creates a reproducible random source.
 *
 * Uniform numbers come from the public-domain "mulberry32" generator (a 32-bit Weyl sequence
 * followed by an xorshift-multiply output mix; period 2^32), which is plenty for noise on a few
 * thousand records. Normal deviates use the Box–Muller transform (Box & Muller, "A note on the
 * generation of random normal deviates", Ann. Math. Statist. 29, 1958), keeping the second
 * deviate of each pair for the next call.
 *
 * @param seed any finite number; it is reduced to an unsigned 32-bit integer (seed >>> 0),
 *   so seeds that differ only above 2^32 or in their fractional part give the same stream.
 */
export function createRng(seed: number): Rng {
  requireFinite('seed', seed);
  let state = Math.trunc(seed) >>> 0;
  let spare = 0;
  let hasSpare = false;

  const uniform = (): number => {
    state = (state + 0x6d2b79f5) >>> 0;
    let z = state;
    z = Math.imul(z ^ (z >>> 15), z | 1);
    z ^= z + Math.imul(z ^ (z >>> 7), z | 61);
    return ((z ^ (z >>> 14)) >>> 0) / 4294967296;
  };

  const gaussian = (): number => {
    if (hasSpare) {
      hasSpare = false;
      return spare;
    }
    // 1 − u lies in (0, 1], so the logarithm is finite.
    const u1 = 1 - uniform();
    const u2 = uniform();
    const r = Math.sqrt(-2 * Math.log(u1));
    const theta = 2 * Math.PI * u2;
    spare = r * Math.sin(theta);
    hasSpare = true;
    return r * Math.cos(theta);
  };

  return { seed: Math.trunc(seed) >>> 0, uniform, gaussian };
}
