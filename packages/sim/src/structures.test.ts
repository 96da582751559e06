import { describe, expect, it } from 'vitest';
import { modeShapeValue } from './modal-model.ts';
import { pumpSkidBaseplate, PUMP_SKID_PLATE } from './pump-skid.ts';
import { steelBar, steelBarModel, STEEL_BAR_SUSPENSION, STEEL_BAR_ZETA } from './steel-bar.ts';

describe('steelBar', () => {
  const bar = steelBar();
  // The bending modes; the four rigid-body modes on the supports sit below 3 Hz.
  const elastic = bar.model.modes.filter((m) => m.fnHz > 10);

  it('has 21 points B01…B21 every 50 mm along X and lines between neighbours', () => {
    expect(bar.points).toHaveLength(21);
    bar.points.forEach((p, i) => {
      expect(p.label).toBe(`B${String(i + 1).padStart(2, '0')}`);
      expect(p.xMm).toBeCloseTo(50 * i, 10);
      expect(p.yMm).toBe(0);
      expect(p.zMm).toBe(0);
    });
    expect(bar.lines).toHaveLength(20);
    expect(bar.lines[0]).toEqual(['B01', 'B02']);
    expect(bar.lines[19]).toEqual(['B20', 'B21']);
  });

  it('carries the Euler–Bernoulli weak modes in ±Z and stiff modes in ±Y at the docs/methods.md#free-free-beam frequencies', () => {
    const z = elastic.filter((m) => 'B01:+Z' in m.shape).map((m) => Math.round(m.fnHz * 100) / 100);
    const y = elastic.filter((m) => 'B01:+Y' in m.shape).map((m) => Math.round(m.fnHz * 100) / 100);
    expect(z).toEqual([53.17, 146.55, 287.3, 474.93, 709.46]); // docs/methods.md#free-free-beam weak direction
    expect(y).toEqual([212.66, 586.22]); // docs/methods.md#free-free-beam stiff direction
    const f = bar.model.modes.map((m) => m.fnHz);
    expect([...f].sort((a, b) => a - b)).toEqual(f);
  });

  it('damps each bending mode as set: 0.42, 0.27, 0.35, 0.61, 0.24 % (weak) and 0.53, 0.38 % (stiff), no two alike', () => {
    // The invented pattern of docs/methods.md#demo-bar, by family and mode number.
    const weak = elastic.filter((m) => 'B01:+Z' in m.shape).map((m) => m.zeta);
    const stiff = elastic.filter((m) => 'B01:+Y' in m.shape).map((m) => m.zeta);
    expect(weak).toEqual([0.0042, 0.0027, 0.0035, 0.0061, 0.0024]);
    expect(stiff).toEqual([0.0053, 0.0038]);
    expect(new Set([...weak, ...stiff]).size).toBe(7);
    for (const z of [...STEEL_BAR_ZETA.weak, ...STEEL_BAR_ZETA.stiff]) {
      expect(z).toBeGreaterThanOrEqual(0.002);
      expect(z).toBeLessThanOrEqual(0.008);
    }
  });

  it('puts the rigid-body modes on the soft supports: bounce 2.0 Hz and pitch 2.0·√12·(½ − 0.224158) = 1.9111 Hz in Z, 1.4 and 1.3378 Hz in Y, ζ = 4 %', () => {
    // Rigid bar of mass m on two springs k at x_s and L − x_s: ω_bounce² = 2k/m, ω_pitch² = 2k(L/2 − x_s)²/(mL²/12)
    // (closed form for a rigid bar on two springs); symmetric supports keep the two uncoupled.
    const rigid = bar.model.modes.filter((m) => m.fnHz < 10);
    expect(rigid).toHaveLength(4);
    const ratio = Math.sqrt(12) * (0.5 - 0.224158);
    const expected = [1.4 * ratio, 1.4, 2.0 * ratio, 2.0];
    rigid.forEach((m, i) => expect(Math.abs(m.fnHz - expected[i]!)).toBeLessThan(1e-12));
    expect(Math.abs(2.0 * ratio - 1.9111)).toBeLessThan(1e-4);
    for (const m of rigid) expect(m.zeta).toBe(STEEL_BAR_SUSPENSION.zeta);
  });

  it('mass-normalises the rigid-body shapes: 1/√m and √(12/m)·(x/L − ½), ∫ρA φ² dx = 1 (trapezoid on 2001 points)', () => {
    // Ewins 2000 (unit modal mass); ρA = 3.14 kg/m, L = 1 m.
    const n = 2001;
    const points = Array.from({ length: n }, (_, i) => ({ label: `p${i}`, xM: i / (n - 1) }));
    const model = steelBarModel({ points, weakCount: 1, stiffCount: 0 });
    const rhoA = 7850 * 0.04 * 0.01;
    for (const m of model.modes.filter((x) => x.fnHz < 10)) {
      let integral = 0;
      for (let i = 0; i < n; i++) integral += (i === 0 || i === n - 1 ? 0.5 : 1) * rhoA * modeShapeValue(m, `p${i}:+Z`) ** 2 / (n - 1);
      expect(Math.abs(integral - 1)).toBeLessThan(1e-6);
    }
    const [rotation, translation] = model.modes;
    expect(modeShapeValue(translation!, 'p0:+Z')).toBeCloseTo(1 / Math.sqrt(rhoA), 12);
    expect(modeShapeValue(rotation!, 'p0:+Z')).toBeCloseTo(-Math.sqrt(12 / rhoA) / 2, 12);
    expect(modeShapeValue(rotation!, 'p1000:+Z')).toBeCloseTo(0, 12);
  });

  it('has its centre point B11 on a node of every antisymmetric mode (docs/methods.md#free-free-beam)', () => {
    const z = elastic.filter((m) => 'B01:+Z' in m.shape);
    expect(Math.abs(modeShapeValue(z[1], 'B11:+Z'))).toBeLessThan(1e-12);
    expect(Math.abs(modeShapeValue(z[3], 'B11:+Z'))).toBeLessThan(1e-12);
    expect(Math.abs(modeShapeValue(z[0], 'B11:+Z'))).toBeGreaterThan(0.1);
  });

  it('puts 2/√(ρAL) = 1.1287 /√kg at the free ends of every bending mode', () => {
    const end = 2 / Math.sqrt(7850 * 0.04 * 0.01 * 1.0); // ρAL = 3.14 kg (docs/methods.md#free-free-beam)
    for (const m of elastic) {
      const axis = 'B01:+Z' in m.shape ? 'Z' : 'Y';
      expect(Math.abs(modeShapeValue(m, `B01:+${axis}`) - end)).toBeLessThan(1e-10);
      expect(Math.abs(Math.abs(modeShapeValue(m, `B21:+${axis}`)) - end)).toBeLessThan(1e-9);
    }
  });

  it('takes damping per mode and optional rigid-body modes', () => {
    const model = steelBarModel({ points: [{ label: 'a', xM: 0 }], weakCount: 2, stiffCount: 0, zeta: [0.01, 0.02], suspension: null });
    expect(model.modes.map((m) => m.fnHz === 0)).toEqual([true, true, false, false]);
    expect(steelBarModel({ points: [{ label: 'a', xM: 0 }], weakCount: 2, stiffCount: 0, rigidBody: false }).modes).toHaveLength(2);
    expect(model.modes.slice(2).map((m) => m.zeta)).toEqual([0.01, 0.02]);
  });

  it('rejects too few damping values, duplicate labels and points off the bar', () => {
    expect(() => steelBarModel({ points: [{ label: 'a', xM: 0 }], zeta: [0.01] })).toThrow(/zeta has 1 entries/);
    expect(() => steelBarModel({ points: [{ label: 'a', xM: 0 }, { label: 'a', xM: 1 }] })).toThrow(/used twice/);
    expect(() => steelBarModel({ points: [{ label: 'a', xM: 1.2 }] })).toThrow(/xM=1.2/);
    expect(() => steelBarModel({ points: [{ label: 'a', xM: 0 }], suspension: { ...STEEL_BAR_SUSPENSION, supportXi: 0.6 } })).toThrow(/supportXi=0.6/);
    expect(() => steelBarModel({ points: [{ label: 'a', xM: 0 }], suspension: { ...STEEL_BAR_SUSPENSION, zeta: 0 } })).toThrow(/suspension.zeta/);
  });
});

