// The background-noise check before testing: a few seconds recorded with nobody touching the
// structure, read as a Welch PSD. It tells the engineer the floor each channel will add to every
// hit, how close the force channel's noise comes to the trigger level, and whether a tone (mains
// hum at 50/60 Hz and its harmonics, a running machine) stands out of the floor.
import { median } from './stats.ts';
import { checkFs, checkSamples } from './validate.ts';
import { welchPsd } from './welch.ts';

export interface BackgroundNoiseOptions {
  /** Band of interest in Hz: the RMS is integrated over it and tones are looked for in it. */
  bandHz: readonly [number, number];
  /** Welch segment length in samples; default the largest power of two ≤ min(N, fs) (≈ 1 Hz lines or finer). */
  segmentLength?: number;
  /** Frequencies (Hz) to test for a tone; default 50 and 60 Hz and their harmonics up to 5×. */
  tonesHz?: readonly number[];
  /** A tone is reported when its line stands this many dB above the local floor; default 10 dB. */
  toneThresholdDb?: number;
}

export interface BackgroundNoise {
  /** Frequency axis of the PSD, Hz. */
  f: Float64Array;
  /** Single-sided PSD in [x]²/Hz (Welch, Hann, 50 % overlap, mean removed first). */
  psd: Float64Array;
  segments: number;
  /** Mean removed before anything else (an AC-coupled chain reads 0): its value in [x]. */
  mean: number;
  /** RMS of x − mean over the whole record, [x]. */
  rms: number;
  /** RMS within bandHz: √(Σ psd·Δf over the lines in the band), [x]. */
  rmsInBand: number;
  /** Largest |x − mean|, [x]. */
  peak: number;
  /** Tones found: the tested frequency, the line's frequency and its level above the local floor (dB). */
  tones: { testedHz: number; fHz: number; aboveFloorDb: number }[];
}

/**
 * Background noise of one channel, in its own unit [x] (N for a hammer, m/s² for an accelerometer).
 *
 * In: x, fs in Hz, the band of interest. The mean is removed, then the Welch PSD is taken
 * (`welchPsd`: Hann, 50 % overlap, density scaling as scipy.signal.welch), so Σ psd·Δf over all
 * lines ≈ the variance (Parseval; exact in expectation for white noise), and a sine of amplitude A
 * adds A²/2 to the band's mean square (density scaling keeps a tone's power, Bendat & Piersol 2010).
 * A tone is a PSD line within ±1.5 lines of a tested frequency whose level stands `toneThresholdDb`
 * above the median of the lines from 2 to 10 Hz away on both sides (the local floor); the 10 dB
 * default is Resonote's rule of thumb (common practice: a hum that high is visible in every FRF's
 * coherence), not a standard.
 */
export function backgroundNoise(x: ArrayLike<number>, fs: number, options: BackgroundNoiseOptions): BackgroundNoise {
  checkFs(fs);
  const n = checkSamples(x, 'x', 16);
  if (!options || !Array.isArray(options.bandHz) || options.bandHz.length !== 2) throw new RangeError('options.bandHz must be [low, high] in Hz');
  const [lo, hi] = options.bandHz;
  if (!(Number.isFinite(lo) && Number.isFinite(hi) && lo >= 0 && hi > lo)) throw new RangeError(`bandHz=[${lo}, ${hi}] must satisfy 0 ≤ low < high`);
  let seg = options.segmentLength;
  if (seg === undefined) {
    seg = 1;
    while (seg * 2 <= Math.min(n, fs)) seg *= 2;
  }
  let mean = 0;
  for (let i = 0; i < n; i++) mean += x[i]!;
  mean /= n;
  const centred = new Float64Array(n);
  let ss = 0;
  let peak = 0;
  for (let i = 0; i < n; i++) {
    const v = x[i]! - mean;
    centred[i] = v;
    ss += v * v;
    if (Math.abs(v) > peak) peak = Math.abs(v);
  }
  const { f, psd, segments } = welchPsd(centred, fs, { segmentLength: seg, window: 'hann' });
  const df = fs / seg;
  let band = 0;
  for (let k = 0; k < f.length; k++) if (f[k]! >= lo && f[k]! <= hi) band += psd[k]! * df;

  const threshold = options.toneThresholdDb ?? 10;
  const tested = options.tonesHz ?? [50, 100, 150, 200, 250, 60, 120, 180, 240, 300];
  const tones: BackgroundNoise['tones'] = [];
  for (const t of tested) {
    if (!(t >= lo && t <= hi && t < fs / 2 - 10)) continue;
    // Lines are k·df: the tone's lines lie within ±1.5 lines of t, the floor's 2–10 Hz (at least 3–12 lines) away.
    let best = -1;
    for (let k = Math.max(0, Math.ceil(t / df - 1.5)); k <= Math.min(f.length - 1, Math.floor(t / df + 1.5)); k++) if (best < 0 || psd[k]! > psd[best]!) best = k;
    if (best < 0) continue;
    const near = Math.max(2, 3 * df);
    const far = Math.max(10, 12 * df);
    const floorLines: number[] = [];
    for (let k = Math.max(0, Math.ceil((t - far) / df)); k <= Math.min(f.length - 1, Math.floor((t + far) / df)); k++) if (Math.abs(f[k]! - t) >= near) floorLines.push(psd[k]!);
    const floor = median(floorLines);
    if (!(floor > 0)) continue;
    const above = 10 * Math.log10(psd[best]! / floor);
    if (above >= threshold) tones.push({ testedHz: t, fHz: f[best]!, aboveFloorDb: above });
  }
  return { f, psd, segments, mean, rms: Math.sqrt(ss / n), rmsInBand: Math.sqrt(band), peak, tones };
}
