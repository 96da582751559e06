// Shared argument checks for the correlation functions: a list of real mode shapes, one vector per
// mode, all over the same DOFs, read into a DOF-major matrix Φ (n DOFs × m modes).
import { Matrix } from 'ml-matrix';
import { checkSameLength, checkSamples } from '../validate.ts';

/** Real mode shapes: `shapes[r][i]` is mode r at DOF i (one vector per mode, as `macMatrix` takes them). */
export type RealShapes = readonly ArrayLike<number>[];

export interface ShapeMatrix {
  /** DOFs (rows of Φ). */
  n: number;
  /** Modes (columns of Φ). */
  m: number;
  /** Φ row-major: phi[i * m + r] = shapes[r][i]. */
  phi: Float64Array;
}

export function readShapes(shapes: RealShapes, name: string, minDofs = 1): ShapeMatrix {
  if (!Array.isArray(shapes) || shapes.length === 0) throw new RangeError(`${name} is empty: give at least one mode shape`);
  const m = shapes.length;
  const n = checkSamples(shapes[0]!, `${name}[0]`, minDofs);
  for (let r = 1; r < m; r++) checkSameLength(n, checkSamples(shapes[r]!, `${name}[${r}]`), `${name}[0]`, `${name}[${r}]`);
  const phi = new Float64Array(n * m);
  for (let r = 0; r < m; r++) {
    const s = shapes[r]!;
    let any = false;
    for (let i = 0; i < n; i++) {
      const v = s[i]!;
      phi[i * m + r] = v;
      if (v !== 0) any = true;
    }
    if (!any) throw new RangeError(`${name}[${r}] is all zeros: a mode shape needs at least one non-zero entry`);
  }
  return { n, m, phi };
}

/** ΦᵀΦ over the listed rows (or all rows), exactly symmetric, as an ml-matrix Matrix. */
export function gram(s: ShapeMatrix, rows?: ArrayLike<number>): Matrix {
  const { m, phi } = s;
  const a = new Matrix(m, m);
  const count = rows ? rows.length : s.n;
  for (let p = 0; p < m; p++) {
    for (let q = p; q < m; q++) {
      let sum = 0;
      for (let k = 0; k < count; k++) {
        const o = (rows ? rows[k]! : k) * m;
        sum += phi[o + p]! * phi[o + q]!;
      }
      a.set(p, q, sum);
      a.set(q, p, sum);
    }
  }
  return a;
}

/** Plain nested arrays of a Matrix, one Float64Array per row. */
export function rowsOf(a: Matrix): Float64Array[] {
  const out: Float64Array[] = [];
  for (let i = 0; i < a.rows; i++) out.push(Float64Array.from(a.getRow(i)));
  return out;
}
