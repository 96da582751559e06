import { correctExponentialDamping } from '../windows.ts';
import { poleValues, type PoleValues } from './poles.ts';
import type { PoleInput } from './types.ts';

/**
 * Removes the damping an exponential window (time constant tauS, s, the same window on force and response)
 * added to poles estimated from windowed FRFs. The window maps H(s) to H(s + 1/τ), so every pole moved
 * left by 1/τ; the exact correction is σ_true = σ_est − 1/τ with ω_d unchanged, ω_n = √(ω_d² + σ_true²),
 * ζ = σ_true/ω_n (docs/methods.md#exp-window; Fladung 1997). Uses `correctExponentialDamping` of ../windows.ts.
 *
 * In: poles as { fHz (Hz), zeta (ratio) } or { lambda (rad/s) }, other fields are kept. Out: the same
 * poles with corrected fHz, zeta and lambda. Residues and shapes are unchanged by the window (docs/methods.md#exp-window).
 * Throws a RangeError when a pole holds less damping than the window added.
 */
export function correctWindowDamping<T extends PoleInput>(poles: readonly T[], tauS: number): (T & PoleValues)[] {
  if (!Array.isArray(poles)) throw new RangeError(`poles=${String(poles)} must be an array`);
  if (typeof tauS !== 'number' || !(tauS > 0) || !Number.isFinite(tauS)) throw new RangeError(`tauS=${String(tauS)} must be > 0 and finite`);
  return poles.map((p, r) => {
    const v = poleValues(p, `poles[${r}]`);
    let c: { fnHz: number; zeta: number };
    try {
      c = correctExponentialDamping({ fnHz: v.fHz, zeta: v.zeta, tauS });
    } catch (e) {
      throw new RangeError(`poles[${r}]: ${(e as Error).message}`);
    }
    const wn = 2 * Math.PI * c.fnHz;
    return {
      ...p,
      fHz: c.fnHz,
      zeta: c.zeta,
      lambda: { re: -c.zeta * wn, im: wn * Math.sqrt(1 - c.zeta * c.zeta) },
    };
  });
}
