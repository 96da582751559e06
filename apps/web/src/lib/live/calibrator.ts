// The calibrator check's reading of a recorded tone (docs/methods.md#input-scaling): the RMS
// about the mean and the frequency from the positive-going zero crossings, interpolated linearly
// between samples. A handheld calibrator gives one clean sine, for which both are exact to well
// under 0.1 % over a second or more.

export interface Tone {
  /** RMS about the mean, in the samples' unit. */
  rms: number;
  /** Frequency from the zero crossings, Hz; NaN-free: throws when fewer than two crossings. */
  frequencyHz: number;
  /** Largest |x − mean|, same unit. */
  peak: number;
}

export function toneOf(x: ArrayLike<number>, sampleRateHz: number): Tone {
  if (!(sampleRateHz > 0)) throw new RangeError(`sampleRateHz=${sampleRateHz} must be > 0`);
  const n = x.length;
  if (n < 4) throw new RangeError(`the recording has ${n} samples; a tone needs more`);
  let mean = 0;
  for (let i = 0; i < n; i++) mean += x[i]!;
  mean /= n;
  let sq = 0;
  let peak = 0;
  let first = -1;
  let last = -1;
  let crossings = 0;
  for (let i = 0; i < n; i++) {
    const v = x[i]! - mean;
    sq += v * v;
    if (Math.abs(v) > peak) peak = Math.abs(v);
    if (i > 0) {
      const p = x[i - 1]! - mean;
      if (p < 0 && v >= 0) {
        const t = i - 1 + p / (p - v);
        if (first < 0) first = t;
        last = t;
        crossings += 1;
      }
    }
  }
  if (crossings < 2) throw new RangeError('the recording holds no tone (fewer than two zero crossings): is the calibrator running?');
  return { rms: Math.sqrt(sq / n), frequencyHz: ((crossings - 1) * sampleRateHz) / (last - first), peak };
}
