import { CholeskyDecomposition, Matrix } from 'ml-matrix';
import { checkInteger } from '../validate.ts';
import { gram, readShapes, type RealShapes } from './shapes.ts';

export interface EffectiveIndependenceOptions {
  /** Candidate DOFs to keep (the number of sensors), an integer ≥ the number of modes. */
  target: number;
  /** Candidate indices never deleted (sensors already placed, the reference); at most `target` of them. */
  keep?: readonly number[];
  /** Also return, for every step, E_D of every candidate still present (memory grows as n²/2). */
  recordEd?: boolean;
}

export interface EffectiveIndependenceStep {
  /** Candidate index deleted at this step. */
  removed: number;
  /** Its E_D when it was deleted (dimensionless, 0…1). */
  edRemoved: number;
  /** Candidates left after the deletion. */
  remaining: number;
  /** ln det(ΦᵀΦ) of the candidates left after the deletion (Φ in the shapes' unit, squared). */
  logDetFisher: number;
  /** With `recordEd`: the candidates present before the deletion and their E_D. */
  ed?: { dofs: Int32Array; values: Float64Array };
}

export interface EffectiveIndependence {
  /** The kept candidates, ascending by index. */
  kept: Int32Array;
  /** E_D of each kept candidate in the final set, aligned with `kept`; they sum to the number of modes. */
  ed: Float64Array;
  /** Deleted candidates, in the order they were deleted (the weakest first). */
  removed: Int32Array;
  /** Every candidate, best first: the kept ones by final E_D (highest first), then the deleted ones, last deleted first. */
  ranking: Int32Array;
  steps: EffectiveIndependenceStep[];
  /** E_D of every candidate before any deletion. */
  initialEd: Float64Array;
  /** ln det(ΦᵀΦ) over all candidates and over the kept set. */
  initialLogDetFisher: number;
  logDetFisher: number;
  /** det(ΦᵀΦ)_kept / det(ΦᵀΦ)_all = exp(logDetFisher − initialLogDetFisher), the share of the information kept (0…1). */
  informationKept: number;
}

/** Ties: candidates within this fraction of the largest E_D above the smallest count as equal (lowest index goes). */
const TIE = 1e-9;
/** E_D is recomputed from scratch (ml-matrix Cholesky) after this many rank-one updates, to stop drift. */
const REFRESH = 32;

interface Fisher {
  inv: Float64Array;
  logDet: number;
}

function factor(a: Matrix, m: number, what: string): Fisher {
  const chol = new CholeskyDecomposition(a);
  if (!chol.isPositiveDefinite()) {
    throw new RangeError(
      `the mode shapes are linearly dependent over ${what} (ΦᵀΦ is singular): give independent modes, or more candidates than modes`,
    );
  }
  const L = chol.lowerTriangularMatrix;
  let logDet = 0;
  for (let r = 0; r < m; r++) logDet += 2 * Math.log(L.get(r, r));
  const inv = chol.solve(Matrix.eye(m, m));
  return { inv: Float64Array.from(inv.to1DArray()), logDet };
}

/**
 * Effective Independence sensor placement (Kammer 1991, "Sensor placement for on-orbit modal
 * identification and correlation of large space structures", J. Guidance, Control, and Dynamics 14(2),
 * pp. 251–259): from n candidate DOFs and m target modes, Φ (n × m, `shapes[r][i]` = mode r at candidate i,
 * any consistent unit; the result does not depend on each mode's scaling), the candidate with the smallest
 *   E_D = diag(Φ (ΦᵀΦ)⁻¹ Φᵀ)   (dimensionless, 0…1, Σ E_D = m; E_D = 1: the mode set needs that DOF)
 * is deleted, Φ loses that row, and the step repeats until `target` candidates remain. Each deletion keeps
 * the Fisher information matrix ΦᵀΦ (for unit, uncorrelated sensor noise) as large in determinant as one
 * deletion can: det(ΦᵀΦ) falls by the factor (1 − E_D). Ties (E_D within 1e-9 × the largest E_D of the
 * smallest) delete the lowest candidate index first — Resonote's rule, so a symmetric structure gives a
 * reproducible order. E_D is updated by rank one per step ((ΦᵀΦ)⁻¹ by Sherman–Morrison, ln det by the
 * determinant lemma) and recomputed from a Cholesky factor (ml-matrix) every 32 steps and at the end.
 * Candidates are single DOFs (one sensor axis each); a triaxial sensor is three candidates.
 * Throws a RangeError for target < m or > n, linearly dependent modes, or a `keep` list that leaves only
 * candidates the modes cannot do without.
 */
