import { describe, expect, it } from 'vitest';
import { digitise, quantisationStep } from './adc.ts';
import { fromVolts, toVolts } from './volts.ts';

describe('toVolts and fromVolts', () => {
  it('converts 5 g = 49.033 m/s² at 100 mV/g to 0.5 V (docs/methods.md#units)', () => {
    const mvPerMs2 = 100 / 9.80665; // 100 mV/g = 10.1972 mV/(m/s²), docs/methods.md#units
    expect(Math.abs(mvPerMs2 - 10.1972)).toBeLessThan(5e-5);
    expect(toVolts([5 * 9.80665], mvPerMs2)[0]).toBeCloseTo(0.5, 12);
    expect(Math.abs(fromVolts([0.5], mvPerMs2)[0] - 49.033)).toBeLessThan(5e-4); // docs/methods.md#units check: 49.033 m/s²
  });

  it('converts force at 2.2481 mV/N (10 mV/lbf, docs/methods.md#units) and back without loss', () => {
    const s = 10 / 4.4482216152605; // docs/methods.md#units: 1 lbf = 4.4482216152605 N exactly
    expect(Math.abs(s - 2.2481)).toBeLessThan(5e-5);
    const x = [0, 100, -250.5];
    const back = fromVolts(toVolts(x, s), s);
    x.forEach((v, i) => expect(back[i]).toBeCloseTo(v, 12));
  });

  it('rejects a sensitivity that is not > 0', () => {
    expect(() => toVolts([1], 0)).toThrow(/sensitivityMvPerUnit=0/);
    expect(() => toVolts([1], Number.NaN)).toThrow(/sensitivityMvPerUnit=NaN/);
  });
});

describe('digitise', () => {
  it('uses the step 2·range/2^bits: 1.1920929e-6 N for ±10 N at 24 bits', () => {
    expect(quantisationStep(10, 24)).toBe(20 / 16777216);
  });

  it('limits codes to the converter span and flags the overload', () => {
    const q = quantisationStep(1, 8); // 1/128
    const { samples, overload } = digitise([0.5, 1.2, -3, 0.999], 1, 8);
    expect(overload).toBe(true);
    expect(Array.from(samples)).toEqual([0.5, 1 - q, -1, 1 - q]);
    expect(digitise([0.2, -0.9], 1, 8).overload).toBe(false);
  });
});
