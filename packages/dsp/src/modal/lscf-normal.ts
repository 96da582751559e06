// The reduced normal equations of the poly-reference least-squares complex frequency-domain estimator
// (Guillaume, Verboven, Vanlanduit, Van der Auweraer & Peeters, IMAC XXI 2003; Peeters, Van der Auweraer,
// Guillaume & Leuridan, Shock and Vibration 11, 2004), built once for the largest model order and solved
// for every order from nested blocks. Internal: `stabilizationDiagram` (lscf.ts) is the public entry.
//
// Per response o (FRF row H_o over the N_i references, already multiplied by its scalar weight w_o) and
// line k, with Ω_k = e^{jω_kΔt}: X_o = [Ω_k^0 … Ω_k^n] (numerator basis) and Y_o = −H_o ⊗ X_o. Then
//   R = Re(XᴴX),  S_o = Re(XᴴY_o),  T_o = Re(Y_oᴴY_o),  M = Σ_o (T_o − S_oᵀR⁻¹S_o)
// and the denominator coefficients solve M·α = 0 with α_n = I. R, S_o and T = Σ_o T_o are block Toeplitz
// in the powers (entry (a, b) depends on b − a only), so they come from O(n) sums per FRF.
//
// Nesting: R of order n is the leading (n+1)×(n+1) block of R of order n_max, so its Cholesky factor L_n is
// the leading block of L_max, and Q_o = L_max⁻¹·S_o restricted to rows and columns of order n is
// L_n⁻¹·S_o^(n). Hence S_oᵀR⁻¹S_o of order n = Σ_{a ≤ n} Q_o[a,·]ᵀQ_o[a,·] on the leading block: one
// triangular solve per response and one rank-one update per (response, row) serve all orders.
// R is never inverted explicitly; the reduced system is Jacobi-scaled and solved by Cholesky (LU with
// partial pivoting if rounding makes it indefinite).
import { backSubstT, cholesky, forwardSubst, luSolve } from './linalg.ts';

/** Toeplitz sums of the normal equations up to power n_max. */
export interface LscfSums {
  ni: number;
  no: number;
  nd: number;
  /** r(d) = Σ_k cos(dθ_k), d = 0..n_max. */
  rr: Float64Array;
  /** Re s_oi(±d) = sp ∓ sm with s_oi(d) = Σ_k Ω_k^d H_oi(k); index (o·N_i + i)·nd + d. */
  sp: Float64Array;
  sm: Float64Array;
  /** Re t_il(±d) = tp ∓ tm with t_il(d) = Σ_k Ω_k^d Σ_o conj(H_oi)H_ol; index (i·N_i + l)·nd + d. */
  tp: Float64Array;
  tm: Float64Array;
}

/**
 * The sums of `LscfSums` for the lines k0..k1−1 of the FRF grid re/im (rows o, columns i), each row
 * multiplied by weights[o], with θ_k = 2π·(f_k)·Δt.
 */
