import { describe, expect, it } from 'vitest';
import { coherenceOverBand, flagReasons } from './flag-reasons.ts';

// Lines every 1 Hz from 0 to 100 Hz; the band of interest 5–75 Hz holds the 71 lines 5, 6, …, 75.
const f = Float64Array.from({ length: 101 }, (_, k) => k);
const band = { low: 5, high: 75 };

describe('flag reasons of a schedule entry', () => {
  it('reads the mean, the share below the threshold and the lowest line over the band only', () => {
    // γ² = 0.5 on the 21 lines 5–25 Hz, 1 elsewhere; the lines outside the band (0.1) do not count.
    const g = Float64Array.from(f, (fk) => (fk < 5 || fk > 75 ? 0.1 : fk <= 25 ? 0.5 : 1));
    const c = coherenceOverBand(f, g, band, 0.9)!;
    // Arithmetic: (21 × 0.5 + 50 × 1) / 71 = 60.5 / 71 = 0.852112…; 21 / 71 = 29.6 % below.
    expect(c.lines).toBe(71);
    expect(c.mean).toBeCloseTo(60.5 / 71, 12);
    expect(c.belowShare).toBeCloseTo(21 / 71, 12);
    expect(c.min).toBe(0.5);
    expect(c.minAt).toBe(5);
  });

  it('says the mean coherence, the band and the threshold in words when the coherence is low', () => {
    const g = Float64Array.from(f, (fk) => (fk <= 25 ? 0.5 : 1));
    const reasons = flagReasons({ f, coherence: g, bandHz: band, threshold: 0.9, requiredHits: 5, acceptedHits: 5, averages: 5 });
    expect(reasons).toHaveLength(1);
    const [r] = reasons;
    expect(r!.code).toBe('low-coherence');
    expect(r!.value).toBeCloseTo(60.5 / 71, 12); // arithmetic, as above
    expect(r!.threshold).toBe(0.9);
    expect(r!.message).toBe('coherence 0.85 mean over 5–75 Hz, below 0.90; γ² is under 0.90 on 30 % of the band, lowest 0.50 at 5 Hz');
    expect(r!.advice).toMatch(/nearer the point.*harder tip.*softer one.*sensor mounting/);
  });

  it('gives no reason when the mean coherence reaches the threshold, nor while hits are missing', () => {
    const g = Float64Array.from(f, () => 0.95);
    expect(flagReasons({ f, coherence: g, bandHz: band, threshold: 0.9, requiredHits: 5, acceptedHits: 5, averages: 5 })).toEqual([]);
    const low = Float64Array.from(f, () => 0.3);
    expect(flagReasons({ f, coherence: low, bandHz: band, threshold: 0.9, requiredHits: 5, acceptedHits: 4, averages: 4 })).toEqual([]);
  });

  it('takes the threshold from the settings: a mean of 0.85 passes 0.8 and fails 0.9', () => {
    const g = Float64Array.from(f, () => 0.85);
    expect(flagReasons({ f, coherence: g, bandHz: band, threshold: 0.8, requiredHits: 3, acceptedHits: 3, averages: 3 })).toEqual([]);
    const [r] = flagReasons({ f, coherence: g, bandHz: band, threshold: 0.9, requiredHits: 3, acceptedHits: 3, averages: 3 });
    expect(r!.message).toMatch(/^coherence 0\.85 mean over 5–75 Hz, below 0\.90; γ² is under 0\.90 on 100 % of the band/);
  });

  it('names accepted hits left out of the average and an entry with nothing to average', () => {
    const g = Float64Array.from(f, () => 0.99);
    const [left] = flagReasons({ f, coherence: g, bandHz: band, threshold: 0.9, requiredHits: 5, acceptedHits: 5, averages: 3 });
    expect(left).toMatchObject({ code: 'hits-left-out', value: 2, threshold: 0 });
    expect(left!.message).toMatch(/^2 of 5 accepted hits were recorded under other acquisition settings/);
    const none = flagReasons({ f, coherence: null, bandHz: band, threshold: 0.9, requiredHits: 5, acceptedHits: 5, averages: 0 });
    expect(none.map((r) => r.code)).toEqual(['hits-left-out', 'no-average']);
  });
});
