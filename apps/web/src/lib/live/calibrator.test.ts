import { describe, expect, it } from 'vitest';
import { toneOf } from './calibrator.ts';

describe('calibrator tone', () => {
  it('reads a 159.2 Hz sine of amplitude A as RMS A/√2 and its frequency within 0.01 %', () => {
    // Closed form: a sine's RMS is its amplitude / √2 (any handbook); 2 s at 48 kHz.
    const fs = 48_000;
    const x = Float32Array.from({ length: 2 * fs }, (_, i) => 0.3 + 0.1414 * Math.sin(2 * Math.PI * 159.2 * (i / fs) + 0.3));
    const t = toneOf(x, fs);
    expect(t.rms).toBeCloseTo(0.1414 / Math.SQRT2, 4);
    expect(Math.abs(t.frequencyHz - 159.2) / 159.2).toBeLessThan(1e-4);
    // The mean of a non-whole number of periods is off 0.3 by ~1e-4, and so is the peak about it.
    expect(t.peak).toBeCloseTo(0.1414, 3);
  });

  it('refuses silence with words', () => {
    expect(() => toneOf(new Float32Array(1000), 48_000)).toThrow(/no tone/);
  });
});
