import { dofLabel } from './dof.ts';
import { freeFreeBeamRoots, freeFreeShape } from './free-free-beam.ts';
import type { DemoStructure, GeometryPoint } from './geometry.ts';
import type { Mode } from './modal-model.ts';
import { requirePositive } from './validate.ts';

/**
 * INVENTED DEMO STRUCTURE — physically plausible, not a model of any real product.
 *
 * The demo's fictional lab tests the baseplate of a pump skid for a fictional client: a flat steel
 * plate 1200 × 800 × 20 mm (E = 210 GPa, ν = 0.3, ρ = 7850 kg/m³, 150.7 kg) resting on four soft
 * rubber mounts 100 mm in from each corner. Out-of-plane motion (±Z) only.
 *
 * How the modes are made (an approximation, good to a few % at best):
 * - Elastic modes: the shapes are products X_m(x)·Y_n(y) of free–free beam functions (index 0 =
 *   rigid translation, 1 = rigid rotation, m ≥ 2 = beam mode m − 1), which are exactly orthogonal
 *   under the plate's uniform mass, mass-normalised by 1/√(ρhab). Frequencies use Warburton's
 *   approximation for rectangular plates (Warburton, "The vibration of rectangular plates",
 *   Proc. IMechE 168, 1954; coefficients as reproduced in Blevins, *Formulas for Natural
 *   Frequency and Mode Shape*, ch. 11 — from memory, not checked against the text):
 *     ω² = π⁴D/(a⁴ρh) · [G_x⁴ + G_y⁴(a/b)⁴ + 2(a/b)²(ν H_x H_y + (1 − ν) J_x J_y)],
 *     D = Eh³/(12(1 − ν²)); G_m = β_{m−1}L/π (exact free–free roots) for m ≥ 2, and
 *     H, J: m = 0: 0, 0; m = 1: 0, 12/π²; m = 2: 1.248, 5.017;
 *     m ≥ 3: g²(1 − 2/(gπ)), g²(1 + 6/(gπ)) with g = m − ½.
 *   The true free-plate modes are not separable; this is the usual engineering shortcut.
 * - The mounts (4 × 100 kN/m, invented) turn the three out-of-plane rigid-body motions into
 *   bounce, pitch and roll modes of the rigid plate on springs (8.2, 11.8 and 10.7 Hz). Their
 *   coupling to the elastic modes is neglected (the mounts are soft: 8–12 Hz against ≥ 73 Hz).
 * - Damping (invented): 4 % for the mount modes (rubber), 0.6–1.5 % for the plate modes.
 *
 * Plate modes up to `maxHz` (default 400 Hz: 8 plate modes, 73.7 to 362 Hz) are kept.
 */
export const PUMP_SKID_PLATE = {
  lengthXM: 1.2,
  widthYM: 0.8,
  thicknessM: 0.02,
  youngsPa: 210e9,
  poisson: 0.3,
  densityKgM3: 7850,
  /** Mount positions (m) and stiffness per mount (N/m); invented. */
  mountXM: [0.1, 1.1],
  mountYM: [0.1, 0.7],
  mountStiffnessNm: 1.0e5,
  mountZeta: 0.04,
  /** Damping of the plate modes in ascending order of frequency, repeated if more are asked for. */
  plateZeta: [0.01, 0.008, 0.012, 0.007, 0.015, 0.009, 0.011, 0.006, 0.013, 0.01],
} as const;

/** Grid of measurement points (mm): 5 along X, 4 along Y, labelled P01…P20 row by row. */
const GRID_X_MM = [100, 350, 600, 850, 1100];
const GRID_Y_MM = [100, 300, 500, 700];

function warburtonHJ(m: number): [number, number] {
  if (m === 0) return [0, 0];
  if (m === 1) return [0, 12 / (Math.PI * Math.PI)];
  if (m === 2) return [1.248, 5.017];
  const g = m - 0.5;
  return [g * g * (1 - 2 / (g * Math.PI)), g * g * (1 + 6 / (g * Math.PI))];
}

/** Beam function of index m (0: 1, 1: √3(2ξ − 1), m ≥ 2: free–free mode m − 1), mean square 1 on [0, 1]. */
function beamFunction(m: number, roots: Float64Array, xi: number): number {
  if (m === 0) return 1;
  if (m === 1) return Math.sqrt(3) * (2 * xi - 1);
  return freeFreeShape(roots[m - 2], xi);
}

export interface PumpSkidOptions {
  /** Keep plate modes up to this frequency, Hz (default 400). */
  maxHz?: number;
}

