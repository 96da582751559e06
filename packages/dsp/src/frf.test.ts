import { describe, expect, it } from 'vitest';
import { circShift, gaussian, halfSine, loadFixture, noise, relErrC } from '../test/helpers.ts';
import { averageFrf, convertFrf, type Hit } from './frf.ts';
import { transientSpectrum } from './spectra.ts';

function mean(a: ArrayLike<number>, from: number, to: number): number {
  let s = 0;
  for (let k = from; k < to; k++) s += a[k];
  return s / (to - from);
}

function absC(h: { re: Float64Array; im: Float64Array }): Float64Array {
  return h.re.map((r, k) => Math.hypot(r, h.im[k]));
}

describe('averageFrf on an SDOF struck by a half-sine', () => {
  const fx = loadFixture('sdof-half-sine.json');
  const scales = [1, 0.7, 1.3];
  const hits: Hit[] = scales.map((s) => ({
    force: fx.force.map((v: number) => v * s),
    responses: [fx.acceleration.map((v: number) => v * s)],
  }));
  const frf = averageFrf(hits, fx.fs, { forceWindow: null, exponentialWindow: null });

  it('matches the closed-form accelerance in magnitude (0.2 %) and phase (0.3°) from 60 to 140 Hz', () => {
    expect(frf.averages).toBe(3);
    expect(frf.f[1]).toBe(1);
    fx.linesHz.forEach((hz: number, i: number) => {
      const k = Math.round(hz);
      const ar = fx.accelRe[i];
      const ai = fx.accelIm[i];
      const hr = frf.h1[0].re[k];
      const hi = frf.h1[0].im[k];
      // closed form A = −ω²/(k − mω² + jcω) (docs/methods.md#frf-kinds), response from scipy solve_ivp (fixture);
      // tolerance covers the sampled 5 ms pulse (its spectrum at 4096 Hz aliasing is ~0.06 %)
      expect(Math.abs(Math.hypot(hr, hi) / Math.hypot(ar, ai) - 1)).toBeLessThan(2e-3);
      const dphi = Math.atan2(hi * ar - hr * ai, hr * ar + hi * ai);
      expect(Math.abs((dphi * 180) / Math.PI)).toBeLessThan(0.3);
    });
    // docs/methods.md#frf-kinds [calc]: A(ω_n) = 25.000·j (m/s²)/N at 100 Hz
    expect(frf.h1[0].re[100]).toBeCloseTo(0, 1);
    expect(frf.h1[0].im[100] / 25 - 1).toBeLessThan(2e-3);
  });

  it('has coherence 1 for noise-free hits of different strength', () => {
    // docs/methods.md#h1-h2-coherence: noise-free data give γ² = 1 and H1 = H2
    for (let k = 1; k < frf.f.length; k++) expect(frf.coherence[0][k]).toBeGreaterThan(1 - 1e-9);
    expect(relErrC(frf.h2[0].re[100], frf.h2[0].im[100], frf.h1[0].re[100], frf.h1[0].im[100])).toBeLessThan(1e-9);
  });

  it('reports G_ff as the mean single-sided force ESD per hit', () => {
    const F = transientSpectrum(fx.force, fx.fs);
    const meanSq = scales.reduce((s, a) => s + a * a, 0) / scales.length;
    // docs/methods.md#frf-averaging: G_ff = (2/n_d)Σ|F_i|², DC not doubled
    expect(frf.gff[0] / (meanSq * F.re[0] ** 2)).toBeCloseTo(1, 12);
    expect(frf.gff[50] / (2 * meanSq * (F.re[50] ** 2 + F.im[50] ** 2))).toBeCloseTo(1, 12);
  });
});

