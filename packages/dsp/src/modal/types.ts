import type { Complex } from '../types.ts';
import type { FrfKind } from '../frf.ts';

/** Kind of an FRF: receptance (m/N), mobility ((m/s)/N) or accelerance ((m/s²)/N); dsp's one `FrfKind` (frf.ts), by the name the modal code uses. */
export type ModalFrfKind = FrfKind;

/**
 * One measured FRF, H = response ÷ force (docs/methods.md#conventions), on the frequency axis of its set.
 * `response` and `reference` are DOF labels (node plus signed direction, docs/methods.md#dof-signs).
 */
export interface ModalFrf {
  response: string;
  reference: string;
  h: Complex;
}

/**
 * A set of FRFs on one frequency axis `f` (Hz, strictly increasing, ≥ 0), one per (response, reference)
 * pair, all of the same `kind`. Time dependence e^{+jωt}.
 */
export interface FrfSet {
  f: Float64Array;
  frfs: ModalFrf[];
  kind: ModalFrfKind;
}

/** A complex number. */
export interface ComplexValue {
  re: number;
  im: number;
}

/**
 * A pole given either by its natural frequency fHz (Hz, f = |λ|/2π) and damping ratio zeta
 * (fraction of critical, ζ = −Re λ/|λ|), or directly by λ (rad/s, Im λ > 0).
 */
export type PoleInput = { fHz: number; zeta: number } | { lambda: ComplexValue };
