// Test helpers for the modal tests: exact FRFs of small spring–mass–damper systems (direct inverse of the
// dynamic stiffness), the free–free Euler–Bernoulli beam and modal fixture loading. Lives outside src/ so
// nothing shipped can import it; the PRNG and fixture root come from ./helpers.ts.
import { resolve } from 'node:path';
import type { Complex } from '../src/types.ts';
import type { FrfSet, ModalFrfKind } from '../src/modal/types.ts';
import { loadFixture, mulberry32, repoRoot } from './helpers.ts';

export { repoRoot };
export const modalFixtureDir = resolve(repoRoot, 'tests/fixtures/modal');

export function loadModalFixture<T = any>(name: string, dir = modalFixtureDir): T {
  return loadFixture<T>(name, dir);
}

export function axis(f0: number, df: number, n: number): Float64Array {
  const f = new Float64Array(n);
  for (let k = 0; k < n; k++) f[k] = f0 + k * df;
  return f;
}

/** Solves the complex system (Ar + jAi)·x = b (n×n row-major, copied) by Gaussian elimination with partial pivoting. */
export function complexSolve(Ar: Float64Array, Ai: Float64Array, n: number, br: Float64Array, bi: Float64Array): Complex {
  const ar = Float64Array.from(Ar);
  const ai = Float64Array.from(Ai);
  const xr = Float64Array.from(br);
  const xi = Float64Array.from(bi);
  for (let j = 0; j < n; j++) {
    let p = j;
    for (let i = j + 1; i < n; i++) if (Math.hypot(ar[i * n + j], ai[i * n + j]) > Math.hypot(ar[p * n + j], ai[p * n + j])) p = i;
    if (p !== j) {
      for (let c = 0; c < n; c++) {
        [ar[j * n + c], ar[p * n + c]] = [ar[p * n + c], ar[j * n + c]];
        [ai[j * n + c], ai[p * n + c]] = [ai[p * n + c], ai[j * n + c]];
      }
      [xr[j], xr[p]] = [xr[p], xr[j]];
      [xi[j], xi[p]] = [xi[p], xi[j]];
    }
    const pr = ar[j * n + j];
    const pi = ai[j * n + j];
    const pd = pr * pr + pi * pi;
    for (let i = j + 1; i < n; i++) {
      // factor = a_ij / a_jj
      const fr = (ar[i * n + j] * pr + ai[i * n + j] * pi) / pd;
      const fi = (ai[i * n + j] * pr - ar[i * n + j] * pi) / pd;
      for (let c = j; c < n; c++) {
        const ur = ar[j * n + c];
        const ui = ai[j * n + c];
        ar[i * n + c] -= fr * ur - fi * ui;
        ai[i * n + c] -= fr * ui + fi * ur;
      }
      const ur = xr[j];
      const ui = xi[j];
      xr[i] -= fr * ur - fi * ui;
      xi[i] -= fr * ui + fi * ur;
    }
  }
  for (let i = n - 1; i >= 0; i--) {
    let sr = xr[i];
    let si = xi[i];
    for (let c = i + 1; c < n; c++) {
      sr -= ar[i * n + c] * xr[c] - ai[i * n + c] * xi[c];
      si -= ar[i * n + c] * xi[c] + ai[i * n + c] * xr[c];
    }
    const pr = ar[i * n + i];
    const pi = ai[i * n + i];
    const pd = pr * pr + pi * pi;
    xr[i] = (sr * pr + si * pi) / pd;
    xi[i] = (si * pr - sr * pi) / pd;
  }
  return { re: xr, im: xi };
}

/** Multiplies a receptance by (jω)^p to give the FRF of the kind (docs/methods.md#frf-kinds). */
export function toKind(h: Complex, f: Float64Array, kind: ModalFrfKind): Complex {
  const p = kind === 'receptance' ? 0 : kind === 'mobility' ? 1 : 2;
  const re = Float64Array.from(h.re);
  const im = Float64Array.from(h.im);
  for (let k = 0; k < f.length; k++) {
    const w = 2 * Math.PI * f[k];
    for (let q = 0; q < p; q++) {
      const r = -w * im[k];
      im[k] = w * re[k];
      re[k] = r;
    }
  }
  return { re, im };
}