describe('estimators under noise (seeded Monte Carlo, docs/methods.md#h1-h2-coherence)', () => {
  // Records of white force (variance 2) through H = √5·e^{−j2πk·3/N} (a gain and a 3-sample circular
  // delay), as the docs/methods.md#h1-h2-coherence Monte Carlo: |H|² = 5, noise variance 0.5.
  const n = 512;
  const nd = 100;
  const gain = Math.sqrt(5);
  const make = (outputNoise: number, inputNoise: number, seed: number): Hit[] => {
    const g = gaussian(seed);
    const hits: Hit[] = [];
    for (let i = 0; i < nd; i++) {
      const f = noise(n, Math.SQRT2, g);
      const x = circShift(f, 3).map((v) => gain * v);
      const xn = noise(n, Math.sqrt(outputNoise), g);
      const fnz = noise(n, Math.sqrt(inputNoise), g);
      hits.push({ force: f.map((v, j) => v + fnz[j]), responses: [x.map((v, j) => v + xn[j])] });
    }
    return hits;
  };
  const lo = 1;
  const hi = n / 2;

  it('leaves H1 unbiased and pushes H2 high when the noise is on the response', () => {
    const r = averageFrf(make(0.5, 0, 11), 1000, { forceWindow: null, exponentialWindow: null, hv: true });
    // docs/methods.md#h1-h2-coherence: |H| = 2.236; H1 unbiased
    expect(mean(absC(r.h1[0]), lo, hi)).toBeCloseTo(2.236, 1);
    expect(Math.abs(mean(absC(r.h1[0]), lo, hi) / gain - 1)).toBeLessThan(0.01);
    // docs/methods.md#h1-h2-coherence: predicted |H2| = 2.348 and γ² = 10/10.5 = 0.952
    expect(Math.abs(mean(absC(r.h2[0]), lo, hi) / 2.348 - 1)).toBeLessThan(0.01);
    expect(mean(r.coherence[0], lo, hi)).toBeCloseTo(0.952, 2);
  });

  it('pulls H1 low and leaves H2 unbiased when the noise is on the force', () => {
    const r = averageFrf(make(0, 0.5, 12), 1000, { forceWindow: null, exponentialWindow: null });
    // docs/methods.md#h1-h2-coherence: E[H1] ≈ H·G_ff/(G_ff + G_nn) = 2.236·2/2.5 = 1.789; γ² = 0.8
    expect(Math.abs(mean(absC(r.h1[0]), lo, hi) / (gain * 0.8) - 1)).toBeLessThan(0.01);
    expect(Math.abs(mean(absC(r.h2[0]), lo, hi) / gain - 1)).toBeLessThan(0.01);
    expect(mean(r.coherence[0], lo, hi)).toBeCloseTo(0.8, 2);
  });

  it('keeps H1/H2 = γ² to machine precision and |H1| ≤ |Hv| ≤ |H2| at every line', () => {
    const r = averageFrf(make(0.5, 0.3, 13).slice(0, 7), 1000, { forceWindow: null, exponentialWindow: null, hv: true });
    for (let k = 0; k < r.f.length; k++) {
      const h1r = r.h1[0].re[k];
      const h1i = r.h1[0].im[k];
      const h2r = r.h2[0].re[k];
      const h2i = r.h2[0].im[k];
      const d = h2r * h2r + h2i * h2i;
      const qr = (h1r * h2r + h1i * h2i) / d;
      const qi = (h1i * h2r - h1r * h2i) / d;
      // docs/methods.md#h1-h2-coherence: exact identity H1/H2 = γ² (real)
      expect(Math.abs(qr - r.coherence[0][k])).toBeLessThan(1e-12);
      expect(Math.abs(qi)).toBeLessThan(1e-12);
      // docs/methods.md#h1-h2-coherence: |H1| ≤ |Hv| ≤ |H2| (Vold, Crowley & Rocklin 1984)
      const a1 = Math.hypot(h1r, h1i);
      const av = Math.hypot(r.hv![0].re[k], r.hv![0].im[k]);
      const a2 = Math.hypot(h2r, h2i);
      expect(av).toBeGreaterThanOrEqual(a1 * (1 - 1e-12));
      expect(av).toBeLessThanOrEqual(a2 * (1 + 1e-12));
    }
  });

  it('gives coherence 1 at every line from a single average, however noisy', () => {
    const r = averageFrf(make(2, 2, 14).slice(0, 1), 1000, { forceWindow: null, exponentialWindow: null });
    // docs/methods.md#h1-h2-coherence: n_d = 1 gives γ² ≡ 1
    expect(r.coherence[0].length).toBeGreaterThan(1);
    for (const c of r.coherence[0]) expect(c).toBeCloseTo(1, 12);
  });

  it('gives H1 = H2 = Hv = H without noise', () => {
    const r = averageFrf(make(0, 0, 15).slice(0, 4), 1000, { forceWindow: null, exponentialWindow: null, hv: true });
    for (let k = 0; k < r.f.length; k++) {
      const th = (-2 * Math.PI * k * 3) / n;
      const hr = gain * Math.cos(th);
      const hi2 = gain * Math.sin(th);
      // closed form: circular delay of 3 samples with gain √5
      for (const h of [r.h1[0], r.h2[0], r.hv![0]]) expect(relErrC(h.re[k], h.im[k], hr, hi2)).toBeLessThan(1e-12);
    }
  });
});