describe('pumpSkidBaseplate (invented demo structure)', () => {
  const skid = pumpSkidBaseplate();

  it('has 20 points P01…P20 on a 5 × 4 grid in mm and 31 grid lines', () => {
    expect(skid.points).toHaveLength(20);
    expect(skid.points[0]).toEqual({ label: 'P01', xMm: 100, yMm: 100, zMm: 20 });
    expect(skid.points[19]).toEqual({ label: 'P20', xMm: 1100, yMm: 700, zMm: 20 });
    expect(skid.lines).toHaveLength(4 * 4 + 5 * 3);
    const labels = new Set(skid.points.map((p) => p.label));
    for (const [a, b] of skid.lines) expect(labels.has(a) && labels.has(b)).toBe(true);
  });

  it('has three mount modes at the rigid-plate-on-springs frequencies computed with numpy', () => {
    // reference/sim_reference.py: bounce 8.199072, roll 10.650907, pitch 11.834341 Hz
    const f = skid.model.modes.slice(0, 3).map((m) => m.fnHz);
    [8.199072, 10.650907, 11.834341].forEach((v, i) => expect(Math.abs(f[i] - v)).toBeLessThan(1e-6));
    for (const m of skid.model.modes.slice(0, 3)) expect(m.zeta).toBe(PUMP_SKID_PLATE.mountZeta);
  });

  it('has the plate modes of the Warburton approximation below 400 Hz as computed independently with numpy', () => {
    // reference/sim_reference.py (an independent re-implementation of the same approximation)
    const expected = [73.686454, 77.407118, 168.512608, 174.166016, 213.375702, 229.64851, 307.835096, 362.251275];
    const f = skid.model.modes.slice(3).map((m) => m.fnHz);
    expect(f).toHaveLength(expected.length);
    expected.forEach((v, i) => expect(Math.abs(f[i] - v)).toBeLessThan(1e-5));
    for (const m of skid.model.modes.slice(3)) {
      expect(m.zeta).toBeGreaterThanOrEqual(0.005);
      expect(m.zeta).toBeLessThanOrEqual(0.02);
    }
  });

  it('gives the bounce mode the uniform shape 1/√M and the twist mode an antisymmetric shape', () => {
    const M = 7850 * 1.2 * 0.8 * 0.02; // 150.72 kg
    const bounce = skid.model.modes[0];
    for (const p of skid.points) expect(modeShapeValue(bounce, `${p.label}:+Z`)).toBeCloseTo(1 / Math.sqrt(M), 12);
    const twist = skid.model.modes[3]; // (1,1): √3(2ξ−1)·√3(2η−1)/√M
    expect(modeShapeValue(twist, 'P01:+Z')).toBeCloseTo(-modeShapeValue(twist, 'P05:+Z'), 12);
    expect(modeShapeValue(twist, 'P01:+Z')).toBeCloseTo(modeShapeValue(twist, 'P20:+Z'), 12);
    expect(modeShapeValue(twist, 'P03:+Z')).toBeCloseTo(0, 12); // x = 600 mm, the centre line
  });

  it('uses only ±Z DOFs of its own points', () => {
    const labels = new Set(skid.points.map((p) => p.label));
    for (const m of skid.model.modes) {
      for (const key of Object.keys(m.shape)) {
        expect(key.endsWith(':+Z')).toBe(true);
        expect(labels.has(key.slice(0, -3))).toBe(true);
      }
    }
  });
});
