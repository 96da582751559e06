import { describe, expect, it } from 'vitest';
import { cabs, dtft, halfSineAt, rk4Accelerations } from '../test/helpers.ts';
import { halfSineForce, halfSineImpulse, halfSineSpectrum, sdofHalfSineResponse } from './half-sine.ts';

describe('half-sine force pulse', () => {
  it('has the impulse 2AT/π: 0.0636620 N·s for A = 100 N, T = 1 ms (docs/methods.md#pulse-spectra)', () => {
    expect(Math.abs(halfSineImpulse(100, 1e-3) - 0.063662)).toBeLessThan(5e-8); // docs/methods.md#pulse-spectra check value
  });

  it('sums to X(0) = 0.063652 N·s when sampled at 51.2 kHz with N = 8192 (docs/methods.md#pulse-spectra)', () => {
    const f = halfSineForce([{ startS: 0, amplitudeN: 100, widthS: 1e-3 }], 51200, 8192);
    const x0 = f.reduce((s, v) => s + v, 0) / 51200;
    // docs/methods.md#pulse-spectra: 0.063652 (−0.016 %); numpy in reference/sim_reference.py: 0.063651590
    expect(Math.abs(x0 - 0.06365159)).toBeLessThan(1e-9);
  });

  it('peaks at exactly A when a sample falls on the crest', () => {
    // fs = 10 kHz, T = 1 ms, start 10 ms: the crest t₀ + T/2 is sample 105.
    const f = halfSineForce([{ startS: 0.01, amplitudeN: 250, widthS: 1e-3 }], 10000, 400);
    expect(Math.max(...f)).toBeCloseTo(250, 10);
    expect(f[105]).toBeCloseTo(250, 10);
    expect(f[99]).toBe(0);
    expect(f[111]).toBe(0);
  });

  it('has the analytic spectrum of docs/methods.md#pulse-spectra: |X(500 Hz)| = 0.05 and |X(1 kHz)| = 0.0212207 N·s for 100 N, 1 ms', () => {
    const spec = halfSineSpectrum(100, 1e-3, [0, 500, 1000, 1500]);
    expect(Math.abs(spec.re[0] - 0.063662)).toBeLessThan(5e-8); // docs/methods.md#pulse-spectra X(0)
    expect(Math.abs(Math.hypot(spec.re[1], spec.im[1]) - 0.05)).toBeLessThan(1e-12); // docs/methods.md#pulse-spectra, the removable 0/0
    expect(Math.abs(Math.hypot(spec.re[2], spec.im[2]) - 0.0212207)).toBeLessThan(5e-8); // docs/methods.md#pulse-spectra = X(0)/3
    expect(Math.hypot(spec.re[3], spec.im[3])).toBeLessThan(1e-15); // docs/methods.md#pulse-spectra first zero at 1.5/T
  });

  it('samples to a spectrum that matches the analytic one at 51.2 kHz (|X(500 Hz)| = 0.0499999, docs/methods.md#pulse-spectra)', () => {
    const f = halfSineForce([{ startS: 0, amplitudeN: 100, widthS: 1e-3 }], 51200, 8192);
    expect(Math.abs(cabs(dtft(f, 51200, 500)) - 0.0499999)).toBeLessThan(1e-7); // docs/methods.md#pulse-spectra sampled estimate
  });

  it('shows the double-hit notches of docs/methods.md#double-hit: two 100 N, 1 ms pulses 5 ms apart', () => {
    const f = halfSineForce(
      [
        { startS: 0, amplitudeN: 100, widthS: 1e-3 },
        { startS: 5e-3, amplitudeN: 100, widthS: 1e-3 },
      ],
      51200,
      8192,
    );
    // docs/methods.md#double-hit: zero at 100 and 300 Hz, and 0.12261 N·s (twice 0.061305) at 200 Hz.
    expect(cabs(dtft(f, 51200, 100))).toBeLessThan(1e-9);
    expect(cabs(dtft(f, 51200, 300))).toBeLessThan(1e-9);
    expect(Math.abs(cabs(dtft(f, 51200, 200)) - 0.12261)).toBeLessThan(5e-6);
  });

  it('rejects a non-positive width or a NaN amplitude, naming the value', () => {
    expect(() => halfSineForce([{ startS: 0, amplitudeN: 1, widthS: 0 }], 1000, 10)).toThrow(/widthS=0/);
    expect(() => halfSineForce([{ startS: 0, amplitudeN: Number.NaN, widthS: 1e-3 }], 1000, 10)).toThrow(/amplitudeN=NaN/);
  });
});

