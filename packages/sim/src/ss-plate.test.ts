import { describe, expect, it } from 'vitest';
import { SS_PLATE, simplySupportedPlate } from './ss-plate.ts';

describe('simply supported plate (Leissa 1969)', () => {
  const s = simplySupportedPlate();
  const f = s.model.modes.map((m) => m.fnHz);

  it('has f_11 = (π/2)(1/a² + 1/b²)√(D/ρh) and 16 modes between 100 and 1500 Hz', () => {
    const { lengthXM: a, widthYM: b, thicknessM: h, youngsPa: E, poisson: nu, densityKgM3: rho } = SS_PLATE;
    const D = (E * h ** 3) / (12 * (1 - nu * nu));
    // Leissa 1969, NASA SP-160 §4.1, ω_11 = π²(1/a² + 1/b²)√(D/ρh); computed by hand: 117.47 Hz
    expect(f[0]).toBeCloseTo((Math.PI / 2) * (1 / a ** 2 + 1 / b ** 2) * Math.sqrt(D / (rho * h)), 9);
    expect(f[0]).toBeCloseTo(117.47, 2);
    expect(f.filter((x) => x >= 100 && x <= 1500)).toHaveLength(16);
    // the two close pairs of issue 14: (4,1)/(1,3) and (5,2)/(4,3)
    expect(f[7] / f[6] - 1).toBeCloseTo(0.007, 3);
    expect(f[14] / f[13] - 1).toBeCloseTo(0.0139, 4);
  });

  it('has mass-normalised shapes: the grid points carry 2/√(ρhab)·sin·sin, largest |φ| ≤ 2/√(ρhab)', () => {
    const { lengthXM: a, widthYM: b, thicknessM: h, densityKgM3: rho } = SS_PLATE;
    const amp = 2 / Math.sqrt(rho * h * a * b);
    // P01 at (55, 47) mm, mode (1,1)
    expect(s.model.modes[0].shape['P01:+Z']).toBeCloseTo(amp * Math.sin((Math.PI * 0.055) / a) * Math.sin((Math.PI * 0.047) / b), 12);
    for (const m of s.model.modes) for (const v of Object.values(m.shape)) expect(Math.abs(v)).toBeLessThanOrEqual(amp * (1 + 1e-12));
    expect(s.points).toHaveLength(20);
    expect(new Set(s.model.modes.map((m) => m.zeta)).size).toBe(s.model.modes.length);
  });
});
