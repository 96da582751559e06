import { requireFinite, requireInteger, requirePositive } from './validate.ts';

/**
 * Free–free uniform Euler–Bernoulli beam (docs/methods.md#free-free-beam; Thomson & Dahleh, *Theory of
 * Vibration with Applications*, App. D; Blevins, *Formulas for Natural Frequency and Mode Shape*,
 * Table 8-1).
 *
 * Frequency equation: cos βL · cosh βL = 1 (β = 0 gives the two rigid-body modes).
 * f_n = (β_nL)² / (2πL²) · √(EI/(ρA)).
 * Shape: φ̃_n(x) = cosh βx + cos βx − σ_n (sinh βx + sin βx),
 *        σ_n = (cosh βL − cos βL) / (sinh βL − sin βL),
 * and ∫₀ᴸ φ̃_n² dx = L, so the mass-normalised shape is φ_n = φ̃_n / √(ρAL) in 1/√kg.
 */


/** cos x − 1/cosh x: zero exactly where cos x cosh x = 1, and bounded for large x. */
function frequencyFunction(x: number): number {
  const sech = x > 40 ? 2 * Math.exp(-x) : 1 / Math.cosh(x);
  return Math.cos(x) - sech;
}

/**
 * The first `count` positive roots β_nL of cos βL · cosh βL = 1, in ascending order.
 *
 * Root n lies within 0.5 of (n + ½)π (the bracket changes sign there because 1/cosh x < 0.03
 * while |cos x| > 0.47 at the bracket ends); it is found by bisection to the last bit, which is
 * as good as Brent's method here and needs no tuning.
 */
export function freeFreeBeamRoots(count: number): Float64Array {
  requireInteger('count', count, 1, 10000);
  const roots = new Float64Array(count);
  for (let n = 1; n <= count; n++) {
    let lo = (n + 0.5) * Math.PI - 0.5;
    let hi = (n + 0.5) * Math.PI + 0.5;
    let gLo = frequencyFunction(lo);
    for (let it = 0; it < 200; it++) {
      const mid = 0.5 * (lo + hi);
      if (mid <= lo || mid >= hi) break; // interval is one ulp wide
      const gMid = frequencyFunction(mid);
      if (gMid === 0) {
        lo = hi = mid;
        break;
      }
      if (gMid > 0 === gLo > 0) {
        lo = mid;
        gLo = gMid;
      } else {
        hi = mid;
      }
    }
    roots[n - 1] = 0.5 * (lo + hi);
  }
  return roots;
}

/**
 * Unnormalised free–free shape φ̃(ξ) at ξ = x/L ∈ [0, 1] for the root `betaL`, scaled so that
 * ∫₀¹ φ̃² dξ = 1 (φ̃(0) = 2 exactly).
 *
 * Written without the cancellation of cosh βx − σ sinh βx that ruins the textbook form for the
 * higher modes (for mode 20 both terms are ~1e27): with B = βL, u = βx and E = e^{−B},
 *   cosh u − σ sinh u = ½(1 − σ)e^{u} + ½(1 + σ)e^{−u},
 *   (1 − σ)e^{u} = (cos B − sin B − E)·e^{u−B} / d,   σ = (½(1 + E²) − E cos B) / d,
 *   d = (sinh B − sin B)·e^{−B} = ½(1 − E²) − E sin B,
 * every factor of which is O(1).
 */
export function freeFreeShape(betaL: number, xi: number): number {
  const B = betaL;
  const E = Math.exp(-B);
  const d = 0.5 * (1 - E * E) - E * Math.sin(B);
  const sigma = (0.5 * (1 + E * E) - E * Math.cos(B)) / d;
  const u = B * xi;
  const growing = (0.5 * (Math.cos(B) - Math.sin(B) - E) * Math.exp(u - B)) / d;
  const decaying = 0.5 * (1 + sigma) * Math.exp(-u);
  return growing + decaying + Math.cos(u) - sigma * Math.sin(u);
}

