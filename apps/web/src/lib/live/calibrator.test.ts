import { describe, expect, it } from 'vitest';
import { toneOf } from './calibrator.ts';

const fs = 48_000;
const sine = (length: number, at = (i: number) => i) => Float32Array.from({ length }, (_, i) => 0.3 + 0.1414 * Math.sin(2 * Math.PI * 159.2 * (at(i) / fs) + 0.3));

describe('calibrator tone', () => {
  it('reads a 159.2 Hz sine of amplitude A as RMS A/√2 and its frequency within 0.01 %', () => {
    // Closed form: a sine's RMS is its amplitude / √2 (any handbook); 2 s at 48 kHz.
    const t = toneOf(sine(2 * fs), fs);
    expect(t.rms).toBeCloseTo(0.1414 / Math.SQRT2, 4);
    expect(Math.abs(t.frequencyHz - 159.2) / 159.2).toBeLessThan(1e-4);
    expect(t.irregularCycles).toBe(0);
    // The mean of a non-whole number of periods is off 0.3 by ~1e-4, and so is the peak about it.
    expect(t.peak).toBeCloseTo(0.1414, 3);
  });

  it('keeps the frequency when 5 ms of the stream are lost, and counts the cycle the gap cut as irregular', () => {
    // 240 samples (5 ms, 0.8 of a period) missing after 1 s: the span from first to last crossing
    // would read 0.25 % high (159.6 Hz); the median period still reads 159.2 Hz.
    const t = toneOf(sine(2 * fs - 240, (i) => (i < fs ? i : i + 240)), fs);
    expect(Math.abs(t.frequencyHz - 159.2) / 159.2).toBeLessThan(1e-4);
    expect(t.irregularCycles).toBeGreaterThanOrEqual(1);
    expect(t.irregularCycles).toBeLessThanOrEqual(2);
  });

  it('refuses silence with words', () => {
    expect(() => toneOf(new Float32Array(1000), 48_000)).toThrow(/no tone/);
  });
});
