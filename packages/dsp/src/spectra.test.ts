import { describe, expect, it } from 'vitest';
import { add, halfSine, loadFixture, maxAbs, maxAbsDiff, gaussian, noise } from '../test/helpers.ts';
import { autopowerSpectrum, energySpectralDensity, linearSpectrum, transientSpectrum } from './spectra.ts';

describe('transientSpectrum', () => {
  it('gives the check values of docs/methods.md#pulse-spectra for a sampled 100 N, 1 ms half-sine', () => {
    const fs = 51200;
    const x = halfSine(8192, fs, 100, 1e-3);
    const X = transientSpectrum(x, fs);
    expect(X.f.length).toBe(4097);
    // docs/methods.md#pulse-spectra [calc]: sampled estimate X(0) = 0.063652 N·s (analytic 0.0636620, −0.016 %)
    expect(X.re[0]).toBeCloseTo(0.063652, 6);
    expect(X.im[0]).toBe(0);
    // docs/methods.md#pulse-spectra [calc]: |X(500 Hz)| = 0.0499999 (500 Hz is line 80 at Δf = 6.25 Hz)
    expect(X.f[80]).toBe(500);
    expect(Math.hypot(X.re[80], X.im[80])).toBeCloseTo(0.0499999, 7);
    // docs/methods.md#pulse-spectra: analytic |X(1 kHz)| = 0.0212207 = X(0)/3; sampling moves it by < 0.05 %
    expect(Math.hypot(X.re[160], X.im[160]) / 0.0212207 - 1).toBeLessThan(5e-4);
    // docs/methods.md#pulse-spectra: X(f) = (2AT/π)cos(πfT)/(1 − 4f²T²)·e^{−jπfT}; phase at 500 Hz is −π/2
    expect(Math.atan2(X.im[80], X.re[80])).toBeCloseTo(-Math.PI / 2, 2);
  });

  it('matches numpy.fft.rfft(x)/fs for odd, even and non-power-of-two lengths from 1 to 1024', () => {
    const fx = loadFixture('transient.json');
    for (const c of fx.cases) {
      const X = transientSpectrum(c.x, fx.fs);
      expect(X.re.length).toBe(Math.floor(c.n / 2) + 1);
      const scale = Math.max(maxAbs(c.re), maxAbs(c.im));
      // numpy 2.4 rfft (fixture tests/fixtures/dsp/transient.json), rounding-level agreement
      expect(maxAbsDiff(X.re, c.re) / scale).toBeLessThan(1e-12);
      expect(maxAbsDiff(X.im, c.im) / scale).toBeLessThan(1e-12);
    }
    // numpy value for the docs/methods.md#pulse-spectra half-sine, stored in the fixture
    const h = fx.halfSine;
    const X = transientSpectrum(halfSine(h.n, h.fs, h.amplitude, h.durationS), h.fs);
    expect(X.re[0]).toBeCloseTo(h.x0, 14);
  });

  it('gives A·T·|sinc(fT)| for a rectangle, exactly the discrete-rectangle formula, with zeros at k/T', () => {
    const fs = 10000;
    const n = 2000;
    const m = 100; // 100 samples of 2 N: T = 10 ms
    const x = new Float64Array(n);
    x.fill(2, 0, m);
    const X = transientSpectrum(x, fs);
    // docs/methods.md#pulse-spectra: X(0) = A·T = 0.02 N·s
    expect(X.re[0]).toBeCloseTo(0.02, 15);
    for (let k = 1; k < X.f.length; k++) {
      // docs/methods.md#transient-spectrum [calc, exact]: n samples of value 1 give Δt·|sin(πkn/N)/sin(πk/N)|
      const exact = (2 / fs) * Math.abs(Math.sin((Math.PI * k * m) / n) / Math.sin((Math.PI * k) / n));
      expect(Math.abs(Math.hypot(X.re[k], X.im[k]) - exact)).toBeLessThan(1e-15);
    }
    // docs/methods.md#pulse-spectra: zeros at f = k/T = 100, 200 … Hz (lines 20, 40 … at Δf = 5 Hz)
    for (const k of [20, 40, 60]) expect(Math.hypot(X.re[k], X.im[k])).toBeLessThan(1e-15);
    // docs/methods.md#pulse-spectra: |X(1/2T)| = 2AT/π at 50 Hz, sampled within 0.1 %
    expect(Math.hypot(X.re[10], X.im[10]) / ((2 * 2 * 0.01) / Math.PI) - 1).toBeLessThan(1e-3);
  });

  it('sums a one-sided exponential exactly as its geometric series and near A/(a + j2πf)', () => {
    const fs = 51200;
    const n = 8192;
    const a = 100;
    const x = new Float64Array(n);
    for (let i = 0; i < n; i++) x[i] = Math.exp((-a * i) / fs);
    const X = transientSpectrum(x, fs);
    // docs/methods.md#transient-spectrum pitfall [calc]: the rectangle rule gives 0.0100098 instead of 0.0100000
    expect(X.re[0]).toBeCloseTo(0.0100098, 7);
    const q = Math.exp(-a / fs);
    for (let k = 0; k < 200; k++) {
      // geometric series Δt(1 − q^N)/(1 − q·e^{−j2πk/N}) — exact closed form of the DFT
      const th = (-2 * Math.PI * k) / n;
      const dr = 1 - q * Math.cos(th);
      const di = -q * Math.sin(th);
      const num = (1 - q ** n) / fs;
      const er = (num * dr) / (dr * dr + di * di);
      const ei = (-num * di) / (dr * dr + di * di);
      expect(Math.hypot(X.re[k] - er, X.im[k] - ei)).toBeLessThan(1e-15);
      // docs/methods.md#pulse-spectra: X(f) = A/(a + j2πf); rectangle-rule bias ≈ x(0)Δt/2 ≈ 1e-5 N·s
      const w = 2 * Math.PI * X.f[k];
      const cr = a / (a * a + w * w);
      const ci = -w / (a * a + w * w);
      expect(Math.hypot(X.re[k] - cr, X.im[k] - ci)).toBeLessThan(1.1e-5);
    }
  });

  it('keeps every bin of an N-point record in every second bin of the record zero-padded to 2N', () => {
    for (const n of [37, 64, 100]) {
      const x = noise(n, 1, gaussian(n));
      const padded = new Float64Array(2 * n);
      padded.set(x);
      const X = transientSpectrum(x, 100);
      const P = transientSpectrum(padded, 100);
      // docs/methods.md#transient-spectrum [calc, exact]: zero padding identity
      for (let k = 0; k < X.re.length; k++) {
        expect(Math.abs(X.re[k] - P.re[2 * k])).toBeLessThan(1e-13);
        expect(Math.abs(X.im[k] - P.im[2 * k])).toBeLessThan(1e-13);
      }
    }
  });
});

