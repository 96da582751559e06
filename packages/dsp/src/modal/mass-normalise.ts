// Unit-modal-mass shapes from the driving-point residue (Ewins 2000, "Modal Testing: Theory, Practice and
// Application", 2nd ed., §2.7 and §6): for viscous proportional damping the receptance residue of mode r
// between DOFs j and k is A_r,jk = φ_jφ_k/(2jω_d) with φ mass-normalised (φᵀMφ = 1), so the modal constant
// C_jk = 2jω_d·A_r,jk = φ_jφ_k, and with the driving point k: φ_k = √C_kk, φ_j = C_jk/φ_k.
import type { Complex } from '../types.ts';
import type { ModalModel } from './lsfd.ts';

export interface MassNormalisedMode {
  fHz: number;
  /** Mass-normalised shape (1/√kg) over the model's `responses`: φ_j = C_jk/√C_kk, complex as estimated. */
  phi: Complex;
  /** Real approximation: φ rotated so that the driving point is real and positive, real part kept (1/√kg). */
  realPhi: Float64Array;
  /** Phase of the driving-point modal constant C_kk in degrees; 0 for a proportionally damped mode. */
  drivingPhaseDeg: number;
  /**
   * 'ok'; or 'negative-driving-point' when Re C_kk ≤ 0 — a driving-point residue of the wrong sign, which no
   * mass-normalised real mode can give (a noise pole, or a sign error in a DOF's direction): φ is then not usable.
   */
  status: 'ok' | 'negative-driving-point';
}

export interface MassNormalisedShapes {
  /** The driving-point DOF used (present in both `responses` and `references`), or null when there is none. */
  drivingPoint: string | null;
  responses: string[];
  modes: MassNormalisedMode[];
  /** Plain-words note when no driving point exists (then `modes` is empty). */
  note: string | null;
}

/**
 * Mass-normalised shapes of a modal model (from `estimateShapes`; residues in receptance form, so any FRF kind
 * works) from its driving-point residue. `drivingPoint` names the DOF measured as both response and reference;
 * by default the first reference that is also a response. DOF labels must match exactly (a point struck in
 * −Z beside an accelerometer in +Z must be put on one axis first: H(i, −d) = −H(i, +d)).
 * Returns `drivingPoint: null`, no modes and a note when the model has no driving point.
 */
export function massNormalisedShapes(model: ModalModel, drivingPoint?: string): MassNormalisedShapes {
  if (!model || !Array.isArray(model.modes) || !Array.isArray(model.responses) || !Array.isArray(model.references)) {
    throw new RangeError(`model=${String(model)} must come from estimateShapes`);
  }
  if (drivingPoint !== undefined && (typeof drivingPoint !== 'string' || drivingPoint === '')) {
    throw new RangeError(`drivingPoint=${String(drivingPoint)} must be a DOF label`);
  }
  const candidates = model.references.filter((r) => model.responses.includes(r));
  const k = drivingPoint ?? candidates[0];
  if (k === undefined || !candidates.includes(k)) {
    const why =
      drivingPoint === undefined
        ? `no reference DOF (${model.references.join(', ')}) is also a response DOF`
        : `${drivingPoint} is not both a reference (${model.references.join(', ')}) and a response`;
    return {
      drivingPoint: null,
      responses: model.responses.slice(),
      modes: [],
      note: `No driving point: ${why}. Mass-normalised shapes need the FRF with response and force at the same DOF; the unit-normalised shapes stay valid.`,
    };
  }
  const i = model.references.indexOf(k);
  const ok = model.responses.indexOf(k);
  const no = model.responses.length;
  const modes = model.modes.map((m): MassNormalisedMode => {
    const wd = m.lambda.im;
    const A = m.residues[i];
    // C_j = 2jω_d·A_j
    const cr = new Float64Array(no);
    const ci = new Float64Array(no);
    for (let o = 0; o < no; o++) {
      cr[o] = -2 * wd * A.im[o];
      ci[o] = 2 * wd * A.re[o];
    }
    const mod = Math.hypot(cr[ok], ci[ok]);
    const ph = Math.atan2(ci[ok], cr[ok]);
    // φ_k = √C_kk (principal root), φ_j = C_j/φ_k
    const sr = Math.sqrt(mod) * Math.cos(ph / 2);
    const si = Math.sqrt(mod) * Math.sin(ph / 2);
    const d = sr * sr + si * si;
    const re = new Float64Array(no);
    const im = new Float64Array(no);
    const realPhi = new Float64Array(no);
    for (let o = 0; o < no; o++) {
      re[o] = d > 0 ? (cr[o] * sr + ci[o] * si) / d : 0;
      im[o] = d > 0 ? (ci[o] * sr - cr[o] * si) / d : 0;
      // rotate by −arg(φ_k) = −ph/2 so the driving point is real positive
      realPhi[o] = re[o] * Math.cos(ph / 2) + im[o] * Math.sin(ph / 2);
    }
    return {
      fHz: m.fHz,
      phi: { re, im },
      realPhi,
      drivingPhaseDeg: (ph * 180) / Math.PI,
      status: cr[ok] > 0 ? 'ok' : 'negative-driving-point',
    };
  });
  return { drivingPoint: k, responses: model.responses.slice(), modes, note: null };
}