export function effectiveIndependence(shapes: RealShapes, options: EffectiveIndependenceOptions): EffectiveIndependence {
  const s = readShapes(shapes, 'shapes');
  const { n, m, phi } = s;
  if (!options || typeof options !== 'object') throw new RangeError('options must give target (the number of DOFs to keep)');
  const target = options.target;
  checkInteger(target, 'target', 1);
  if (target < m) throw new RangeError(`target=${target} is below the ${m} modes: keep at least as many DOFs as modes`);
  if (target > n) throw new RangeError(`target=${target} exceeds the ${n} candidates`);
  const locked = new Uint8Array(n);
  for (const [k, i] of (options.keep ?? []).entries()) {
    if (!Number.isInteger(i) || i < 0 || i >= n) throw new RangeError(`keep[${k}]=${String(i)} is not a candidate index (0…${n - 1})`);
    locked[i] = 1;
  }
  const lockedCount = locked.reduce((a, b) => a + b, 0);
  if (lockedCount > target) throw new RangeError(`keep lists ${lockedCount} candidates, more than target=${target}`);

  const present: number[] = Array.from({ length: n }, (_, i) => i);
  const ed = new Float64Array(n);
  const u = new Float64Array(m);
  let fisher: Fisher = { inv: new Float64Array(0), logDet: 0 };

  const refresh = (what: string) => {
    fisher = factor(gram(s, present), m, what);
    const inv = fisher.inv;
    for (const i of present) {
      const o = i * m;
      let e = 0;
      for (let p = 0; p < m; p++) {
        let t = 0;
        for (let q = 0; q < m; q++) t += inv[p * m + q]! * phi[o + q]!;
        e += phi[o + p]! * t;
      }
      ed[i] = e;
    }
  };
  refresh('the candidates');
  const initialEd = Float64Array.from(ed);
  const initialLogDetFisher = fisher.logDet;

  const steps: EffectiveIndependenceStep[] = [];
  const removed: number[] = [];
  let sinceRefresh = 0;
  while (present.length > target) {
    let min = Infinity;
    let max = 0;
    for (const i of present) {
      if (ed[i]! > max) max = ed[i]!;
      if (!locked[i] && ed[i]! < min) min = ed[i]!;
    }
    let pos = -1;
    for (let k = 0; k < present.length; k++) {
      const i = present[k]!;
      if (!locked[i] && ed[i]! <= min + TIE * max) {
        pos = k;
        break;
      }
    }
    const i = present[pos]!;
    const e = ed[i]!;
    if (!(1 - e > 1e-10)) {
      throw new RangeError(
        `candidate ${i} has E_D=${e.toFixed(6)}: every candidate not in keep is needed by the modes; keep fewer DOFs or raise target`,
      );
    }
    const record = options.recordEd
      ? { dofs: Int32Array.from(present), values: Float64Array.from(present, (j) => ed[j]!) }
      : undefined;
    present.splice(pos, 1);
    removed.push(i);
    sinceRefresh++;
    if (sinceRefresh >= REFRESH || 1 - e < 1e-3) {
      refresh('the remaining candidates');
      sinceRefresh = 0;
    } else {
      // (A − φφᵀ)⁻¹ = A⁻¹ + u uᵀ/(1 − e), u = A⁻¹φ; E_j gains (φ_jᵀu)²/(1 − e); det falls by (1 − e).
      const inv = fisher.inv;
      const o = i * m;
      for (let p = 0; p < m; p++) {
        let t = 0;
        for (let q = 0; q < m; q++) t += inv[p * m + q]! * phi[o + q]!;
        u[p] = t;
      }
      const g = 1 / (1 - e);
      for (let p = 0; p < m; p++) for (let q = 0; q < m; q++) inv[p * m + q]! += u[p]! * u[q]! * g;
      fisher.logDet += Math.log(1 - e);
      for (const j of present) {
        const oj = j * m;
        let d = 0;
        for (let p = 0; p < m; p++) d += phi[oj + p]! * u[p]!;
        ed[j]! += d * d * g;
      }
    }
    steps.push({ removed: i, edRemoved: e, remaining: present.length, logDetFisher: fisher.logDet, ...(record ? { ed: record } : {}) });
  }
  refresh('the kept candidates');
  if (steps.length) steps[steps.length - 1]!.logDetFisher = fisher.logDet;

  const kept = Int32Array.from(present).sort();
  const keptEd = Float64Array.from(kept, (i) => ed[i]!);
  const byEd = Array.from(kept).sort((a, b) => ed[b]! - ed[a]! || a - b);
  const ranking = Int32Array.from([...byEd, ...removed.slice().reverse()]);
  return {
    kept,
    ed: keptEd,
    removed: Int32Array.from(removed),
    ranking,
    steps,
    initialEd,
    initialLogDetFisher,
    logDetFisher: fisher.logDet,
    informationKept: Math.min(1, Math.exp(fisher.logDet - initialLogDetFisher)),
  };
}
