// Stabilization diagram by the poly-reference least-squares complex frequency-domain estimator over a
// band of any width: option checks, time base and weights, and the loop over model orders. The normal
// equations are in lscf-normal.ts, the poles in lscf-poles.ts, the stability classes in stability.ts.
import { bandLines, toGrid } from './frf-set.ts';
import { ReducedNormalEquations, lscfSums } from './lscf-normal.ts';
import { polesOfOrder } from './lscf-poles.ts';
import { checkTolerances, classifyPoles, type DiagramPole, type StabilityTolerances, type StabilizationDiagram } from './stability.ts';
import type { FrfSet } from './types.ts';

/**
 * Default time base: 1/(2Δt) = max(1.25·f_hi, f_lo + f_hi). A wide band then spans the unit circle from
 * 0.8π·f_lo/f_hi to 0.8π, leaving a guard arc of 0.2π each side of z = −1 between the band's top modes and the
 * aliases of their conjugates; a narrow band is centred at π/2, as far from z = −1 as from z = +1
 * (docs/decisions/wide-band-lscf.md: a band ending at z = −1 biases low orders near its top; 2·f_hi loses
 * accuracy at high orders on wide bands).
 */
const BAND_GUARD = 1.25;

/** How the FRFs of each response DOF are weighted in the fit. */
export type LscfWeighting = 'rms' | 'unit' | readonly number[];

/** Options of `stabilizationDiagram`. */
export interface StabilizationOptions {
  /** Band [lo, hi] in Hz; only the lines inside it are fitted and only poles inside it are kept. */
  bandHz: [number, number];
  /** Model orders to fit (integers ≥ 2), e.g. 2, 4, …, 120; each gives up to order × N_i poles. */
  orders: number[];
  /** Stability tolerances; defaults `DEFAULT_STABILITY_TOLERANCES`. */
  tolerances?: Partial<StabilityTolerances>;
  /** Poles with a larger damping ratio are dropped; default 0.3 (common practice). */
  maxDampingRatio?: number;
  /**
   * Sample interval Δt (s) of the z-domain basis Ω = e^{jωΔt}. Default: tied to the band, not to the recording's
   * rate: 1/(2Δt) = max(1.25·hi, lo + hi), so a wide band fills most of the upper half of the unit circle (from
   * angle 0.8π·lo/hi to 0.8π) and a narrow one sits around π/2. Must satisfy bandHz[1] ≤ 1/(2Δt).
   */
  dtS?: number;
  /** 'band' (default, 1/(2Δt) = max(1.25·hi, lo + hi)) or 'data' (Δt = 1/(2·f_last), the behaviour before wide bands); ignored when dtS is given. */
  timeBase?: 'band' | 'data';
  /**
   * Scalar weight per response DOF: 'rms' (default) divides each response's FRFs by their RMS magnitude over
   * the band and references, so every response counts alike whatever its level; 'unit' weighs all by 1; or
   * one positive number per response DOF (along the diagram's `responses`, e.g. from coherence).
   */
  weighting?: LscfWeighting;
}