describe('averageFrf windows and delays', () => {
  const fs = 51200;
  const n = 4096;
  const pulse = halfSine(n, fs, 100, 1e-3, 2e-3);
  // response: the force delayed by 20 samples and scaled, plus a decaying ring
  const resp = circShift(pulse, 20).map((v, i) => 0.5 * v + Math.exp(-i / 400) * Math.sin(i / 7));

  it('leaves H1 unchanged by a force window whose unity part holds the whole pulse', () => {
    const plain = averageFrf([{ force: pulse, responses: [resp] }], fs, { forceWindow: null, exponentialWindow: null });
    const windowed = averageFrf([{ force: pulse, responses: [resp] }], fs, {
      forceWindow: { startS: 2e-3, lengthS: 2e-3, taperS: 1e-3 },
      exponentialWindow: null,
    });
    // docs/methods.md#force-window: pulse wholly in the unity part → same F to machine precision
    for (let k = 0; k < plain.f.length; k += 7) {
      expect(relErrC(windowed.h1[0].re[k], windowed.h1[0].im[k], plain.h1[0].re[k], plain.h1[0].im[k])).toBeLessThan(1e-12);
    }
  });

  it('does not change the FRF for a common time shift of both channels', () => {
    const a = averageFrf([{ force: pulse, responses: [resp] }], fs, { forceWindow: null, exponentialWindow: null });
    const b = averageFrf([{ force: circShift(pulse, 100), responses: [circShift(resp, 100)] }], fs, {
      forceWindow: null,
      exponentialWindow: null,
    });
    // docs/methods.md#transient-spectrum: a common shift multiplies both spectra by e^{−j2πft0}; H is unchanged
    for (let k = 1; k < 400; k += 3) {
      expect(relErrC(b.h1[0].re[k], b.h1[0].im[k], a.h1[0].re[k], a.h1[0].im[k])).toBeLessThan(1e-10);
    }
  });

  it('shows a 10 µs inter-channel delay as a −3.6° phase error at 1 kHz', () => {
    const fs2 = 100000;
    const n2 = 1000; // Δf = 100 Hz, line 10 = 1 kHz
    const f = halfSine(n2, fs2, 10, 1e-3, 1e-4);
    const base = averageFrf([{ force: f, responses: [f] }], fs2, { forceWindow: null, exponentialWindow: null });
    const late = averageFrf([{ force: f, responses: [circShift(f, 1)] }], fs2, { forceWindow: null, exponentialWindow: null });
    const phase = (h: { re: Float64Array; im: Float64Array }) => (Math.atan2(h.im[10], h.re[10]) * 180) / Math.PI;
    // docs/methods.md#transient-spectrum: −2πfτ = −3.6° for τ = 10 µs at 1 kHz; H1 phase of a delay is negative (G_fx = F*·X)
    expect(phase(late.h1[0]) - phase(base.h1[0])).toBeCloseTo(-3.6, 10);
  });

  it('matches the analytic shifted FRF of an exponentially windowed SDOF within 0.25 % at 50 Hz (numpy gives 0.208 %)', () => {
    const fs3 = 2048;
    const n3 = 2048; // T = 1 s
    const fn = 50;
    const zeta = 0.005;
    const wn = 2 * Math.PI * fn;
    const wd = wn * Math.sqrt(1 - zeta * zeta);
    const tau = 0.21715; // docs/methods.md#exp-window: T = 1 s, p = 1 %
    const h = new Float64Array(n3);
    for (let i = 0; i < n3; i++) {
      const t = i / fs3;
      h[i] = (Math.exp(-zeta * wn * t) * Math.sin(wd * t)) / wd; // docs/methods.md#impulse-response, m = 1 kg
    }
    const impulse = new Float64Array(n3);
    impulse[0] = fs3; // unit impulse: Δt·Σ = 1 N·s
    const r = averageFrf([{ force: impulse, responses: [h] }], fs3, {
      forceWindow: null,
      exponentialWindow: { startS: 0, tauS: tau },
    });
    // docs/methods.md#exp-window: H_w(s) = H(s + 1/τ), i.e. α with σ → ζω_n + 1/τ: 1/((jω + σ')² + ω_d²)
    const w = 2 * Math.PI * 50;
    const sig = zeta * wn + 1 / tau;
    const dr = sig * sig - w * w + wd * wd;
    const di = 2 * sig * w;
    const ar = dr / (dr * dr + di * di);
    const ai = -di / (dr * dr + di * di);
    // docs/methods.md#exp-window quotes "within 0.2 %"; numpy 2.4 gives 0.208 % for this very record (the
    // windowed envelope is still e^{−6.18} ≈ 0.2 % at T = 1 s), so the bound here is 0.25 %
    const err = relErrC(r.h1[0].re[50], r.h1[0].im[50], ar, ai);
    expect(err).toBeLessThan(2.5e-3);
    expect(err).toBeCloseTo(0.00208, 4); // numpy.fft.rfft of the same samples: 0.0020805
  });
});

