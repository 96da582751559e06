import { mac } from '../assurance.ts';
import type { Complex } from '../types.ts';

type Shape = Complex | ArrayLike<number>;

function parts(v: Shape, name: string): { re: ArrayLike<number>; im: ArrayLike<number> | null } {
  if (v && typeof v === 'object' && 're' in v && 'im' in v && typeof (v as Complex).re === 'object') {
    const c = v as Complex;
    if (!c.re || !c.im || c.re.length !== c.im.length) throw new RangeError(`${name} must have re and im arrays of one length`);
    return { re: c.re, im: c.im };
  }
  const r = v as ArrayLike<number>;
  if (!r || typeof r.length !== 'number') throw new RangeError(`${name}=${String(v)} must be a shape vector`);
  return { re: r, im: null };
}

/**
 * Table of MAC values between two lists of shapes (real or complex vectors, all of one length):
 * result[a][b] = MAC(shapesA[a], shapesB[b]) (dimensionless, 0…1), using `mac` of ../assurance.ts.
 * Source: Allemang & Brown, IMAC 1 (1982), pp. 110–116 (docs/methods.md#mac).
 */
export function macMatrix(shapesA: readonly Shape[], shapesB: readonly Shape[]): Float64Array[] {
  if (!Array.isArray(shapesA) || shapesA.length === 0) throw new RangeError('shapesA is empty: give at least one shape');
  if (!Array.isArray(shapesB) || shapesB.length === 0) throw new RangeError('shapesB is empty: give at least one shape');
  return shapesA.map((a, i) =>
    Float64Array.from(shapesB, (b, j) => {
      try {
        return mac(a, b);
      } catch (e) {
        throw new RangeError(`shapesA[${i}] against shapesB[${j}]: ${(e as Error).message}`);
      }
    }),
  );
}

/**
 * The shape's points x_i + j·y_i in the complex plane and their second moments a = xᵀx, b = xᵀy, c = yᵀy.
 * Throws a RangeError for a non-finite entry, or for an all-zero shape (`why` says what is then undefined).
 */
function secondMoments(shape: Shape, why: string): { re: ArrayLike<number>; im: ArrayLike<number> | null; a: number; b: number; c: number } {
  const { re, im } = parts(shape, 'shape');
  let a = 0;
  let b = 0;
  let c = 0;
  for (let i = 0; i < re.length; i++) {
    const x = re[i];
    const y = im ? im[i] : 0;
    if (!Number.isFinite(x) || !Number.isFinite(y)) throw new RangeError(`shape[${i}]=(${x}, ${y}) is not finite`);
    a += x * x;
    b += x * y;
    c += y * y;
  }
  if (!(a + c > 0)) throw new RangeError(`shape is all zeros: ${why}`);
  return { re, im, a, b, c };
}

/**
 * Modal phase collinearity of a complex shape ψ = x + jy (dimensionless, 0…1): with
 * a = xᵀx, b = xᵀy, c = yᵀy (the uncentred 2×2 matrix [[a, b], [b, c]] whose eigenvalues are λ₁ ≥ λ₂),
 * MPC = ((λ₁ − λ₂)/(λ₁ + λ₂))² = ((a − c)² + 4b²)/(a + c)². 1 for a shape whose entries share one phase
 * (up to sign), 0 for [1, j]. Variant: no centring of the data (docs/methods.md#mpc).
 * Source: Pappa, Elliott & Schenk 1993 (docs/methods.md#mpc). Throws for an all-zero shape.
 */
export function mpc(shape: Shape): number {
  const { a, b, c } = secondMoments(shape, 'MPC is undefined');
  return Math.min(1, ((a - c) * (a - c) + 4 * b * b) / ((a + c) * (a + c)));
}

/**
 * Real-valued "normal mode" approximation of a complex shape, for animation: the shape rotated by the
 * angle θ that maximises Σ Re(e^{−jθ}ψ_i)² (the principal axis of the points in the complex plane,
 * θ = ½·atan2(2xᵀy, xᵀx − yᵀy)), its real part, scaled so the largest entry is +1. Dimensionless.
 */
export function realShape(shape: Complex): Float64Array {
  const { re, im, a, b, c } = secondMoments(shape, 'it has no real approximation');
  const th = 0.5 * Math.atan2(2 * b, a - c);
  const ct = Math.cos(th);
  const st = Math.sin(th);
  const out = new Float64Array(re.length);
  let big = 0;
  for (let i = 0; i < re.length; i++) {
    out[i] = re[i] * ct + (im ? im[i] : 0) * st;
    if (Math.abs(out[i]) > Math.abs(big)) big = out[i];
  }
  for (let i = 0; i < out.length; i++) out[i] /= big;
  return out;
}
