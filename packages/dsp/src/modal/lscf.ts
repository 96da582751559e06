import { EigenvalueDecomposition, Matrix } from 'ml-matrix';
import { mac } from '../assurance.ts';
import type { Complex } from '../types.ts';
import { bandLines, toGrid } from './frf-set.ts';
import { hermitianEigen, jacobiEigen, luSolve } from './linalg.ts';

/** Relative eigenvalue threshold of the pseudo-inverse of R (see solveOrder). */
const RCOND = 1e-12;
import type { ComplexValue, FrfSet } from './types.ts';

/** Stability class of a pole against the previous model order (docs/methods.md#stabilization), from weakest to strongest. */
export type Stability = 'new' | 'freq' | 'freq-damp' | 'all';

/** Relative tolerances of the stability checks (docs/methods.md#stabilization, common practice). */
export interface StabilityTolerances {
  /** Largest |Δf|/f for a stable frequency; default 0.01. */
  freq: number;
  /** Largest |Δζ|/ζ for a stable damping ratio; default 0.05. */
  damping: number;
  /** Smallest MAC of the two shape estimates for a stable vector; default 0.98. */
  mac: number;
}

/** Defaults of the stability checks: 1 % in frequency, 5 % in damping, MAC 0.98 (docs/methods.md#stabilization, common practice). */
export const DEFAULT_STABILITY_TOLERANCES: Readonly<StabilityTolerances> = Object.freeze({ freq: 0.01, damping: 0.05, mac: 0.98 });

/** What the stability checks need of a pole: natural frequency (Hz), damping ratio, and a shape vector. */
export interface PoleForStability {
  fHz: number;
  zeta: number;
  shape: Complex;
}

/** One pole of a stabilization diagram. */
export interface DiagramPole extends PoleForStability {
  /** Model order (degree of the matrix denominator polynomial) that produced the pole. */
  order: number;
  /** Natural frequency |λ|/2π, Hz. */
  fHz: number;
  /** Damping ratio −Re λ/|λ| (fraction of critical). */
  zeta: number;
  /** Stability against the nearest pole of the previous order in the diagram. */
  stable: Stability;
  /** Continuous-time pole λ (rad/s), Im λ > 0; the pole of the e^{+jωt} model H ∝ 1/(jω − λ). */
  lambda: ComplexValue;
  /** Modal participation factor l_r over the reference DOFs (left null vector of the denominator at the pole), largest entry real and 1. */
  participation: Complex;
  /** Shape estimate ψ_r = B(z_r)·L_r over the response DOFs (numerator at the pole), largest entry real and 1; used for the MAC check. */
  shape: Complex;
}

/** Options of `stabilizationDiagram`. */
export interface StabilizationOptions {
  /** Band [lo, hi] in Hz; only the lines inside it are fitted and only poles inside it are kept. */
  bandHz: [number, number];
  /** Model orders to fit (integers ≥ 2), e.g. 2, 4, …, 40; each gives up to order × N_i poles. */
  orders: number[];
  /** Stability tolerances; defaults `DEFAULT_STABILITY_TOLERANCES`. */
  tolerances?: Partial<StabilityTolerances>;
  /** Poles with a larger damping ratio are dropped; default 0.3 (docs/methods.md#stabilization, common practice). */
  maxDampingRatio?: number;
  /** Sample interval Δt (s) of the z-domain basis Ω = e^{jωΔt}; default 1/(2·f_max) with f_max the last line of the data. Must satisfy bandHz[1] ≤ 1/(2Δt). */
  dtS?: number;
}

/** Result of `stabilizationDiagram`. */
export interface StabilizationDiagram {
  bandHz: [number, number];
  /** Δt (s) of the z-domain basis that was used. */
  dtS: number;
  /** Number of frequency lines inside the band. */
  lines: number;
  /** DOFs along the shape vectors (the response DOFs, or the reference DOFs when the set was transposed). */
  responses: string[];
  /** DOFs along the participation vectors. */
  references: string[];
  /** True when the set had more references than responses and was transposed by reciprocity (docs/methods.md#modal-model). */
  transposed: boolean;
  /** Per model order, in ascending order, the poles inside the band with 0 < ζ ≤ maxDampingRatio, by frequency. */
  orders: { order: number; poles: DiagramPole[] }[];
}

