// drivingPointMeasure on the simply supported beam, modes sin(nπx/L) (Blevins 1979): closed forms.
import { describe, expect, it } from 'vitest';
import { drivingPointMeasure } from './driving-point.ts';
import { simplySupportedBeam } from '../../test/correlation-support.ts';

const shapes = simplySupportedBeam(3, 41);
const x = (i: number) => i / 40;

describe('drivingPointMeasure', () => {
  it('is zero at a node: the supports (every mode) exactly, midspan (mode 2) to rounding', () => {
    const d = drivingPointMeasure(shapes);
    // sin(0) = 0 exactly at x = 0
    expect(d.product[0]).toBe(0);
    expect(d.minimum[0]).toBe(0);
    // sin(nπ) is 1.2e-16·n in floating point, not 0, at x = L
    expect(d.product[40]).toBeLessThan(1e-15);
    // midspan: sin(2π·½) = 0 → the product and the minimum vanish; the weakest mode is mode 2 (index 1)
    expect(d.product[20]).toBeLessThan(1e-15);
    expect(d.minimum[20]).toBeLessThan(1e-15);
    expect(d.weakestMode[20]).toBe(1);
    expect(d.ranking.slice(-3)).not.toContain(10);
    expect(Array.from(d.ranking.slice(-3)).sort((a, b) => a - b)).toEqual([0, 20, 40]);
  });

  it('equals Π_r |sin(rπx)| / max_j |sin(rπx_j)| at every candidate (closed form)', () => {
    const d = drivingPointMeasure(shapes);
    // every mode reaches |sin| = 1 on the grid (x = ½ for modes 1 and 3, x = ¼ for mode 2), so no rescaling
    const peak3 = 1;
    for (let i = 0; i <= 40; i++) {
      const a = [Math.abs(Math.sin(Math.PI * x(i))), Math.abs(Math.sin(2 * Math.PI * x(i))), Math.abs(Math.sin(3 * Math.PI * x(i))) / peak3];
      expect(d.product[i]).toBeCloseTo(a[0]! * a[1]! * a[2]!, 14);
      expect(d.minimum[i]).toBeCloseTo(Math.min(...a), 14);
      expect(d.geometricMean[i]).toBeCloseTo(Math.cbrt(a[0]! * a[1]! * a[2]!), 12);
    }
    // at x = L/4: sin(π/4) = √2/2 (mode 1), sin(π/2) = 1, sin(3π/4) = √2/2 (mode 3): the tie goes to the lower mode
    expect(d.minimum[10]).toBeCloseTo(Math.SQRT1_2, 14);
    expect(d.weakestMode[10]).toBe(0);
  });

  it('ranks first the candidate where |sin πx · sin 2πx · sin 3πx| is largest on the grid, and its mirror next', () => {
    const d = drivingPointMeasure(shapes);
    let best = 0;
    for (let i = 1; i <= 40; i++) {
      const p = (j: number) => Math.abs(Math.sin(Math.PI * x(j)) * Math.sin(2 * Math.PI * x(j)) * Math.sin(3 * Math.PI * x(j)));
      if (p(i) > p(best) + 1e-12) best = i;
    }
    // the function is symmetric about midspan, so the best and its mirror tie; the lower index is ranked first
    expect(d.ranking[0]).toBe(best);
    expect(d.ranking[1]).toBe(40 - best);
  });

  it('does not depend on how each mode is scaled or signed', () => {
    const a = drivingPointMeasure(shapes);
    const b = drivingPointMeasure(shapes.map((s, r) => s.map((v) => v * [-3, 0.01, 250][r]!)));
    for (let i = 0; i <= 40; i++) expect(b.product[i]).toBeCloseTo(a.product[i]!, 14);
    expect(Array.from(b.ranking)).toEqual(Array.from(a.ranking));
  });

  it('refuses an empty list, an all-zero mode and shapes of different lengths', () => {
    expect(() => drivingPointMeasure([])).toThrow(/empty/);
    expect(() => drivingPointMeasure([new Float64Array(4)])).toThrow(/shapes\[0\] is all zeros/);
    expect(() => drivingPointMeasure([[1, 2, 3], [1, 2]])).toThrow(/shapes\[1\] has length 2 but shapes\[0\] has length 3/);
  });
});
