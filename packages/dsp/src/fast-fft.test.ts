// The fast (PFFFT WebAssembly SIMD, float32) plans against the float64 fft.js plans, which remain
// the reference checked against the DFT definition and numpy/scipy in fft.test.ts and the fixtures.
// Tolerance: Higham (2002), "Accuracy and Stability of Numerical Algorithms", 2nd ed., Thm 24.2: a
// radix-2 FFT computed with unit roundoff u has ‖X̂ − X‖₂ / ‖X‖₂ ≤ log2(N)·η / (1 − log2(N)·η), with
// η = µ + γ₄(√2 + µ) ≈ 5.7u for accurately precomputed twiddles (µ ≈ u). Here u = 2⁻²⁴ (float32), plus
// one u for rounding the float64 input to float32: bound ≈ (5.7·log2 N + 1)·u, which this test
// rounds up to 6·(log2 N + 1)·u.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { gaussian, noise } from '../test/helpers.ts';
import { fftPathName, realFftPlan, referenceRealFftPlan, type RealFftPlan } from './fft.ts';
import { useFastFft, useReferenceFft } from './fast-fft.ts';
import { averageFrf, type Hit } from './frf.ts';

const U32 = 2 ** -24;
const bound = (n: number) => 6 * (Math.log2(n) + 1) * U32;

function spectrum(plan: RealFftPlan, x: Float64Array) {
  const re = new Float64Array(plan.bins);
  const im = new Float64Array(plan.bins);
  plan.forward(x, re, im);
  return { re, im };
}

/** ‖a − b‖₂ / ‖b‖₂ over the one-sided lines. */
function relativeError(a: { re: Float64Array; im: Float64Array }, b: { re: Float64Array; im: Float64Array }): number {
  let e = 0;
  let s = 0;
  for (let k = 0; k < b.re.length; k++) {
    e += (a.re[k] - b.re[k]) ** 2 + (a.im[k] - b.im[k]) ** 2;
    s += b.re[k] ** 2 + b.im[k] ** 2;
  }
  return Math.sqrt(e / s);
}

let active = false;
beforeAll(async () => {
  active = await useFastFft();
});
afterAll(() => useReferenceFft());

describe('fast FFT (PFFFT WebAssembly SIMD)', () => {
  it('loads on this Node without network and serves power-of-two lengths from 32 up', () => {
    // Node 20 runs WebAssembly 128-bit SIMD (V8 ≥ 9.1); the .wasm ships in the package.
    expect(active).toBe(true);
    expect(fftPathName()).toBe('pffft-wasm-simd-f32-235');
    expect(realFftPlan(16384).constructor.name).toBe('PffftPlan');
  });

  it('forward() matches the float64 fft.js plan within the float32 FFT error bound (Higham 2002)', () => {
    for (const n of [32, 64, 256, 1024, 4096, 16384, 65536]) {
      const x = noise(n, 1.5, gaussian(n + 7));
      const err = relativeError(spectrum(realFftPlan(n), x), spectrum(referenceRealFftPlan(n), x));
      expect(err, `N = ${n}`).toBeLessThanOrEqual(bound(n));
      // Not bit-identical: the fast path really runs in float32 (an error of at least ~u/10 remains).
      expect(err, `N = ${n}`).toBeGreaterThan(U32 / 10);
    }
  });

  it('serves the other lengths PFFFT takes (multiples of 32 with factors 2, 3, 5: 1 s at 48 or 96 kHz) within the same bound, and leaves the rest to Bluestein', () => {
    // PFFFT's real transform takes N = 2^a·3^b·5^c with a ≥ 5 (pffft.h, Pommier). The bound is the
    // radix-2 one of Higham (2002) with log2 N rounded up; mixed-radix FFTs grow their error with
    // log N alike (Higham 2002, §24.1, from memory), and the measured error is far below it.
    for (const n of [96, 480, 48000, 96000]) {
      expect(realFftPlan(n).constructor.name, `N = ${n}`).toBe('PffftPlan');
      const x = noise(n, 1.5, gaussian(n + 11));
      const err = relativeError(spectrum(realFftPlan(n), x), spectrum(referenceRealFftPlan(n), x));
      expect(err, `N = ${n}`).toBeLessThanOrEqual(bound(2 ** Math.ceil(Math.log2(n))));
      expect(err, `N = ${n}`).toBeGreaterThan(U32 / 10);
    }
    // 44 100 is not a multiple of 32; 224 = 32·7 has the factor 7.
    for (const n of [44100, 224, 1000]) expect(realFftPlan(n).constructor.name, `N = ${n}`).toBe('BluesteinPlan');
  });

  it('forwardCross() accumulates the same sums as the float64 path within the bound', () => {
    const n = 4096;
    const fast = realFftPlan(n);
    const ref = referenceRealFftPlan(n);
    const r = noise(n, 1, gaussian(3));
    const x = noise(n, 2, gaussian(4));
    const sums = (plan: RealFftPlan) => {
      const rs = spectrum(plan, r);
      const auto = new Float64Array(plan.bins);
      const cr = new Float64Array(plan.bins);
      const ci = new Float64Array(plan.bins);
      const dc = plan.forwardCross(x, rs.re, rs.im, auto, cr, ci);
      return { dc, auto, cross: { re: cr, im: ci } };
    };
    const a = sums(fast);
    const b = sums(ref);
    // Products of two spectra: twice the relative error of one.
    expect(relativeError(a.cross, b.cross)).toBeLessThanOrEqual(2 * bound(n));
    expect(relativeError({ re: a.auto, im: new Float64Array(a.auto.length) }, { re: b.auto, im: new Float64Array(b.auto.length) })).toBeLessThanOrEqual(2 * bound(n));
    expect(Math.abs(a.dc - b.dc)).toBeLessThanOrEqual(bound(n) * Math.sqrt(n) * 2);
  });

  it('leaves other lengths on the float64 plans (results identical to the reference)', () => {
    for (const n of [1, 2, 16, 100, 257, 1000]) {
      const x = noise(n, 1, gaussian(n));
      const a = spectrum(realFftPlan(n), x);
      const b = spectrum(referenceRealFftPlan(n), x);
      expect(Array.from(a.re)).toEqual(Array.from(b.re));
      expect(Array.from(a.im)).toEqual(Array.from(b.im));
    }
  });

  it('averageFrf gives H1 and coherence on the fast path within the float32 bound of the float64 path', async () => {
    const n = 2048;
    const hits: Hit[] = [];
    for (let h = 0; h < 4; h++) {
      const f = noise(n, 1, gaussian(10 + h));
      const y = new Float64Array(n);
      const e = noise(n, 0.1, gaussian(20 + h));
      // y = a lowpass of f plus uncorrelated noise: coherence well below 1 on some lines.
      for (let i = 0; i < n; i++) y[i] = 0.6 * f[i] + (i > 0 ? 0.3 * f[i - 1] : 0) + e[i];
      hits.push({ force: f, responses: [y] });
    }
    const opts = { forceWindow: null, exponentialWindow: null };
    const fast = averageFrf(hits, 1000, opts);
    useReferenceFft();
    const ref = averageFrf(hits, 1000, opts);
    expect(fftPathName()).toBe('fft.js-f64');
    expect(await useFastFft()).toBe(true);
    expect(relativeError(fast.h1[0], ref.h1[0])).toBeLessThanOrEqual(4 * bound(n));
    let worst = 0;
    for (let k = 0; k < ref.coherence[0].length; k++) worst = Math.max(worst, Math.abs(fast.coherence[0][k] - ref.coherence[0][k]));
    expect(worst).toBeLessThanOrEqual(4 * bound(n));
  });
});
