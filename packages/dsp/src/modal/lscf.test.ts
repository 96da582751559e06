import { describe, expect, it } from 'vitest';
import { classifyPoles, pickStablePoles, type PoleForStability } from './stability.ts';
import { stabilizationDiagram } from './lscf.ts';
import { axis, loadModalFixture, threeDof, twoDof63 } from '../../test/modal-systems.ts';
import { closeModes } from '../../test/close-modes.ts';
import type { Complex } from '../types.ts';

const sys = loadModalFixture('systems.json');
const rel = (a: number, b: number) => Math.abs(a - b) / Math.abs(b);


describe('stabilizationDiagram (poly-reference LSCF)', () => {
  it('reproduces the docs/methods.md#lscf check: n = 4 on 50–200 Hz, Δf = 0.125 Hz, Δt = 1/1024 s', () => {
    // axis 0…512 Hz; the published check uses Δt = 1/(2·512) s (the data's rate, timeBase 'data') and unit weights
    const set = twoDof63(axis(0, 0.125, 4097), [0]);
    const d = stabilizationDiagram(set, { bandHz: [50, 200], orders: [4], timeBase: 'data', weighting: 'unit' });
    expect(d.dtS).toBe(1 / 1024);
    const p = d.orders[0].poles;
    expect(p).toHaveLength(2);
    // docs/methods.md#lscf [calc]; Guillaume et al. 2003: f = 100.65849 / 174.34415 Hz, ζ = 0.99972 % / 1.99933 %,
    // suggested tolerances 1e-4 relative on f, 1e-3 relative on ζ
    expect(rel(p[0].fHz, 100.65849)).toBeLessThan(1e-4);
    expect(rel(p[1].fHz, 174.34415)).toBeLessThan(1e-4);
    expect(rel(p[0].zeta, 0.0099972)).toBeLessThan(1e-3);
    expect(rel(p[1].zeta, 0.0199933)).toBeLessThan(1e-3);
    // same check, tighter: the unit-weight estimator is deterministic, so it should agree to the printed digits
    expect(p[0].fHz).toBeCloseTo(100.65849, 5);
    expect(p[1].fHz).toBeCloseTo(174.34415, 5);
  });

  it('recovers the docs/methods.md#chain-2dof-lscf 2-DOF poles to 1e-4 in frequency and 1e-3 in damping at orders 6–20, all stable', () => {
    const set = twoDof63(axis(0, 0.125, 4097), [0]);
    const d = stabilizationDiagram(set, { bandHz: [50, 200], orders: [6, 8, 10, 12, 16, 20] });
    expect(d.orders).toHaveLength(6);
    for (const o of d.orders) {
      for (let r = 0; r < 2; r++) {
        const p = o.poles.find((q) => rel(q.fHz, sys.twoDof63.fn[r]) < 1e-4);
        // scipy.linalg.eig of the state matrix (fixture systems.json): f_n and ζ of each mode
        expect(p, `order ${o.order} mode ${r + 1}`).toBeDefined();
        expect(rel(p!.zeta, sys.twoDof63.zeta[r])).toBeLessThan(1e-3);
        // docs/methods.md#stabilization: poles that agree across orders are stable in all three checks
        if (o.order > 6) expect(p!.stable).toBe('all');
      }
    }
  });

  it('recovers the docs/methods.md#chain-3dof 3-DOF poles from receptance, mobility and accelerance alike', () => {
    const f = axis(0, 0.01, 2001); // 0…20 Hz
    for (const kind of ['receptance', 'mobility', 'accelerance'] as const) {
      const d = stabilizationDiagram(threeDof(f, kind), { bandHz: [1, 15], orders: [6, 8, 10, 12] });
      const top = pickStablePoles(d);
      expect(top, kind).toHaveLength(3);
      top.forEach((p, r) => {
        // scipy.linalg.eig (fixture systems.json); docs/methods.md#chain-3dof 3.85203, 7.11763, 9.29963 Hz
        expect(rel(p.fHz, sys.threeDof73d.fn[r])).toBeLessThan(1e-4);
        expect(rel(p.zeta, sys.threeDof73d.zeta[r])).toBeLessThan(1e-3);
      });
    }
  });

  it('resolves two modes 1 % apart (100 and 101 Hz, ζ = 0.5 %) with two references at the lowest order', () => {
    const m = closeModes([0, 4], 0);
    const d = stabilizationDiagram(m.set, { bandHz: [95, 106], orders: [2, 4, 6], });
    expect(d.orders).toHaveLength(3);
    // order 2 with 2 references has 4 poles, i.e. exactly the 2 modes
    for (const o of d.orders) {
      expect(o.poles.length).toBeGreaterThanOrEqual(2);
      for (let r = 0; r < 2; r++) {
        // closed-form modal model of the test (m.fHz, m.zeta): noise-free, so 1e-4 / 1e-3 as docs/methods.md#lscf
        const p = o.poles.find((q) => rel(q.fHz, m.fHz[r]) < 1e-4);
        expect(p, `order ${o.order}, ${m.fHz[r]} Hz`).toBeDefined();
        expect(rel(p!.zeta, m.zeta)).toBeLessThan(1e-3);
        // reciprocity (docs/methods.md#modal-model): the participation factor is the shape at the references
        const l = p!.participation;
        const exact = [m.psi[r][0], m.psi[r][4]];
        const dot = Math.hypot(l.re[0] * exact[0] + l.re[1] * exact[1], l.im[0] * exact[0] + l.im[1] * exact[1]);
        const macL = (dot * dot) / ((l.re[0] ** 2 + l.im[0] ** 2 + l.re[1] ** 2 + l.im[1] ** 2) * (exact[0] ** 2 + exact[1] ** 2));
        expect(macL).toBeGreaterThan(0.9999);
      }
    }
    expect(d.orders[0].poles).toHaveLength(2);
  });

  it('keeps both close modes stable in all checks with 1 % noise and two references', () => {
    const m = closeModes([0, 4], 0.01);
    const d = stabilizationDiagram(m.set, { bandHz: [95, 106], orders: [2, 4, 6, 8, 10], });
    for (const o of d.orders.slice(1)) {
      for (let r = 0; r < 2; r++) {
        const p = o.poles.find((q) => rel(q.fHz, m.fHz[r]) < 1e-3 && q.stable === 'all');
        // 1 % relative noise: within 0.1 % in f (half-power bandwidth is 1 %), 10 % in ζ (common practice)
        expect(p, `order ${o.order}, ${m.fHz[r]} Hz`).toBeDefined();
        expect(rel(p!.zeta, m.zeta)).toBeLessThan(0.1);
      }
    }
  });

  it('keeps only poles inside the band with 0 < ζ ≤ maxDampingRatio, sorted by frequency', () => {
    const set = twoDof63(axis(0, 0.125, 4097), [0]);
    const d = stabilizationDiagram(set, { bandHz: [50, 200], orders: [30, 40], maxDampingRatio: 0.05 });
    expect(d.orders).toHaveLength(2);
    // the band holds both modes, so each order keeps poles to check
    for (const o of d.orders) expect(o.poles.length).toBeGreaterThanOrEqual(2);
    for (const o of d.orders) {
      for (let r = 0; r < o.poles.length; r++) {
        const p = o.poles[r];
        expect(p.fHz).toBeGreaterThanOrEqual(50);
        expect(p.fHz).toBeLessThanOrEqual(200);
        expect(p.zeta).toBeGreaterThan(0);
        expect(p.zeta).toBeLessThanOrEqual(0.05);
        if (r > 0) expect(p.fHz).toBeGreaterThan(o.poles[r - 1].fHz);
        // definitions f = |λ|/2π and ζ = −Re λ/|λ| (docs/methods.md#poles)
        expect(Math.hypot(p.lambda.re, p.lambda.im) / (2 * Math.PI)).toBeCloseTo(p.fHz, 9);
        expect(-p.lambda.re / Math.hypot(p.lambda.re, p.lambda.im)).toBeCloseTo(p.zeta, 12);
      }
    }
  });

  it('gives the same poles whatever the FRFs are scaled by (the estimator is scale invariant)', () => {
    const set = twoDof63(axis(0, 0.125, 4097), [0]);
    const scaled = { ...set, frfs: set.frfs.map((q) => ({ ...q, h: { re: q.h.re.map((v) => v * 1e6), im: q.h.im.map((v) => v * 1e6) } })) };
    const a = stabilizationDiagram(set, { bandHz: [50, 200], orders: [8] }).orders[0].poles;
    const b = stabilizationDiagram(scaled, { bandHz: [50, 200], orders: [8] }).orders[0].poles;
    expect(b).toHaveLength(a.length);
    // exact in exact arithmetic; the near-singular noise-free normal equations leave rounding at ~1e-8
    b.forEach((p, r) => expect(rel(p.fHz, a[r].fHz)).toBeLessThan(1e-7));
  });

  it('returns no stable pole in a band between the modes of a noise-free system', () => {
    // docs/methods.md#chain-3dof chain, 4.5–6.5 Hz lies between the 3.85 and 7.12 Hz modes
    const d = stabilizationDiagram(threeDof(axis(0, 0.01, 2001)), { bandHz: [4.5, 6.5], orders: [2, 4, 6, 8] });
    expect(pickStablePoles(d)).toEqual([]);
  });
});

