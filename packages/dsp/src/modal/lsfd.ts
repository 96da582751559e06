import type { Complex } from '../types.ts';
import { bandLines, kindPower, toGrid } from './frf-set.ts';
import { normalise } from './lscf.ts';
import { poleValues } from './poles.ts';
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
  for (let k = 0; k < nl; k++) {
    const w = 2 * Math.PI * g.f[k0 + k];
    for (let r = 0; r < nm; r++) {
      const { re: a, im: b } = pv[r].lambda;
      // 1/(jω − λ) and 1/(jω − λ*)
      const d1 = a * a + (w - b) * (w - b);
      const d2 = a * a + (w + b) * (w + b);
      const p1r = -a / d1;
      const p1i = -(w - b) / d1;
      const p2r = -a / d2;
      const p2i = -(w + b) / d2;
      put(2 * r, k, p1r + p2r, p1i + p2i, w);
      // j/(jω − λ) − j/(jω − λ*)
      put(2 * r + 1, k, -(p1i - p2i), p1r - p2r, w);
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

/**
 * Least squares min‖G·x − b‖ for every column b of B (G rows×np and B rows×nrhs, both column-major) by
 * Householder QR of the column-scaled G. Returns x as nrhs blocks of np values. Throws when G is rank deficient.
 */
function leastSquares(G: Float64Array, rows: number, np: number, B: Float64Array, nrhs: number): Float64Array {
  const scale = new Float64Array(np);
  for (let c = 0; c < np; c++) {
    let s = 0;
    for (let k = 0; k < rows; k++) s += G[c * rows + k] * G[c * rows + k];
    s = Math.sqrt(s);
    if (!(s > 0) || !Number.isFinite(s)) throw new RangeError(`basis column ${c} is ${s}: a pole or residual term is undefined on the band`);
    scale[c] = s;
    for (let k = 0; k < rows; k++) G[c * rows + k] /= s;
  }
  const diag = new Float64Array(np);
  for (let j = 0; j < np; j++) {
    const cj = j * rows;
    let nrm = 0;
    for (let k = j; k < rows; k++) nrm += G[cj + k] * G[cj + k];
    nrm = Math.sqrt(nrm);
    if (!(nrm > 1e-10)) {
      throw new RangeError(
        `the fit is singular at unknown ${j} (${j < np - 2 || np % 2 === 1 ? `pole ${Math.floor(j / 2)}` : 'residual term'}): two poles too close for the band's resolution, or a basis the band cannot separate`,
      );
    }
    const alpha = G[cj + j] > 0 ? -nrm : nrm;
    G[cj + j] -= alpha; // v = x − α·e_j, stored in place
    let vv = 0;
    for (let k = j; k < rows; k++) vv += G[cj + k] * G[cj + k];
    diag[j] = alpha;
    const apply = (M: Float64Array, c: number) => {
      let s = 0;
      for (let k = j; k < rows; k++) s += G[cj + k] * M[c + k];
      s = (2 * s) / vv;
      for (let k = j; k < rows; k++) M[c + k] -= s * G[cj + k];
    };
    for (let c = j + 1; c < np; c++) apply(G, c * rows);
    for (let c = 0; c < nrhs; c++) apply(B, c * rows);
  }
  const x = new Float64Array(nrhs * np);
  for (let c = 0; c < nrhs; c++) {
    const b = c * rows;
    for (let i = np - 1; i >= 0; i--) {
      let s = B[b + i];
      for (let j = i + 1; j < np; j++) s -= G[j * rows + i] * x[c * np + j];
      x[c * np + i] = s / diag[i];
    }
    for (let i = 0; i < np; i++) x[c * np + i] /= scale[i];
  }
  return x;
}

/**
 * FRF synthesised from a modal model at the frequencies f (Hz): the pole–residue sum of docs/methods.md#modal-model
 * plus the model's residual terms, H = (jω)^p·{Σ_r [A_r/(jω − λ_r) + conj(A_r)/(jω − λ_r*)] + U − L/ω²}, in the
 * requested kind (receptance m/N, mobility (m/s)/N, accelerance (m/s²)/N), whatever kind was fitted.
 * (response, reference) must be a pair of the model; the swapped pair is accepted by reciprocity (docs/methods.md#modal-model).
 * The residual terms are only meaningful inside the fitted band; at 0 Hz the lower term is left out.
 */
export function synthesize(model: ModalModel, f: ArrayLike<number>, response: string, reference: string, kind: ModalFrfKind): Complex {
  if (!model || !Array.isArray(model.modes)) throw new RangeError(`model=${String(model)} must come from estimateShapes`);
  const p = kindPower(kind);
  if (!f || typeof f.length !== 'number' || f.length === 0) throw new RangeError('f is empty: give frequencies in Hz');
  for (let k = 0; k < f.length; k++) {
    if (!Number.isFinite(f[k]) || f[k] < 0) throw new RangeError(`f[${k}]=${f[k]} Hz must be finite and ≥ 0`);
  }
  let o = model.responses.indexOf(response);
  let i = model.references.indexOf(reference);
  if (o < 0 || i < 0) {
    o = model.responses.indexOf(reference);
    i = model.references.indexOf(response);
  }
  if (o < 0 || i < 0) {
    throw new RangeError(`the model has no FRF of response ${response}, reference ${reference} (responses ${model.responses.join(', ')}; references ${model.references.join(', ')})`);
  }
  const re = new Float64Array(f.length);
  const im = new Float64Array(f.length);
  for (let k = 0; k < f.length; k++) {
    const w = 2 * Math.PI * f[k];
    let hr = 0;
    let hi = 0;
    for (const m of model.modes) {
      const { re: a, im: b } = m.lambda;
      const Ar = m.residues[i].re[o];
      const Ai = m.residues[i].im[o];
      // A/(jω − λ) + A*/(jω − λ*)
      const d1 = a * a + (w - b) * (w - b);
      const d2 = a * a + (w + b) * (w + b);
      const p1r = -a / d1;
      const p1i = -(w - b) / d1;
      const p2r = -a / d2;
      const p2i = -(w + b) / d2;
      hr += Ar * p1r - Ai * p1i + Ar * p2r + Ai * p2i;
      hi += Ar * p1i + Ai * p1r + Ar * p2i - Ai * p2r;
    }
    if (model.residuals) {
      hr += model.residuals.upper[i][o];
      if (w > 0) hr -= model.residuals.lower[i][o] / (w * w);
    }
    for (let q = 0; q < p; q++) {
      const t = -w * hi;
      hi = w * hr;
      hr = t;
    }
    re[k] = hr;
    im[k] = hi;
  }
  return { re, im };
}
