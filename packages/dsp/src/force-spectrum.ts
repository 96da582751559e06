// The force spectrum of one hit as the roll-off check reads it (docs/methods.md#roll-off): the
// hit check and the hit plot both draw it from here, so the plot's −10/−20 dB marks sit on the
// curve they were read from.
import { realFftPlan } from './fft.ts';
import { checkFs, checkSamples } from './validate.ts';

/** Where the pulse is: the force offset to remove (N) and the samples kept, [fromIndex, toIndex). */
export interface ForcePulseGate {
  offsetN: number;
  fromIndex: number;
  toIndex: number;
}

export interface ForcePulseSpectrum {
  /** Frequency lines k·fs/N, Hz (N = record length). */
  f: Float64Array;
  /** 10·log10(|F(f)|² / |F(0)|²), dB; −Infinity where |F(f)| is 0. */
  levelDb: Float64Array;
}

/**
 * |F(f)|² of the pulse relative to |F(0)|², in dB.
 * In: force (N, raw), fs (Hz), the gate: `offsetN` is subtracted and every sample outside
 * [fromIndex, toIndex) is set to 0 (noise and after-ringing that a force window removes before any
 * FRF, docs/methods.md#force-window). Out: the spectrum over 0 … fs/2, or null when F(0) is 0 (no pulse).
 */
export function forcePulseSpectrum(force: ArrayLike<number>, fs: number, gate: ForcePulseGate): ForcePulseSpectrum | null {
  checkFs(fs);
  const n = checkSamples(force, 'force');
  const from = Math.max(0, Math.floor(gate.fromIndex));
  const to = Math.min(n, Math.ceil(gate.toIndex));
  if (!(Number.isFinite(gate.offsetN) && to > from)) throw new RangeError(`gate=[${gate.fromIndex}, ${gate.toIndex}) with offset ${gate.offsetN} must hold samples of the ${n}-sample record`);
  const gated = new Float64Array(n);
  for (let i = from; i < to; i++) gated[i] = force[i] - gate.offsetN;
  const plan = realFftPlan(n);
  const re = new Float64Array(plan.bins);
  const im = new Float64Array(plan.bins);
  plan.forward(gated, re, im);
  const ref = re[0] * re[0] + im[0] * im[0];
  if (!(ref > 0)) return null;
  const f = new Float64Array(plan.bins);
  const levelDb = new Float64Array(plan.bins);
  for (let k = 0; k < plan.bins; k++) {
    f[k] = (k * fs) / n;
    const pw = re[k] * re[k] + im[k] * im[k];
    levelDb[k] = pw > 0 ? 10 * Math.log10(pw / ref) : -Infinity;
  }
  return { f, levelDb };
}

/**
 * The first frequency where the spectrum falls more than `db` below its DC level, interpolated
 * linearly in dB between the two lines around the crossing (Hz); null when it never does.
 */
export function rollOffFrequency(spectrum: ForcePulseSpectrum, db: number): number | null {
  const { f, levelDb } = spectrum;
  let prev = 0;
  for (let k = 1; k < f.length; k++) {
    const level = levelDb[k]!;
    if (level < -db) {
      const frac = Number.isFinite(level) ? (prev + db) / (prev - level) : 0;
      return f[k - 1]! + frac * (f[k]! - f[k - 1]!);
    }
    prev = level;
  }
  return null;
}
