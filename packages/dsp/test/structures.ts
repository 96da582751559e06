// Structure models with closed-form modes for the modal tests, and FRFs made from them as an impact test
// measures them: exact modal sums, the exponential window's effect, and seeded noise. Test support only.
import type { FrfSet, ModalFrfKind } from '../src/modal/types.ts';
import { gaussian } from './helpers.ts';

/** A structure as a list of modes: natural frequency (Hz), damping ratio and mass-normalised shape (1/√kg) at named DOFs. */
export interface ClosedFormModel {
  dofs: string[];
  modes: { fHz: number; zeta: number; phi: Float64Array; label: string }[];
}

/** Steel: E = 210 GPa, ν = 0.3, ρ = 7850 kg/m³ (handbook values, e.g. Blevins 1979, table of materials; from memory). */
export const STEEL = { E: 210e9, nu: 0.3, rho: 7850 };

export interface PlateInput {
  a: number;
  b: number;
  h: number;
  /** Points (x, y) in m where the plate is measured. */
  points: [number, number][];
  /** Modes up to this frequency (Hz) are included. */
  fMaxHz: number;
  /** Damping ratio of mode r (by ascending frequency). */
  zeta: (r: number, m: number, n: number) => number;
}

/**
 * Simply supported rectangular Kirchhoff plate a × b × h (Leissa 1969, "Vibration of Plates", NASA SP-160,
 * §4.1): ω_mn = π²(m²/a² + n²/b²)·√(D/(ρh)), D = Eh³/(12(1 − ν²)); mass-normalised shapes
 * φ_mn(x, y) = 2/√(ρhab)·sin(mπx/a)·sin(nπy/b) (∫ρhφ² dA = 1).
 */
export function ssPlate(p: PlateInput): ClosedFormModel {
  const { E, nu, rho } = STEEL;
  const D = (E * p.h ** 3) / (12 * (1 - nu * nu));
  const c = Math.PI ** 2 * Math.sqrt(D / (rho * p.h));
  const amp = 2 / Math.sqrt(rho * p.h * p.a * p.b);
  const list: { fHz: number; m: number; n: number }[] = [];
  for (let m = 1; m < 40; m++) {
    for (let n = 1; n < 40; n++) {
      const f = (c * (m * m / p.a ** 2 + n * n / p.b ** 2)) / (2 * Math.PI);
      if (f <= p.fMaxHz) list.push({ fHz: f, m, n });
    }
  }
  list.sort((x, y) => x.fHz - y.fHz);
  return {
    dofs: p.points.map((_, i) => `P${String(i + 1).padStart(2, '0')}:+Z`),
    modes: list.map(({ fHz, m, n }, r) => ({
      fHz,
      zeta: p.zeta(r, m, n),
      label: `(${m},${n})`,
      phi: Float64Array.from(p.points, ([x, y]) => amp * Math.sin((m * Math.PI * x) / p.a) * Math.sin((n * Math.PI * y) / p.b)),
    })),
  };
}

export interface MeasureInput {
  f: Float64Array;
  /** Indices into model.dofs of the accelerometers (responses) and the struck points (references). */
  responses: number[];
  references: number[];
  kind: ModalFrfKind;
  /** Time constant τ (s) of the exponential window on force and response; the FRF becomes H(jω + 1/τ). */
  tauS?: number;
  /** Relative complex noise (standard deviation per part, of |H| at the line) and an absolute floor (of max |H| of the FRF). */
  noise?: { relative: number; floor: number; seed: number };
}

/**
 * FRFs H_ij = Σ_r φ_iφ_j/(s² + 2ζ_rω_r s + ω_r²)·s^p at s = jω + 1/τ (viscous proportional damping with
 * mass-normalised real shapes, Ewins 2000, §2.7; the exponential window shifts every pole by −1/τ, Fladung
 * 1997), p = 0/1/2 for receptance/mobility/accelerance, plus seeded gaussian noise.
 */
export function measure(model: ClosedFormModel, opt: MeasureInput): FrfSet {
  const sig = opt.tauS ? 1 / opt.tauS : 0;
  const p = opt.kind === 'receptance' ? 0 : opt.kind === 'mobility' ? 1 : 2;
  const rnd = gaussian(opt.noise?.seed ?? 1);
  const frfs: FrfSet['frfs'] = [];
  for (const j of opt.references) {
    for (const i of opt.responses) {
      const re = new Float64Array(opt.f.length);
      const im = new Float64Array(opt.f.length);
      for (let k = 0; k < opt.f.length; k++) {
        const sr = sig;
        const si = 2 * Math.PI * opt.f[k];
        const s2r = sr * sr - si * si;
        const s2i = 2 * sr * si;
        let hr = 0;
        let hi = 0;
        for (const md of model.modes) {
          const A = md.phi[i] * md.phi[j];
          const wn = 2 * Math.PI * md.fHz;
          let dr = s2r + wn * wn;
          let di = s2i;
          if (wn > 0) {
            dr += 2 * md.zeta * wn * sr;
            di += 2 * md.zeta * wn * si;
          }
          const d = dr * dr + di * di;
          hr += (A * dr) / d;
          hi -= (A * di) / d;
        }
        for (let q = 0; q < p; q++) {
          const t = hr * sr - hi * si;
          hi = hr * si + hi * sr;
          hr = t;
        }
        re[k] = hr;
        im[k] = hi;
      }
      if (opt.noise) {
        let big = 0;
        for (let k = 0; k < re.length; k++) big = Math.max(big, Math.hypot(re[k], im[k]));
        for (let k = 0; k < re.length; k++) {
          const sd = opt.noise.relative * Math.hypot(re[k], im[k]) + opt.noise.floor * big;
          re[k] += sd * rnd();
          im[k] += sd * rnd();
        }
      }
      frfs.push({ response: model.dofs[i], reference: model.dofs[j], h: { re, im } });
    }
  }
  return { f: opt.f, frfs, kind: opt.kind };
}

