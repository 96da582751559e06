import { describe, expect, it } from 'vitest';
import { simpson } from '../test/helpers.ts';
import { freeFreeBeamModes, freeFreeBeamRoots, freeFreeShape } from './free-free-beam.ts';

// The bar of docs/methods.md#free-free-beam: L = 1.000 m, 40 × 10 mm, E = 210 GPa, ρ = 7850 kg/m³.
const bar = { lengthM: 1, widthM: 0.04, thicknessM: 0.01, youngsPa: 210e9, densityKgM3: 7850 } as const;

describe('freeFreeBeamRoots', () => {
  it('solves cos βL cosh βL = 1 for the first five roots of docs/methods.md#free-free-beam', () => {
    const roots = freeFreeBeamRoots(5);
    // docs/methods.md#free-free-beam [calc, brentq]: 4.730041, 7.853205, 10.995608, 14.137165, 17.278760 (6 decimals).
    const expected = [4.730041, 7.853205, 10.995608, 14.137165, 17.27876];
    expected.forEach((r, i) => expect(Math.abs(roots[i] - r)).toBeLessThan(5e-7));
  });

  it('agrees with scipy brentq to 1e-12 for roots 10, 20 and 30', () => {
    const roots = freeFreeBeamRoots(30);
    // reference/sim_reference.py (scipy.optimize.brentq, xtol 1e-15)
    expect(Math.abs(roots[9] - 32.986722862693)).toBeLessThan(1e-11);
    expect(Math.abs(roots[19] - 64.402649398591)).toBeLessThan(1e-11);
    expect(Math.abs(roots[29] - 95.818575934489)).toBeLessThan(1e-11);
  });

  it('approaches (2n + 1)π/2 for the higher roots (docs/methods.md#free-free-beam)', () => {
    const roots = freeFreeBeamRoots(12);
    expect(Math.abs(roots[11] - (25 * Math.PI) / 2)).toBeLessThan(1e-9);
  });

  it('rejects a count that is not a positive integer', () => {
    expect(() => freeFreeBeamRoots(0)).toThrow(/count=0/);
    expect(() => freeFreeBeamRoots(2.5)).toThrow(/count=2.5/);
  });
});

