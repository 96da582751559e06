// Residues (mode shapes) and residual terms of given poles by least squares in the frequency domain
// (docs/methods.md#lsfd); the QR solver is in least-squares.ts, the synthesis in synthesize.ts.
import type { Complex } from '../types.ts';
import { bandLines, kindPower, toGrid } from './frf-set.ts';
import { leastSquares } from './least-squares.ts';
import { normalise } from './linalg.ts';
import { polePairTerms, poleValues } from './poles.ts';
import { mpc, realShape } from './shape-tools.ts';
import type { ComplexValue, FrfSet, ModalFrfKind, PoleInput } from './types.ts';

/** Options of `estimateShapes`. */
export interface ShapeOptions {
  /** Band [lo, hi] in Hz fitted; default the whole axis. The line at 0 Hz is never used. */
  bandHz?: [number, number];
  /** Fit lower (mass-like) and upper (stiffness-like) residual terms for modes outside the band; default true. */
  residuals?: boolean;
}

/** One mode of a `ModalModel`. */
export interface ModelMode {
  /** Natural frequency |λ|/2π, Hz. */
  fHz: number;
  /** Damping ratio −Re λ/|λ|. */
  zeta: number;
  /** Pole λ, rad/s, Im λ > 0. */
  lambda: ComplexValue;
  /**
   * Receptance residues A_r, in m/(N·s), of the pole–residue model; residues[i] runs over the model's
   * `responses` for the reference `references[i]`. For proportional damping A_jk = φ_jφ_k/(2jω_d) (docs/methods.md#modal-model).
   */
  residues: Complex[];
  /** The residue vector of the reference with the largest residue norm for this mode (its label in `shapeReference`). */
  shape: Complex;
  shapeReference: string;
  /** Modal phase collinearity of `shape` (uncentred variant, Pappa et al. 1993, docs/methods.md#mpc). */
  mpc: number;
  /** Real "normal mode" approximation of `shape` (rotated to the largest real part, largest entry +1). */
  realShape: Float64Array;
}

/** Modal model returned by `estimateShapes`; `synthesize` regenerates FRFs of any kind from it. */
export interface ModalModel {
  /** Kind of the FRFs that were fitted (residues and residual terms are stored in receptance form whatever it was). */
  kind: ModalFrfKind;
  bandHz: [number, number];
  /** DOFs along each residue vector (the response DOFs, or the reference DOFs if the set was transposed by reciprocity). */
  responses: string[];
  references: string[];
  transposed: boolean;
  modes: ModelMode[];
  /**
   * Residual terms in receptance form, H_res(ω) = upper − lower/ω², per reference over the responses:
   * upper[i][o] = 1/K_U (m/N), lower[i][o] = 1/M_L (1/kg) (docs/methods.md#modal-model). Null if not fitted.
   */
  residuals: { upper: Float64Array[]; lower: Float64Array[] } | null;
}

/**
 * Residues (mode shapes) of given poles by linear least squares in the frequency domain (the second step
 * of poly-reference LSCF, docs/methods.md#lscf; Peeters et al. 2004), one FRF at a time with the pole–residue
 * model of docs/methods.md#modal-model adapted to the FRF kind:
 *   H(ω) = (jω)^p·{ Σ_r [A_r/(jω − λ_r) + conj(A_r)/(jω − λ_r*)] + U − L/ω² },
 * p = 0, 1, 2 for receptance, mobility, accelerance; A_r complex, U (upper, stiffness-like, 1/K_U in m/N) and
 * L (lower, mass-like, 1/M_L in 1/kg) real. So residues are in receptance form (m/(N·s)) for any kind.
 * Solved by Householder QR of the real-stacked, column-scaled basis (shared by all FRFs).
 *
 * In: FRFs (H_ij = response i / force j, e^{+jωt}), poles as { fHz, zeta } or { lambda } (e.g. from
 * `pickStablePoles`). Out: a `ModalModel` with per-mode residues, shape, MPC and real shape.
 * Throws RangeError for bad input: no poles, a pole given twice, too few lines for the unknowns, or a
 * basis the band cannot separate.
 */