export type BendingDirection = 'weak' | 'stiff';

export interface FreeFreeBeamInput {
  /** Beam length L, m. */
  lengthM: number;
  /** Cross-section width, m (the larger side of a flat bar). */
  widthM: number;
  /** Cross-section thickness, m. */
  thicknessM: number;
  /** Young's modulus E, Pa. */
  youngsPa: number;
  /** Density ρ, kg/m³. */
  densityKgM3: number;
  /**
   * `weak`: bending through the smaller side, I = big·small³/12; `stiff`: through the larger
   * side, I = small·big³/12 (docs/methods.md#free-free-beam "weak direction" / "stiff direction").
   */
  direction: BendingDirection;
  /** Number of elastic modes. */
  count: number;
}

export interface BeamMode {
  /** Elastic mode number, 1-based. */
  n: number;
  /** Root β_nL of cos βL cosh βL = 1. */
  betaL: number;
  /** Natural frequency, Hz. */
  fnHz: number;
  /** Mass-normalised shape at x (m from the end x = 0), 1/√kg. */
  shapeAt(xM: number): number;
}

export interface FreeFreeBeam {
  lengthM: number;
  /** ρA, kg/m. */
  massPerLengthKgM: number;
  /** EI, N·m². */
  bendingStiffnessNm2: number;
  modes: BeamMode[];
  /** Rigid-body translation, mass-normalised: 1/√(ρAL), 1/√kg. */
  translationAt(xM: number): number;
  /** Rigid-body rotation about the centre, mass-normalised: √(12/(ρAL))·(x/L − ½), 1/√kg. */
  rotationAt(xM: number): number;
}

/**
 * Elastic bending modes of a free–free uniform rectangular bar (Euler–Bernoulli: no shear
 * deformation or rotary inertia, so stiff-direction modes from the 3rd on come out several %
 * high, docs/methods.md#free-free-beam).
 */
export function freeFreeBeamModes(input: FreeFreeBeamInput): FreeFreeBeam {
  const L = requirePositive('lengthM', input?.lengthM);
  const w = requirePositive('widthM', input.widthM);
  const t = requirePositive('thicknessM', input.thicknessM);
  const E = requirePositive('youngsPa', input.youngsPa);
  const rho = requirePositive('densityKgM3', input.densityKgM3);
  const count = requireInteger('count', input.count, 1, 10000);
  if (input.direction !== 'weak' && input.direction !== 'stiff') {
    throw new RangeError(`direction="${String(input.direction)}" must be 'weak' or 'stiff'`);
  }
  const big = Math.max(w, t);
  const small = Math.min(w, t);
  const I = input.direction === 'weak' ? (big * small ** 3) / 12 : (small * big ** 3) / 12;
  const rhoA = rho * w * t;
  const EI = E * I;
  const c = Math.sqrt(EI / rhoA);
  const scale = 1 / Math.sqrt(rhoA * L);
  const roots = freeFreeBeamRoots(count);
  const checkX = (xM: number): number => {
    requireFinite('xM', xM);
    // Allow a rounding hair outside the ends (coordinates converted from mm).
    if (xM < -1e-9 * L || xM > L * (1 + 1e-9)) throw new RangeError(`xM=${xM} must lie on the beam, in [0, ${L}]`);
    return Math.min(1, Math.max(0, xM / L));
  };
  const modes: BeamMode[] = Array.from(roots, (betaL, i) => ({
    n: i + 1,
    betaL,
    fnHz: ((betaL * betaL) / (2 * Math.PI * L * L)) * c,
    shapeAt: (xM: number) => scale * freeFreeShape(betaL, checkX(xM)),
  }));
  return {
    lengthM: L,
    massPerLengthKgM: rhoA,
    bendingStiffnessNm2: EI,
    modes,
    translationAt: (xM: number) => (checkX(xM), scale),
    rotationAt: (xM: number) => Math.sqrt(12) * scale * (checkX(xM) - 0.5),
  };
}

