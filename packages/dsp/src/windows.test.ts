import { describe, expect, it } from 'vitest';
import { halfSine } from '../test/helpers.ts';
import { transientSpectrum } from './spectra.ts';
import { correctExponentialDamping, exponentialWindow, forceWindow, tauFromEndLevel } from './windows.ts';

describe('forceWindow', () => {
  const fs = 1000;
  const w = forceWindow(100, fs, { startS: 0.01, lengthS: 0.02, taperS: 0.01 });

  it('is 1 from the first sample (pre-trigger included) to startS + lengthS, then tapers by a half cosine to 0', () => {
    // definition, docs/methods.md#force-window: unity from record start to t_e = 30 ms
    for (let i = 0; i <= 30; i++) expect(w[i]).toBe(1);
    // half-cosine: ½(1 + cos(π·(t − t_e)/taper)) is ½ halfway through the taper (35 ms)
    expect(w[35]).toBeCloseTo(0.5, 14);
    expect(w[32]).toBeCloseTo(0.5 * (1 + Math.cos(Math.PI * 0.2)), 14);
    for (let i = 40; i < 100; i++) expect(w[i]).toBe(0);
    for (let i = 31; i < 40; i++) expect(w[i]).toBeLessThan(w[i - 1]);
  });

  it('leaves the spectrum of a pulse that lies in the unity part unchanged, and changes one it cuts', () => {
    const fs2 = 51200;
    const x = halfSine(2048, fs2, 100, 1e-3, 1e-3);
    const ok = forceWindow(2048, fs2, { startS: 1e-3, lengthS: 1.5e-3, taperS: 1e-3 });
    const cut = forceWindow(2048, fs2, { startS: 1e-3, lengthS: 0.5e-3, taperS: 0.1e-3 });
    const X = transientSpectrum(x, fs2);
    const Xok = transientSpectrum(x.map((v, i) => v * ok[i]), fs2);
    const Xcut = transientSpectrum(x.map((v, i) => v * cut[i]), fs2);
    // docs/methods.md#force-window test: pulse wholly in the unity part → same F to machine precision
    for (let k = 0; k < X.re.length; k++) {
      expect(Xok.re[k]).toBe(X.re[k]);
      expect(Xok.im[k]).toBe(X.im[k]);
    }
    // a window that cuts the pulse loses impulse: X(0) drops well below 2AT/π
    expect(Xcut.re[0]).toBeLessThan(0.9 * X.re[0]);
  });
});

describe('exponentialWindow and its damping', () => {
  it('is 1 before startS and e^{−(t − t0)/τ} after', () => {
    const w = exponentialWindow(1000, 1000, { startS: 0.1, tauS: 0.2 });
    expect(w[99]).toBe(1);
    // definition, docs/methods.md#exp-window
    expect(w[100]).toBe(1);
    expect(w[300]).toBeCloseTo(Math.exp(-1), 15);
  });

  it('reproduces the docs/methods.md#exp-window worked example: τ = 0.21715 s, added damping 1.466 % at 50 Hz, 2.000 % → 0.5342 %', () => {
    const tau = tauFromEndLevel(1, 0, 0.01);
    // docs/methods.md#exp-window [calc]: T = 1 s, p = 1 % → τ = 0.21715 s, σ_w = 4.6052 s⁻¹
    expect(tau).toBeCloseTo(0.21715, 5);
    expect(1 / tau).toBeCloseTo(4.6052, 4);
    // docs/methods.md#exp-window [calc]: added damping 1/(τω) = 7.33 % at 10 Hz, 1.466 % at 50 Hz, 0.0733 % at 1 kHz
    expect(1 / (tau * 2 * Math.PI * 10)).toBeCloseTo(0.0733, 4);
    expect(1 / (tau * 2 * Math.PI * 50)).toBeCloseTo(0.01466, 5);
    expect(1 / (tau * 2 * Math.PI * 1000)).toBeCloseTo(0.000733, 6);
    const c = correctExponentialDamping({ fnHz: 50, zeta: 0.02, tauS: tau });
    // docs/methods.md#exp-window [calc]: 2.000 % at 50 Hz corrects to 0.5342 % (exact)
    expect(c.zeta * 100).toBeCloseTo(0.5342, 4);
    // the damped frequency is kept: ω_n,true ≈ ω_d,est, a little below 50 Hz
    expect(c.fnHz).toBeCloseTo(50 * Math.sqrt(1 - 0.0004) / Math.sqrt(1 - c.zeta ** 2), 9);
  });

  it('undoes the pole shift of a windowed 0.5 % mode at 50 Hz, which appears at 1.9655 %', () => {
    const tau = tauFromEndLevel(1, 0, 0.01);
    const wn = 2 * Math.PI * 50;
    const zeta = 0.005;
    const wd = wn * Math.sqrt(1 - zeta * zeta);
    // docs/methods.md#exp-window: the window moves the pole left by 1/τ, ω_d unchanged
    const sig = zeta * wn + 1 / tau;
    const wnApp = Math.hypot(wd, sig);
    const zetaApp = sig / wnApp;
    // docs/methods.md#exp-window [calc]: appears at 1.9655 %, half-power bandwidth 0.50 Hz → 1.966 Hz
    expect(zetaApp * 100).toBeCloseTo(1.9655, 4);
    expect(2 * zetaApp * (wnApp / (2 * Math.PI))).toBeCloseTo(1.966, 3);
    const back = correctExponentialDamping({ fnHz: wnApp / (2 * Math.PI), zeta: zetaApp, tauS: tau });
    // exact inverse of the shift (closed form)
    expect(back.zeta).toBeCloseTo(0.005, 14);
    expect(back.fnHz).toBeCloseTo(50, 12);
  });

  it('refuses an estimate with less damping than the window adds', () => {
    expect(() => correctExponentialDamping({ fnHz: 50, zeta: 0.01, tauS: 0.21715 })).toThrow(RangeError);
    expect(() => correctExponentialDamping({ fnHz: 50, zeta: 0.01, tauS: 0.21715 })).toThrow(/zeta=0.01/);
  });
});