export function lscfSums(
  re: Float64Array[][],
  im: Float64Array[][],
  f: Float64Array,
  k0: number,
  k1: number,
  dt: number,
  weights: Float64Array,
  nmax: number,
): LscfSums {
  const no = re.length;
  const ni = re[0].length;
  const nf = k1 - k0;
  const nd = nmax + 1;
  // Powers Ω_k^d by recurrence from Ω_k, re-seeded every 16 steps against rounding drift.
  const cs = new Float64Array(nd * nf);
  const sn = new Float64Array(nd * nf);
  for (let k = 0; k < nf; k++) {
    const th = 2 * Math.PI * f[k0 + k] * dt;
    const c1 = Math.cos(th);
    const s1 = Math.sin(th);
    let c = 1;
    let s = 0;
    for (let d = 0; d < nd; d++) {
      if (d > 0 && d % 16 === 0) {
        c = Math.cos(d * th);
        s = Math.sin(d * th);
      }
      cs[d * nf + k] = c;
      sn[d * nf + k] = s;
      const cn = c * c1 - s * s1;
      s = s * c1 + c * s1;
      c = cn;
    }
  }
  const rr = new Float64Array(nd);
  for (let d = 0; d < nd; d++) {
    let a = 0;
    const off = d * nf;
    for (let k = 0; k < nf; k++) a += cs[off + k];
    rr[d] = a;
  }
  const sp = new Float64Array(no * ni * nd);
  const sm = new Float64Array(no * ni * nd);
  const hr = new Float64Array(nf);
  const hi = new Float64Array(nf);
  // P_il(k) = Σ_o conj(H_oi)·H_ol (weighted), accumulated while the rows pass.
  const pr = new Float64Array(ni * ni * nf);
  const pim = new Float64Array(ni * ni * nf);
  for (let o = 0; o < no; o++) {
    const w = weights[o];
    for (let i = 0; i < ni; i++) {
      const xr = re[o][i];
      const xi = im[o][i];
      for (let k = 0; k < nf; k++) {
        hr[k] = w * xr[k0 + k];
        hi[k] = w * xi[k0 + k];
      }
      const base = (o * ni + i) * nd;
      for (let d = 0; d < nd; d++) {
        let a = 0;
        let b = 0;
        const off = d * nf;
        for (let k = 0; k < nf; k++) {
          a += cs[off + k] * hr[k];
          b += sn[off + k] * hi[k];
        }
        sp[base + d] = a;
        sm[base + d] = b;
      }
    }
    const w2 = w * w;
    for (let i = 0; i < ni; i++) {
      for (let l = 0; l < ni; l++) {
        const ar = re[o][i];
        const ai = im[o][i];
        const br = re[o][l];
        const bi = im[o][l];
        const off = (i * ni + l) * nf;
        for (let k = 0; k < nf; k++) {
          const q = k0 + k;
          pr[off + k] += w2 * (ar[q] * br[q] + ai[q] * bi[q]);
          pim[off + k] += w2 * (ar[q] * bi[q] - ai[q] * br[q]);
        }
      }
    }
  }
  const tp = new Float64Array(ni * ni * nd);
  const tm = new Float64Array(ni * ni * nd);
  for (let il = 0; il < ni * ni; il++) {
    for (let d = 0; d < nd; d++) {
      let a = 0;
      let b = 0;
      const off = d * nf;
      const po = il * nf;
      for (let k = 0; k < nf; k++) {
        a += cs[off + k] * pr[po + k];
        b += sn[off + k] * pim[po + k];
      }
      tp[il * nd + d] = a;
      tm[il * nd + d] = b;
    }
  }
  return { ni, no, nd, rr, sp, sm, tp, tm };
}

/** Denominator α ((n+1)·N_i × N_i, rows (j, i), α_n = I) and numerators β (per response (n+1) × N_i) of one order. */
export interface LscfCoefficients {
  n: number;
  alpha: Float64Array;
  /** beta[o] is (n+1)·N_i values, row j holds β_oj (1 × N_i), in units of the unweighted FRFs. */
  beta: Float64Array[];
}

/** Relative ridge added to R before its Cholesky factor (see `ReducedNormalEquations`). */
const RIDGE = 1e-11;

/**
 * The reduced normal equations for every order up to n_max; call `solve` with ascending orders.
 *
 * R gets a ridge δ = 1e-11·r(0) on its diagonal before the Cholesky factor: on a short arc of the unit
 * circle (a narrow band) the powers Ω^j are nearly dependent and R is numerically singular; the ridge lets
 * the numerators do without the directions the data cannot tell apart (a Tikhonov-regularised numerator),
 * and is negligible on a wide band, where R is nearly diagonal. It is diagonal, so nesting is kept.
 */
export class ReducedNormalEquations {
  private readonly L: Float64Array;
  private readonly Q: Float64Array;
  private readonly P: Float64Array;
  private readonly mFull: number;
  private rowsDone = 0;

  constructor(
    private readonly s: LscfSums,
    private readonly weights: Float64Array,
  ) {
    const { nd, ni, no, rr, sp, sm } = s;
    const mFull = nd * ni;
    this.mFull = mFull;
    let L: Float64Array | null = null;
    for (let ridge = RIDGE; ridge < 1 && !L; ridge *= 100) {
      const a = new Float64Array(nd * nd);
      for (let r = 0; r < nd; r++) for (let c = 0; c < nd; c++) a[r * nd + c] = rr[Math.abs(c - r)];
      for (let r = 0; r < nd; r++) a[r * nd + r] += ridge * rr[0];
      if (cholesky(a, nd)) L = a;
    }
    if (!L) throw new RangeError("the band's lines do not determine the numerator (R is not positive definite)");
    this.L = L;
    // Q_o = L⁻¹·S_o (nd × mFull) for every response, S_o[a, (b, l)] = −Re s_ol(b − a).
    this.Q = new Float64Array(no * nd * mFull);
    for (let o = 0; o < no; o++) {
      const q = this.Q.subarray(o * nd * mFull, (o + 1) * nd * mFull);
      for (let a = 0; a < nd; a++) {
        for (let b = 0; b < nd; b++) {
          const d = b - a;
          const ad = Math.abs(d);
          for (let l = 0; l < ni; l++) {
            const x = (o * ni + l) * nd + ad;
            q[a * mFull + b * ni + l] = -(d >= 0 ? sp[x] - sm[x] : sp[x] + sm[x]);
          }
        }
      }
      forwardSubst(L, nd, q, mFull);
    }
    this.P = new Float64Array(mFull * mFull);
  }

