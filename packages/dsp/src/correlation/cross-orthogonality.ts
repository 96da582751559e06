import { Matrix, pseudoInverse, SingularValueDecomposition } from 'ml-matrix';
import { checkSameLength, checkSamples } from '../validate.ts';
import { readShapes, rowsOf, type RealShapes } from './shapes.ts';

export interface CrossOrthogonality {
  /** 'mass-matrix': the M given; 'serep': M_a = (Φ_a⁺)ᵀΦ_a⁺ from the model's mass-normalised shapes. */
  method: 'mass-matrix' | 'serep';
  /** matrix[t][m] = φ_tᵀ M φ_m (kg·[φ]²; 1 on the diagonal for mass-normalised shapes in kg^-½ that agree). */
  matrix: Float64Array[];
  /** matrix[t][m] / √(|φ_tᵀMφ_t|·|φ_mᵀMφ_m|): scale-free, for shapes not mass-normalised (−1…1). */
  normalized: Float64Array[];
  /** Self-orthogonality of the test shapes, Φ_testᵀ M Φ_test (identity for exact mass-normalised shapes). */
  testSelf: Float64Array[];
  /** Largest |normalized[t][m]| with t ≠ m, and where; null when there is no off-diagonal entry. */
  maxOffDiagonal: { test: number; model: number; value: number } | null;
  /** The mass matrix used, over the test DOFs (the SEREP-reduced one for 'serep'). */
  mass: Float64Array[];
}

/** Condition number above which the model's shapes at the test DOFs are taken as dependent (SEREP). */
const MAX_CONDITION = 1e10;

function readMass(mass: readonly ArrayLike<number>[], n: number): Matrix {
  if (!Array.isArray(mass) || mass.length !== n) throw new RangeError(`M has ${Array.isArray(mass) ? mass.length : 0} rows; it needs ${n}, one per DOF`);
  const M = new Matrix(n, n);
  for (let i = 0; i < n; i++) {
    checkSameLength(n, checkSamples(mass[i]!, `M[${i}]`), 'the DOFs', `M[${i}]`);
    for (let j = 0; j < n; j++) M.set(i, j, mass[i]![j]!);
  }
  for (let i = 0; i < n; i++) {
    for (let j = i + 1; j < n; j++) {
      const a = M.get(i, j);
      const b = M.get(j, i);
      if (Math.abs(a - b) > 1e-9 * Math.max(Math.abs(a), Math.abs(b), Math.abs(M.get(i, i)), Math.abs(M.get(j, j)))) {
        throw new RangeError(`M[${i}][${j}]=${a} differs from M[${j}][${i}]=${b}: a mass matrix is symmetric`);
      }
    }
  }
  return M;
}

function toMatrix(phi: Float64Array, n: number, m: number): Matrix {
  const out = new Matrix(n, m);
  for (let i = 0; i < n; i++) for (let r = 0; r < m; r++) out.set(i, r, phi[i * m + r]!);
  return out;
}

/**
 * Cross-orthogonality of test and model mode shapes, O = Φ_testᵀ M Φ_model (rows test modes, columns
 * model modes). Both shape sets are real, over the same test DOFs in the same order (`shapes[r][i]`), and
 * mass-normalised (φᵀMφ = 1 with M in kg, so φ in kg^-½) for the raw matrix to read 1 on the diagonal.
 * - With `M` (n × n, kg, symmetric; the mass matrix reduced to the test DOFs, or the full one when the
 *   test DOFs are all the model's DOFs): O = Φ_testᵀ M Φ_model.
 * - Without `M`, as is common: the pseudo-orthogonality with the SEREP-reduced mass matrix (O'Callahan,
 *   Avitabile & Riemer 1989, "System equivalent reduction expansion process", IMAC VII). With Φ_a the
 *   model's mass-normalised shapes at the test DOFs (n ≥ modes, independent columns) and Φ_a⁺ its
 *   pseudo-inverse (ml-matrix), M_a = (Φ_a⁺)ᵀ Φ_a⁺ (since Φᵀ M Φ = I for the full model); then
 *   O = Φ_testᵀ M_a Φ_a, exactly the identity (to rounding) when Φ_test = Φ_a.
 * `normalized` divides by the diagonals of Φ_testᵀMΦ_test and Φ_modelᵀMΦ_model, for shapes not scaled to
 * unit modal mass. Common acceptance in aerospace practice is |diagonal| ≥ 0.9 and |off-diagonal| ≤ 0.1
 * (common practice, from memory; the lead decides). Row t, column t is "the same mode" only if the caller
 * orders the test shapes by their pairs (`macPairs`).
 */
export function crossOrthogonality(
  testShapes: RealShapes,
  modelShapes: RealShapes,
  mass?: readonly ArrayLike<number>[],
): CrossOrthogonality {
  const t = readShapes(testShapes, 'testShapes');
  const m = readShapes(modelShapes, 'modelShapes');
  checkSameLength(t.n, m.n, 'testShapes[0]', 'modelShapes[0]');
  const n = t.n;
  const T = toMatrix(t.phi, n, t.m);
  const P = toMatrix(m.phi, n, m.m);
  let M: Matrix;
  let method: CrossOrthogonality['method'];
  if (mass !== undefined) {
    M = readMass(mass, n);
    method = 'mass-matrix';
  } else {
    if (n < m.m) throw new RangeError(`SEREP needs at least as many test DOFs as model modes: ${n} DOFs, ${m.m} modes`);
    const cond = new SingularValueDecomposition(P, { autoTranspose: true }).condition;
    if (!(cond < MAX_CONDITION)) {
      throw new RangeError(`the model's shapes at the test DOFs are linearly dependent (condition ${cond.toExponential(2)}): SEREP cannot reduce the mass matrix; give M or more test DOFs`);
    }
    const pinv = pseudoInverse(P);
    M = pinv.transpose().mmul(pinv);
    // exact symmetry, so M is symmetric to the last bit
    for (let i = 0; i < n; i++) for (let j = i + 1; j < n; j++) M.set(j, i, M.get(i, j));
    method = 'serep';
  }
  const MT = M.mmul(T);
  const O = T.transpose().mmul(M.mmul(P));
  const selfT = T.transpose().mmul(MT);
  const selfP = P.transpose().mmul(M.mmul(P));
  const normalized = new Matrix(t.m, m.m);
  let maxOff: CrossOrthogonality['maxOffDiagonal'] = null;
  for (let a = 0; a < t.m; a++) {
    for (let b = 0; b < m.m; b++) {
      const d = Math.sqrt(Math.abs(selfT.get(a, a)) * Math.abs(selfP.get(b, b)));
      if (!(d > 0)) throw new RangeError(`test mode ${a} or model mode ${b} has zero modal mass under M: check M and the shapes`);
      const v = O.get(a, b) / d;
      normalized.set(a, b, v);
      if (a !== b && (!maxOff || Math.abs(v) > maxOff.value)) maxOff = { test: a, model: b, value: Math.abs(v) };
    }
  }
  return { method, matrix: rowsOf(O), normalized: rowsOf(normalized), testSelf: rowsOf(selfT), maxOffDiagonal: maxOff, mass: rowsOf(M) };
}
