import { describe, expect, it } from 'vitest';
import { amplitudeDb, firstPositiveLine, formatValue, fromAmplitudeDb, magnitudes, magnitudesDb, magnitudeTitle, phaseDeg, phasesDeg, STANDARD_GRAVITY, wrapPhaseDeg } from './frf-math.ts';

describe('decibels of an FRF', () => {
  it('gives 27.96 dB re 1 (m/s²)/N for 25 (m/s²)/N (20·log10 25, closed form)', () => {
    expect(amplitudeDb(25)).toBeCloseTo(27.96, 2);
  });

  it('gives 19.83 dB re 1 (m/s²)/N for 1 g/N, with g = 9.80665 m/s² (20·log10 9.80665, closed form)', () => {
    expect(amplitudeDb(1 * STANDARD_GRAVITY)).toBeCloseTo(19.83, 2);
  });

  it('computes the same dB from complex values as from their magnitude, and inverts', () => {
    // 3 + 4j has |H| = 5 exactly, so 20·log10(5) = 13.9794 dB.
    const db = magnitudesDb({ re: [3, 0, -25], im: [4, 25, 0] });
    expect(db[0]).toBeCloseTo(13.9794, 4);
    expect(db[1]).toBeCloseTo(27.9588, 4);
    expect(db[2]).toBeCloseTo(27.9588, 4);
    expect(fromAmplitudeDb(amplitudeDb(0.0123))).toBeCloseTo(0.0123, 12);
    expect(Array.from(magnitudes({ re: [3], im: [-4] }))).toEqual([5]);
  });

  it('never returns −∞ or NaN for a zero magnitude', () => {
    expect(amplitudeDb(0)).toBe(-600);
    expect(magnitudesDb({ re: [0], im: [0] })[0]).toBeCloseTo(-600, 6);
  });

  it('refuses arrays of different length and non-finite input, naming the bad value', () => {
    expect(() => magnitudesDb({ re: [1, 2], im: [1] })).toThrow(/re has 2 values but im has 1/);
    expect(() => amplitudeDb(Number.NaN)).toThrow(/magnitude=NaN/);
  });
});

describe('phase wrapping to (−180°, 180°]', () => {
  it('maps −180 to 180 and keeps 180', () => {
    expect(wrapPhaseDeg(-180)).toBe(180);
    expect(wrapPhaseDeg(180)).toBe(180);
    expect(phaseDeg(-1, 0)).toBe(180);
    expect(phaseDeg(-1, -0)).toBe(180);
  });

  it('wraps angles beyond one turn either way', () => {
    expect(wrapPhaseDeg(190)).toBeCloseTo(-170, 12);
    expect(wrapPhaseDeg(-190)).toBeCloseTo(170, 12);
    expect(wrapPhaseDeg(540)).toBeCloseTo(180, 12);
    expect(wrapPhaseDeg(-540)).toBeCloseTo(180, 12);
    expect(wrapPhaseDeg(720)).toBeCloseTo(0, 12);
    expect(wrapPhaseDeg(0)).toBe(0);
    expect(wrapPhaseDeg(-179.5)).toBe(-179.5);
  });

  it('gives the quadrant phases of complex values', () => {
    const p = phasesDeg({ re: [1, 0, -1, 0], im: [0, 1, 0, -1] });
    expect(Array.from(p)).toEqual([0, 90, 180, -90]);
    for (const deg of [-720, -359, -181, -180, -1, 0, 1, 179, 180, 181, 359, 1000]) {
      const w = wrapPhaseDeg(deg);
      expect(w).toBeGreaterThan(-180);
      expect(w).toBeLessThanOrEqual(180);
      // The wrapped angle differs from the input by whole turns.
      expect(Math.abs(Math.round((deg - w) / 360) * 360 - (deg - w))).toBeLessThan(1e-9);
    }
  });
});

describe('labels and readouts', () => {
  it('prints the dB reference with the unit of the FRF kind', () => {
    expect(magnitudeTitle('accelerance', true)).toBe('|H1| (dB re 1 (m/s²)/N)');
    expect(magnitudeTitle('mobility', false)).toBe('|H1| ((m/s)/N)');
    expect(magnitudeTitle('receptance', true)).toBe('|H1| (dB re 1 m/N)');
  });

  it('skips the 0 Hz line for a log frequency axis and formats values', () => {
    expect(firstPositiveLine([0, 0.5, 1])).toBe(1);
    expect(formatValue(27.9588)).toBe('27.96');
    expect(formatValue(null)).toBe('–');
  });
});

describe('min/max decimation for drawing', async () => {
  const { minMaxDecimate } = await import('./decimate.ts');
  it('keeps the peak and the notch of each bucket, in frequency order', () => {
    const x = Float64Array.from({ length: 1000 }, (_, k) => k);
    const y = Float64Array.from(x, (k) => (k === 437 ? 50 : k === 612 ? -80 : Math.sin(k / 30)));
    const d = minMaxDecimate(x, y, 100);
    expect(d.x.length).toBeLessThanOrEqual(200);
    expect(Math.max(...d.y)).toBe(50);
    expect(Math.min(...d.y)).toBe(-80);
    expect(d.x[Array.from(d.y).indexOf(50)]).toBe(437);
    for (let k = 1; k < d.x.length; k++) expect(d.x[k]!).toBeGreaterThan(d.x[k - 1]!);
  });
  it('leaves short curves alone', () => {
    const x = new Float64Array([1, 2, 3]);
    expect(minMaxDecimate(x, x, 10).x).toBe(x);
  });
});
