import { dofLabel } from './dof.ts';
import type { DemoStructure, GeometryPoint } from './geometry.ts';
import type { Mode } from './modal-model.ts';
import { requirePositive } from './validate.ts';

/**
 * A simply supported rectangular steel plate with closed-form modes, for wide-band fits (issue 14's
 * structure): Kirchhoff plate theory (Leissa 1969, "Vibration of Plates", NASA SP-160, §4.1):
 *   ω_mn = π²(m²/a² + n²/b²)·√(D/(ρh)),  D = Eh³/(12(1 − ν²)),
 *   φ_mn(x, y) = 2/√(ρhab)·sin(mπx/a)·sin(nπy/b)   (mass-normalised, ∫ρhφ² dA = 1).
 * Default 550 × 400 × 5 mm steel (E = 210 GPa, ν = 0.3, ρ = 7850 kg/m³): 16 modes from 117.5 to 1391.8 Hz,
 * with the pairs (4,1)/(1,3) 0.70 % and (5,2)/(4,3) 1.39 % apart. Damping 0.3–0.8 %, different for every
 * mode (invented). Points P01…P20 on a 5 × 4 grid off the nodal lines of the modes up to 1.5 kHz; ±Z only.
 */
export const SS_PLATE = { lengthXM: 0.55, widthYM: 0.4, thicknessM: 0.005, youngsPa: 210e9, poisson: 0.3, densityKgM3: 7850 } as const;

export interface SsPlateOptions {
  /** Modes up to this frequency (Hz) are kept; default 6000 (so the band's upper neighbours are in the model). */
  maxHz?: number;
}

export function simplySupportedPlate(options: SsPlateOptions = {}): DemoStructure {
  const maxHz = requirePositive('maxHz', options.maxHz ?? 6000);
  const { lengthXM: a, widthYM: b, thicknessM: h, youngsPa: E, poisson: nu, densityKgM3: rho } = SS_PLATE;
  const D = (E * h ** 3) / (12 * (1 - nu * nu));
  const c = Math.PI ** 2 * Math.sqrt(D / (rho * h));
  const amp = 2 / Math.sqrt(rho * h * a * b);
  const points: GeometryPoint[] = [];
  for (let iy = 0; iy < 4; iy++) {
    for (let ix = 0; ix < 5; ix++) {
      points.push({ label: `P${String(points.length + 1).padStart(2, '0')}`, xMm: (0.055 + ix * 0.1037) * 1000, yMm: (0.047 + iy * 0.0973) * 1000, zMm: 0 });
    }
  }
  const lines: [string, string][] = [];
  for (let iy = 0; iy < 4; iy++) {
    for (let ix = 0; ix < 5; ix++) {
      const here = points[iy * 5 + ix].label;
      if (ix + 1 < 5) lines.push([here, points[iy * 5 + ix + 1].label]);
      if (iy + 1 < 4) lines.push([here, points[(iy + 1) * 5 + ix].label]);
    }
  }
  const list: { f: number; m: number; n: number }[] = [];
  for (let m = 1; m < 60; m++) {
    for (let n = 1; n < 60; n++) {
      const f = (c * ((m * m) / (a * a) + (n * n) / (b * b))) / (2 * Math.PI);
      if (f <= maxHz) list.push({ f, m, n });
    }
  }
  list.sort((x, y) => x.f - y.f);
  const modes: Mode[] = list.map(({ f, m, n }, r) => {
    const shape: Record<string, number> = {};
    for (const p of points) shape[dofLabel(p.label, 'Z')] = amp * Math.sin((m * Math.PI * p.xMm) / 1000 / a) * Math.sin((n * Math.PI * p.yMm) / 1000 / b);
    return { fnHz: f, zeta: 0.003 + 0.005 * ((r * 0.618034) % 1), shape };
  });
  return {
    name: 'Simply supported plate',
    description:
      'Steel plate 550 × 400 × 5 mm, simply supported on all edges; modes from the Kirchhoff plate formula (Leissa 1969), exact for that idealisation. Damping is invented (0.3–0.8 %).',
    points,
    lines,
    model: { modes },
  };
}
