import { describe, expect, it } from 'vitest';
import { cabs, dtft } from '../test/helpers.ts';
import { decimationFilter } from './anti-alias.ts';

describe('decimationFilter', () => {
  for (const R of [4, 8, 16]) {
    it(`has unit DC gain, a flat passband to 0.4·fs and ≥ 95 dB rejection above 0.6·fs (R = ${R})`, () => {
      const taps = decimationFilter(R);
      const fsHi = R; // output fs = 1
      const centre = (taps.length - 1) / 2;
      const gain = (f: number) => cabs(dtft(taps, fsHi, f)) * fsHi; // dtft scales by Δt = 1/fsHi
      expect(Math.abs(taps.reduce((a, b) => a + b, 0) - 1)).toBeLessThan(1e-14);
      for (let k = 0; k < taps.length; k++) expect(taps[k]).toBeCloseTo(taps[taps.length - 1 - k], 15); // linear phase
      expect(centre).toBe(Math.floor(centre));
      for (let f = 0; f <= 0.4; f += 0.01) expect(Math.abs(gain(f) - 1)).toBeLessThan(1e-4);
      for (let f = 0.6; f <= R / 2; f += 0.013) expect(gain(f)).toBeLessThan(10 ** (-95 / 20));
    });
  }

  it('rejects an oversampling factor that is not an integer in [2, 64]', () => {
    expect(() => decimationFilter(1)).toThrow(/oversample=1/);
    expect(() => decimationFilter(2.5)).toThrow(/oversample=2.5/);
  });
});