/**
 * Stabilization diagram by the poly-reference least-squares complex frequency-domain estimator (Guillaume,
 * Verboven, Vanlanduit, Van der Auweraer & Peeters, IMAC XXI 2003; "PolyMAX", Peeters, Van der Auweraer,
 * Guillaume & Leuridan, Shock and Vibration 11, 2004), with Levy's linearisation (Levy 1959).
 *
 * Model, per response o (a row H_o(ω) over the N_i references): the right matrix fraction
 * H_o(ω) = B_o(Ω)·A(Ω)⁻¹ with Ω = e^{jωΔt}, B_o(Ω) = Σ_j Ω^j β_oj (1×N_i) and A(Ω) = Σ_j Ω^j α_j
 * (N_i×N_i), all coefficients real, α_n = I. The error w_o·[B_o − H_o·A] is minimised over the lines of the
 * band, with one scalar weight w_o per response (`weighting`); the numerators are eliminated (reduced normal
 * equations, see lscf-normal.ts), which is solved once for the largest order and nested for the others.
 *
 * Time base: 1/(2Δt) = max(1.25·f_hi, f_lo + f_hi) by default, so a wide band spans the arc from 0.8π·f_lo/f_hi to 0.8π
 * and the basis stays near-orthogonal however wide the band (docs/decisions/wide-band-lscf.md). Poles:
 * eigenvalues z_r of the block companion matrix, λ_r = ln(z_r)/Δt, f = |λ|/2π, ζ = −Re λ/|λ|; kept when
 * Im z > 0, f inside the band, 0 < ζ ≤ maxDampingRatio. Participation factor: left null vector of A(z_r);
 * shape estimate ψ_r = B(z_r)·L_r.
 *
 * FRFs of any kind (receptance, mobility, accelerance) give the same poles. H_ij = response i / force j,
 * time dependence e^{+jωt}. The plain least-squares estimator is biased under noise (De Troyer et al. 2012).
 * Throws RangeError for bad input: fewer than 2 response DOFs (no MAC check possible), a band without lines
 * or with fewer lines than the largest order needs, orders < 2, non-finite FRF values, bad weights.
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
  const timeBase = options.timeBase ?? 'band';
  if (timeBase !== 'band' && timeBase !== 'data') throw new RangeError(`timeBase=${String(timeBase)} must be 'band' or 'data'`);
  const fLast = g.f[g.f.length - 1];
  const dt = options.dtS ?? 1 / (2 * (timeBase === 'band' ? Math.max(BAND_GUARD * hi, lo + hi) : fLast));
  if (typeof dt !== 'number' || !(dt > 0) || !Number.isFinite(dt)) throw new RangeError(`dtS=${String(dt)} must be > 0 and finite`);
  if (hi > (1 / (2 * dt)) * (1 + 1e-12)) throw new RangeError(`dtS=${dt} s aliases the band: bandHz[1]=${hi} Hz is above 1/(2·dtS)=${1 / (2 * dt)} Hz`);
  const orders = [...new Set(options.orders)].sort((a, b) => a - b);
  const nmax = orders[orders.length - 1];
  const nf = k1 - k0;
  if (nf < nmax + 1) throw new RangeError(`bandHz [${lo}, ${hi}] Hz holds ${nf} lines; order ${nmax} needs at least ${nmax + 1}`);
  const weights = responseWeights(options.weighting ?? 'rms', g.re, g.im, k0, k1, g.rows);

  const sums = lscfSums(g.re, g.im, g.f, k0, k1, dt, weights, nmax);
  const normal = new ReducedNormalEquations(sums, weights);
  const out: StabilizationDiagram = {
    bandHz: [lo, hi],
    dtS: dt,
    weights: Array.from(weights),
    lines: nf,
    responses: g.rows.slice(),
    references: g.cols.slice(),
    transposed: g.transposed,
    orders: [],
  };
  let previous: DiagramPole[] | null = null;
  for (const n of orders) {
    const poles = polesOfOrder(normal.solve(n), ni, dt, lo, hi, maxZeta);
    if (previous) {
      const cls = classifyPoles(previous, poles, tol);
      poles.forEach((p, r) => (p.stable = cls[r]));
    }
    out.orders.push({ order: n, poles });
    previous = poles;
  }
  return out;
}

/** The scalar weight of each response row (see `StabilizationOptions.weighting`). */
function responseWeights(
  weighting: LscfWeighting,
  re: Float64Array[][],
  im: Float64Array[][],
  k0: number,
  k1: number,
  rows: string[],
): Float64Array {
  const no = re.length;
  if (weighting === 'unit') return new Float64Array(no).fill(1);
  if (weighting === 'rms') {
    const w = new Float64Array(no);
    for (let o = 0; o < no; o++) {
      let s = 0;
      for (let i = 0; i < re[o].length; i++) for (let k = k0; k < k1; k++) s += re[o][i][k] ** 2 + im[o][i][k] ** 2;
      const rms = Math.sqrt(s / (re[o].length * (k1 - k0)));
      if (!(rms > 0)) throw new RangeError(`the FRFs of response ${rows[o]} are zero over the band: drop them or give weighting 'unit'`);
      w[o] = 1 / rms;
    }
    return w;
  }
  if (!Array.isArray(weighting) || weighting.length !== no) {
    throw new RangeError(`weighting must be 'rms', 'unit' or ${no} positive numbers (one per response DOF: ${rows.join(', ')})`);
  }
  return Float64Array.from(weighting, (v, o) => {
    if (typeof v !== 'number' || !(v > 0) || !Number.isFinite(v)) throw new RangeError(`weighting[${o}]=${String(v)} (response ${rows[o]}) must be > 0 and finite`);
    return v;
  });
}
