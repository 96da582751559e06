// Small dense linear algebra on row-major Float64Arrays, without allocation in the inner loops. Internal.
import type { Complex } from '../types.ts';

/** In-place Cholesky factor of the symmetric matrix a (n×n, row-major): lower triangle holds L, a = L·Lᵀ. False if not positive definite. */
export function cholesky(a: Float64Array, n: number): boolean {
  for (let j = 0; j < n; j++) {
    let d = a[j * n + j];
    for (let k = 0; k < j; k++) d -= a[j * n + k] * a[j * n + k];
    if (!(d > 0)) return false;
    const ljj = Math.sqrt(d);
    a[j * n + j] = ljj;
    for (let i = j + 1; i < n; i++) {
      let s = a[i * n + j];
      for (let k = 0; k < j; k++) s -= a[i * n + k] * a[j * n + k];
      a[i * n + j] = s / ljj;
    }
  }
  return true;
}

/** Solves L·X = B in place (B is n×m row-major), L from `cholesky`. */
export function forwardSubst(l: Float64Array, n: number, b: Float64Array, m: number): void {
  for (let i = 0; i < n; i++) {
    const lii = l[i * n + i];
    for (let k = 0; k < i; k++) {
      const lik = l[i * n + k];
      if (lik === 0) continue;
      for (let c = 0; c < m; c++) b[i * m + c] -= lik * b[k * m + c];
    }
    for (let c = 0; c < m; c++) b[i * m + c] /= lii;
  }
}

/** Solves Lᵀ·X = B in place (B is n×m row-major), L from `cholesky`. */
export function backSubstT(l: Float64Array, n: number, b: Float64Array, m: number): void {
  for (let i = n - 1; i >= 0; i--) {
    for (let k = i + 1; k < n; k++) {
      const lki = l[k * n + i];
      if (lki === 0) continue;
      for (let c = 0; c < m; c++) b[i * m + c] -= lki * b[k * m + c];
    }
    const lii = l[i * n + i];
    for (let c = 0; c < m; c++) b[i * m + c] /= lii;
  }
}

/**
 * Solves A·X = B (A n×n, B n×m, row-major; both overwritten, X returned in B) by LU with partial pivoting.
 * Returns false when a pivot is zero or not finite (a singular system).
 */
export function luSolve(a: Float64Array, n: number, b: Float64Array, m: number): boolean {
  for (let j = 0; j < n; j++) {
    let p = j;
    let best = Math.abs(a[j * n + j]);
    for (let i = j + 1; i < n; i++) {
      const v = Math.abs(a[i * n + j]);
      if (v > best) {
        best = v;
        p = i;
      }
    }
    if (!(best > 0) || !Number.isFinite(best)) return false;
    if (p !== j) {
      for (let c = 0; c < n; c++) {
        const t = a[j * n + c];
        a[j * n + c] = a[p * n + c];
        a[p * n + c] = t;
      }
      for (let c = 0; c < m; c++) {
        const t = b[j * m + c];
        b[j * m + c] = b[p * m + c];
        b[p * m + c] = t;
      }
    }
    const piv = a[j * n + j];
    for (let i = j + 1; i < n; i++) {
      const fct = a[i * n + j] / piv;
      if (fct === 0) continue;
      for (let c = j + 1; c < n; c++) a[i * n + c] -= fct * a[j * n + c];
      for (let c = 0; c < m; c++) b[i * m + c] -= fct * b[j * m + c];
    }
  }
  for (let i = n - 1; i >= 0; i--) {
    for (let c = 0; c < m; c++) {
      let s = b[i * m + c];
      for (let k = i + 1; k < n; k++) s -= a[i * n + k] * b[k * m + c];
      b[i * m + c] = s / a[i * n + i];
    }
  }
  for (let i = 0; i < n * m; i++) if (!Number.isFinite(b[i])) return false;
  return true;
}

/**
 * Eigen-decomposition of a real symmetric matrix by cyclic Jacobi rotations (a is n×n row-major and is
 * destroyed). Returns eigenvalues (unsorted, on the diagonal order) and, if asked, eigenvectors as the
 * columns of v (n×n row-major).
 */
export function jacobiEigen(a: Float64Array, n: number, v: Float64Array | null): Float64Array {
  if (v) {
    v.fill(0);
    for (let i = 0; i < n; i++) v[i * n + i] = 1;
  }
  for (let sweep = 0; sweep < 60; sweep++) {
    let off = 0;
    let diag = 0;
    for (let i = 0; i < n; i++) {
      diag += a[i * n + i] * a[i * n + i];
      for (let j = i + 1; j < n; j++) off += a[i * n + j] * a[i * n + j];
    }
    if (off <= 1e-32 * diag || off === 0) break;
    for (let p = 0; p < n - 1; p++) {
      for (let q = p + 1; q < n; q++) {
        const apq = a[p * n + q];
        if (apq === 0) continue;
        const app = a[p * n + p];
        const aqq = a[q * n + q];
        const theta = (aqq - app) / (2 * apq);
        const t = Math.sign(theta || 1) / (Math.abs(theta) + Math.sqrt(theta * theta + 1));
        const c = 1 / Math.sqrt(t * t + 1);
        const s = t * c;
        for (let k = 0; k < n; k++) {
          const akp = a[k * n + p];
          const akq = a[k * n + q];
          a[k * n + p] = c * akp - s * akq;
          a[k * n + q] = s * akp + c * akq;
        }
        for (let k = 0; k < n; k++) {
          const apk = a[p * n + k];
          const aqk = a[q * n + k];
          a[p * n + k] = c * apk - s * aqk;
          a[q * n + k] = s * apk + c * aqk;
        }
        if (v) {
          for (let k = 0; k < n; k++) {
            const vkp = v[k * n + p];
            const vkq = v[k * n + q];
            v[k * n + p] = c * vkp - s * vkq;
            v[k * n + q] = s * vkp + c * vkq;
          }
        }
      }
    }
  }
  const d = new Float64Array(n);
  for (let i = 0; i < n; i++) d[i] = a[i * n + i];
  return d;
}

