// crossOrthogonality on a five-mass chain with known M and K (scipy.linalg.eigh reference,
// tests/reference/efi_reference.py → spring-chain.json), with the full mass matrix and with the SEREP
// reduction (O'Callahan, Avitabile & Riemer 1989).
import { describe, expect, it } from 'vitest';
import { crossOrthogonality } from './cross-orthogonality.ts';
import { expectClose, loadCorrelationFixture } from '../../test/correlation-support.ts';

const chain = loadCorrelationFixture('spring-chain.json');
const M: number[][] = chain.M;
const K: number[][] = chain.K;
const model: number[][] = chain.model.shapes;
const test: number[][] = chain.test.shapes;

function expectIdentity(a: Float64Array[], tol: number): void {
  a.forEach((row, i) => row.forEach((v, j) => expect(Math.abs(v - (i === j ? 1 : 0)), `[${i}][${j}]`).toBeLessThan(tol)));
}

describe('crossOrthogonality', () => {
  it('uses reference shapes that solve K φ = ω² M φ with φᵀMφ = 1 (checked here, apart from scipy)', () => {
    model.forEach((phi, r) => {
      const w2 = (2 * Math.PI * chain.model.fHz[r]) ** 2;
      for (let i = 0; i < 5; i++) {
        let res = 0;
        for (let j = 0; j < 5; j++) res += (K[i]![j]! - w2 * M[i]![j]!) * phi[j]!;
        expect(Math.abs(res)).toBeLessThan(1e-9);
      }
    });
  });

  it('is the identity for the exact mass-normalised shapes with the known mass matrix', () => {
    const o = crossOrthogonality(model, model, M);
    expect(o.method).toBe('mass-matrix');
    expectIdentity(o.matrix, 1e-12);
    expectIdentity(o.normalized, 1e-12);
    expect(o.maxOffDiagonal!.value).toBeLessThan(1e-12);
  });

  it('gives numpy’s Φ_testᵀ M Φ_model for the chain with spring 3 5 % stiffer, near 1 on the diagonal', () => {
    const o = crossOrthogonality(test, model, M);
    o.matrix.forEach((row, t) => expectClose(row, chain.crossOrthogonality[t], 1e-12));
    expectIdentity(o.testSelf, 1e-12);
    for (let k = 0; k < 5; k++) expect(o.matrix[k]![k]).toBeGreaterThan(0.999);
    expect(o.maxOffDiagonal!.value).toBeLessThan(0.03);
  });

  it('is the identity with the SEREP-reduced mass matrix when the test shapes are the model’s own at three of the five DOFs', () => {
    const aSet: number[] = chain.serep.aSet;
    const pick = (shapes: number[][]) => shapes.slice(0, chain.serep.modes).map((s) => aSet.map((i) => s[i]!));
    const o = crossOrthogonality(pick(model), pick(model));
    expect(o.method).toBe('serep');
    expectIdentity(o.matrix, 1e-12);
    o.mass.forEach((row, i) => expectClose(row, chain.serep.reducedMass[i], 1e-10));
    const t = crossOrthogonality(pick(test), pick(model));
    t.matrix.forEach((row, i) => expectClose(row, chain.serep.pseudoOrthogonalityTestModel[i], 1e-10));
  });

  it('normalises away the scale of shapes that are not mass-normalised, keeping the sign', () => {
    const raw = crossOrthogonality(test, model, M);
    const scaled = crossOrthogonality(test.map((s) => s.map((v) => 3 * v)), model.map((s, r) => s.map((v) => (r === 1 ? -v : v))), M);
    for (let a = 0; a < 5; a++) {
      for (let b = 0; b < 5; b++) {
        expect(scaled.matrix[a]![b]).toBeCloseTo(3 * raw.matrix[a]![b]! * (b === 1 ? -1 : 1), 12);
        expect(scaled.normalized[a]![b]).toBeCloseTo(raw.normalized[a]![b]! * (b === 1 ? -1 : 1), 12);
      }
    }
  });

  it('refuses an asymmetric or wrongly sized M, fewer test DOFs than model modes, dependent model shapes and DOF mismatches', () => {
    const bad = M.map((r) => r.slice());
    bad[0]![1] = 0.5;
    expect(() => crossOrthogonality(model, model, bad)).toThrow(/M\[0\]\[1\]=0.5 differs from M\[1\]\[0\]=0/);
    expect(() => crossOrthogonality(model, model, M.slice(0, 4))).toThrow(/M has 4 rows; it needs 5/);
    expect(() => crossOrthogonality([[1, 2]], [[1, 0], [0, 1], [1, 1]])).toThrow(/at least as many test DOFs as model modes/);
    expect(() => crossOrthogonality([[1, 2, 3]], [[1, 2, 3], [2, 4, 6]])).toThrow(/linearly dependent/);
    expect(() => crossOrthogonality([[1, 2, 3]], [[1, 2]])).toThrow(/modelShapes\[0\] has length 2 but testShapes\[0\] has length 3/);
  });
});
