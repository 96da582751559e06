// The numbers behind the fit's warnings, on a 3-mode chain whose truth is known: a missing mode shows as a
// CMIF peak without a column and as a larger synthesis error; bad options of the new estimator are refused.
import { describe, expect, it } from 'vitest';
import { cmif, cmifPeaksWithoutColumn, estimateShapes, fitQuality, stabilizationDiagram } from '../src/modal/index.ts';
import { lines, measure, type ClosedFormModel } from './structures.ts';

// three modes with invented mass-normalised shapes (1/√kg) at four DOFs; the hammer at d1 (driving point)
const model: ClosedFormModel = {
  dofs: ['d1:+Z', 'd2:+Z', 'd3:+Z', 'd4:+Z'],
  modes: [
    { fHz: 50, zeta: 0.01, label: 'a', phi: Float64Array.of(0.5, 0.4, 0.2, -0.1) },
    { fHz: 80, zeta: 0.01, label: 'b', phi: Float64Array.of(0.4, -0.3, 0.5, 0.2) },
    { fHz: 120, zeta: 0.01, label: 'c', phi: Float64Array.of(0.3, 0.2, -0.4, 0.5) },
  ],
};
const set = measure(model, { f: lines(0.25, 801), responses: [0, 1, 2, 3], references: [0], kind: 'receptance' });
const all = model.modes.map((m) => ({ fHz: m.fHz, zeta: m.zeta }));

describe('fit quality numbers', () => {
  it('synthesis error is ~0 with every mode (exact modal sum) and large for the FRFs of a missing mode', () => {
    const full = fitQuality(set, estimateShapes(set, all, { bandHz: [20, 180] }));
    // the data is the exact 3-mode sum (Ewins 2000, §2.7), so the synthesis reproduces it to rounding
    expect(full.worstErrorPercent).toBeLessThan(1e-6);
    expect(full.modes.map((m) => m.mpc)).toEqual([1, 1, 1].map(() => expect.closeTo(1, 9)));
    const missing = fitQuality(set, estimateShapes(set, all.slice(0, 2), { bandHz: [20, 180] }));
    // without the 120 Hz mode its resonance is left unexplained: several percent on every FRF (against < 1e-6 %)
    expect(missing.frfs).toHaveLength(set.frfs.length);
    for (const x of missing.frfs) expect(x.errorPercent).toBeGreaterThan(5);
  });

  it('lists the CMIF peak that has no column, and none when every peak has one', () => {
    const ind = cmif(set);
    expect(cmifPeaksWithoutColumn(ind, [50, 80, 120])).toEqual([]);
    const left = cmifPeaksWithoutColumn(ind, [50, 120]);
    expect(left).toHaveLength(1);
    // the peak of |H| of a 1 %-damped mode lies at f_n√(1 − 2ζ²) ≈ 80 Hz (Ewins 2000), on the 0.25 Hz grid
    expect(left[0].fHz).toBeCloseTo(80, 0);
  });

  it('refuses bad weights and time bases with RangeErrors naming them', () => {
    const opts = { bandHz: [20, 180] as [number, number], orders: [6] };
    expect(() => stabilizationDiagram(set, { ...opts, weighting: [1, 2] })).toThrow(/weighting must be 'rms', 'unit' or 4 positive numbers/);
    expect(() => stabilizationDiagram(set, { ...opts, weighting: [1, 1, -1, 1] })).toThrow(/weighting\[2\]=-1/);
    expect(() => stabilizationDiagram(set, { ...opts, timeBase: 'fast' as never })).toThrow(/timeBase=fast/);
    expect(() => cmifPeaksWithoutColumn(cmif(set), [Number.NaN])).toThrow(/columnsHz/);
  });

  it('gives the same poles for unit, RMS and explicit weights on exact data (weights only matter under noise)', () => {
    const opts = { bandHz: [20, 180] as [number, number], orders: [12] };
    const f = (w: 'unit' | 'rms' | number[]) => stabilizationDiagram(set, { ...opts, weighting: w }).orders[0].poles.filter((p) => p.zeta < 0.05).map((p) => p.fHz);
    const u = f('unit');
    expect(u).toHaveLength(3);
    // exact modal data: closed-form natural frequencies (ζ = 1 %: |λ|/2π = f_n)
    u.forEach((x, r) => expect(x / model.modes[r].fHz - 1).toBeLessThan(1e-6));
    f('rms').forEach((x, r) => expect(Math.abs(x / u[r] - 1)).toBeLessThan(1e-7));
    f([1, 10, 0.1, 3]).forEach((x, r) => expect(Math.abs(x / u[r] - 1)).toBeLessThan(1e-7));
  });
});
