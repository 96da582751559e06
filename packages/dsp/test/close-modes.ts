// Test support: two modes 1 % apart (100 and 101 Hz, ζ = 0.5 %) with distinct shapes on 6 DOFs, built in
// closed form (receptance modal sum of docs/methods.md#modal-model), optionally with relative gaussian noise.
import type { FrfSet } from '../src/modal/types.ts';
import { axis, gaussianCosOnly } from './modal-systems.ts';

export const CLOSE_PSI = [
  [1.0, 0.8, 0.3, -0.2, -0.7, -1.0],
  [0.9, -0.4, -1.0, -0.3, 0.5, 1.0],
];

export function closeModes(refs: number[], noise: number, seed = 7) {
  const fHz = [100, 101];
  const zeta = 0.005;
  const f = axis(0, 0.1, 2001); // 0…200 Hz
  const rnd = gaussianCosOnly(seed);
  const frfs: FrfSet['frfs'] = [];
  for (const j of refs) {
    for (let i = 0; i < 6; i++) {
      const re = new Float64Array(f.length);
      const im = new Float64Array(f.length);
      for (let k = 0; k < f.length; k++) {
        const w = 2 * Math.PI * f[k];
        let hr = 0;
        let hi = 0;
        for (let r = 0; r < 2; r++) {
          const wr = 2 * Math.PI * fHz[r];
          const a = wr * wr - w * w;
          const b = 2 * zeta * wr * w;
          const d = a * a + b * b;
          const A = CLOSE_PSI[r][i] * CLOSE_PSI[r][j];
          hr += (A * a) / d;
          hi -= (A * b) / d;
        }
        const m = Math.hypot(hr, hi);
        re[k] = hr + noise * m * rnd();
        im[k] = hi + noise * m * rnd();
      }
      frfs.push({ response: `p${i}`, reference: `p${j}`, h: { re, im } });
    }
  }
  const set: FrfSet = { f, frfs, kind: 'receptance' };
  return { set, fHz, zeta, psi: CLOSE_PSI };
}
