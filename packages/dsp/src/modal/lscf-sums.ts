// Toeplitz sums of the poly-reference LSCF normal equations (see lscf-normal.ts): r(d), s_oi(d), t_il(d) over
// the lines of the band, d = 0..n_max, for the basis Ω_k = e^{jω_kΔt}. Internal.

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
  // Weighted FRFs, four at a time per pass over the table of powers (the table is the memory traffic).
  const nq = no * ni;
  const hr = new Float64Array(4 * nf);
  const hi = new Float64Array(4 * nf);
  for (let q0 = 0; q0 < nq; q0 += 4) {
    const cnt = Math.min(4, nq - q0);
    hr.fill(0);
    hi.fill(0);
    for (let c = 0; c < cnt; c++) {
      const o = Math.floor((q0 + c) / ni);
      const i = (q0 + c) % ni;
      const w = weights[o];
      const xr = re[o][i];
      const xi = im[o][i];
      for (let k = 0; k < nf; k++) {
        hr[c * nf + k] = w * xr[k0 + k];
        hi[c * nf + k] = w * xi[k0 + k];
      }
    }
    for (let d = 0; d < nd; d++) {
      let a0 = 0, a1 = 0, a2 = 0, a3 = 0;
      let b0 = 0, b1 = 0, b2 = 0, b3 = 0;
      const off = d * nf;
      for (let k = 0; k < nf; k++) {
        const c = cs[off + k];
        const sv = sn[off + k];
        a0 += c * hr[k];
        b0 += sv * hi[k];
        a1 += c * hr[nf + k];
        b1 += sv * hi[nf + k];
        a2 += c * hr[2 * nf + k];
        b2 += sv * hi[2 * nf + k];
        a3 += c * hr[3 * nf + k];
        b3 += sv * hi[3 * nf + k];
      }
      const a = [a0, a1, a2, a3];
      const b = [b0, b1, b2, b3];
      for (let c = 0; c < cnt; c++) {
        sp[(q0 + c) * nd + d] = a[c];
        sm[(q0 + c) * nd + d] = b[c];
      }
    }
  }
  // P_il(k) = Σ_o conj(H_oi)·H_ol (weighted).
  const pr = new Float64Array(ni * ni * nf);
  const pim = new Float64Array(ni * ni * nf);
  for (let o = 0; o < no; o++) {
    const w2 = weights[o] * weights[o];
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
