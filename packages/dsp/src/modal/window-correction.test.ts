import { describe, expect, it } from 'vitest';
import { correctWindowDamping } from './window-correction.ts';

describe('correctWindowDamping (docs/methods.md#exp-window, exact pole shift)', () => {
  it('turns 2.000 % at 50 Hz into 0.5342 % for τ = 0.21715 s, keeping ω_d', () => {
    // docs/methods.md#exp-window worked example [calc]
    const [p] = correctWindowDamping([{ fHz: 50, zeta: 0.02 }], 0.21715);
    expect(p.zeta * 100).toBeCloseTo(0.5342, 4);
    const wd = 2 * Math.PI * 50 * Math.sqrt(1 - 0.02 ** 2);
    expect(p.lambda.im).toBeCloseTo(wd, 9);
    // σ_true = σ_est − 1/τ
    expect(-p.lambda.re).toBeCloseTo(0.02 * 2 * Math.PI * 50 - 1 / 0.21715, 9);
  });

  it('undoes the shift of a 50 Hz, 0.50 % mode that appears at 1.9655 % (docs/methods.md#exp-window)', () => {
    const tau = 1 / Math.log(100); // T = 1 s, p = 1 %: τ = 0.21715 s
    const wn = 2 * Math.PI * 50;
    const lam = { re: -0.005 * wn - 1 / tau, im: wn * Math.sqrt(1 - 0.005 ** 2) };
    // docs/methods.md#exp-window [calc]: appears at 1.9655 %
    expect((-lam.re / Math.hypot(lam.re, lam.im)) * 100).toBeCloseTo(1.9655, 4);
    const [p] = correctWindowDamping([{ lambda: lam, label: 'mode 1' }], tau);
    expect(p.zeta).toBeCloseTo(0.005, 12);
    expect(p.fHz).toBeCloseTo(50, 10);
    expect(p.label).toBe('mode 1');
  });
});
