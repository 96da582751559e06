// Stability classes of the poles of a stabilization diagram against the previous model order, the
// diagram's types, and the plain "stable poles of one order" selection (Phillips & Allemang, IMAC 2005;
// thresholds common practice). The estimator itself is in lscf.ts.
import { mac } from '../assurance.ts';
import type { Complex } from '../types.ts';
import type { ComplexValue } from './types.ts';

/** Stability class of a pole against the previous model order (Phillips & Allemang, IMAC 2005), from weakest to strongest. */
export type Stability = 'new' | 'freq' | 'freq-damp' | 'all';

/** Relative tolerances of the stability checks (common practice; Phillips & Allemang, IMAC 2005). */
export interface StabilityTolerances {
  /** Largest |Δf|/f for a stable frequency; default 0.01. */
  freq: number;
  /** Largest |Δζ|/ζ for a stable damping ratio; default 0.05. */
  damping: number;
  /** Smallest MAC of the two shape estimates for a stable vector; default 0.98. */
  mac: number;
}

/** Defaults of the stability checks: 1 % in frequency, 5 % in damping, MAC 0.98 (common practice; Phillips & Allemang, IMAC 2005). */
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

/** Result of `stabilizationDiagram`. */
export interface StabilizationDiagram {
  bandHz: [number, number];
  /** Δt (s) of the z-domain basis that was used. */
  dtS: number;
  /** Scalar weight per response DOF (along `responses`) that multiplied its FRFs in the fit; absent in diagrams of older versions. */
  weights?: number[];
  /** Number of frequency lines inside the band. */
  lines: number;
  /** DOFs along the shape vectors (the response DOFs, or the reference DOFs when the set was transposed). */
  responses: string[];
  /** DOFs along the participation vectors. */
  references: string[];
  /** True when the set had more references than responses and was transposed by reciprocity (Maxwell–Betti, H_ij = H_ji). */
  transposed: boolean;
  /** Per model order, in ascending order, the poles inside the band with 0 < ζ ≤ maxDampingRatio, by frequency. */
  orders: { order: number; poles: DiagramPole[] }[];
}

/**
 * Stability classes of `current` poles against the poles of the previous model order (common practice;
 * presentation after Phillips & Allemang, IMAC 2005). Each current pole is compared with the
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

export function checkTolerances(t: Partial<StabilityTolerances>): StabilityTolerances {
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
