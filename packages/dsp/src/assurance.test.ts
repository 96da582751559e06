import { describe, expect, it } from 'vitest';
import { frac, mac } from './assurance.ts';

describe('mac and frac', () => {
  it('gives the MAC check values of docs/methods.md#mac', () => {
    // docs/methods.md#mac [calc]
    expect(mac([1, 2, 3], [1, 2, 3])).toBeCloseTo(1, 15);
    expect(mac([1, 1, 1], [1, 0, -1])).toBe(0);
    expect(mac([1, 0], [1, 1])).toBeCloseTo(0.5, 15);
    expect(mac([1, 2, 3], [1, 2, 3.5])).toBeCloseTo(0.994824, 6);
    // docs/methods.md#chain-2dof: the two 2-DOF modes (1/√2)[1, 1] and (1/√2)[1, −1] → 0
    expect(mac([Math.SQRT1_2, Math.SQRT1_2], [Math.SQRT1_2, -Math.SQRT1_2])).toBeCloseTo(0, 15);
  });

  it('ignores a complex scale factor: φ against (2 − j)·φ gives 1', () => {
    const phi = { re: new Float64Array([1, -0.5, 0.3]), im: new Float64Array([0.2, 0.1, -0.4]) };
    const scaled = {
      re: phi.re.map((r, i) => 2 * r + phi.im[i]),
      im: phi.im.map((m, i) => 2 * m - phi.re[i]),
    };
    // docs/methods.md#mac [calc]: φ against (2 − j)·φ → 1
    expect(mac(phi, scaled)).toBeCloseTo(1, 14);
    // docs/methods.md#frac: FRAC cannot see a constant complex factor
    expect(frac(phi, scaled)).toBeCloseTo(1, 14);
    expect(mac([0, 0], [1, 2])).toBe(0);
  });
});
