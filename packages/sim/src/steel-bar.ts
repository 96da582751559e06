import { dofLabel } from './dof.ts';
import { freeFreeBeamModes } from './free-free-beam.ts';
import type { DemoStructure, GeometryPoint } from './geometry.ts';
import type { Mode, ModalModel } from './modal-model.ts';
import { requireFinite, requireInteger, requirePositive } from './validate.ts';

/**
 * The free–free steel calibration bar of the demo (docs/methods.md#free-free-beam worked example):
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

/**
 * Damping ratios of the bar's elastic modes, by family and mode number (invented; docs/methods.md#demo-bar).
 * Measured bars show 0.2–0.8 % that differs from mode to mode without a trend (support friction, the
 * sensor cable and air each take a different share of each mode), so the values are spread over that
 * range, no two equal and not monotonic in frequency. A family with more modes than listed repeats its list.
 */
export const STEEL_BAR_ZETA = {
  weak: [0.0042, 0.0027, 0.0035, 0.0061, 0.0024, 0.0048, 0.0031, 0.0056],
  stiff: [0.0053, 0.0038, 0.0072, 0.0029],
} as const;

/** Where the bar rests and how stiffly: its rigid-body modes come from this (docs/methods.md#rigid-body). */
export interface SteelBarSuspension {
  /** Position of the two supports, x/L from either end; the demo's are at the nodes of bending mode 1. */
  supportXi: number;
  /** Rigid translation (bounce) frequency on the supports per axis, Hz. */
  bounceHz: { Z: number; Y: number };
  /** Damping ratio of the rigid-body modes (the supports are elastomer). */
  zeta: number;
}

/**
 * The demo's soft support (invented): two elastomer cords at the nodes of bending mode 1, x/L = 0.224158
 * (scipy brentq on the mode-1 shape), stiff enough for a bounce at 2.0 Hz in Z and a pendulum-like sway at
 * 1.4 Hz in Y, ζ = 4 %. Symmetric supports leave translation and rotation uncoupled, and the rotation
 * frequency follows from the geometry: f_rot = f_bounce·√12·(½ − x_s/L) = 0.9555·f_bounce (1.911 Hz and
 * 1.338 Hz). Common practice keeps suspension modes below a tenth of the first elastic mode (53.17 Hz).
 */
export const STEEL_BAR_SUSPENSION: SteelBarSuspension = {
  supportXi: 0.224158,
  bounceHz: { Z: 2.0, Y: 1.4 },
  zeta: 0.04,
};

export interface SteelBarModelInput {
  /** Measurement points along the bar: label and position x from the end, m. */
  points: { label: string; xM: number }[];
  /**
   * Damping ratio of the elastic modes: one value for all, or one per elastic mode in the
   * order of the returned model (ascending frequency). Default STEEL_BAR_ZETA by family and mode number.
   */
  zeta?: number | number[];
  /** Number of weak-direction (±Z) bending modes, default 5. */
  weakCount?: number;
  /** Number of stiff-direction (±Y) bending modes, default 2 (0 to leave them out). */
  stiffCount?: number;
  /**
   * Add the rigid-body modes (translation and rotation, in Z and/or Y for each direction that has
   * elastic modes), so the accelerance shows the mass line below the first bending mode. Default true.
   */
  rigidBody?: boolean;
  /**
   * The support that gives the rigid-body modes their small frequencies; default STEEL_BAR_SUSPENSION.
   * null gives the ideal free–free bar: rigid-body modes at exactly 0 Hz.
   */
  suspension?: SteelBarSuspension | null;
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

  const rigidBody = input.rigidBody ?? true;
  const suspension = input.suspension === null ? null : checkSuspension(input.suspension ?? STEEL_BAR_SUSPENSION);
  const elastic: { fnHz: number; zeta: number; shape: Record<string, number> }[] = [];
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
      const pattern = STEEL_BAR_ZETA[direction];
      elastic.push({ fnHz: mode.fnHz, zeta: pattern[(mode.n - 1) % pattern.length], shape });
    }
    if (rigidBody) {
      const translation: Record<string, number> = {};
      const rotation: Record<string, number> = {};
      for (const p of input.points) {
        translation[dofLabel(p.label, axis)] = beam.translationAt(p.xM);
        rotation[dofLabel(p.label, axis)] = beam.rotationAt(p.xM);
      }
      if (suspension) {
        const bounce = suspension.bounceHz[axis];
        const pitch = bounce * Math.sqrt(12) * (0.5 - suspension.supportXi);
        rigid.push({ fnHz: pitch, zeta: suspension.zeta, shape: rotation }, { fnHz: bounce, zeta: suspension.zeta, shape: translation });
      } else {
        rigid.push({ fnHz: 0, zeta: 0, shape: translation }, { fnHz: 0, zeta: 0, shape: rotation });
      }
    }
  }
  rigid.sort((a, b) => a.fnHz - b.fnHz);
  elastic.sort((a, b) => a.fnHz - b.fnHz);
  const zetas = input.zeta === undefined ? elastic.map((m) => m.zeta) : resolveZeta(input.zeta, elastic.length);
  return { modes: [...rigid, ...elastic.map((m, i) => ({ fnHz: m.fnHz, zeta: zetas[i], shape: m.shape }))] };
}

function checkSuspension(s: SteelBarSuspension): SteelBarSuspension {
  if (!s || typeof s !== 'object') throw new RangeError(`suspension=${String(s)} must be an object or null`);
  requireFinite('suspension.supportXi', s.supportXi);
  if (!(s.supportXi >= 0 && s.supportXi < 0.5)) throw new RangeError(`suspension.supportXi=${s.supportXi} must be in [0, 0.5)`);
  requirePositive('suspension.bounceHz.Z', s.bounceHz?.Z);
  requirePositive('suspension.bounceHz.Y', s.bounceHz?.Y);
  requirePositive('suspension.zeta', s.zeta);
  if (s.zeta >= 1) throw new RangeError(`suspension.zeta=${s.zeta} must be < 1`);
  return s;
}

function resolveZeta(zeta: number | number[], count: number): number[] {
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
 * modes in ±Z, 2 stiff-direction modes in ±Y, damping STEEL_BAR_ZETA, and the four rigid-body modes on
 * STEEL_BAR_SUSPENSION: 1.911 and 2.0 Hz in Z, 1.338 and 1.4 Hz in Y).
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
      'Bending modes from Euler–Bernoulli beam theory (Blevins 1979); rigid-body modes on two soft supports at ' +
      'the mode-1 nodes (bounce 2.0 Hz, pitch 1.9 Hz, ζ = 4 %), so the accelerance shows the mass line below ' +
      'the first bending mode; damping of the bending modes 0.24–0.72 %, different for each mode (invented).',
    points,
    lines,
    model,
  };
}
