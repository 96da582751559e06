import { describe, expect, it } from 'vitest';
import { createRng } from './rng.ts';

describe('createRng', () => {
  it('repeats the same stream for the same seed', () => {
    const a = createRng(42);
    const b = createRng(42);
    for (let i = 0; i < 1000; i++) {
      expect(a.uniform()).toBe(b.uniform());
      expect(a.gaussian()).toBe(b.gaussian());
    }
  });

  it('gives a different stream for a different seed', () => {
    const a = createRng(1);
    const b = createRng(2);
    let same = 0;
    for (let i = 0; i < 100; i++) if (a.uniform() === b.uniform()) same++;
    expect(same).toBe(0);
  });

  it('draws uniform numbers in [0, 1) with mean 1/2 and variance 1/12', () => {
    const rng = createRng(7);
    const n = 100_000;
    let sum = 0;
    let sum2 = 0;
    let outside = 0;
    for (let i = 0; i < n; i++) {
      const u = rng.uniform();
      if (!(u >= 0 && u < 1)) outside++;
      sum += u;
      sum2 += u * u;
    }
    expect(outside).toBe(0);
    const mean = sum / n;
    // Uniform(0,1): mean 1/2, variance 1/12. Standard error of the mean is √(1/12/n) = 9.1e-4;
    // the tolerances are about 5 standard errors.
    expect(Math.abs(mean - 0.5)).toBeLessThan(0.005);
    expect(Math.abs(sum2 / n - mean * mean - 1 / 12)).toBeLessThan(0.002);
  });

  it('draws standard normal deviates: mean 0, variance 1, 68.27 % within ±1', () => {
    const rng = createRng(2024);
    const n = 100_000;
    let sum = 0;
    let sum2 = 0;
    let within = 0;
    for (let i = 0; i < n; i++) {
      const g = rng.gaussian();
      sum += g;
      sum2 += g * g;
      if (Math.abs(g) <= 1) within++;
    }
    // Standard errors: mean 1/√n = 0.0032, variance √(2/n) = 0.0045, fraction √(p(1−p)/n) = 0.0015;
    // 0.6827 = P(|Z| ≤ 1) of the standard normal distribution (erf(1/√2)). Tolerances ≈ 6 standard errors.
    expect(Math.abs(sum / n)).toBeLessThan(0.02);
    expect(Math.abs(sum2 / n - 1)).toBeLessThan(0.03);
    expect(Math.abs(within / n - 0.6827)).toBeLessThan(0.01);
  });

  it('rejects a seed that is not a finite number', () => {
    expect(() => createRng(Number.NaN)).toThrow(/seed=NaN/);
    expect(() => createRng(Number.POSITIVE_INFINITY)).toThrow(RangeError);
  });
});