export function estimateShapes(frfSet: FrfSet, poles: readonly PoleInput[], options: ShapeOptions = {}): ModalModel {
  const g = toGrid(frfSet);
  if (!options || typeof options !== 'object') throw new RangeError(`options=${String(options)} must be an object`);
  const [k0a, k1, lo, hi] = bandLines(g.f, options.bandHz, 'bandHz');
  const k0 = g.f[k0a] === 0 ? k0a + 1 : k0a;
  const withRes = options.residuals ?? true;
  if (typeof withRes !== 'boolean') throw new RangeError(`residuals=${String(withRes)} must be true or false`);
  if (!Array.isArray(poles) || poles.length === 0) {
    throw new RangeError('poles is empty: give at least one pole (the band may hold no stable modes)');
  }
  const pv = poles.map((p, r) => poleValues(p, `poles[${r}]`));
  for (let r = 0; r < pv.length; r++) {
    for (let s = 0; s < r; s++) {
      const a = pv[r].lambda;
      const b = pv[s].lambda;
      if (Math.hypot(a.re - b.re, a.im - b.im) <= 1e-9 * Math.hypot(a.re, a.im)) {
        throw new RangeError(`poles[${r}] repeats poles[${s}] (${pv[r].fHz} Hz, ζ=${pv[r].zeta}): the fit would be singular`);
      }
    }
  }
  const nl = k1 - k0;
  const nm = pv.length;
  const np = 2 * nm + (withRes ? 2 : 0);
  if (2 * nl < np + 1) {
    throw new RangeError(`bandHz [${lo}, ${hi}] Hz holds ${nl} usable lines; ${nm} poles${withRes ? ' and 2 residual terms' : ''} need at least ${Math.ceil((np + 1) / 2)}`);
  }
  const p = kindPower(g.kind);
  const rows = 2 * nl;
  // Basis, column-major: column c has rows 0..nl−1 (real parts) and nl..2nl−1 (imaginary parts).
  const G = new Float64Array(rows * np);
  const put = (c: number, k: number, re: number, im: number, w: number) => {
    // multiply by (jω)^p
    for (let q = 0; q < p; q++) {
      const t = -w * im;
      im = w * re;
      re = t;
    }
    G[c * rows + k] = re;
    G[c * rows + nl + k] = im;
  };
  const t = new Float64Array(4);
  for (let k = 0; k < nl; k++) {
    const w = 2 * Math.PI * g.f[k0 + k];
    for (let r = 0; r < nm; r++) {
      // 1/(jω − λ) and 1/(jω − λ*) as t = [re₁, im₁, re₂, im₂]
      polePairTerms(t, pv[r].lambda, w);
      put(2 * r, k, t[0] + t[2], t[1] + t[3], w);
      // j/(jω − λ) − j/(jω − λ*)
      put(2 * r + 1, k, -(t[1] - t[3]), t[0] - t[2], w);
    }
    if (withRes) {
      put(2 * nm, k, 1, 0, w);
      put(2 * nm + 1, k, -1 / (w * w), 0, w);
    }
  }
  const nrhs = g.rows.length * g.cols.length;
  const B = new Float64Array(rows * nrhs);
  for (let o = 0; o < g.rows.length; o++) {
    for (let i = 0; i < g.cols.length; i++) {
      const c = i * g.rows.length + o;
      const hr = g.re[o][i];
      const him = g.im[o][i];
      for (let k = 0; k < nl; k++) {
        B[c * rows + k] = hr[k0 + k];
        B[c * rows + nl + k] = him[k0 + k];
      }
    }
  }
  const x = leastSquares(G, rows, np, B, nrhs);

  const no = g.rows.length;
  const modes: ModelMode[] = pv.map((v, r) => {
    const residues: Complex[] = g.cols.map((_, i) => {
      const re = new Float64Array(no);
      const im = new Float64Array(no);
      for (let o = 0; o < no; o++) {
        const c = i * no + o;
        re[o] = x[c * np + 2 * r];
        im[o] = x[c * np + 2 * r + 1];
      }
      return { re, im };
    });
    let best = 0;
    let bestNorm = -1;
    residues.forEach((v2, i) => {
      let s = 0;
      for (let o = 0; o < no; o++) s += v2.re[o] * v2.re[o] + v2.im[o] * v2.im[o];
      if (s > bestNorm) {
        bestNorm = s;
        best = i;
      }
    });
    const shape = residues[best];
    if (!(bestNorm > 0)) throw new RangeError(`poles[${r}] (${v.fHz} Hz) got all-zero residues: the FRFs hold no such mode`);
    return {
      fHz: v.fHz,
      zeta: v.zeta,
      lambda: v.lambda,
      residues,
      shape,
      shapeReference: g.cols[best],
      mpc: mpc(shape),
      realShape: realShape(normalise(shape)),
    };
  });
  let residuals: ModalModel['residuals'] = null;
  if (withRes) {
    residuals = {
      upper: g.cols.map((_, i) => Float64Array.from({ length: no }, (_, o) => x[(i * no + o) * np + 2 * nm])),
      lower: g.cols.map((_, i) => Float64Array.from({ length: no }, (_, o) => x[(i * no + o) * np + 2 * nm + 1])),
    };
  }
  return {
    kind: g.kind,
    bandHz: [lo, hi],
    responses: g.rows.slice(),
    references: g.cols.slice(),
    transposed: g.transposed,
    modes,
    residuals,
  };
}

export { synthesize } from './synthesize.ts';
