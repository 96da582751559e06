import { parseDof } from './dof.ts';

/**
 * One mode of a structure with proportional viscous damping.
 *
 * - `fnHz`: undamped natural frequency in Hz. `fnHz = 0` marks a rigid-body mode (its `zeta` is
 *   ignored); elastic modes need 0 < zeta < 1.
 * - `zeta`: viscous damping ratio (fraction of critical, 0.01 = 1 %).
 * - `shape`: real, mass-normalised mode shape in 1/√kg, keyed by DOF label. Keys are normally
 *   positive directions (`P01:+Z`); a negative key (`P01:-Z`) is accepted and means the value of
 *   the positive direction is its negation. A direction missing from a mode at a known point is 0.
 */
export interface Mode {
  fnHz: number;
  zeta: number;
  shape: Record<string, number>;
}

/** A modal model: mass-normalised real modes (docs/methods.md#modal-model). */
export interface ModalModel {
  modes: Mode[];
}

/** Internal, validated form of a model: one Float64Array per quantity, indexed by mode. */
export interface CompiledModel {
  count: number;
  /** ω_r in rad/s (0 for rigid-body modes). */
  omega: Float64Array;
  zeta: Float64Array;
  /** Point labels that occur in any mode shape. */
  points: Set<string>;
  /** Positive-direction DOF → shape values over the modes. */
  shapes: Map<string, Float64Array>;
}

/**
 * Validates a model and packs it into typed arrays. Throws RangeError naming the bad value.
 */
export function compileModel(model: ModalModel): CompiledModel {
  if (!model || !Array.isArray(model.modes)) throw new RangeError('model.modes must be an array of modes');
  const count = model.modes.length;
  if (count === 0) throw new RangeError('model.modes=[] must contain at least one mode');
  const omega = new Float64Array(count);
  const zeta = new Float64Array(count);
  const shapes = new Map<string, Float64Array>();
  const points = new Set<string>();
  model.modes.forEach((mode, r) => {
    const fn = mode?.fnHz;
    if (typeof fn !== 'number' || !Number.isFinite(fn) || fn < 0) {
      throw new RangeError(`model.modes[${r}].fnHz=${String(fn)} must be a finite number >= 0`);
    }
    omega[r] = 2 * Math.PI * fn;
    if (fn > 0) {
      const z = mode.zeta;
      if (typeof z !== 'number' || !Number.isFinite(z) || !(z > 0 && z < 1)) {
        throw new RangeError(`model.modes[${r}].zeta=${String(z)} must be in (0, 1) for an elastic mode`);
      }
      zeta[r] = z;
    }
    if (!mode.shape || typeof mode.shape !== 'object') {
      throw new RangeError(`model.modes[${r}].shape must be a record of DOF label → number`);
    }
    const seen = new Set<string>();
    for (const [key, value] of Object.entries(mode.shape)) {
      const dof = parseDof(key);
      if (typeof value !== 'number' || !Number.isFinite(value)) {
        throw new RangeError(`model.modes[${r}].shape["${key}"]=${String(value)} must be a finite number`);
      }
      if (seen.has(dof.positive)) {
        throw new RangeError(`model.modes[${r}].shape has "${key}" and its opposite direction; give one of them`);
      }
      seen.add(dof.positive);
      points.add(dof.point);
      let column = shapes.get(dof.positive);
      if (!column) {
        column = new Float64Array(count);
        shapes.set(dof.positive, column);
      }
      column[r] = dof.sign * value;
    }
  });
  return { count, omega, zeta, points, shapes };
}

/**
 * Shape values of every mode at a signed DOF: φ(i, −d) = −φ(i, +d) (docs/methods.md#dof-signs sign rule).
 * Throws RangeError when the DOF's point does not occur in the model.
 */
export function shapeVector(compiled: CompiledModel, dof: string): Float64Array {
  const parsed = parseDof(dof);
  if (!compiled.points.has(parsed.point)) {
    throw new RangeError(`dof="${dof}" names point "${parsed.point}", which is not in the model`);
  }
  const out = new Float64Array(compiled.count);
  const column = compiled.shapes.get(parsed.positive);
  if (column) for (let r = 0; r < compiled.count; r++) out[r] = parsed.sign * column[r];
  return out;
}

/**
 * The value of one mode's shape at a signed DOF, in 1/√kg. A negative direction flips the sign
 * (docs/methods.md#dof-signs: H(i, −d) = −H(i, +d)); a direction the mode does not list is 0.
 */
export function modeShapeValue(mode: Mode, dof: string): number {
  const parsed = parseDof(dof);
  const pos = mode.shape[parsed.positive];
  if (pos !== undefined) return parsed.sign * pos;
  const neg = mode.shape[`${parsed.point}:-${parsed.axis}`] ?? mode.shape[`${parsed.point}:\u2212${parsed.axis}`];
  if (neg !== undefined) return -parsed.sign * neg;
  return 0;
}

/** All positive-direction DOF labels that occur in the model, in first-seen order. */
export function modelDofs(model: ModalModel): string[] {
  return [...compileModel(model).shapes.keys()];
}
