import { describe, expect, it } from 'vitest';
import { loadFixture, maxAbs, maxAbsDiff } from '../test/helpers.ts';
import { resampleFilter, resamplePoly, resampleRatio } from './resample.ts';

interface ResampleFixture {
  cases: { up: number; down: number; x: number[]; y: number[] }[];
  filter_up2_down3: number[];
}

describe('resamplePoly', () => {
  const fixture = loadFixture<ResampleFixture>('resample.json');

  it('designs the same Kaiser-windowed sinc filter as scipy.signal.firwin', () => {
    const h = resampleFilter(2, 3);
    // scipy.signal.firwin(61, 1/3, window=('kaiser', 5.0)) * 2 (tests/reference/resample_fixture.py)
    expect(h.length).toBe(fixture.filter_up2_down3.length);
    expect(maxAbsDiff(h, fixture.filter_up2_down3)).toBeLessThan(1e-13);
  });

  it.each([0, 1, 2, 3, 4])('matches scipy.signal.resample_poly sample for sample (case %i)', (i) => {
    const c = fixture.cases[i]!;
    const y = resamplePoly(c.x, c.up, c.down);
    expect(y.length).toBe(c.y.length);
    // scipy 1.17 resample_poly with defaults (tests/fixtures/dsp/resample.json); float64 rounding only
    expect(maxAbsDiff(y, c.y) / maxAbs(c.y)).toBeLessThan(1e-12);
  });

  it('keeps a tone below both Nyquist frequencies at its amplitude and phase (48 kHz → 2048 Hz)', () => {
    const from = 48_000;
    const to = 2048;
    const { up, down } = resampleRatio(from, to);
    expect([up, down]).toEqual([16, 375]); // 2048/48000 reduced by gcd 128
    const f0 = 100;
    const x = Float64Array.from({ length: from }, (_, i) => Math.sin((2 * Math.PI * f0 * i) / from));
    const y = resamplePoly(x, up, down);
    // closed form: sin(2π f0 k / 2048); away from the record ends (the filter's half-length) the
    // Kaiser β = 5 design passes 100 Hz at ≈ unit gain (passband ripple ~1e-3, Kaiser 1974)
    let worst = 0;
    for (let k = 100; k < y.length - 100; k++) worst = Math.max(worst, Math.abs(y[k]! - Math.sin((2 * Math.PI * f0 * k) / to)));
    expect(worst).toBeLessThan(2e-3);
  });

  it('refuses rates that are not whole numbers and empty input, naming the value', () => {
    expect(() => resampleRatio(44_100.5, 2048)).toThrow(/fromHz=44100.5/);
    expect(() => resamplePoly([], 2, 3)).toThrow(/x is empty/);
    expect(() => resamplePoly([1, 2], 0, 3)).toThrow(/up=0/);
  });
});
