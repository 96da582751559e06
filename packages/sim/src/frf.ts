import { compileModel, shapeVector, type ModalModel } from './modal-model.ts';
import { requireFinite } from './validate.ts';

export type FrfKind = 'receptance' | 'mobility' | 'accelerance';

export interface ComplexArray {
  re: Float64Array;
  im: Float64Array;
}

/**
 * Closed-form FRF of a modal model with proportional viscous damping (docs/methods.md#modal-model):
 *
 *   α_jk(ω) = Σ_r φ_jr·φ_kr / (ω_r² − ω² + 2j·ζ_r·ω_r·ω)          receptance, m/N
 *   Y_jk(ω) = jω·α_jk(ω)                                             mobility, (m/s)/N
 *   A_jk(ω) = −ω²·α_jk(ω)                                            accelerance, (m/s²)/N
 *
 * with j = response DOF and k = excitation DOF (H_jk = response j ÷ force k), time dependence
 * e^{+jωt} (docs/methods.md#conventions), so a driving-point receptance has its phase in [−180°, 0°].
 * Signed DOFs follow H(i, −d) = −H(i, +d) (docs/methods.md#dof-signs). Rigid-body modes (fnHz = 0) add −φφ/ω² to the
 * receptance, i.e. the constant φ_jφ_k to the accelerance (the mass line). No residual terms are
 * added for modes that are not in the model.
 *
 * @param fHz frequencies in Hz, each finite and ≥ 0. At 0 Hz the receptance and mobility of a
 *   model with rigid-body modes are unbounded, which is reported as a RangeError.
 * @returns real and imaginary parts, one entry per frequency, in the unit of `kind`.
 */
export function modelFrf(
  model: ModalModel,
  responseDof: string,
  excitationDof: string,
  fHz: ArrayLike<number>,
  kind: FrfKind,
): ComplexArray {
  if (kind !== 'receptance' && kind !== 'mobility' && kind !== 'accelerance') {
    throw new RangeError(`kind="${String(kind)}" must be 'receptance', 'mobility' or 'accelerance'`);
  }
  const compiled = compileModel(model);
  const phiJ = shapeVector(compiled, responseDof);
  const phiK = shapeVector(compiled, excitationDof);
  const n = fHz?.length;
  if (typeof n !== 'number') throw new RangeError('fHz must be an array of frequencies in Hz');
  const re = new Float64Array(n);
  const im = new Float64Array(n);
  const { omega, zeta, count } = compiled;
  let hasRigid = false;
  for (let r = 0; r < count; r++) if (omega[r] === 0 && phiJ[r] * phiK[r] !== 0) hasRigid = true;

  for (let i = 0; i < n; i++) {
    const f = requireFinite(`fHz[${i}]`, fHz[i]);
    if (f < 0) throw new RangeError(`fHz[${i}]=${f} must be >= 0`);
    if (f === 0 && hasRigid && kind !== 'accelerance') {
      throw new RangeError(`fHz[${i}]=0: the ${kind} of a model with rigid-body modes is unbounded at 0 Hz`);
    }
    const w = 2 * Math.PI * f;
    // Receptance sum α = Σ a_r / (d_re + j d_im); the rigid modes are handled as accelerance terms.
    let aRe = 0;
    let aIm = 0;
    let rigidAcc = 0; // Σ φφ over rigid modes: their accelerance is exactly this constant.
    for (let r = 0; r < count; r++) {
      const residue = phiJ[r] * phiK[r];
      if (residue === 0) continue;
      const wr = omega[r];
      if (wr === 0) {
        rigidAcc += residue;
        continue;
      }
      const dRe = wr * wr - w * w;
      const dIm = 2 * zeta[r] * wr * w;
      const d2 = dRe * dRe + dIm * dIm;
      aRe += (residue * dRe) / d2;
      aIm -= (residue * dIm) / d2;
    }
    if (kind === 'receptance') {
      re[i] = aRe + (rigidAcc !== 0 ? -rigidAcc / (w * w) : 0);
      im[i] = aIm;
    } else if (kind === 'mobility') {
      // jω(aRe + j aIm) = −ω aIm + j ω aRe; rigid: jω·(−φφ/ω²) = −j φφ/ω.
      re[i] = -w * aIm;
      im[i] = w * aRe + (rigidAcc !== 0 ? -rigidAcc / w : 0);
    } else {
      re[i] = -w * w * aRe + rigidAcc;
      im[i] = -w * w * aIm;
    }
  }
  return { re, im };
}