/**
 * Eigenvalues (descending) and eigenvectors of a Hermitian matrix G = P + jQ (n×n, row-major parts),
 * through the real symmetric embedding [[P, −Q], [Q, P]], whose spectrum is that of G with every value
 * doubled; a vector [x; y] of the embedding is the complex eigenvector x + jy.
 */
export function hermitianEigen(
  p: Float64Array,
  q: Float64Array,
  n: number,
  wantVectors: boolean,
): { values: Float64Array; vre: Float64Array[]; vim: Float64Array[] } {
  const m = 2 * n;
  const a = new Float64Array(m * m);
  for (let i = 0; i < n; i++) {
    for (let j = 0; j < n; j++) {
      const pr = p[i * n + j];
      const qi = q[i * n + j];
      a[i * m + j] = pr;
      a[(i + n) * m + j + n] = pr;
      a[i * m + j + n] = -qi;
      a[(i + n) * m + j] = qi;
    }
  }
  const v = wantVectors ? new Float64Array(m * m) : null;
  const d = jacobiEigen(a, m, v);
  const order = Array.from(d.keys()).sort((x, y) => d[y] - d[x]);
  const values = new Float64Array(n);
  const vre: Float64Array[] = [];
  const vim: Float64Array[] = [];
  // Each eigenvalue of G appears twice; the pair's vectors span {x, jx}, so either one serves.
  for (let r = 0; r < n; r++) {
    const c = order[2 * r];
    values[r] = 0.5 * (d[order[2 * r]] + d[order[2 * r + 1]]);
    if (v) {
      const xr = new Float64Array(n);
      const xi = new Float64Array(n);
      for (let i = 0; i < n; i++) {
        xr[i] = v[i * m + c];
        xi[i] = v[(i + n) * m + c];
      }
      vre.push(xr);
      vim.push(xi);
    }
  }
  return { values, vre, vim };
}

/** Scales a complex vector so its largest-magnitude entry is real and equal to 1 (a zero vector is left unchanged). */
export function normalise(v: Complex): Complex {
  let best = -1;
  let br = 0;
  let bi = 0;
  for (let i = 0; i < v.re.length; i++) {
    const a = v.re[i] * v.re[i] + v.im[i] * v.im[i];
    if (a > best) {
      best = a;
      br = v.re[i];
      bi = v.im[i];
    }
  }
  if (!(best > 0)) return { re: Float64Array.from(v.re), im: Float64Array.from(v.im) };
  // multiply by 1/(br + j·bi) = (br − j·bi)/best
  const re = new Float64Array(v.re.length);
  const im = new Float64Array(v.re.length);
  for (let i = 0; i < re.length; i++) {
    re[i] = (v.re[i] * br + v.im[i] * bi) / best;
    im[i] = (v.im[i] * br - v.re[i] * bi) / best;
  }
  return { re, im };
}

/** Σ_c conj(X_ca)·X_cb, i.e. XᴴX, for X = A (transposed false) or Aᵀ, A = ar + j·ai (n×n, row-major parts). */
function conjGram(ar: Float64Array, ai: Float64Array, n: number, transposed: boolean): [Float64Array, Float64Array] {
  const gr = new Float64Array(n * n);
  const gi = new Float64Array(n * n);
  const at = (c: number, a: number) => (transposed ? a * n + c : c * n + a);
  for (let a = 0; a < n; a++) {
    for (let b = 0; b < n; b++) {
      let sr = 0;
      let si = 0;
      for (let c = 0; c < n; c++) {
        const xr = ar[at(c, a)];
        const xi = ai[at(c, a)];
        const yr = ar[at(c, b)];
        const yi = ai[at(c, b)];
        sr += xr * yr + xi * yi;
        si += xr * yi - xi * yr;
      }
      gr[a * n + b] = sr;
      gi[a * n + b] = si;
    }
  }
  return [gr, gi];
}

/**
 * AᴴA and AAᴴ of a complex n×n matrix A = ar + j·ai (row-major parts), as real and imaginary parts.
 * AAᴴ = conj((Aᵀ)ᴴAᵀ), since Σ_c A_ac·conj(A_bc) is the conjugate of Σ_c conj(A_ac)·A_bc.
 */
export function gramians(ar: Float64Array, ai: Float64Array, n: number): { ahaRe: Float64Array; ahaIm: Float64Array; aahRe: Float64Array; aahIm: Float64Array } {
  const [ahaRe, ahaIm] = conjGram(ar, ai, n, false);
  const [aahRe, conjIm] = conjGram(ar, ai, n, true);
  return { ahaRe, ahaIm, aahRe, aahIm: conjIm.map((v) => -v) };
}
