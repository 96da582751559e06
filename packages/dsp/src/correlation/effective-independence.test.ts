// Effective Independence (Kammer 1991, J. Guidance, Control, and Dynamics 14(2)) on a uniform simply
// supported beam, modes sin(nπx/L) (Blevins 1979), against numpy's implementation of the same iteration
// (tests/reference/efi_reference.py → tests/fixtures/correlation/efi-beam.json).
import { describe, expect, it } from 'vitest';
import { effectiveIndependence } from './effective-independence.ts';
import { expectClose, loadCorrelationFixture, simplySupportedBeam } from '../../test/correlation-support.ts';

const beam = loadCorrelationFixture('efi-beam.json');
const shapes = simplySupportedBeam(3, 41);

describe('effectiveIndependence on a simply supported beam (41 candidates, modes 1–3)', () => {
  it('builds the same beam shapes as the numpy reference', () => {
    shapes.forEach((s, r) => expectClose(s, beam.shapes[r], 1e-15));
  });

  it('keeps 5 sensors symmetric about midspan, off the supports and off the nodes of mode 3, the best of all 749 398 five-sensor sets', () => {
    const result = effectiveIndependence(shapes, { target: 5 });
    const kept = Array.from(result.kept);
    // numpy implementation of Kammer's iteration (efi_reference.py)
    expect(kept).toEqual(beam.fiveSensors.kept);
    expect(kept).toEqual([8, 9, 20, 31, 32]);
    // symmetric about midspan (candidate 20): i ↔ 40 − i
    expect(kept.map((i) => 40 - i).sort((a, b) => a - b)).toEqual(kept);
    // x = 0 and x = L are nodes of every mode; x = L/3, 2L/3 (nearest candidates 13 and 27) are nodes of mode 3
    for (const node of [0, 40, 13, 27]) expect(kept).not.toContain(node);
    // exhaustive search by det(ΦᵀΦ) over C(41, 5) sets in numpy: EfI finds the optimum here
    expect(beam.exhaustive.sets).toBe(749_398);
    expect(kept).toEqual(beam.exhaustive.best);
    expect(result.logDetFisher).toBeCloseTo(Math.log(beam.exhaustive.bestDet), 10);
    expectClose(result.ed, beam.fiveSensors.finalEd, 1e-10);
  });

  it('keeps midspan, a node of mode 2, because it is the antinode of modes 1 and 3: Effective Independence maximises det(ΦᵀΦ), it does not avoid every node', () => {
    const result = effectiveIndependence(shapes, { target: 5 });
    expect(Array.from(result.kept)).toContain(20);
    // sin(2π·½) = 0 (to rounding), sin(π·½) = 1, |sin(3π·½)| = 1 (closed form)
    expect(Math.abs(shapes[1]![20]!)).toBeLessThan(1e-15);
    expect(Math.abs(shapes[0]![20]!)).toBeCloseTo(1, 15);
    expect(Math.abs(shapes[2]![20]!)).toBeCloseTo(1, 15);
    // mode 2 is seen by the pairs 8, 9 and 31, 32, at |sin(2π·8/40)| = sin(0.4π) = 0.951
    expect(Math.abs(shapes[1]![8]!)).toBeCloseTo(Math.sin(0.4 * Math.PI), 15);
  });

  it('deletes the candidates in the same order as numpy down to 3, with the same E_D and ln det(ΦᵀΦ) at every step', () => {
    const result = effectiveIndependence(shapes, { target: 3, recordEd: true });
    const ref = beam.fullRun;
    expect(Array.from(result.removed)).toEqual(ref.steps.map((s: any) => s.removed));
    expect(Array.from(result.kept)).toEqual(ref.kept);
    result.steps.forEach((step, k) => {
      const r = ref.steps[k];
      expect(step.edRemoved, `step ${k}`).toBeCloseTo(r.edRemoved, 9);
      expect(step.logDetFisher, `step ${k}`).toBeCloseTo(r.logDetFisher, 9);
      expectClose(step.ed!.values, r.ed, 1e-9);
    });
    expectClose(result.initialEd, beam.initialEd, 1e-12);
    expect(result.initialLogDetFisher).toBeCloseTo(beam.initialLogDetFisher, 12);
    // ranking: kept first (highest E_D first), then the deleted ones, last deleted first
    expect(result.ranking.length).toBe(41);
    expect(Array.from(result.ranking.slice(3))).toEqual(ref.steps.map((s: any) => s.removed).reverse());
  });

  it('gives E_D summing to the number of modes and 0 at the supports (E_D is the diagonal of a rank-3 projector, Kammer 1991)', () => {
    const result = effectiveIndependence(shapes, { target: 5 });
    expect(result.initialEd.reduce((a, b) => a + b, 0)).toBeCloseTo(3, 12);
    expect(result.ed.reduce((a, b) => a + b, 0)).toBeCloseTo(3, 12);
    expect(result.initialEd[0]).toBe(0);
    expect(result.initialEd[40]).toBeLessThan(1e-30);
    // det falls by (1 − E_D) per deletion (matrix determinant lemma)
    let logDet = result.initialLogDetFisher;
    for (const s of result.steps) logDet += Math.log(1 - s.edRemoved);
    expect(result.logDetFisher).toBeCloseTo(logDet, 9);
    expect(result.informationKept).toBeCloseTo(Math.exp(result.logDetFisher - result.initialLogDetFisher), 12);
  });

  it('gives the same ranking whatever each mode is scaled by (E_D is invariant under Φ → ΦT)', () => {
    const scaled = shapes.map((s, r) => s.map((v) => v * [1, -1000, 0.001][r]!));
    expect(Array.from(effectiveIndependence(scaled, { target: 3 }).removed)).toEqual(beam.fullRun.steps.map((s: any) => s.removed));
  });

  it('never deletes a candidate listed in keep, even a support', () => {
    const result = effectiveIndependence(shapes, { target: 5, keep: [0, 10] });
    expect(Array.from(result.kept)).toContain(0);
    expect(Array.from(result.kept)).toContain(10);
    expect(result.kept.length).toBe(5);
  });

  it('refuses a target below the number of modes or above the candidates, dependent modes, bad entries and bad keep indices', () => {
    expect(() => effectiveIndependence(shapes, { target: 2 })).toThrow(/target=2 is below the 3 modes/);
    expect(() => effectiveIndependence(shapes, { target: 42 })).toThrow(/exceeds the 41 candidates/);
    expect(() => effectiveIndependence(shapes, { target: 1.5 })).toThrow(/target=1.5 must be an integer/);
    expect(() => effectiveIndependence([shapes[0]!, shapes[0]!.map((v) => 2 * v)], { target: 4 })).toThrow(/linearly dependent/);
    const bad = [Float64Array.from(shapes[0]!), shapes[1]!];
    bad[0]![7] = Number.NaN;
    expect(() => effectiveIndependence(bad, { target: 4 })).toThrow(/shapes\[0\]\[7\]=NaN is not finite/);
    expect(() => effectiveIndependence([new Float64Array(5)], { target: 2 })).toThrow(/all zeros/);
    expect(() => effectiveIndependence(shapes, { target: 5, keep: [41] })).toThrow(/keep\[0\]=41/);
    expect(() => effectiveIndependence([], { target: 1 })).toThrow(/empty/);
  });
});