describe('freeFreeBeamModes for the steel bar', () => {
  it('gives the weak-direction frequencies 53.17, 146.55, 287.30, 474.93, 709.46 Hz (docs/methods.md#free-free-beam)', () => {
    const beam = freeFreeBeamModes({ ...bar, direction: 'weak', count: 5 });
    const printed = [53.17, 146.55, 287.3, 474.93, 709.46]; // docs/methods.md#free-free-beam table, Euler–Bernoulli column
    beam.modes.forEach((m, i) => expect(Math.round(m.fnHz * 100) / 100).toBe(printed[i]));
    // reference/sim_reference.py (numpy): 53.166013, 146.554161, 287.304754, 474.929352, 709.462517 Hz
    const numpy = [53.166013, 146.554161, 287.304754, 474.929352, 709.462517];
    beam.modes.forEach((m, i) => expect(Math.abs(m.fnHz - numpy[i])).toBeLessThan(1e-6));
  });

  it('gives the stiff-direction frequencies 212.66, 586.22, 1149.22, 1899.72 Hz (docs/methods.md#free-free-beam)', () => {
    const beam = freeFreeBeamModes({ ...bar, direction: 'stiff', count: 4 });
    const printed = [212.66, 586.22, 1149.22, 1899.72]; // docs/methods.md#free-free-beam table
    beam.modes.forEach((m, i) => expect(Math.round(m.fnHz * 100) / 100).toBe(printed[i]));
  });

  it('has ρA = 3.140 kg/m and EI = 700 N·m² (weak) and 11 200 N·m² (stiff) (docs/methods.md#free-free-beam)', () => {
    const weak = freeFreeBeamModes({ ...bar, direction: 'weak', count: 1 });
    const stiff = freeFreeBeamModes({ ...bar, direction: 'stiff', count: 1 });
    expect(weak.massPerLengthKgM).toBeCloseTo(3.14, 12);
    expect(weak.bendingStiffnessNm2).toBeCloseTo(700, 9);
    expect(stiff.bendingStiffnessNm2).toBeCloseTo(11200, 8);
  });

  it('puts the nodes of modes 1–4 at the x/L values of docs/methods.md#free-free-beam', () => {
    const beam = freeFreeBeamModes({ ...bar, direction: 'weak', count: 4 });
    // docs/methods.md#free-free-beam [calc], 4 decimals.
    const expected = [
      [0.2242, 0.7758],
      [0.1321, 0.5, 0.8679],
      [0.0944, 0.3558, 0.6442, 0.9056],
      [0.0735, 0.2768, 0.5, 0.7232, 0.9265],
    ];
    beam.modes.forEach((mode, i) => {
      const nodes: number[] = [];
      const steps = 10000;
      for (let s = 0; s < steps; s++) {
        let a = s / steps;
        let b = (s + 1) / steps;
        let fa = mode.shapeAt(a);
        const fb = mode.shapeAt(b);
        if (fa === 0) {
          nodes.push(a);
          continue;
        }
        if (fa * fb > 0) continue;
        for (let it = 0; it < 60; it++) {
          const m = 0.5 * (a + b);
          const fm = mode.shapeAt(m);
          if (fa * fm <= 0) b = m;
          else {
            a = m;
            fa = fm;
          }
        }
        nodes.push(0.5 * (a + b));
      }
      expect(nodes.length).toBe(expected[i].length);
      nodes.forEach((x, k) => expect(Math.abs(x - expected[i][k])).toBeLessThan(5e-5));
    });
  });

  it('mass-normalises every shape: ∫ρA φ² dx = 1, and the shapes are mass-orthogonal', () => {
    const beam = freeFreeBeamModes({ ...bar, direction: 'weak', count: 30 });
    const rhoA = beam.massPerLengthKgM;
    for (const n of [1, 2, 3, 4, 5, 12, 20, 30]) {
      const mode = beam.modes[n - 1];
      // Composite Simpson with 20 000 intervals: error ≪ 1e-9 even for mode 30 (βL ≈ 96).
      const mass = simpson((x) => rhoA * mode.shapeAt(x) ** 2, 0, 1, 20000);
      expect(Math.abs(mass - 1)).toBeLessThan(1e-9);
    }
    for (const [p, q] of [[1, 2], [1, 3], [2, 5], [4, 20], [19, 30]]) {
      const cross = simpson((x) => rhoA * beam.modes[p - 1].shapeAt(x) * beam.modes[q - 1].shapeAt(x), 0, 1, 20000);
      expect(Math.abs(cross)).toBeLessThan(1e-9);
    }
  });

  it('makes the rigid-body shapes mass-normalised and orthogonal to the elastic modes', () => {
    const beam = freeFreeBeamModes({ ...bar, direction: 'weak', count: 3 });
    const rhoA = beam.massPerLengthKgM;
    const integral = (g: (x: number) => number) => simpson(g, 0, 1, 4000);
    expect(Math.abs(integral((x) => rhoA * beam.translationAt(x) ** 2) - 1)).toBeLessThan(1e-12);
    expect(Math.abs(integral((x) => rhoA * beam.rotationAt(x) ** 2) - 1)).toBeLessThan(1e-12);
    for (const mode of beam.modes) {
      expect(Math.abs(integral((x) => rhoA * mode.shapeAt(x) * beam.translationAt(x)))).toBeLessThan(1e-10);
      expect(Math.abs(integral((x) => rhoA * mode.shapeAt(x) * beam.rotationAt(x)))).toBeLessThan(1e-10);
    }
  });

  it('has the value ±2/√(ρAL) at both free ends for every mode', () => {
    const beam = freeFreeBeamModes({ ...bar, direction: 'weak', count: 40 });
    const end = 2 / Math.sqrt(beam.massPerLengthKgM * 1);
    // At x = 0 the textbook shape is cosh 0 + cos 0 = 2 exactly; by symmetry |φ(L)| = |φ(0)|.
    for (const mode of beam.modes) {
      expect(Math.abs(mode.shapeAt(0) - end)).toBeLessThan(1e-11 * end);
      expect(Math.abs(Math.abs(mode.shapeAt(1)) - end)).toBeLessThan(1e-9 * end);
    }
  });

  it('stays accurate for high modes where the textbook form cancels catastrophically', () => {
    const roots = freeFreeBeamRoots(30);
    // reference/sim_reference.py: mpmath with 80 digits, unnormalised shape at x/L = 0.13, 0.5, 0.77, 1.0.
    const mode20 = [-1.36385900992, 0, 1.405672694726, -2];
    const mode30 = [1.103699159218, 0, 0.951783423984, -2];
    const xs = [0.13, 0.5, 0.77, 1.0];
    xs.forEach((x, i) => {
      expect(Math.abs(freeFreeShape(roots[19], x) - mode20[i])).toBeLessThan(1e-9);
      expect(Math.abs(freeFreeShape(roots[29], x) - mode30[i])).toBeLessThan(1e-9);
    });
    // The textbook form loses everything at mode 30: cosh(0.77·96) ≈ 1e32 and sinh are equal in
    // double precision and σ rounds to 1, so the difference is rounding noise, not the shape.
    const B = roots[29];
    const sigma = (Math.cosh(B) - Math.cos(B)) / (Math.sinh(B) - Math.sin(B));
    const naive = Math.cosh(B * 0.77) + Math.cos(B * 0.77) - sigma * (Math.sinh(B * 0.77) + Math.sin(B * 0.77));
    expect(Math.abs(naive - mode30[2])).toBeGreaterThan(0.1);
  });

  it('rejects bad dimensions, direction and positions, naming the value', () => {
    expect(() => freeFreeBeamModes({ ...bar, lengthM: 0, direction: 'weak', count: 1 })).toThrow(/lengthM=0/);
    expect(() => freeFreeBeamModes({ ...bar, youngsPa: Number.NaN, direction: 'weak', count: 1 })).toThrow(/youngsPa=NaN/);
    expect(() => freeFreeBeamModes({ ...bar, direction: 'sideways' as never, count: 1 })).toThrow(/direction="sideways"/);
    const beam = freeFreeBeamModes({ ...bar, direction: 'weak', count: 1 });
    expect(() => beam.modes[0].shapeAt(1.5)).toThrow(/xM=1.5/);
  });
});
