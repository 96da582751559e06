import { dofLabel } from './dof.ts';
import { freeFreeBeamModes } from './free-free-beam.ts';
import type { DemoStructure, GeometryPoint } from './geometry.ts';
import type { Mode, ModalModel } from './modal-model.ts';
import { requireFinite, requireInteger, requirePositive } from './validate.ts';

/**
 * The free–free steel calibration bar of the demo (field-reference §7.1 worked example):
 * L = 1.000 m, section 40 mm × 10 mm, E = 210 GPa, ρ = 7850 kg/m³, lying flat on soft supports
 * with its length along X, the 40 mm side along Y and the 10 mm side along Z. Weak-direction
 * bending (53.17, 146.55, 287.30, 474.93, 709.46 Hz) moves the bar in Z; stiff-direction bending
 * (212.66, 586.22, … Hz) moves it in Y.
 */
export const STEEL_BAR = {
  lengthM: 1.0,
  widthM: 0.04,
  thicknessM: 0.01,
  youngsPa: 210e9,
  densityKgM3: 7850,
} as const;

/** Default damping ratio of the bar's elastic modes (0.5 %; invented, plausible for a bar hung on bungees with a sensor cable). */
export const STEEL_BAR_DEFAULT_ZETA = 0.005;

export interface SteelBarModelInput {
  /** Measurement points along the bar: label and position x from the end, m. */
  points: { label: string; xM: number }[];
  /**
   * Damping ratio of the elastic modes: one value for all, or one per elastic mode in the
   * order of the returned model (ascending frequency). Default 0.005.
   */
  zeta?: number | number[];
  /** Number of weak-direction (±Z) bending modes, default 5. */
  weakCount?: number;
  /** Number of stiff-direction (±Y) bending modes, default 2 (0 to leave them out). */
  stiffCount?: number;
  /**
   * Add the rigid-body modes (translation and rotation, in Z and/or Y for each direction that has
   * elastic modes) as fnHz = 0 modes, so
   * the accelerance tends to the mass line at low frequency. Default false: the bar hangs on
   * supports soft enough that their modes are far below the band and the demo's modal fit
   * only has elastic poles to recover.
   */
  rigidBody?: boolean;
  /** Override the bar's dimensions or material (defaults: STEEL_BAR). */
  lengthM?: number;
  widthM?: number;
  thicknessM?: number;
  youngsPa?: number;
  densityKgM3?: number;
}

/**
 * Modal model of a free–free rectangular bar from Euler–Bernoulli theory (free-free-beam.ts):
 * weak-direction bending as shapes in `<label>:+Z`, stiff-direction bending in `<label>:+Y`,
 * mass-normalised (1/√kg). Modes are sorted by frequency, rigid-body ones first.
 */
