// Property tests (fast-check) of the transforms: linearity, time shift → phase ramp, scaling.
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { energySpectralDensity, transientSpectrum } from '../src/index.ts';
import { circShift } from './helpers.ts';

const signal = fc
  .integer({ min: 1, max: 300 })
  .chain((n) => fc.array(fc.double({ min: -1e3, max: 1e3, noNaN: true }), { minLength: n, maxLength: n }));
const fsArb = fc.double({ min: 1, max: 1e5, noNaN: true });

function scaleOf(...xs: ArrayLike<number>[]): number {
  let s = 0;
  for (const x of xs) for (let i = 0; i < x.length; i++) s += Math.abs(x[i]);
  return s;
}

describe('transform properties', () => {
  it('is linear: X(a·x + b·y) = a·X(x) + b·X(y)', () => {
    fc.assert(
      fc.property(
        signal,
        fc.double({ min: -10, max: 10, noNaN: true }),
        fc.double({ min: -10, max: 10, noNaN: true }),
        fsArb,
        (x, a, b, fs) => {
          const y = x.map((v, i) => Math.sin(i + v));
          const z = x.map((v, i) => a * v + b * y[i]);
          const X = transientSpectrum(x, fs);
          const Y = transientSpectrum(y, fs);
          const Z = transientSpectrum(z, fs);
          // linearity of the DFT (closed form); tolerance: rounding of sums of N terms
          const tol = (1e-12 * (Math.abs(a) + Math.abs(b) + 1) * scaleOf(x, y)) / fs + 1e-300;
          for (let k = 0; k < X.re.length; k++) {
            expect(Math.abs(Z.re[k] - (a * X.re[k] + b * Y.re[k]))).toBeLessThanOrEqual(tol * 10);
            expect(Math.abs(Z.im[k] - (a * X.im[k] + b * Y.im[k]))).toBeLessThanOrEqual(tol * 10);
          }
        },
      ),
      { numRuns: 150 },
    );
  });

  it('turns a circular time shift of d samples into the phase ramp e^{−j2πkd/N}', () => {
    fc.assert(
      fc.property(signal, fc.integer({ min: 0, max: 1000 }), (x, d) => {
        const n = x.length;
        const X = transientSpectrum(x, 1);
        const S = transientSpectrum(circShift(x, d), 1);
        const tol = 1e-11 * scaleOf(x) + 1e-300;
        for (let k = 0; k < X.re.length; k++) {
          // DFT shift theorem (closed form)
          const th = (-2 * Math.PI * k * (d % n)) / n;
          const er = X.re[k] * Math.cos(th) - X.im[k] * Math.sin(th);
          const ei = X.re[k] * Math.sin(th) + X.im[k] * Math.cos(th);
          expect(Math.abs(S.re[k] - er)).toBeLessThanOrEqual(tol);
          expect(Math.abs(S.im[k] - ei)).toBeLessThanOrEqual(tol);
        }
      }),
      { numRuns: 150 },
    );
  });

  it('scales with the sample interval: the same samples at c·fs give X/c, and ESD/c²', () => {
    fc.assert(
      fc.property(signal, fsArb, fc.double({ min: 0.01, max: 100, noNaN: true }), (x, fs, c) => {
        const A = transientSpectrum(x, fs);
        const B = transientSpectrum(x, c * fs);
        const Ea = energySpectralDensity(x, fs);
        const Eb = energySpectralDensity(x, c * fs);
        // X = Δt·DFT (docs/methods.md#transient-spectrum): Δt scales by 1/c; frequencies by c
        for (let k = 0; k < A.re.length; k++) {
          expect(B.re[k] * c).toBeCloseTo(A.re[k], 9);
          expect(B.im[k] * c).toBeCloseTo(A.im[k], 9);
          expect(Math.abs(B.f[k] - c * A.f[k])).toBeLessThanOrEqual(1e-9 * c * A.f[k] + 1e-12);
          expect(Math.abs(Eb.esd[k] * c * c - Ea.esd[k])).toBeLessThanOrEqual(1e-10 * Math.abs(Ea.esd[k]) + 1e-300);
        }
      }),
      { numRuns: 100 },
    );
  });
});