/** 0, df, 2df, … (n lines). */
export function lines(df: number, n: number): Float64Array {
  return Float64Array.from({ length: n }, (_, k) => k * df);
}

/** The plate of the wide-band tests: 550 × 400 × 5 mm steel, 16 modes 117–1392 Hz, pairs (4,1)/(1,3) 0.70 % and (4,3)/(5,2) 1.39 % apart (Leissa 1969). */
export function widePlate(): { model: ClosedFormModel; points: [number, number][] } {
  const points: [number, number][] = [];
  // 5 × 4 grid, off the nodal lines of the modes in the band
  for (let iy = 0; iy < 4; iy++) for (let ix = 0; ix < 5; ix++) points.push([0.055 + ix * 0.1037, 0.047 + iy * 0.0973]);
  const model = ssPlate({
    a: 0.55,
    b: 0.4,
    h: 0.005,
    points,
    fMaxHz: 6000,
    // 0.3 … 0.8 %, different for every mode (invented, realistic for a bolted steel plate)
    zeta: (r) => 0.003 + 0.005 * ((r * 0.618034) % 1),
  });
  return { model, points };
}

/** Roots βL of cos βL·cosh βL = 1 (free–free beam, Blevins 1979, table 8-1: 4.7300, 7.8532, 10.9956, …), by Newton from (2n+1)π/2. */
export function freeFreeBetaL(n: number): number {
  let x = ((2 * n + 1) * Math.PI) / 2;
  for (let it = 0; it < 50; it++) {
    // g(x) = cos x − 1/cosh x (= 0 ⇔ cos x cosh x = 1), well scaled for large x
    const g = Math.cos(x) - 1 / Math.cosh(x);
    const dg = -Math.sin(x) + Math.tanh(x) / Math.cosh(x);
    const step = g / dg;
    x -= step;
    if (Math.abs(step) < 1e-15 * x) break;
  }
  return x;
}

/**
 * Free–free Euler–Bernoulli beam (Blevins 1979, "Formulas for Natural Frequency and Mode Shape", table 8-1):
 * ω_n = (β_nL)²/L²·√(EI/(ρA)); shape φ(x) = cosh βx + cos βx − σ(sinh βx + sin βx),
 * σ = (cosh βL − cos βL)/(sinh βL − sin βL), with ∫₀ᴸφ² dx = L, so φ/√(ρAL) is mass-normalised; plus the two
 * rigid-body modes (0 Hz): translation 1/√(ρAL) and rotation √(12/(ρAL))·(x/L − ½).
 */
export function freeFreeBeam(p: { L: number; EI: number; rhoA: number; points: number[]; flexible: number; zeta: (r: number) => number }): ClosedFormModel {
  const { L, EI, rhoA } = p;
  const m = rhoA * L;
  const modes: ClosedFormModel['modes'] = [
    { fHz: 0, zeta: 0, label: 'rigid translation', phi: Float64Array.from(p.points, () => 1 / Math.sqrt(m)) },
    { fHz: 0, zeta: 0, label: 'rigid rotation', phi: Float64Array.from(p.points, (x) => Math.sqrt(12 / m) * (x / L - 0.5)) },
  ];
  for (let n = 1; n <= p.flexible; n++) {
    const bl = freeFreeBetaL(n);
    const b = bl / L;
    // 1 − σ without cancellation: (cos βL − sin βL − e^{−βL})/(sinh βL − sin βL)
    const oneMinusSigma = (Math.cos(bl) - Math.sin(bl) - Math.exp(-bl)) / (Math.sinh(bl) - Math.sin(bl));
    const sigma = 1 - oneMinusSigma;
    const phi = Float64Array.from(p.points, (x) => {
      const u = b * x;
      // cosh u − σ sinh u = e^{−u}(1 + σ)/2 + e^{u}(1 − σ)/2
      const hyp = (Math.exp(-u) * (1 + sigma)) / 2 + (Math.exp(u) * oneMinusSigma) / 2;
      return (hyp + Math.cos(u) - sigma * Math.sin(u)) / Math.sqrt(m);
    });
    modes.push({ fHz: (b * b * Math.sqrt(EI / rhoA)) / (2 * Math.PI), zeta: p.zeta(n - 1), label: `bending ${n}`, phi });
  }
  return { dofs: p.points.map((_, i) => `B${String(i + 1).padStart(2, '0')}:+Z`), modes };
}

/** The spring–mass chain of tests/reference/chain_modes.py: masses (kg), springs (N/m), and M, K (row-major). */
export function chainMatrices(masses: number[], springs: number[]): { M: Float64Array; K: Float64Array; n: number } {
  const n = masses.length;
  const M = new Float64Array(n * n);
  const K = new Float64Array(n * n);
  for (let i = 0; i < n; i++) {
    M[i * n + i] = masses[i];
    K[i * n + i] = springs[i] + springs[i + 1];
    if (i + 1 < n) K[i * n + i + 1] = K[(i + 1) * n + i] = -springs[i + 1];
  }
  return { M, K, n };
}