/**
 * Stability classes of `current` poles against the poles of the previous model order (docs/methods.md#stabilization,
 * common practice; presentation after Phillips & Allemang, IMAC 2005). Each current pole is compared with the
 * previous pole nearest in frequency:
 *  - 'new'       if there is none or |Δf|/f ≥ tol.freq;
 *  - 'freq'      if only the frequency agrees;
 *  - 'freq-damp' if frequency and damping (|Δζ|/ζ < tol.damping) agree but MAC(shapes) ≤ tol.mac;
 *  - 'all'       if all three agree.
 * Relative differences are taken against the previous pole. Frequencies in Hz, damping as ratios.
 */
export function classifyPoles(
  previous: readonly PoleForStability[],
  current: readonly PoleForStability[],
  tolerances: Partial<StabilityTolerances> = {},
): Stability[] {
  const tol = checkTolerances(tolerances);
  if (!Array.isArray(previous)) throw new RangeError(`previous=${String(previous)} must be an array of poles`);
  if (!Array.isArray(current)) throw new RangeError(`current=${String(current)} must be an array of poles`);
  previous.forEach((p, i) => checkPole(p, `previous[${i}]`));
  current.forEach((p, i) => checkPole(p, `current[${i}]`));
  return current.map((c) => {
    let best: PoleForStability | null = null;
    let bestDf = Infinity;
    for (const p of previous) {
      const df = Math.abs(c.fHz - p.fHz);
      if (df < bestDf) {
        bestDf = df;
        best = p;
      }
    }
    if (!best || !(bestDf / best.fHz < tol.freq)) return 'new';
    if (!(Math.abs(c.zeta - best.zeta) / best.zeta < tol.damping)) return 'freq';
    if (c.shape.re.length !== best.shape.re.length || !(mac(c.shape, best.shape) > tol.mac)) return 'freq-damp';
    return 'all';
  });
}

function checkPole(p: PoleForStability, name: string): void {
  if (!p || !(p.fHz > 0) || !Number.isFinite(p.fHz)) throw new RangeError(`${name}.fHz=${String(p?.fHz)} must be > 0 and finite`);
  if (!(p.zeta > 0) || !Number.isFinite(p.zeta)) throw new RangeError(`${name}.zeta=${String(p.zeta)} must be > 0 and finite`);
  if (!p.shape || !p.shape.re || !p.shape.im) throw new RangeError(`${name}.shape must have re and im arrays`);
}

function checkTolerances(t: Partial<StabilityTolerances>): StabilityTolerances {
  if (!t || typeof t !== 'object') throw new RangeError(`tolerances=${String(t)} must be an object`);
  const out = { ...DEFAULT_STABILITY_TOLERANCES, ...t };
  for (const k of ['freq', 'damping', 'mac'] as const) {
    const v = out[k];
    if (typeof v !== 'number' || !(v > 0) || !Number.isFinite(v) || (k === 'mac' && v > 1)) {
      throw new RangeError(`tolerances.${k}=${String(v)} must be > 0${k === 'mac' ? ' and ≤ 1' : ' and finite'}`);
    }
  }
  return out;
}

