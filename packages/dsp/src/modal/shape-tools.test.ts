import { describe, expect, it } from 'vitest';
import { frac, mac } from '../assurance.ts';
import { macMatrix, mpc, realShape } from './shape-tools.ts';

const c = (re: number[], im: number[]) => ({ re: Float64Array.from(re), im: Float64Array.from(im) });

describe('MAC, FRAC and MPC check values (docs/methods.md#mac)', () => {
  it('gives the MAC check values of docs/methods.md#mac [calc]; Allemang & Brown 1982', () => {
    expect(mac([1, 1, 1], [1, 0, -1])).toBeCloseTo(0, 15);
    expect(mac([1, 0], [1, 1])).toBeCloseTo(0.5, 15);
    expect(mac([1, 2, 3], [1, 2, 3.5])).toBeCloseTo(0.994824, 6);
    // φ against (2 − j)·φ → 1
    const phi = c([0.3, -1, 0.7], [0.1, 0.2, -0.4]);
    const scaled = c([0, 1, 2].map((i) => 2 * phi.re[i] + phi.im[i]), [0, 1, 2].map((i) => 2 * phi.im[i] - phi.re[i]));
    expect(mac(phi, scaled)).toBeCloseTo(1, 14);
    // the two 2-DOF modes of docs/methods.md#chain-2dof → 0
    expect(mac([1, 1], [1, -1])).toBeCloseTo(0, 15);
  });

  it('builds a MAC table with the same values', () => {
    const t = macMatrix([[1, 1, 1], [1, 2, 3]], [[1, 0, -1], [1, 2, 3.5], [1, 1, 1]]);
    expect(t).toHaveLength(2);
    // docs/methods.md#mac [calc]
    expect(t[0][0]).toBeCloseTo(0, 15);
    expect(t[1][1]).toBeCloseTo(0.994824, 6);
    expect(t[0][2]).toBeCloseTo(1, 15);
    // MAC([1,2,3],[1,1,1]) = 36/(14·3) = 6/7, closed form
    expect(t[1][2]).toBeCloseTo(6 / 7, 14);
  });

  it('gives FRAC = 1 for FRFs that differ by a constant complex factor (docs/methods.md#frac)', () => {
    const h = c([1, 2, -1, 0.5], [0.3, -0.2, 0.1, 1]);
    const g = c([0, 1, 2, 3].map((i) => 3 * h.re[i]), [0, 1, 2, 3].map((i) => 3 * h.im[i]));
    expect(frac(h, g)).toBeCloseTo(1, 14);
  });

  it('gives MPC 1 for a real shape, 0 for [1, j], and 1 for a real shape turned by any phase (Pappa et al. 1993)', () => {
    // docs/methods.md#mac [calc]
    expect(mpc([1, -0.5, 0.25])).toBe(1);
    expect(mpc(c([1, 0], [0, 1]))).toBeCloseTo(0, 15);
    const th = 0.7;
    const v = [1, -0.5, 0.25];
    expect(mpc(c(v.map((x) => x * Math.cos(th)), v.map((x) => x * Math.sin(th))))).toBeCloseTo(1, 14);
    // closed form ((a − c)² + 4b²)/(a + c)² for [1, 1 + j]: a = 2, b = 1, c = 1 → 5/9
    expect(mpc(c([1, 1], [0, 1]))).toBeCloseTo(5 / 9, 15);
  });

  it('rotates a complex shape to its best real approximation with the largest entry +1', () => {
    const th = -1.1;
    const v = [0.2, -1, 0.6];
    const r = realShape(c(v.map((x) => x * Math.cos(th)), v.map((x) => x * Math.sin(th))));
    // the pattern of v up to a global sign, scaled so the largest entry is +1: v/(−1)
    expect(Array.from(r)).toEqual([expect.closeTo(-0.2, 12), expect.closeTo(1, 12), expect.closeTo(-0.6, 12)]);
  });
});