describe('convertFrf', () => {
  // docs/methods.md#frf-kinds [calc]: m = 1 kg, f_n = 100 Hz, ζ = 0.02
  const m = 1;
  const k = 394784.176;
  const c = 25.13274;
  const f = new Float64Array([0, 50, 100, 200]);
  const alpha = { re: new Float64Array(4), im: new Float64Array(4) };
  f.forEach((hz, i) => {
    const w = 2 * Math.PI * hz;
    const dr = k - m * w * w;
    const di = c * w;
    alpha.re[i] = dr / (dr * dr + di * di);
    alpha.im[i] = -di / (dr * dr + di * di);
  });

  it('turns receptance into mobility and accelerance with the check values of docs/methods.md#frf-kinds', () => {
    const y = convertFrf(alpha, f, 'receptance', 'mobility');
    const a = convertFrf(alpha, f, 'receptance', 'accelerance');
    // docs/methods.md#frf-kinds [calc]: α(ω_n) = −6.33257e-5·j, Y(ω_n) = 0.0397887, A(ω_n) = 25.000·j
    expect(alpha.im[2]).toBeCloseTo(-6.33257e-5, 9);
    expect(y.re[2]).toBeCloseTo(0.0397887, 6);
    expect(y.im[2]).toBeCloseTo(0, 6);
    expect(a.re[2]).toBeCloseTo(0, 3);
    expect(a.im[2]).toBeCloseTo(25.0, 3);
    // docs/methods.md#conventions: accelerance leads receptance by 180° (A = −ω²α)
    const w = 2 * Math.PI * 50;
    expect(a.re[1]).toBeCloseTo(-w * w * alpha.re[1], 12);
  });

  it('inverts itself, and sets the DC line of a division to 0 instead of NaN', () => {
    const a = convertFrf(alpha, f, 'receptance', 'accelerance');
    const back = convertFrf(a, f, 'accelerance', 'receptance');
    for (let i = 1; i < 4; i++) expect(relErrC(back.re[i], back.im[i], alpha.re[i], alpha.im[i])).toBeLessThan(1e-13);
    // documented choice: division by jω at f = 0 gives 0
    expect(back.re[0]).toBe(0);
    expect(back.im[0]).toBe(0);
    const same = convertFrf(alpha, f, 'mobility', 'mobility');
    expect(Array.from(same.re)).toEqual(Array.from(alpha.re));
  });
});