/**
 * Stabilization diagram by the poly-reference least-squares complex frequency-domain estimator (LSCF,
 * Guillaume, Verboven, Vanlanduit, Van der Auweraer & Peeters, IMAC XXI 2003; Peeters et al. 2004), with
 * Levy's linearisation (Levy 1959) and the reduced normal equations of docs/methods.md#lscf.
 *
 * Model, per response o (a row H_o(ω) over the N_i references): the right matrix fraction
 * H_o(ω) = B_o(Ω)·A(Ω)⁻¹ with Ω = e^{jωΔt}, B_o(Ω) = Σ_j Ω^j β_oj (1×N_i) and A(Ω) = Σ_j Ω^j α_j
 * (N_i×N_i), all coefficients real, α_n = I. The error W·[B_o − H_o·A] is minimised with unit weights
 * W = 1 over the lines of the band; the numerators are eliminated: M = Σ_o (T_o − S_oᵀR⁻¹S_o) with
 * R = Re(XᴴX), S_o = Re(XᴴY_o), T_o = Re(Y_oᴴY_o). R, S_o and T_o are Toeplitz in the powers, so they are
 * built from O(n) sums per FRF; the largest order's sums serve every order.
 *
 * Poles: the eigenvalues z_r of the block companion matrix of A, λ_r = ln(z_r)/Δt (rad/s), f = |λ|/2π (Hz),
 * ζ = −Re λ/|λ|. Kept: Im λ > 0, f inside the band, 0 < ζ ≤ maxDampingRatio. Participation factor l_r:
 * the left null vector of A(z_r); shape estimate ψ_r = B(z_r)·L_r with L_r the right null vector.
 *
 * Choice of Δt: 1/(2·f_max) with f_max the last line of the data's frequency axis (the Nyquist frequency
 * of the measurement), unless `dtS` is given. A z-domain model of a continuous-time FRF is not exactly
 * rational, and its error (the aliased tails of the modes) shrinks as 1/Δt grows, so the data's f_max gives
 * less bias at low orders than the band's upper edge does (checked on the docs/methods.md#lscf system). The
 * price is a shorter arc of the unit circle and an ill-conditioned R, handled by its pseudo-inverse.
 *
 * FRFs of any kind (receptance, mobility, accelerance) give the same poles. H_ij = response i / force j,
 * time dependence e^{+jωt}. The plain least-squares estimator is biased under noise (De Troyer et al. 2012).
 * Throws RangeError for bad input: fewer than 2 response DOFs (no MAC check possible), a band without
 * lines or with fewer lines than the largest order needs, orders < 2, non-finite FRF values.
 */