function shape(v: number[]): Complex {
  return { re: Float64Array.from(v), im: new Float64Array(v.length) };
}

describe('classifyPoles (docs/methods.md#stabilization, common practice)', () => {
  const prev: PoleForStability[] = [
    { fHz: 50, zeta: 0.01, shape: shape([1, 0.5, -0.2]) },
    { fHz: 120, zeta: 0.02, shape: shape([0.3, -1, 0.4]) },
    { fHz: 300, zeta: 0.005, shape: shape([1, 1, 1]) },
  ];

  it('marks identical pole sets at successive orders all stable', () => {
    expect(classifyPoles(prev, prev)).toEqual(['all', 'all', 'all']);
  });

  it('marks a 2 % frequency shift unstable in frequency', () => {
    const cur = prev.map((p) => ({ ...p, fHz: p.fHz * 1.02 }));
    expect(classifyPoles(prev, cur)).toEqual(['new', 'new', 'new']);
    // 0.5 % stays inside the 1 % tolerance
    expect(classifyPoles(prev, prev.map((p) => ({ ...p, fHz: p.fHz * 1.005 })))).toEqual(['all', 'all', 'all']);
  });

  it('marks a 10 % damping change stable in frequency only, and a changed shape stable in frequency and damping', () => {
    expect(classifyPoles(prev, [{ ...prev[0], zeta: 0.011 }])).toEqual(['freq']);
    // MAC([1, 0.5, −0.2], [1, −0.5, −0.2]) = (1 − 0.25 + 0.04)²/1.29² = 0.375 < 0.98
    expect(classifyPoles(prev, [{ ...prev[0], shape: shape([1, -0.5, -0.2]) }])).toEqual(['freq-damp']);
  });

  it('uses the tolerances it is given', () => {
    const cur = [{ ...prev[1], fHz: 120 * 1.02 }];
    expect(classifyPoles(prev, cur, { freq: 0.03 })).toEqual(['all']);
    expect(classifyPoles(prev, [])).toEqual([]);
    expect(classifyPoles([], prev)).toEqual(['new', 'new', 'new']);
  });
});
