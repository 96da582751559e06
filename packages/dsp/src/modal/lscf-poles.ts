// Poles, participation factors and shape estimates of one model order of the poly-reference LSCF
// estimator, from its denominator α and numerators β (lscf-normal.ts). Internal.
import { EigenvalueDecomposition, Matrix } from 'ml-matrix';
import type { Complex } from '../types.ts';
import { eigenvalues } from './linalg-eig.ts';
import { gramians, hermitianEigen, normalise } from './linalg.ts';
import type { LscfCoefficients } from './lscf-normal.ts';
import type { DiagramPole } from './stability.ts';

/**
 * Poles of order n: the eigenvalues z_r of the block companion matrix of A(z) = Σ_j α_j z^j (α_n = I),
 * λ_r = ln(z_r)/Δt (rad/s) for the basis Ω = e^{+jωΔt}, f = |λ|/2π (Hz), ζ = −Re λ/|λ|. Kept: Im z > 0
 * (one of each conjugate pair), |z| < 1 (stable), f inside [lo, hi], 0 < ζ ≤ maxZeta; sorted by f.
 * Participation l_r: left null vector of A(z_r); shape estimate ψ_r = B(z_r)·L_r (L_r the right null vector).
 */
export function polesOfOrder(
  coef: LscfCoefficients,
  ni: number,
  dt: number,
  lo: number,
  hi: number,
  maxZeta: number,
): DiagramPole[] {
  const { n, alpha, beta } = coef;
  const no = beta.length;
  const na = n * ni;
  // Block companion matrix of A(z) = Σ α_j z^j with α_n = I: its eigenvalues are the roots z_r.
  const C = new Float64Array(na * na);
  for (let u = 0; u + ni < na; u++) C[u * na + u + ni] = 1;
  for (let i = 0; i < ni; i++) {
    for (let j = 0; j < n; j++) {
      for (let l = 0; l < ni; l++) C[(na - ni + i) * na + j * ni + l] = -alpha[(j * ni + i) * ni + l];
    }
  }
  let ev = eigenvalues(C, na);
  if (!ev) {
    // the QR iteration did not converge: the general routine (with vectors) of ml-matrix
    const evd = new EigenvalueDecomposition(new Matrix(Array.from({ length: na }, (_, u) => Array.from(C.subarray(u * na, (u + 1) * na)))));
    ev = { re: Float64Array.from(evd.realEigenvalues), im: Float64Array.from(evd.imaginaryEigenvalues) };
  }
  const zr = ev.re;
  const zi = ev.im;
  const poles: DiagramPole[] = [];
  for (let r = 0; r < na; r++) {
    if (!(zi[r] > 0)) continue;
    const mod = Math.hypot(zr[r], zi[r]);
    const lre = Math.log(mod) / dt;
    const lim = Math.atan2(zi[r], zr[r]) / dt;
    const wn = Math.hypot(lre, lim);
    const fHz = wn / (2 * Math.PI);
    const zeta = -lre / wn;
    if (!(fHz >= lo && fHz <= hi && zeta > 0 && zeta <= maxZeta)) continue;
    const { right, left } = nullVectors(alpha, n, ni, zr[r], zi[r]);
    const shape = { re: new Float64Array(no), im: new Float64Array(no) };
    for (let o = 0; o < no; o++) {
      // ψ_o = Σ_i B_oi(z)·L_i, B_oi(z) by Horner
      let sr = 0;
      let si = 0;
      for (let i = 0; i < ni; i++) {
        let br = 0;
        let bi = 0;
        for (let j = n; j >= 0; j--) {
          const t = br * zr[r] - bi * zi[r] + beta[o][j * ni + i];
          bi = br * zi[r] + bi * zr[r];
          br = t;
        }
        sr += br * right.re[i] - bi * right.im[i];
        si += br * right.im[i] + bi * right.re[i];
      }
      shape.re[o] = sr;
      shape.im[o] = si;
    }
    poles.push({
      order: n,
      fHz,
      zeta,
      stable: 'new',
      lambda: { re: lre, im: lim },
      participation: normalise(left),
      shape: normalise(shape),
    });
  }
  poles.sort((a, b) => a.fHz - b.fHz);
  return poles;
}

/** Right and left null vectors of A(z) = Σ_j α_j z^j (ni × ni, α_n = I), from the smallest eigenpairs of AᴴA and AAᴴ. */
function nullVectors(alpha: Float64Array, n: number, ni: number, zre: number, zim: number): { right: Complex; left: Complex } {
  if (ni === 1) {
    const one = () => ({ re: Float64Array.of(1), im: Float64Array.of(0) });
    return { right: one(), left: one() };
  }
  const ar = new Float64Array(ni * ni);
  const ai = new Float64Array(ni * ni);
  for (let i = 0; i < ni; i++) {
    for (let l = 0; l < ni; l++) {
      let br = 0;
      let bi = 0;
      for (let j = n; j >= 0; j--) {
        const t = br * zre - bi * zim + alpha[(j * ni + i) * ni + l];
        bi = br * zim + bi * zre;
        br = t;
      }
      ar[i * ni + l] = br;
      ai[i * ni + l] = bi;
    }
  }
  // AᴴA gives the right null vector, AAᴴ u with uᴴA = 0 (the left null vector is conj(u)).
  const g = gramians(ar, ai, ni);
  const e1 = hermitianEigen(g.ahaRe, g.ahaIm, ni, true);
  const e2 = hermitianEigen(g.aahRe, g.aahIm, ni, true);
  const u = e2.vim[ni - 1];
  return {
    right: { re: e1.vre[ni - 1], im: e1.vim[ni - 1] },
    left: { re: e2.vre[ni - 1], im: u.map((x) => -x) },
  };
}

