import { describe, expect, it } from 'vitest';
import { gaussian, noise } from '../test/helpers.ts';
import { backgroundNoise } from './noise.ts';

const fs = 12800;
const n = 10 * fs; // 10 s of quiet, as the Tap screen records it

describe('backgroundNoise', () => {
  it('reads white noise: RMS σ overall and σ·√(B/(fs/2)) in a band B wide (flat one-sided PSD 2σ²/fs)', () => {
    const sigma = 0.01;
    const x = noise(n, sigma, gaussian(41));
    const r = backgroundNoise(x, fs, { bandHz: [5, 400] });
    // Definition of the one-sided PSD of white noise: σ² spread evenly over 0…fs/2 (Bendat & Piersol 2010, §5.2).
    expect(r.rms / sigma).toBeCloseTo(1, 2);
    const expected = sigma * Math.sqrt((400 - 5) / (fs / 2));
    expect(Math.abs(r.rmsInBand / expected - 1)).toBeLessThan(0.03);
    // Σ psd·Δf over every line ≈ the variance (Parseval, in expectation).
    const df = r.f[1]! - r.f[0]!;
    const total = r.psd.reduce((a, b) => a + b, 0) * df;
    expect(Math.abs(total / (sigma * sigma) - 1)).toBeLessThan(0.02);
    expect(r.tones).toEqual([]);
    // Largest |x| of 128 000 Gaussian samples: about 4–5 σ (normal tail: P(|x| > 4.5σ) ≈ 6.8e-6 per sample).
    expect(r.peak / sigma).toBeGreaterThan(3.5);
    expect(r.peak / sigma).toBeLessThan(6);
  });

  it('finds mains hum at 50 Hz and counts its power A²/2 in the band, and reports no 60 Hz tone', () => {
    const sigma = 0.005;
    const a = 0.02;
    const x = noise(n, sigma, gaussian(7));
    for (let i = 0; i < n; i++) x[i]! += a * Math.sin((2 * Math.PI * 50 * i) / fs + 0.3);
    const r = backgroundNoise(x, fs, { bandHz: [5, 400] });
    // Mean square in the band = A²/2 (sine) + σ²·B/(fs/2) (white noise): power adds for uncorrelated parts.
    const expected = Math.sqrt((a * a) / 2 + (sigma * sigma * 395) / (fs / 2));
    expect(Math.abs(r.rmsInBand / expected - 1)).toBeLessThan(0.02);
    const hum = r.tones.find((t) => t.testedHz === 50);
    expect(hum).toBeDefined();
    expect(Math.abs(hum!.fHz - 50)).toBeLessThanOrEqual(r.f[1]! - r.f[0]!);
    // Tone line vs floor: A²/2 spread over the Hann ENBW (1.5 lines) against 2σ²/fs per Hz: ≈ 10·log10((A²/2)/(1.5·Δf) / (2σ²/fs)) ≈ 30 dB.
    expect(hum!.aboveFloorDb).toBeGreaterThan(25);
    expect(r.tones.some((t) => t.testedHz === 60)).toBe(false);
  });

  it('removes the mean first, as an AC-coupled chain would', () => {
    const x = noise(n, 0.01, gaussian(3));
    const shifted = x.map((v) => v + 3);
    const a = backgroundNoise(x, fs, { bandHz: [5, 400] });
    const b = backgroundNoise(shifted, fs, { bandHz: [5, 400] });
    expect(b.mean - a.mean).toBeCloseTo(3, 12);
    expect(b.rms).toBeCloseTo(a.rms, 12);
    expect(b.rmsInBand).toBeCloseTo(a.rmsInBand, 12);
  });

  it('refuses bad input with a RangeError that names it', () => {
    expect(() => backgroundNoise(new Float64Array(8), fs, { bandHz: [5, 400] })).toThrow(RangeError);
    expect(() => backgroundNoise(noise(1000, 1, gaussian(1)), fs, { bandHz: [400, 5] })).toThrow(/bandHz=\[400, 5\]/);
    expect(() => backgroundNoise(noise(1000, 1, gaussian(1)), 0, { bandHz: [5, 400] })).toThrow(/fs/);
    const bad = noise(1000, 1, gaussian(1));
    bad[10] = Number.NaN;
    expect(() => backgroundNoise(bad, fs, { bandHz: [5, 400] })).toThrow(/NaN|finite/);
  });
});
