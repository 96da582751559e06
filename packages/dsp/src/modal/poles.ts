import type { ComplexValue, PoleInput } from './types.ts';

/** A pole in both forms: λ (rad/s) and natural frequency (Hz) with damping ratio. */
export interface PoleValues {
  fHz: number;
  zeta: number;
  lambda: ComplexValue;
}

/**
 * λ = −ζω_n + jω_n√(1 − ζ²) from (fHz, zeta), or f = |λ|/2π and ζ = −Re λ/|λ| from λ (docs/methods.md#modal-model).
 * Throws a RangeError naming the bad value unless 0 < ζ < 1 and f > 0 (Im λ > 0, Re λ < 0).
 */
export function poleValues(p: PoleInput, name: string): PoleValues {
  if (!p || typeof p !== 'object') throw new RangeError(`${name}=${String(p)} must be a pole { fHz, zeta } or { lambda }`);
  if ('lambda' in p && p.lambda) {
    const { re, im } = p.lambda;
    if (!Number.isFinite(re) || !Number.isFinite(im)) throw new RangeError(`${name}.lambda=(${re}, ${im}) must be finite`);
    if (!(im > 0)) throw new RangeError(`${name}.lambda.im=${im} rad/s must be > 0 (give the pole of positive frequency)`);
    if (!(re < 0)) throw new RangeError(`${name}.lambda.re=${re} s⁻¹ must be < 0 (a stable pole, ζ > 0)`);
    const wn = Math.hypot(re, im);
    return { fHz: wn / (2 * Math.PI), zeta: -re / wn, lambda: { re, im } };
  }
  const q = p as { fHz: number; zeta: number };
  if (typeof q.fHz !== 'number' || !Number.isFinite(q.fHz) || !(q.fHz > 0)) throw new RangeError(`${name}.fHz=${String(q.fHz)} must be > 0 and finite`);
  if (typeof q.zeta !== 'number' || !(q.zeta > 0 && q.zeta < 1)) throw new RangeError(`${name}.zeta=${String(q.zeta)} must be between 0 and 1`);
  const wn = 2 * Math.PI * q.fHz;
  return { fHz: q.fHz, zeta: q.zeta, lambda: { re: -q.zeta * wn, im: wn * Math.sqrt(1 - q.zeta * q.zeta) } };
}

/**
 * The pole pair's partial fractions at ω (rad/s): 1/(jω − λ) and 1/(jω − λ*) for λ = a + jb, written
 * into out as [re₁, im₁, re₂, im₂] (out is reused by the callers' loops; docs/methods.md#modal-model).
 */
export function polePairTerms(out: Float64Array, lambda: ComplexValue, w: number): void {
  const { re: a, im: b } = lambda;
  const d1 = a * a + (w - b) * (w - b);
  const d2 = a * a + (w + b) * (w + b);
  out[0] = -a / d1;
  out[1] = -(w - b) / d1;
  out[2] = -a / d2;
  out[3] = -(w + b) / d2;
}