  /** Adds rows up to `a` of every Q_o to P = Σ_o Σ_rows Q_o[row,·]ᵀQ_o[row,·] (upper triangle). */
  private accumulate(upTo: number): void {
    const { mFull, P, Q } = this;
    const { nd, no } = this.s;
    for (let a = this.rowsDone; a <= upTo; a++) {
      for (let o = 0; o < no; o++) {
        const row = (o * nd + a) * mFull;
        for (let u = 0; u < mFull; u++) {
          const qu = Q[row + u];
          if (qu === 0) continue;
          const pu = u * mFull;
          for (let v = u; v < mFull; v++) P[pu + v] += qu * Q[row + v];
        }
      }
    }
    this.rowsDone = Math.max(this.rowsDone, upTo + 1);
  }

  /** α and β of order n (2 ≤ n ≤ n_max; orders must come in ascending order). */
  solve(n: number): LscfCoefficients {
    const { ni, no, nd, tp, tm } = this.s;
    const { mFull, P, Q, L } = this;
    if (n + 1 < this.rowsDone) throw new Error(`orders must ascend: order ${n} after rows ${this.rowsDone}`);
    this.accumulate(n);
    const n1 = n + 1;
    const m = n1 * ni;
    const na = n * ni;
    // M = T − P on the leading block; T[(a,i),(b,l)] = Re t_il(b − a).
    const M = new Float64Array(m * m);
    for (let a = 0; a < n1; a++) {
      for (let b = a; b < n1; b++) {
        const d = b - a;
        for (let i = 0; i < ni; i++) {
          for (let l = 0; l < ni; l++) {
            const u = a * ni + i;
            const v = b * ni + l;
            if (v < u) continue;
            const x = (i * ni + l) * nd + d;
            M[u * m + v] = tp[x] - tm[x] - P[u * mFull + v];
          }
        }
      }
    }
    for (let u = 0; u < m; u++) for (let v = u + 1; v < m; v++) M[v * m + u] = M[u * m + v];
    // α_n = I: (D·M_aa·D)·(D⁻¹α_a) = −D·M_ab with the Jacobi scaling D = diag(M_aa)^{-1/2}.
    const dsc = new Float64Array(na);
    for (let u = 0; u < na; u++) dsc[u] = M[u * m + u] > 0 ? 1 / Math.sqrt(M[u * m + u]) : 1;
    const Maa = new Float64Array(na * na);
    const rhs = new Float64Array(na * ni);
    for (let u = 0; u < na; u++) {
      for (let v = 0; v < na; v++) Maa[u * na + v] = dsc[u] * M[u * m + v] * dsc[v];
      for (let i = 0; i < ni; i++) rhs[u * ni + i] = -dsc[u] * M[u * m + na + i];
    }
    const copy = Float64Array.from(Maa);
    const rcopy = Float64Array.from(rhs);
    if (cholesky(Maa, na)) {
      forwardSubst(Maa, na, rhs, ni);
      backSubstT(Maa, na, rhs, ni);
    } else {
      rhs.set(rcopy);
      if (!luSolve(copy, na, rhs, ni)) {
        throw new RangeError(`order ${n}: the reduced normal equations are singular (is every FRF zero in the band?)`);
      }
    }
    const alpha = new Float64Array(m * ni);
    for (let u = 0; u < na; u++) for (let i = 0; i < ni; i++) alpha[u * ni + i] = dsc[u] * rhs[u * ni + i];
    for (let i = 0; i < ni; i++) alpha[(na + i) * ni + i] = 1;
    // β_o = −R_n⁻¹S_oα = −L_n⁻ᵀ(Q_o^(n)α), then ÷ w_o back to the unweighted FRFs.
    const Ln = new Float64Array(n1 * n1);
    for (let a = 0; a < n1; a++) for (let b = 0; b <= a; b++) Ln[a * n1 + b] = L[a * nd + b];
    const beta: Float64Array[] = [];
    for (let o = 0; o < no; o++) {
      const qa = new Float64Array(n1 * ni);
      for (let a = 0; a < n1; a++) {
        const row = (o * nd + a) * mFull;
        for (let c = 0; c < ni; c++) {
          let s = 0;
          for (let u = 0; u < m; u++) s += Q[row + u] * alpha[u * ni + c];
          qa[a * ni + c] = s;
        }
      }
      backSubstT(Ln, n1, qa, ni);
      const w = this.weights[o];
      for (let x = 0; x < qa.length; x++) qa[x] = -qa[x] / w;
      beta.push(qa);
    }
    return { n, alpha, beta };
  }
}
