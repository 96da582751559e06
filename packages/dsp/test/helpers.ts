// Test helpers: a seeded PRNG, closed-form signals, fixture loading. Node APIs are fine here.
import { readFileSync } from 'node:fs';
import { dirname, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';

export const repoRoot = resolve(dirname(fileURLToPath(import.meta.url)), '../../..');
export const fixtureDir = resolve(repoRoot, 'tests/fixtures/dsp');

export function loadFixture<T = any>(name: string, dir = fixtureDir): T {
  return JSON.parse(readFileSync(resolve(dir, name), 'utf8')) as T;
}

/** mulberry32: a tiny 32-bit seeded PRNG (Tommy Ettinger's public-domain generator). Uniform in [0, 1). */
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

/** Standard normal samples by the Box–Muller transform over a seeded uniform generator. */
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
    while (u1 <= 0) u1 = u();
    const r = Math.sqrt(-2 * Math.log(u1));
    const th = 2 * Math.PI * u();
    spare = r * Math.sin(th);
    return r * Math.cos(th);
  };
}

export function noise(n: number, sigma: number, rnd: () => number): Float64Array {
  const x = new Float64Array(n);
  for (let i = 0; i < n; i++) x[i] = sigma * rnd();
  return x;
}

/** Samples of A·sin(π(t − t0)/T) for t0 ≤ t ≤ t0 + T, else 0 (docs/methods.md#pulse-spectra). */
export function halfSine(n: number, fs: number, amplitude: number, durationS: number, startS = 0): Float64Array {
  const x = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const t = i / fs - startS;
    if (t >= 0 && t <= durationS) x[i] = amplitude * Math.sin((Math.PI * t) / durationS);
  }
  return x;
}

export function add(...xs: Float64Array[]): Float64Array {
  const out = new Float64Array(xs[0].length);
  for (const x of xs) for (let i = 0; i < out.length; i++) out[i] += x[i];
  return out;
}

/** Relative error |a − b| / |b| of complex numbers. */
export function relErrC(ar: number, ai: number, br: number, bi: number): number {
  return Math.hypot(ar - br, ai - bi) / Math.hypot(br, bi);
}

export function maxAbsDiff(a: ArrayLike<number>, b: ArrayLike<number>): number {
  let m = 0;
  for (let i = 0; i < a.length; i++) m = Math.max(m, Math.abs(a[i] - b[i]));
  return m;
}

export function maxAbs(a: ArrayLike<number>): number {
  let m = 0;
  for (let i = 0; i < a.length; i++) m = Math.max(m, Math.abs(a[i]));
  return m;
}

/** Circular shift right by d samples. */
export function circShift(x: ArrayLike<number>, d: number): Float64Array {
  const n = x.length;
  const out = new Float64Array(n);
  for (let i = 0; i < n; i++) out[(((i + d) % n) + n) % n] = x[i];
  return out;
}