/**
 * Exact FRFs of M·ẍ + C·ẋ + K·x = f by the direct inverse of (K − ω²M + jωC) at every line
 * (docs/methods.md#modal-model, #check-systems). DOF labels are '1', '2', …; `references` are 0-based DOF indices.
 */
export function systemFrfs(
  M: number[][],
  K: number[][],
  C: number[][],
  f: Float64Array,
  references: number[],
  kind: ModalFrfKind = 'receptance',
): FrfSet {
  const n = M.length;
  const cols = references.map(() => Array.from({ length: n }, () => ({ re: new Float64Array(f.length), im: new Float64Array(f.length) })));
  const zr = new Float64Array(n * n);
  const zi = new Float64Array(n * n);
  for (let k = 0; k < f.length; k++) {
    const w = 2 * Math.PI * f[k];
    for (let i = 0; i < n; i++) {
      for (let j = 0; j < n; j++) {
        zr[i * n + j] = K[i][j] - w * w * M[i][j];
        zi[i * n + j] = w * C[i][j];
      }
    }
    references.forEach((ref, c) => {
      const br = new Float64Array(n);
      br[ref] = 1;
      const x = complexSolve(zr, zi, n, br, new Float64Array(n));
      for (let i = 0; i < n; i++) {
        cols[c][i].re[k] = x.re[i];
        cols[c][i].im[k] = x.im[i];
      }
    });
  }
  const frfs = references.flatMap((ref, c) =>
    cols[c].map((h, i) => ({ response: String(i + 1), reference: String(ref + 1), h: toKind(h, f, kind) })),
  );
  return { f, frfs, kind };
}

/** Rayleigh damping C = aM + bK giving ζ1 at ω1 and ζ2 at ω2 (rad/s): a + bω² = 2ζω at both. */
export function rayleigh(z1: number, w1: number, z2: number, w2: number): { a: number; b: number } {
  const b = (2 * (z2 * w2 - z1 * w1)) / (w2 * w2 - w1 * w1);
  return { a: 2 * z1 * w1 - b * w1 * w1, b };
}

export function lin(a: number, A: number[][], b: number, B: number[][]): number[][] {
  return A.map((row, i) => row.map((v, j) => a * v + b * B[i][j]));
}

/**
 * Modal viscous damping C = M·Φ·diag(2ζ_rω_r)·Φᵀ·M for mass-normalised real modes Φ (columns), which gives
 * exactly ζ_r in mode r (docs/methods.md#modal-model, proportional damping).
 */
export function modalDamping(M: number[][], phi: number[][], w: number[], zeta: number[]): number[][] {
  const n = M.length;
  const C = Array.from({ length: n }, () => new Array<number>(n).fill(0));
  // MΦ
  const mp = M.map((row) => phi[0].map((_, r) => row.reduce((s, v, k) => s + v * phi[k][r], 0)));
  for (let i = 0; i < n; i++) {
    for (let j = 0; j < n; j++) {
      let s = 0;
      for (let r = 0; r < w.length; r++) s += mp[i][r] * 2 * zeta[r] * w[r] * mp[j][r];
      C[i][j] = s;
    }
  }
  return C;
}

/** Roots β_nL of cos βL·cosh βL = 1 (free–free beam, docs/methods.md#free-free-beam), by bisection; n = 1, 2, … */
export function freeFreeRoot(n: number): number {
  const g = (x: number) => Math.cos(x) * Math.cosh(x) - 1;
  let a = (n + 0.5) * Math.PI - 0.5;
  let b = (n + 0.5) * Math.PI + 0.5;
  if (g(a) * g(b) > 0) throw new Error(`no bracket for root ${n}`);
  for (let i = 0; i < 200; i++) {
    const c = 0.5 * (a + b);
    if (g(a) * g(c) <= 0) b = c;
    else a = c;
  }
  return 0.5 * (a + b);
}

