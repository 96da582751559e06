import { toGrid } from './frf-set.ts';
import { hermitianEigen } from './linalg.ts';
import type { FrfSet } from './types.ts';

/** Curves of a mode indicator over the frequency axis `f` (Hz). */
export interface IndicatorCurves {
  f: Float64Array;
  values: Float64Array[];
}

/**
 * Complex mode indicator function: at each line, the singular values of the N_o × N_i FRF matrix
 * H(ω_k) (rows: response DOFs, columns: reference DOFs), sorted descending; `values[c][k]` is the
 * (c+1)-th largest at line k, so there are min(N_o, N_i) curves. Units are those of the FRFs (the
 * singular values, not their squares; Shih et al. define CMIF as the eigenvalues of HᴴH, i.e. the
 * squares). Peaks mark modes; two curves peaking at about one frequency reveal close or repeated modes.
 *
 * Computed as √eig(HᴴH) (or √eig(HHᴴ), the smaller) by Jacobi rotations of the real symmetric
 * embedding of the Hermitian matrix. With one reference the single value is √(Σ_j |H_j|²) exactly
 * (docs/methods.md#cmif). Source: Shih, Tsuei, Allemang & Brown 1988, MSSP 2(4) (docs/methods.md#cmif).
 */
export function cmif(frfSet: FrfSet): IndicatorCurves {
  const g = toGrid(frfSet);
  const nl = g.f.length;
  const no = g.rows.length;
  const ni = g.cols.length;
  // The grid always has ni ≤ no (it is transposed otherwise), so HᴴH (ni × ni) is the smaller product.
  const values = Array.from({ length: ni }, () => new Float64Array(nl));
  const p = new Float64Array(ni * ni);
  const q = new Float64Array(ni * ni);
  for (let k = 0; k < nl; k++) {
    p.fill(0);
    q.fill(0);
    for (let a = 0; a < ni; a++) {
      for (let b = a; b < ni; b++) {
        // (HᴴH)_ab = Σ_o conj(H_oa)·H_ob
        let sr = 0;
        let si = 0;
        for (let o = 0; o < no; o++) {
          const ar = g.re[o][a][k];
          const ai = g.im[o][a][k];
          const br = g.re[o][b][k];
          const bi = g.im[o][b][k];
          sr += ar * br + ai * bi;
          si += ar * bi - ai * br;
        }
        p[a * ni + b] = sr;
        p[b * ni + a] = sr;
        q[a * ni + b] = si;
        q[b * ni + a] = -si;
      }
    }
    const { values: ev } = hermitianEigen(p, q, ni, false);
    for (let c = 0; c < ni; c++) values[c][k] = Math.sqrt(Math.max(0, ev[c]));
  }
  return { f: Float64Array.from(g.f), values };
}

/**
 * Summation function Σ_{o,i} |H_oi(ω_k)| over all FRFs of the set, one curve (units of the FRFs).
 * A simple indicator to draw under a stabilization diagram (docs/methods.md#cmif, "the summation function").
 */
export function sumFrf(frfSet: FrfSet): IndicatorCurves {
  const g = toGrid(frfSet);
  const s = new Float64Array(g.f.length);
  for (let o = 0; o < g.rows.length; o++) {
    for (let i = 0; i < g.cols.length; i++) {
      const re = g.re[o][i];
      const im = g.im[o][i];
      for (let k = 0; k < s.length; k++) s[k] += Math.hypot(re[k], im[k]);
    }
  }
  return { f: Float64Array.from(g.f), values: [s] };
}