export function stabilizationDiagram(frfSet: FrfSet, options: StabilizationOptions): StabilizationDiagram {
  const g = toGrid(frfSet);
  if (!options || typeof options !== 'object') throw new RangeError(`options=${String(options)} must be an object`);
  const [k0, k1, lo, hi] = bandLines(g.f, options.bandHz, 'bandHz');
  const no = g.rows.length;
  const ni = g.cols.length;
  if (no < 2) {
    throw new RangeError(`frfSet has ${no} response DOF (${g.rows.join(', ')}): the MAC check of a stabilization diagram needs at least 2`);
  }
  if (!Array.isArray(options.orders) || options.orders.length === 0) throw new RangeError('orders is empty: give model orders such as 2, 4, …, 40');
  options.orders.forEach((n, i) => {
    if (typeof n !== 'number' || !Number.isInteger(n) || n < 2) throw new RangeError(`orders[${i}]=${String(n)} must be an integer ≥ 2`);
  });
  const tol = checkTolerances(options.tolerances ?? {});
  const maxZeta = options.maxDampingRatio ?? 0.3;
  if (typeof maxZeta !== 'number' || !(maxZeta > 0 && maxZeta < 1)) throw new RangeError(`maxDampingRatio=${String(maxZeta)} must be between 0 and 1`);
  const dt = options.dtS ?? 1 / (2 * g.f[g.f.length - 1]);
  if (typeof dt !== 'number' || !(dt > 0) || !Number.isFinite(dt)) throw new RangeError(`dtS=${String(dt)} must be > 0 and finite`);
  if (hi > 1 / (2 * dt) * (1 + 1e-12)) throw new RangeError(`dtS=${dt} s aliases the band: bandHz[1]=${hi} Hz is above 1/(2·dtS)=${1 / (2 * dt)} Hz`);
  const orders = [...new Set(options.orders)].sort((a, b) => a - b);
  const nmax = orders[orders.length - 1];
  const nf = k1 - k0;
  if (nf < nmax + 1) {
    throw new RangeError(`bandHz [${lo}, ${hi}] Hz holds ${nf} lines; order ${nmax} needs at least ${nmax + 1}`);
  }

  // Powers Ω_k^d = cos(dω_kΔt) + j·sin(dω_kΔt), d = 0..nmax, by recurrence from Ω_k.
  const nd = nmax + 1;
  const cs = new Float64Array(nd * nf);
  const sn = new Float64Array(nd * nf);
  for (let k = 0; k < nf; k++) {
    const th = 2 * Math.PI * g.f[k0 + k] * dt;
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
  // r(d) = Re Σ_k Ω^d (even in d).
  const rr = new Float64Array(nd);
  for (let d = 0; d < nd; d++) {
    let a = 0;
    for (let k = 0; k < nf; k++) a += cs[d * nf + k];
    rr[d] = a;
  }
  // Re s_oi(±d) = sp ∓ sm with s_oi(d) = Σ_k Ω^d H_oi.
  const sp = new Float64Array(no * ni * nd);
  const sm = new Float64Array(no * ni * nd);
  for (let o = 0; o < no; o++) {
    for (let i = 0; i < ni; i++) {
      const hr = g.re[o][i];
      const him = g.im[o][i];
      const base = (o * ni + i) * nd;
      for (let d = 0; d < nd; d++) {
        let a = 0;
        let b = 0;
        const off = d * nf - k0;
        for (let k = k0; k < k1; k++) {
          a += cs[off + k] * hr[k];
          b += sn[off + k] * him[k];
        }
        sp[base + d] = a;
        sm[base + d] = b;
      }
    }
  }
  // P_il(k) = Σ_o conj(H_oi)·H_ol; Re t_il(±d) = tp ∓ tm with t_il(d) = Σ_k Ω^d P_il.
  const tp = new Float64Array(ni * ni * nd);
  const tm = new Float64Array(ni * ni * nd);
  {
    const pr = new Float64Array(nf);
    const pim = new Float64Array(nf);
    for (let i = 0; i < ni; i++) {
      for (let l = 0; l < ni; l++) {
        pr.fill(0);
        pim.fill(0);
        for (let o = 0; o < no; o++) {
          const ar = g.re[o][i];
          const ai = g.im[o][i];
          const br = g.re[o][l];
          const bi = g.im[o][l];
          for (let k = 0; k < nf; k++) {
            const q = k0 + k;
            pr[k] += ar[q] * br[q] + ai[q] * bi[q];
            pim[k] += ar[q] * bi[q] - ai[q] * br[q];
          }
        }
        const base = (i * ni + l) * nd;
        for (let d = 0; d < nd; d++) {
          let a = 0;
          let b = 0;
          const off = d * nf;
          for (let k = 0; k < nf; k++) {
            a += cs[off + k] * pr[k];
            b += sn[off + k] * pim[k];
          }
          tp[base + d] = a;
          tm[base + d] = b;
        }
      }
    }
  }

  const out: StabilizationDiagram = {
    bandHz: [lo, hi],
    dtS: dt,
    lines: nf,
    responses: g.rows.slice(),
    references: g.cols.slice(),
    transposed: g.transposed,
    orders: [],
  };
  let previous: DiagramPole[] | null = null;
  const qBuf = new Float64Array(no * nd * nd * ni); // Q_o of every response, reused across orders
  for (const n of orders) {
    const poles = solveOrder(n, ni, no, rr, sp, sm, tp, tm, nd, qBuf, dt, lo, hi, maxZeta);
    if (previous) {
      const cls = classifyPoles(previous, poles, tol);
      poles.forEach((p, r) => (p.stable = cls[r]));
    }
    out.orders.push({ order: n, poles });
    previous = poles;
  }
  return out;
}

function solveOrder(
  n: number,
  ni: number,
  no: number,
  rr: Float64Array,
  sp: Float64Array,
  sm: Float64Array,
  tp: Float64Array,
  tm: Float64Array,
  nd: number,
  qBuf: Float64Array,
  dt: number,
  lo: number,
  hi: number,
  maxZeta: number,
): DiagramPole[] {
  const n1 = n + 1;
  const m = n1 * ni;
  // R = Re(XᴴX), Toeplitz, shared by all responses (unit weights). Its pseudo-inverse R⁺ = WᵀW with
  // W = Λ^{-1/2}Vᵀ over the eigenpairs above RCOND·λ_max: on a short arc of the unit circle the powers Ω^j are
  // nearly dependent and R is too ill-conditioned for a Cholesky factor; the numerator then simply does
  // without the directions the data cannot tell apart.
  const R = new Float64Array(n1 * n1);
  for (let a = 0; a < n1; a++) for (let b = 0; b < n1; b++) R[a * n1 + b] = rr[Math.abs(b - a)];
  const V = new Float64Array(n1 * n1);
  const lam = jacobiEigen(R, n1, V);
  let lmax = 0;
  for (let a = 0; a < n1; a++) lmax = Math.max(lmax, lam[a]);
  const keep: number[] = [];
  for (let a = 0; a < n1; a++) if (lam[a] > RCOND * lmax) keep.push(a);
  const nk = keep.length;
  if (nk === 0) throw new RangeError(`order ${n}: the band's lines do not determine the numerator (R is zero)`);
  const W = new Float64Array(nk * n1);
  keep.forEach((a, r) => {
    const s = 1 / Math.sqrt(lam[a]);
    for (let b = 0; b < n1; b++) W[r * n1 + b] = s * V[b * n1 + a];
  });
  // M = T − Σ_o S_oᵀR⁺S_o = T − Σ_o Q_oᵀQ_o with Q_o = W·S_o.
  const M = new Float64Array(m * m);
  for (let a = 0; a < n1; a++) {
    for (let b = 0; b < n1; b++) {
      const d = b - a;
      const ad = Math.abs(d);
      for (let i = 0; i < ni; i++) {
        for (let l = 0; l < ni; l++) {
          const x = (i * ni + l) * nd + ad;
          M[(a * ni + i) * m + b * ni + l] = d >= 0 ? tp[x] - tm[x] : tp[x] + tm[x];
        }
      }
    }
  }
  const qs = nk * m;
  const S = new Float64Array(n1 * m);
  for (let o = 0; o < no; o++) {
    for (let a = 0; a < n1; a++) {
      for (let b = 0; b < n1; b++) {
        const d = b - a;
        const ad = Math.abs(d);
        for (let l = 0; l < ni; l++) {
          const x = (o * ni + l) * nd + ad;
          S[a * m + b * ni + l] = -(d >= 0 ? sp[x] - sm[x] : sp[x] + sm[x]);
        }
      }
    }
    const Q = qBuf.subarray(o * qs, (o + 1) * qs);
    Q.fill(0);
    for (let r = 0; r < nk; r++) {
      for (let a = 0; a < n1; a++) {
        const w = W[r * n1 + a];
        if (w === 0) continue;
        for (let u = 0; u < m; u++) Q[r * m + u] += w * S[a * m + u];
      }
    }
    // M −= QᵀQ (upper triangle, mirrored below)
    for (let r = 0; r < nk; r++) {
      const row = r * m;
      for (let u = 0; u < m; u++) {
        const qu = Q[row + u];
        if (qu === 0) continue;
        const mu = u * m;
        for (let v = u; v < m; v++) M[mu + v] -= qu * Q[row + v];
      }
    }
  }
  for (let u = 0; u < m; u++) for (let v = u + 1; v < m; v++) M[v * m + u] = M[u * m + v];

  // α_n = I; (D·M_aa·D)·(D⁻¹α_a) = −D·M_ab with the Jacobi scaling D = diag(M_aa)^{-1/2}.
  const na = n * ni;
  const Maa = new Float64Array(na * na);
  const rhs = new Float64Array(na * ni);
  const dsc = new Float64Array(na);
  for (let u = 0; u < na; u++) dsc[u] = M[u * m + u] > 0 ? 1 / Math.sqrt(M[u * m + u]) : 1;
  for (let u = 0; u < na; u++) {
    for (let v = 0; v < na; v++) Maa[u * na + v] = dsc[u] * M[u * m + v] * dsc[v];
    for (let i = 0; i < ni; i++) rhs[u * ni + i] = -dsc[u] * M[u * m + na + i];
  }
  if (!luSolve(Maa, na, rhs, ni)) {
    throw new RangeError(`order ${n}: the reduced normal equations are singular (is every FRF zero in the band?)`);
  }
  // alpha: (n+1)·ni × ni, rows (j, i), α_j = alpha[j·ni .. j·ni+ni−1][·]
  const alpha = new Float64Array(m * ni);
  for (let u = 0; u < na; u++) for (let i = 0; i < ni; i++) alpha[u * ni + i] = dsc[u] * rhs[u * ni + i];
  for (let i = 0; i < ni; i++) alpha[(na + i) * ni + i] = 1;

  // Numerators β_o = −R⁺S_oα = −Wᵀ(Q_oα), (n+1) × ni each.
  const beta = new Float64Array(no * n1 * ni);
  const qa = new Float64Array(nk * ni);
  for (let o = 0; o < no; o++) {
    const Q = qBuf.subarray(o * qs, (o + 1) * qs);
    for (let r = 0; r < nk; r++) {
      for (let c = 0; c < ni; c++) {
        let s = 0;
        for (let u = 0; u < m; u++) s += Q[r * m + u] * alpha[u * ni + c];
        qa[r * ni + c] = s;
      }
    }
    const base = o * n1 * ni;
    for (let a = 0; a < n1; a++) {
      for (let c = 0; c < ni; c++) {
        let s = 0;
        for (let r = 0; r < nk; r++) s += W[r * n1 + a] * qa[r * ni + c];
        beta[base + a * ni + c] = -s;
      }
    }
  }

  // Block companion matrix of A(z) = Σ α_j z^j with α_n = I: eigenvalues are the roots z_r.
  const C = new Matrix(na, na);
  for (let u = 0; u + ni < na; u++) C.set(u, u + ni, 1);
  for (let i = 0; i < ni; i++) {
    for (let j = 0; j < n; j++) {
      for (let l = 0; l < ni; l++) C.set(na - ni + i, j * ni + l, -alpha[(j * ni + i) * ni + l]);
    }
  }
  const evd = new EigenvalueDecomposition(C);
  const zr = evd.realEigenvalues;
  const zi = evd.imaginaryEigenvalues;
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
          const t = br * zr[r] - bi * zi[r] + beta[(o * n1 + j) * ni + i];
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
  // G1 = AᴴA (right null vector), G2 = AAᴴ (u with uᴴA = 0; the left null vector is conj(u)).
  const g1r = new Float64Array(ni * ni);
  const g1i = new Float64Array(ni * ni);
  const g2r = new Float64Array(ni * ni);
  const g2i = new Float64Array(ni * ni);
  for (let a = 0; a < ni; a++) {
    for (let b = 0; b < ni; b++) {
      let s1r = 0;
      let s1i = 0;
      let s2r = 0;
      let s2i = 0;
      for (let c = 0; c < ni; c++) {
        // (AᴴA)_ab = Σ_c conj(A_ca)·A_cb
        const xr = ar[c * ni + a];
        const xi = ai[c * ni + a];
        const yr = ar[c * ni + b];
        const yi = ai[c * ni + b];
        s1r += xr * yr + xi * yi;
        s1i += xr * yi - xi * yr;
        // (AAᴴ)_ab = Σ_c A_ac·conj(A_bc)
        const ur = ar[a * ni + c];
        const ui = ai[a * ni + c];
        const vr = ar[b * ni + c];
        const vi = ai[b * ni + c];
        s2r += ur * vr + ui * vi;
        s2i += ui * vr - ur * vi;
      }
      g1r[a * ni + b] = s1r;
      g1i[a * ni + b] = s1i;
      g2r[a * ni + b] = s2r;
      g2i[a * ni + b] = s2i;
    }
  }
  const e1 = hermitianEigen(g1r, g1i, ni, true);
  const e2 = hermitianEigen(g2r, g2i, ni, true);
  const u = e2.vim[ni - 1];
  return {
    right: { re: e1.vre[ni - 1], im: e1.vim[ni - 1] },
    left: { re: e2.vre[ni - 1], im: u.map((x) => -x) },
  };
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

/**
 * The poles marked 'all' (stable in frequency, damping and MAC) at one order of a diagram — by default the
 * highest order — sorted by frequency. An empty array when the band shows no stable pole. A plain, documented
 * selection rule; a person picking poles on the diagram is the usual alternative. Caution: far above the
 * needed order, and more so with several references, noise poles next to physical ones can also pass the
 * three checks; pick at a moderate order (about twice the number of modes ÷ N_i, or more) in that case.
 */
export function pickStablePoles(diagram: StabilizationDiagram, order?: number): DiagramPole[] {
  if (!diagram || !Array.isArray(diagram.orders) || diagram.orders.length === 0) {
    throw new RangeError('diagram has no orders: run stabilizationDiagram first');
  }
  const row = order === undefined ? diagram.orders[diagram.orders.length - 1] : diagram.orders.find((o) => o.order === order);
  if (!row) throw new RangeError(`order=${String(order)} is not in the diagram (orders ${diagram.orders.map((o) => o.order).join(', ')})`);
  return row.poles.filter((p) => p.stable === 'all');
}