/** Mass-normalised free–free Euler–Bernoulli shape φ_n(x) (1/√kg) of docs/methods.md#free-free-beam for the root βL. */
export function freeFreeShape(betaL: number, L: number, rhoA: number, x: number): number {
  const b = betaL / L;
  const sigma = (Math.cosh(betaL) - Math.cos(betaL)) / (Math.sinh(betaL) - Math.sin(betaL));
  return (Math.cosh(b * x) + Math.cos(b * x) - sigma * (Math.sinh(b * x) + Math.sin(b * x))) / Math.sqrt(rhoA * L);
}

/**
 * Standard normal samples (Box–Muller, cosine branch only: one normal per two uniforms) from mulberry32.
 * Not the same sequence as helpers.ts `gaussian`, which also returns the sine branch; the modal tests and
 * fixtures (close-modes, bar) were made with this one, so it keeps its own name.
 */
export function gaussianCosOnly(seed: number): () => number {
  const u = mulberry32(seed);
  return () => {
    let u1 = u();
    while (u1 <= 0) u1 = u();
    return Math.sqrt(-2 * Math.log(u1)) * Math.cos(2 * Math.PI * u());
  };
}

/** Largest |a − b| over |b| line by line, for complex arrays. */
export function maxRelDiff(a: Complex, b: Complex, k0 = 0, k1 = b.re.length): number {
  let m = 0;
  for (let k = k0; k < k1; k++) m = Math.max(m, Math.hypot(a.re[k] - b.re[k], a.im[k] - b.im[k]) / Math.hypot(b.re[k], b.im[k]));
  return m;
}

/** M = I kg and K = [[2k, −k], [−k, 2k]] N/m: two 1 kg masses between fixed ends on three springs k (N/m). */
export function fixedChain2(k: number): { M: number[][]; K: number[][] } {
  return {
    M: [
      [1, 0],
      [0, 1],
    ],
    K: [
      [2 * k, -k],
      [-k, 2 * k],
    ],
  };
}

/** 2-DOF of docs/methods.md#chain-2dof-lscf: M = I kg, K = 400·[[2000, −1000], [−1000, 2000]] N/m, ζ = 1 % and 2 %. */
export function twoDof63(f: Float64Array, references = [0], kind: ModalFrfKind = 'receptance'): FrfSet {
  const { M, K } = fixedChain2(400000);
  // ω² = 400·1000 and 400·3000 (eigenvalues of K, modes [1, 1]/√2 and [1, −1]/√2)
  const w1 = Math.sqrt(400000);
  const w2 = Math.sqrt(1200000);
  const { a, b } = rayleigh(0.01, w1, 0.02, w2);
  return systemFrfs(M, K, lin(a, M, b, K), f, references, kind);
}

/** docs/methods.md#chain-3dof 3-DOF fixed–fixed chain, m = 1 kg, k = 1000 N/m, modal damping 1 %, 1.5 %, 2 %. */
export function threeDof(f: Float64Array, kind: ModalFrfKind = 'receptance', refs = [0]) {
  const M = [
    [1, 0, 0],
    [0, 1, 0],
    [0, 0, 1],
  ];
  const K = [
    [2000, -1000, 0],
    [-1000, 2000, -1000],
    [0, -1000, 2000],
  ];
  const s = Math.SQRT1_2;
  const phi = [
    [0.5, -s, 0.5],
    [s, 0, -s],
    [0.5, s, 0.5],
  ];
  const w = [2 - Math.SQRT2, 2, 2 + Math.SQRT2].map((v) => Math.sqrt(1000 * v));
  return systemFrfs(M, K, modalDamping(M, phi, w, [0.01, 0.015, 0.02]), f, refs, kind);
}

/** Largest |a − b| over the band divided by the largest |b| over the band (an error relative to the peak level). */
export function peakRelDiff(a: Complex, b: Complex, k0 = 0, k1 = b.re.length): number {
  let e = 0;
  let m = 0;
  for (let k = k0; k < k1; k++) {
    e = Math.max(e, Math.hypot(a.re[k] - b.re[k], a.im[k] - b.im[k]));
    m = Math.max(m, Math.hypot(b.re[k], b.im[k]));
  }
  return e / m;
}
