// FRF synthesis from a fitted modal model (docs/methods.md#modal-model): the pole–residue sum plus the
// residual terms, in any FRF kind.
import type { Complex } from '../types.ts';
import { kindPower } from './frf-set.ts';
import type { ModalModel } from './lsfd.ts';
import { polePairTerms } from './poles.ts';
import type { ModalFrfKind } from './types.ts';

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
  const out: Complex = { re: new Float64Array(f.length), im: new Float64Array(f.length) };
  const t = new Float64Array(4);
  for (let k = 0; k < f.length; k++) {
    const w = 2 * Math.PI * f[k];
    let [hr, hi] = [0, 0];
    for (const m of model.modes) {
      polePairTerms(t, m.lambda, w);
      const Ar = m.residues[i].re[o];
      const Ai = m.residues[i].im[o];
      // A/(jω − λ) + A*/(jω − λ*)
      hr += Ar * t[0] - Ai * t[1] + Ar * t[2] + Ai * t[3];
      hi += Ar * t[1] + Ai * t[0] + Ar * t[3] - Ai * t[2];
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
    out.re[k] = hr;
    out.im[k] = hi;
  }
  return out;
}
