import { describe, expect, it } from 'vitest';
import { closeModes } from '../../test/close-modes.ts';
import { cmif, sumFrf } from './cmif.ts';
import { axis, loadModalFixture, twoDof63 } from '../../test/modal-systems.ts';

const fx = loadModalFixture('close-modes-cmif.json');

function localMaxima(y: Float64Array, f: Float64Array, lo: number, hi: number): number[] {
  const out: number[] = [];
  for (let k = 1; k < y.length - 1; k++) if (f[k] >= lo && f[k] <= hi && y[k] > y[k - 1] && y[k] >= y[k + 1]) out.push(f[k]);
  return out;
}

describe('cmif and sumFrf', () => {
  it('equals √(Σ_j |H_j|²) with a single reference (docs/methods.md#cmif, exact)', () => {
    const set = twoDof63(axis(0, 0.5, 801), [0]);
    const c = cmif(set);
    expect(c.values).toHaveLength(1);
    for (let k = 0; k < c.f.length; k++) {
      let s = 0;
      for (const q of set.frfs) s += q.h.re[k] ** 2 + q.h.im[k] ** 2;
      expect(Math.abs(c.values[0][k] / Math.sqrt(s) - 1)).toBeLessThan(1e-13);
    }
  });

  it('gives the singular values numpy.linalg.svd gives for a 6 × 2 FRF matrix', () => {
    const m = closeModes(fx.references, 0);
    const c = cmif(m.set);
    expect(c.values).toHaveLength(2);
    (fx.f as number[]).forEach((fk, r) => {
      const k = Math.round(fk / 0.1);
      expect(c.f[k]).toBeCloseTo(fk, 9);
      // numpy 2.4 svd (fixture close-modes-cmif.json), sorted descending
      expect(Math.abs(c.values[0][k] / fx.singularValues[r][0] - 1)).toBeLessThan(1e-9);
      expect(Math.abs(c.values[1][k] / fx.singularValues[r][1] - 1)).toBeLessThan(1e-9);
      expect(c.values[0][k]).toBeGreaterThanOrEqual(c.values[1][k]);
    });
  });

  it('shows two modes 1 % apart as a double peak with two references', () => {
    const m = closeModes([0, 4], 0);
    const c = cmif(m.set);
    // the first curve peaks at both modes (100 and 101 Hz) — Shih et al. 1988, docs/methods.md#cmif
    // (within 0.15 Hz: 1.5 lines of 0.1 Hz; the two modes pull each other's peak a little)
    const first = localMaxima(c.values[0], c.f, 95, 106);
    expect(first).toHaveLength(2);
    expect(Math.abs(first[0] - 100)).toBeLessThan(0.15);
    expect(Math.abs(first[1] - 101)).toBeLessThan(0.15);
    // the second curve peaks between them and stays high: a second mode is present (ratio is a test threshold)
    const second = localMaxima(c.values[1], c.f, 95, 106);
    expect(second).toHaveLength(1);
    expect(second[0]).toBeGreaterThanOrEqual(99.5);
    expect(second[0]).toBeLessThanOrEqual(101.5);
    const k = Math.round(second[0] / 0.1);
    expect(c.values[1][k] / c.values[0][k]).toBeGreaterThan(0.3);
  });

  it('sums |H| over all FRFs', () => {
    const set = twoDof63(axis(0, 0.5, 401), [0, 1]);
    const s = sumFrf(set);
    expect(s.values).toHaveLength(1);
    for (const k of [0, 100, 201, 348]) {
      const want = set.frfs.reduce((a, q) => a + Math.hypot(q.h.re[k], q.h.im[k]), 0);
      expect(s.values[0][k]).toBeCloseTo(want, 15);
    }
    // docs/methods.md#check-systems, #frf-kinds: at 0 Hz the receptance is K⁻¹, Σ|K⁻¹_ij| = (2·2 + 2·1)/(3·400000) m/N
    expect(s.values[0][0]).toBeCloseTo(6 / 1.2e6, 15);
  });
});