export function steelBarModel(input: SteelBarModelInput): ModalModel {
  const lengthM = input.lengthM ?? STEEL_BAR.lengthM;
  const geometry = {
    lengthM,
    widthM: input.widthM ?? STEEL_BAR.widthM,
    thicknessM: input.thicknessM ?? STEEL_BAR.thicknessM,
    youngsPa: input.youngsPa ?? STEEL_BAR.youngsPa,
    densityKgM3: input.densityKgM3 ?? STEEL_BAR.densityKgM3,
  };
  const weakCount = requireInteger('weakCount', input.weakCount ?? 5, 0, 200);
  const stiffCount = requireInteger('stiffCount', input.stiffCount ?? 2, 0, 200);
  if (weakCount + stiffCount === 0) {
    throw new RangeError('weakCount=0 and stiffCount=0 leave the bar model without modes');
  }
  if (!Array.isArray(input.points) || input.points.length === 0) {
    throw new RangeError('points must be a non-empty array of { label, xM }');
  }
  const labels = new Set<string>();
  for (const [i, p] of input.points.entries()) {
    if (typeof p?.label !== 'string' || p.label.length === 0 || p.label.includes(':')) {
      throw new RangeError(`points[${i}].label=${String(p?.label)} must be a non-empty string without ':'`);
    }
    if (labels.has(p.label)) throw new RangeError(`points[${i}].label="${p.label}" is used twice`);
    labels.add(p.label);
    requireFinite(`points[${i}].xM`, p.xM);
  }

  const elastic: { fnHz: number; shape: Record<string, number> }[] = [];
  const rigid: Mode[] = [];
  const families: ['weak' | 'stiff', 'Z' | 'Y', number][] = [
    ['weak', 'Z', weakCount],
    ['stiff', 'Y', stiffCount],
  ];
  for (const [direction, axis, count] of families) {
    if (count === 0) continue;
    const beam = freeFreeBeamModes({ ...geometry, direction, count });
    for (const mode of beam.modes) {
      const shape: Record<string, number> = {};
      for (const p of input.points) shape[dofLabel(p.label, axis)] = mode.shapeAt(p.xM);
      elastic.push({ fnHz: mode.fnHz, shape });
    }
    if (input.rigidBody) {
      const translation: Record<string, number> = {};
      const rotation: Record<string, number> = {};
      for (const p of input.points) {
        translation[dofLabel(p.label, axis)] = beam.translationAt(p.xM);
        rotation[dofLabel(p.label, axis)] = beam.rotationAt(p.xM);
      }
      rigid.push({ fnHz: 0, zeta: 0, shape: translation }, { fnHz: 0, zeta: 0, shape: rotation });
    }
  }
  elastic.sort((a, b) => a.fnHz - b.fnHz);
  const zetas = resolveZeta(input.zeta, elastic.length);
  return { modes: [...rigid, ...elastic.map((m, i) => ({ fnHz: m.fnHz, zeta: zetas[i], shape: m.shape }))] };
}

function resolveZeta(zeta: number | number[] | undefined, count: number): number[] {
  if (zeta === undefined) return new Array<number>(count).fill(STEEL_BAR_DEFAULT_ZETA);
  if (typeof zeta === 'number') {
    requirePositive('zeta', zeta);
    if (zeta >= 1) throw new RangeError(`zeta=${zeta} must be < 1`);
    return new Array<number>(count).fill(zeta);
  }
  if (!Array.isArray(zeta) || zeta.length < count) {
    throw new RangeError(`zeta has ${Array.isArray(zeta) ? zeta.length : 'no'} entries; ${count} elastic modes need one each`);
  }
  return zeta.slice(0, count).map((z, i) => {
    requirePositive(`zeta[${i}]`, z);
    if (z >= 1) throw new RangeError(`zeta[${i}]=${z} must be < 1`);
    return z;
  });
}

/**
 * The demo's steel calibration bar: 21 points B01…B21 every 50 mm along X (x = 0…1000 mm,
 * y = z = 0), lines between neighbours, and `steelBarModel` with its defaults (5 weak-direction
 * modes in ±Z, 2 stiff-direction modes in ±Y, ζ = 0.5 %, no rigid-body modes).
 */
export function steelBar(options: Omit<SteelBarModelInput, 'points'> = {}): DemoStructure {
  const lengthM = options.lengthM ?? STEEL_BAR.lengthM;
  const points: GeometryPoint[] = [];
  for (let i = 0; i < 21; i++) {
    points.push({ label: `B${String(i + 1).padStart(2, '0')}`, xMm: (i * lengthM * 1000) / 20, yMm: 0, zMm: 0 });
  }
  const lines: [string, string][] = [];
  for (let i = 1; i < points.length; i++) lines.push([points[i - 1].label, points[i].label]);
  const model = steelBarModel({ ...options, points: points.map((p) => ({ label: p.label, xM: p.xMm / 1000 })) });
  return {
    name: 'Steel calibration bar (free–free)',
    description:
      'Free–free steel bar 1000 × 40 × 10 mm (E = 210 GPa, ρ = 7850 kg/m³) on soft supports. ' +
      'Modes from Euler–Bernoulli beam theory (field-reference §7.1); damping is an invented 0.5 %.',
    points,
    lines,
    model,
  };
}