describe('sdofHalfSineResponse', () => {
  // SDOF of docs/methods.md#frf-kinds: m = 1 kg, f_n = 100 Hz, ζ = 0.02; a 100 N, 1 ms hammer pulse at t₀ = 2 ms.
  const wn = 2 * Math.PI * 100;
  const k = wn * wn;
  const c = 2 * 0.02 * wn;
  const pulse = { startS: 2e-3, amplitudeN: 100, widthS: 1e-3 };

  it('matches a fine-step RK4 integration of m ẍ + c ẋ + k x = f(t) in acceleration', () => {
    const fs = 10000;
    const samples = 1000; // 0.1 s
    const exact = sdofHalfSineResponse({ fnHz: 100, zeta: 0.02, pulse, fs, samples, derivative: 2 });
    // RK4 with h = 1 µs: the pulse edges (2 ms, 3 ms) fall on steps, so the force is smooth inside each step.
    const h = 1e-6;
    const every = Math.round(1 / fs / h);
    const [rk] = rk4Accelerations([[1]], [[c]], [[k]], [1], (t) => halfSineAt(t, [pulse]), h, (samples - 1) * every, every);
    const peak = Math.max(...exact.map(Math.abs));
    for (let n = 0; n < samples; n++) expect(Math.abs(exact[n] - rk[n])).toBeLessThan(1e-7 * peak);
  });

  it('gives displacement and velocity consistent with the acceleration (ẍ = f − cẋ − kx)', () => {
    const fs = 20000;
    const samples = 2000;
    const x = sdofHalfSineResponse({ fnHz: 100, zeta: 0.02, pulse, fs, samples, derivative: 0 });
    const v = sdofHalfSineResponse({ fnHz: 100, zeta: 0.02, pulse, fs, samples, derivative: 1 });
    const a = sdofHalfSineResponse({ fnHz: 100, zeta: 0.02, pulse, fs, samples, derivative: 2 });
    const f = halfSineForce([pulse], fs, samples);
    const peak = Math.max(...a.map(Math.abs));
    for (let n = 0; n < samples; n++) expect(Math.abs(a[n] - (f[n] - c * v[n] - k * x[n]))).toBeLessThan(1e-9 * peak);
  });

  it('starts from rest and decays freely after the pulse with the envelope e^{−ζω_n t}', () => {
    const fs = 20000;
    const x = sdofHalfSineResponse({ fnHz: 100, zeta: 0.02, pulse, fs, samples: 4000, derivative: 0 });
    for (let n = 0; n <= 40; n++) expect(x[n]).toBe(0); // before and at t₀ = 2 ms
    // After the pulse x(t) = X e^{−σt} sin(ω_d t + ψ): one damped period later the value shrinks by e^{−σ T_d} (docs/methods.md#impulse-response).
    const Td = 1 / (100 * Math.sqrt(1 - 0.02 ** 2));
    const sigma = 0.02 * wn;
    // x at τ = 50 ms, and at τ = 50 ms + 20 T_d (by moving the pulse start, so both land on a sample).
    const fs2 = 10000;
    const a = sdofHalfSineResponse({ fnHz: 100, zeta: 0.02, pulse: { ...pulse, startS: 0 }, fs: fs2, samples: 501, derivative: 0 })[500];
    const later = 0.5 - (0.05 + 20 * Td);
    const b = sdofHalfSineResponse({ fnHz: 100, zeta: 0.02, pulse: { ...pulse, startS: later }, fs: fs2, samples: 5001, derivative: 0 })[5000];
    expect(Math.abs(b / a - Math.exp(-sigma * 20 * Td))).toBeLessThan(1e-9);
    expect(Number.isFinite(x[3999])).toBe(true);
  });

  it('tends to impulse × h(t) (docs/methods.md#impulse-response) for a very short pulse', () => {
    const short = { startS: 0, amplitudeN: 1000, widthS: 1e-6 };
    const I = (2 * short.amplitudeN * short.widthS) / Math.PI;
    const fs = 5000;
    const x = sdofHalfSineResponse({ fnHz: 100, zeta: 0.02, pulse: short, fs, samples: 500, derivative: 0 });
    const wd = wn * Math.sqrt(1 - 0.02 ** 2);
    for (let n = 1; n < 500; n++) {
      const t = n / fs - short.widthS / 2; // the pulse's centroid is at T/2
      const h = (Math.exp(-0.02 * wn * t) * Math.sin(wd * t)) / wd; // docs/methods.md#impulse-response, m = 1 kg
      expect(Math.abs(x[n] - I * h)).toBeLessThan(1e-6 * (I / wd));
    }
  });

  it('gives a free mass (fnHz = 0) the velocity impulse/m after the pulse', () => {
    const v = sdofHalfSineResponse({ fnHz: 0, zeta: 0, massKg: 2, pulse, fs: 10000, samples: 100, derivative: 1 });
    expect(Math.abs(v[99] - halfSineImpulse(100, 1e-3) / 2)).toBeLessThan(1e-15);
  });

  it('scales with 1/mass', () => {
    const one = sdofHalfSineResponse({ fnHz: 50, zeta: 0.01, pulse, fs: 5000, samples: 300 });
    const four = sdofHalfSineResponse({ fnHz: 50, zeta: 0.01, massKg: 4, pulse, fs: 5000, samples: 300 });
    for (let n = 0; n < 300; n++) expect(four[n]).toBeCloseTo(one[n] / 4, 12);
  });

  it('rejects damping outside (0, 1) and a bad derivative order, naming the value', () => {
    expect(() => sdofHalfSineResponse({ fnHz: 50, zeta: 0, pulse, fs: 5000, samples: 10 })).toThrow(/zeta=0/);
    expect(() => sdofHalfSineResponse({ fnHz: 50, zeta: 0.1, pulse, fs: 5000, samples: 10, derivative: 3 as never })).toThrow(/derivative=3/);
    expect(() => sdofHalfSineResponse({ fnHz: 50, zeta: 0.1, pulse, fs: -1, samples: 10 })).toThrow(/fs=-1/);
  });
});