/**
 * The demo's pump-skid baseplate (invented; see PUMP_SKID_PLATE): 20 points P01…P20 on a 5 × 4
 * grid (x = 100…1100 mm, y = 100…700 mm, z = 20 mm, the top face), lines along the grid, and an
 * approximate modal model in ±Z with three mount modes and the plate modes up to `maxHz`.
 */
export function pumpSkidBaseplate(options: PumpSkidOptions = {}): DemoStructure {
  const maxHz = requirePositive('maxHz', options.maxHz ?? 400);
  const P = PUMP_SKID_PLATE;
  const a = P.lengthXM;
  const b = P.widthYM;
  const h = P.thicknessM;
  const massKg = P.densityKgM3 * a * b * h;
  const D = (P.youngsPa * h ** 3) / (12 * (1 - P.poisson ** 2));
  const base = (Math.PI ** 4 * D) / (a ** 4 * P.densityKgM3 * h);
  const r = a / b;

  const points: GeometryPoint[] = [];
  for (const y of GRID_Y_MM) {
    for (const x of GRID_X_MM) {
      points.push({ label: `P${String(points.length + 1).padStart(2, '0')}`, xMm: x, yMm: y, zMm: h * 1000 });
    }
  }
  const lines: [string, string][] = [];
  const nx = GRID_X_MM.length;
  for (let j = 0; j < GRID_Y_MM.length; j++) {
    for (let i = 0; i < nx; i++) {
      const here = points[j * nx + i].label;
      if (i + 1 < nx) lines.push([here, points[j * nx + i + 1].label]);
      if (j + 1 < GRID_Y_MM.length) lines.push([here, points[(j + 1) * nx + i].label]);
    }
  }

  const maxIndex = 8;
  const roots = freeFreeBeamRoots(maxIndex);
  const shapeOf = (m: number, n: number): Record<string, number> => {
    const shape: Record<string, number> = {};
    const scale = 1 / Math.sqrt(massKg);
    for (const p of points) {
      const value = beamFunction(m, roots, p.xMm / 1000 / a) * beamFunction(n, roots, p.yMm / 1000 / b);
      shape[dofLabel(p.label, 'Z')] = scale * value;
    }
    return shape;
  };

  // Rigid plate on four springs at (±mx, ±my) about the centre: bounce, pitch (about Y), roll (about X).
  const k = P.mountStiffnessNm;
  const mx = (P.mountXM[1] - P.mountXM[0]) / 2;
  const my = (P.mountYM[1] - P.mountYM[0]) / 2;
  const mountHz = (stiffness: number, inertia: number) => Math.sqrt(stiffness / inertia) / (2 * Math.PI);
  const mountModes: Mode[] = [
    { fnHz: mountHz(4 * k, massKg), zeta: P.mountZeta, shape: shapeOf(0, 0) },
    { fnHz: mountHz(4 * k * mx * mx, (massKg * a * a) / 12), zeta: P.mountZeta, shape: shapeOf(1, 0) },
    { fnHz: mountHz(4 * k * my * my, (massKg * b * b) / 12), zeta: P.mountZeta, shape: shapeOf(0, 1) },
  ].sort((p, q) => p.fnHz - q.fnHz);

  const plate: { fnHz: number; m: number; n: number }[] = [];
  for (let m = 0; m < maxIndex; m++) {
    for (let n = 0; n < maxIndex; n++) {
      if (m + n <= 1) continue; // the three rigid-body motions are the mount modes above
      const Gx = m >= 2 ? roots[m - 2] / Math.PI : 0;
      const Gy = n >= 2 ? roots[n - 2] / Math.PI : 0;
      const [Hx, Jx] = warburtonHJ(m);
      const [Hy, Jy] = warburtonHJ(n);
      const factor = Gx ** 4 + Gy ** 4 * r ** 4 + 2 * r * r * (P.poisson * Hx * Hy + (1 - P.poisson) * Jx * Jy);
      const fnHz = Math.sqrt(base * factor) / (2 * Math.PI);
      if (fnHz <= maxHz) plate.push({ fnHz, m, n });
    }
  }
  plate.sort((p, q) => p.fnHz - q.fnHz);
  const plateModes: Mode[] = plate.map((p, i) => ({
    fnHz: p.fnHz,
    zeta: P.plateZeta[i % P.plateZeta.length],
    shape: shapeOf(p.m, p.n),
  }));

  return {
    name: 'Pump-skid baseplate (invented demo structure)',
    description:
      'Invented steel baseplate 1200 × 800 × 20 mm on four soft mounts; out-of-plane (±Z) modes from ' +
      "products of free–free beam functions with Warburton's frequency approximation. Approximate demo data.",
    points,
    lines,
    model: { modes: [...mountModes, ...plateModes] },
  };
}
