import { describe, expect, it } from 'vitest';
import { frac, mac } from './assurance.ts';

describe('mac and frac', () => {
  it('gives the field-reference MAC check values', () => {
    // field-reference §6.7 [calc]
    expect(mac([1, 2, 3], [1, 2, 3])).toBeCloseTo(1, 15);
    expect(mac([1, 1, 1], [1, 0, -1])).toBe(0);
    expect(mac([1, 0], [1, 1])).toBeCloseTo(0.5, 15);
    expect(mac([1, 2, 3], [1, 2, 3.5])).toBeCloseTo(0.994824, 6);
    // field-reference §7.3(a): the two 2-DOF modes (1/√2)[1, 1] and (1/√2)[1, −1] → 0
    expect(mac([Math.SQRT1_2, Math.SQRT1_2], [Math.SQRT1_2, -Math.SQRT1_2])).toBeCloseTo(0, 15);
  });

  it('ignores a complex scale factor: φ against (2 − j)·φ gives 1', () => {
    const phi = { re: new Float64Array([1, -0.5, 0.3]), im: new Float64Array([0.2, 0.1, -0.4]) };
    const scaled = {
      re: phi.re.map((r, i) => 2 * r + phi.im[i]),
      im: phi.im.map((m, i) => 2 * m - phi.re[i]),
    };
    // field-reference §6.7 [calc]: φ against (2 − j)·φ → 1
    expect(mac(phi, scaled)).toBeCloseTo(1, 14);
    // field-reference §6.7: FRAC cannot see a constant complex factor
    expect(frac(phi, scaled)).toBeCloseTo(1, 14);
    expect(mac([0, 0], [1, 2])).toBe(0);
  });
});
