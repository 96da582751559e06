import { describe, expect, it } from 'vitest';
import { gaussian, noise } from '../test/helpers.ts';
import { realFftPlan } from './fft.ts';

/** Direct O(N²) DFT, X_k = Σ x_n e^{−j2πkn/N} (the definition numpy.fft uses), one-sided. */
function directDft(x: Float64Array): { re: Float64Array; im: Float64Array } {
  const n = x.length;
  const bins = Math.floor(n / 2) + 1;
  const re = new Float64Array(bins);
  const im = new Float64Array(bins);
  for (let k = 0; k < bins; k++) {
    for (let i = 0; i < n; i++) {
      const a = (-2 * Math.PI * ((k * i) % n)) / n;
      re[k] += x[i] * Math.cos(a);
      im[k] += x[i] * Math.sin(a);
    }
  }
  return { re, im };
}

// Lengths that reach every plan: 1 and 2 (tiny), powers of two (half-length complex FFT, with the
// self-mirrored line k = N/4), odd and even non-powers (Bluestein).
const lengths = [1, 2, 3, 4, 8, 12, 31, 64, 100, 256, 257, 1000];

describe('realFftPlan', () => {
  it('forward() equals the DFT definition for every kind of length', () => {
    for (const n of lengths) {
      const x = noise(n, 1.5, gaussian(n));
      const plan = realFftPlan(n);
      const re = new Float64Array(plan.bins);
      const im = new Float64Array(plan.bins);
      plan.forward(x, re, im);
      const ref = directDft(x);
      const scale = Math.sqrt(n) * 1.5;
      for (let k = 0; k < plan.bins; k++) {
        // DFT definition (numpy.fft convention): agreement to rounding, relative to ‖x‖√N
        expect(Math.abs(re[k] - ref.re[k]) / scale, `n=${n} k=${k}`).toBeLessThan(1e-12);
        expect(Math.abs(im[k] - ref.im[k]) / scale, `n=${n} k=${k}`).toBeLessThan(1e-12);
      }
    }
  });

  it('forwardCross() adds exactly |X|² and conj(R)·X to the sums, as forward() followed by the sums would', () => {
    for (const n of lengths) {
      const plan = realFftPlan(n);
      const bins = plan.bins;
      const r = { re: new Float64Array(bins), im: new Float64Array(bins) };
      plan.forward(noise(n, 2, gaussian(7 * n + 1)), r.re, r.im);
      const x = noise(n, 0.3, gaussian(11 * n + 3));
      const X = { re: new Float64Array(bins), im: new Float64Array(bins) };
      plan.forward(x, X.re, X.im);
      // Start from non-zero sums: the method must add, not overwrite.
      const auto = new Float64Array(bins).fill(0.25);
      const crossRe = new Float64Array(bins).fill(-1);
      const crossIm = new Float64Array(bins).fill(2);
      const dc = plan.forwardCross(x, r.re, r.im, auto, crossRe, crossIm);
      expect(dc).toBe(X.re[0]);
      for (let k = 0; k < bins; k++) {
        const a = X.re[k];
        const b = X.im[k];
        // conj(p + jq)·(a + jb) = (pa + qb) + j(pb − qa): the force-conjugated cross sum (docs/methods.md#conventions)
        expect(auto[k], `n=${n} k=${k}`).toBe(0.25 + (a * a + b * b));
        expect(crossRe[k], `n=${n} k=${k}`).toBe(-1 + (r.re[k] * a + r.im[k] * b));
        expect(crossIm[k], `n=${n} k=${k}`).toBe(2 + (r.re[k] * b - r.im[k] * a));
      }
    }
  });
});
