// Complex FRF → the numbers plots show: magnitude (linear or dB re 1 unit), phase in degrees
// wrapped to (−180°, 180°], real and imaginary parts. ISO 1683:2015 (reference values): amplitude ratios use
// 20·log10, FRF plots print their reference ("dB re 1 (m/s²)/N"), phase is wrapped to (−180, 180].
// Typed arrays throughout: an overlay of 100 FRFs × 8193 lines runs through here.

import { unwrapPhaseDeg } from '@resonote/dsp';
import { frfUnits, type FrfKind } from '@resonote/contracts';

export type { FrfKind };

/** SI unit of each FRF kind (ISO 7626-1:2011 names). */
export const frfUnit = frfUnits;
export const frfKindLabel: Record<FrfKind, string> = { receptance: 'Receptance', mobility: 'Mobility', accelerance: 'Accelerance' };

/** Standard gravity, m/s² (exact, ISO 80000-3). */
export const STANDARD_GRAVITY = 9.80665;

/** Smallest magnitude shown in dB: keeps log10(0) = −∞ out of the plots (−600 dB is far below any noise floor). */
const FLOOR = 1e-30;

export interface ComplexArrays {
  re: ArrayLike<number>;
  im: ArrayLike<number>;
}

/** 20·log10(|x| / 1 unit): dB re 1 of the FRF's unit. Zero magnitude maps to −600 dB, never −∞ or NaN. */
export function amplitudeDb(magnitude: number): number {
  if (!Number.isFinite(magnitude)) throw new RangeError(`magnitude=${magnitude} must be finite`);
  return 20 * Math.log10(Math.max(Math.abs(magnitude), FLOOR));
}

/** Inverse of amplitudeDb: 10^(dB/20), in the FRF's unit. */
export function fromAmplitudeDb(db: number): number {
  return 10 ** (db / 20);
}

/** Any angle in degrees wrapped to (−180, 180]: −180 becomes 180, 540 becomes 180, −190 becomes 170. */
export function wrapPhaseDeg(deg: number): number {
  if (!Number.isFinite(deg)) throw new RangeError(`phase=${deg} must be finite`);
  const r = deg - 360 * Math.ceil((deg - 180) / 360);
  // ceil maps exactly 180 + 360k to 180; guard the rounding edge of the subtraction.
  return r <= -180 ? r + 360 : r;
}

/** arg(re + j·im) in degrees, wrapped to (−180, 180]. atan2 already lies in [−180, 180]; −180 → 180. */
export function phaseDeg(re: number, im: number): number {
  const d = (Math.atan2(im, re) * 180) / Math.PI;
  return d === -180 ? 180 : d;
}

function check(h: ComplexArrays): number {
  if (h.re.length !== h.im.length) throw new RangeError(`re has ${h.re.length} values but im has ${h.im.length}`);
  return h.re.length;
}

/** |H| at every line, in the FRF's unit. */
export function magnitudes(h: ComplexArrays): Float64Array {
  const n = check(h);
  const out = new Float64Array(n);
  for (let k = 0; k < n; k++) out[k] = Math.hypot(h.re[k]!, h.im[k]!);
  return out;
}

/** 20·log10|H| at every line, dB re 1 of the FRF's unit (e.g. dB re 1 (m/s²)/N for accelerance). */
export function magnitudesDb(h: ComplexArrays): Float64Array {
  const n = check(h);
  const out = new Float64Array(n);
  for (let k = 0; k < n; k++) {
    const re = h.re[k]!;
    const im = h.im[k]!;
    // 10·log10(re² + im²) = 20·log10|H| without the square root.
    out[k] = 10 * Math.log10(Math.max(re * re + im * im, FLOOR * FLOOR));
  }
  return out;
}

/** Phase of H at every line, degrees wrapped to (−180, 180]. */
export function phasesDeg(h: ComplexArrays): Float64Array {
  const n = check(h);
  const out = new Float64Array(n);
  for (let k = 0; k < n; k++) out[k] = phaseDeg(h.re[k]!, h.im[k]!);
  return out;
}

/**
 * Phase of H at every line in degrees, unwrapped: continuous through ±180° (dsp `unwrapPhaseDeg`,
 * numpy.unwrap's rule). The one place the screens unwrap a phase.
 */
export function phasesDegUnwrapped(h: ComplexArrays): Float64Array {
  return unwrapPhaseDeg(phasesDeg(h));
}

export function toFloat64(values: ArrayLike<number>): Float64Array {
  return values instanceof Float64Array ? values : Float64Array.from(values);
}

/**
 * Lines with f > 0 only, for a log frequency axis (log(0) has no place on it). Returns the index
 * of the first such line.
 */
export function firstPositiveLine(f: ArrayLike<number>): number {
  let k = 0;
  while (k < f.length && !(f[k]! > 0)) k++;
  return k;
}

/** Axis title of the magnitude: "|H1| in dB re 1 (m/s²)/N" or "|H1| in (m/s²)/N". */
export function magnitudeTitle(kind: FrfKind, db: boolean, estimator = 'H1'): string {
  return db ? `|${estimator}| (dB re 1 ${frfUnit[kind]})` : `|${estimator}| (${frfUnit[kind]})`;
}

/** Formats a number for a readout: 4 significant figures, exponent form outside 1e-3…1e5. */
export function formatValue(x: number | null | undefined, digits = 4): string {
  if (x === null || x === undefined || !Number.isFinite(x)) return '–';
  const a = Math.abs(x);
  if (a !== 0 && (a < 1e-3 || a >= 1e5)) return x.toExponential(digits - 1).replace('e', '·10^').replace('+', '');
  return String(Number(x.toPrecision(digits)));
}

/** Hz with sensible precision: 0.5 Hz resolution data reads as "146.5 Hz". */
export function formatHz(x: number | null | undefined): string {
  if (x === null || x === undefined || !Number.isFinite(x)) return '–';
  return `${x >= 100 ? x.toFixed(1) : x >= 10 ? x.toFixed(2) : x.toFixed(3)} Hz`;
}