describe('energySpectralDensity', () => {
  it('satisfies Parseval exactly for odd and even lengths', () => {
    for (const n of [1, 2, 3, 255, 256, 1000, 1001]) {
      const fs = 2000;
      const x = noise(n, 3, gaussian(1000 + n));
      const { f, esd } = energySpectralDensity(x, fs);
      expect(f.length).toBe(Math.floor(n / 2) + 1);
      let e = 0;
      for (const v of x) e += (v * v) / fs;
      let s = 0;
      for (const v of esd) s += v * (fs / n);
      // docs/methods.md#esd: Δt·Σx² = Δf·ΣG_k (exact DFT identity)
      expect(Math.abs(s - e) / e).toBeLessThan(1e-12);
    }
  });

  it('gives 4.99999 N²·s for the 100 N, 1 ms half-sine, doubled except at DC and Nyquist', () => {
    const fs = 51200;
    const x = halfSine(8192, fs, 100, 1e-3);
    const { esd } = energySpectralDensity(x, fs);
    let s = 0;
    for (const v of esd) s += v * (fs / 8192);
    // docs/methods.md#esd [calc]: both sides give 4.99999 N²·s against 5.0 analytic
    expect(s).toBeCloseTo(4.99999, 5);
    const X = transientSpectrum(x, fs);
    // docs/methods.md#esd: G(0) = |X(0)|², G(f) = 2|X(f)|²
    expect(esd[0]).toBeCloseTo(X.re[0] ** 2, 15);
    expect(esd[10] / (2 * (X.re[10] ** 2 + X.im[10] ** 2))).toBeCloseTo(1, 12);
    expect(esd[4096] / (X.re[4096] ** 2 + X.im[4096] ** 2)).toBeCloseTo(1, 12);
  });
});

describe('linearSpectrum and autopowerSpectrum', () => {
  const fs = 1024;
  const n = 1024;
  const A = 3;
  const sine = (k: number, phase = 0.3) => {
    const x = new Float64Array(n);
    for (let i = 0; i < n; i++) x[i] = A * Math.cos((2 * Math.PI * k * i) / n + phase);
    return x;
  };

  it('reads the amplitude of a sine on a line as A (peak) or A/√2 (rms) with every window', () => {
    for (const window of ['hann', 'rectangular', 'flattop'] as const) {
      const peak = linearSpectrum(sine(100), fs, { window, scaling: 'peak' });
      const rms = linearSpectrum(sine(100), fs, { window, scaling: 'rms' });
      // closed form: coherent-gain-corrected DFT of A·cos on line k is A (peak), A/√2 (rms)
      expect(peak.magnitude[100]).toBeCloseTo(A, 12);
      expect(rms.magnitude[100]).toBeCloseTo(A / Math.SQRT2, 12);
      // closed form: phase of A·cos(2πf t + φ) is φ at its line (0.3 rad)
      expect(Math.atan2(peak.im[100], peak.re[100])).toBeCloseTo(0.3, 12);
      expect(peak.scaling).toBe('peak');
      expect(rms.scaling).toBe('rms');
      expect(rms.window).toBe(window);
    }
  });

  it('reads a constant at DC without doubling in both scalings', () => {
    const x = new Float64Array(n).fill(2.5);
    // closed form: the mean of a constant is its value, and its rms too
    expect(linearSpectrum(x, fs, { window: 'hann', scaling: 'peak' }).magnitude[0]).toBeCloseTo(2.5, 12);
    expect(linearSpectrum(x, fs, { window: 'hann', scaling: 'rms' }).magnitude[0]).toBeCloseTo(2.5, 12);
  });

  it('gives autopower A²/2 (rms) or A² (peak) for a sine, and lines that sum to the mean square with a rectangular window', () => {
    const x = add(sine(100), sine(37, 1.1));
    const rms = autopowerSpectrum(x, fs, { window: 'rectangular', scaling: 'rms' });
    const peak = autopowerSpectrum(x, fs, { window: 'rectangular', scaling: 'peak' });
    // closed form: mean square of A·cos is A²/2
    expect(rms.power[100]).toBeCloseTo((A * A) / 2, 10);
    expect(peak.power[100]).toBeCloseTo(A * A, 10);
    let ms = 0;
    for (const v of x) ms += (v * v) / n;
    let sum = 0;
    for (const v of rms.power) sum += v;
    // Parseval (exact DFT identity): Σ lines = mean square of x, here 2·A²/2
    expect(sum / ms).toBeCloseTo(1, 12);
    expect(ms).toBeCloseTo(A * A, 10);
    expect(rms.unit).toMatch(/mean square/);
  });
});
