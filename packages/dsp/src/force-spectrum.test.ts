import { describe, expect, it } from 'vitest';
import { add, gaussian, halfSine, noise } from '../test/helpers.ts';
import { forcePulseSpectrum, rollOffFrequency } from './force-spectrum.ts';
import { checkHit } from './hit-check.ts';
import { channelOffset } from './offsets.ts';

describe('forcePulseSpectrum', () => {
  // A half-sine pulse of length T has |F(f)/F(0)|² = cos²(πfT) / (1 − 4f²T²)² (closed form of its
  // Fourier transform, e.g. Harris' Shock and Vibration Handbook, impact pulses); at f = 1/T that is
  // 1/9, i.e. −9.542 dB. Sampled at 100 kHz (100 samples per pulse) the DFT matches it to 0.01 dB.
  const fs = 100_000;
  const n = 10_000; // 0.1 s, lines every 10 Hz
  const T = 1e-3;
  const pulse = halfSine(n, fs, 200, T, 0.01);

  it('gives the half-sine pulse’s closed-form level at f = 1/T', () => {
    const spec = forcePulseSpectrum(pulse, fs, { offsetN: 0, fromIndex: 0, toIndex: n })!;
    expect(spec.f[100]).toBe(1000);
    // The level is relative to DC (0 dB there by definition); a positive pulse has |F(f)| ≤ F(0) = ∫x dt,
    // so no line may stand above it.
    expect(Math.max(...spec.levelDb)).toBeLessThanOrEqual(spec.levelDb[0]);
    // closed form at f = 1/(4T): cos²(π/4)/(1 − 1/4)² = 0.5/0.5625, −0.512 dB; at f = 1/T: 1/9, −9.542 dB
    expect(spec.levelDb[25]).toBeCloseTo(10 * Math.log10(0.5 / 0.5625), 2);
    expect(spec.levelDb[100]).toBeCloseTo(10 * Math.log10(1 / 9), 2);
  });

  it('removes the offset and gates out everything outside the pulse', () => {
    // 5 N offset everywhere and noise outside the gate: gated, the level at 1/T is the clean pulse's.
    const dirty = add(pulse.map((v) => v + 5), noise(n, 1, gaussian(3)).map((v, i) => (i >= 900 && i < 1300 ? 0 : v)));
    const spec = forcePulseSpectrum(dirty, fs, { offsetN: 5, fromIndex: 900, toIndex: 1300 })!;
    expect(spec.levelDb[100]).toBeCloseTo(10 * Math.log10(1 / 9), 2);
  });

  it('reads the roll-off where the closed form crosses −10 and −20 dB', () => {
    // Roots of cos²(πfT)/(1 − 4f²T²)² = 0.1 and 0.01 (scipy.optimize.brentq): 1019.37 Hz and 1303.28 Hz;
    // the lines are 10 Hz apart, and interpolating in dB between them is within 0.5 Hz.
    const spec = forcePulseSpectrum(pulse, fs, { offsetN: 0, fromIndex: 0, toIndex: n })!;
    expect(Math.abs(rollOffFrequency(spec, 10)! - 1019.37)).toBeLessThan(0.5);
    expect(Math.abs(rollOffFrequency(spec, 20)! - 1303.28)).toBeLessThan(0.5);
  });

  it('is the curve the hit check reads its roll-off from', () => {
    const force = add(halfSine(8192, 8192 * 4, 80, 1e-3, 0.02), noise(8192, 0.02, gaussian(11)));
    const check = checkHit(force, [], 8192 * 4, { preTriggerSamples: 300 });
    const spec = forcePulseSpectrum(force, 8192 * 4, check.forceGate!)!;
    expect(check.rollOff10dBHz).toBe(rollOffFrequency(spec, 10));
    expect(check.rollOff20dBHz).toBe(rollOffFrequency(spec, 20));
  });

  it('refuses a gate that holds no sample of the record', () => {
    expect(() => forcePulseSpectrum(pulse, fs, { offsetN: 0, fromIndex: 20_000, toIndex: 30_000 })).toThrow(RangeError);
  });
});

describe('checkHit with a pre-trigger', () => {
  it('takes the force offset as the mean of the pre-trigger samples, the offset removeOffsets subtracts', () => {
    const fs = 10_000;
    const force = add(halfSine(4000, fs, 100, 1e-3, 0.05).map((v) => v + 3), noise(4000, 0.05, gaussian(5)));
    const pre = 400;
    const check = checkHit(force, [], fs, { preTriggerSamples: pre });
    expect(check.offsetN).toBe(channelOffset(force, pre));
    // the noise rms over those samples: 0.05 N by construction, within sampling error (±10 % for 400 samples)
    expect(check.noiseRmsN).toBeGreaterThan(0.045);
    expect(check.noiseRmsN).toBeLessThan(0.055);
  });
});
