// The calibrator check's reading of a recorded tone (docs/methods.md#m33-live-input-scaling-an-audio-class-interface-and-the-calibrator-check):
// the RMS about the mean, and the frequency from the positive-going zero crossings, interpolated
// linearly between samples. A handheld calibrator gives one clean sine, for which both are exact to
// well under 0.1 % over a second or more. The frequency is the reciprocal of the median period
// (crossing to crossing), so one cycle cut short or stretched by a break in the stream does not
// move it; such cycles are counted as irregular, so the page can ask for another recording.

export interface Tone {
  /** RMS about the mean, in the samples' unit. */
  rms: number;
  /** Frequency from the median zero-crossing period, Hz; NaN-free: throws when fewer than two crossings. */
  frequencyHz: number;
  /** Largest |x − mean|, same unit. */
  peak: number;
  /** Periods more than IRREGULAR_PERIOD away from the median: a break in the stream or a disturbance. */
  irregularCycles: number;
}

/** A period this far (relative) from the median is irregular: a sine sampled at ≥ 40 samples per cycle interpolates to ~1e-4. */
export const IRREGULAR_PERIOD = 0.01;

export function toneOf(x: ArrayLike<number>, sampleRateHz: number): Tone {
  if (!(sampleRateHz > 0)) throw new RangeError(`sampleRateHz=${sampleRateHz} must be > 0`);
  const n = x.length;
  if (n < 4) throw new RangeError(`the recording has ${n} samples; a tone needs more`);
  let mean = 0;
  for (let i = 0; i < n; i++) mean += x[i]!;
  mean /= n;
  let sq = 0;
  let peak = 0;
  let last = -1;
  const periods: number[] = [];
  for (let i = 0; i < n; i++) {
    const v = x[i]! - mean;
    sq += v * v;
    if (Math.abs(v) > peak) peak = Math.abs(v);
    if (i > 0) {
      const p = x[i - 1]! - mean;
      if (p < 0 && v >= 0) {
        const t = i - 1 + p / (p - v);
        if (last >= 0) periods.push(t - last);
        last = t;
      }
    }
  }
  if (periods.length < 1) throw new RangeError('the recording holds no tone (fewer than two zero crossings): is the calibrator running?');
  const sorted = [...periods].sort((a, b) => a - b);
  const mid = sorted.length >> 1;
  const median = sorted.length % 2 ? sorted[mid]! : (sorted[mid - 1]! + sorted[mid]!) / 2;
  const irregularCycles = periods.filter((p) => Math.abs(p / median - 1) > IRREGULAR_PERIOD).length;
  return { rms: Math.sqrt(sq / n), frequencyHz: sampleRateHz / median, peak, irregularCycles };
}
