import { SpectralAverager, coherenceFromSums, frequencyAxis, oneSided } from './spectral-engine.ts';
import type { WindowName } from './types.ts';
import { checkFs, checkInteger, checkSameLength, checkSamples } from './validate.ts';
import { analysisWindow } from './windows.ts';

export interface WelchOptions {
  /** Samples per segment (scipy's nperseg). Default min(256, length of x). */
  segmentLength?: number;
  /** Samples shared by consecutive segments (scipy's noverlap). Default ⌊segmentLength/2⌋. */
  overlapSamples?: number;
  /** Periodic window, default 'hann' (scipy 'hann'; 'rectangular' is scipy 'boxcar'). */
  window?: WindowName;
}

interface Prepared {
  nseg: number;
  step: number;
  segments: number;
  window: Float64Array;
  scale: number;
}

function prepare(n: number, fs: number, options: WelchOptions | undefined): Prepared {
  const o = options ?? {};
  const nseg = o.segmentLength ?? Math.min(256, n);
  checkInteger(nseg, 'segmentLength', 1);
  if (nseg > n) throw new RangeError(`segmentLength=${nseg} must not exceed the signal length ${n}`);
  const overlap = o.overlapSamples ?? Math.floor(nseg / 2);
  checkInteger(overlap, 'overlapSamples', 0);
  if (overlap >= nseg) throw new RangeError(`overlapSamples=${overlap} must be less than segmentLength=${nseg}`);
  const window = analysisWindow(o.window ?? 'hann', nseg);
  let s2 = 0;
  for (let i = 0; i < nseg; i++) s2 += window[i] * window[i];
  const step = nseg - overlap;
  return { nseg, step, segments: Math.floor((n - overlap) / step), window, scale: 1 / (fs * s2) };
}

function run(x: ArrayLike<number>, y: ArrayLike<number> | null, p: Prepared): SpectralAverager {
  const avg = new SpectralAverager(p.nseg, y ? 1 : 0);
  const others = y ? [y] : [];
  for (let s = 0; s < p.segments; s++) avg.add(x, others, s * p.step, p.window, p.window);
  return avg;
}

/** The checks every Welch function makes at entry (fs, x, y of x's length unless 'none', options), then the averaging. */
function checkedRun(x: ArrayLike<number>, y: ArrayLike<number> | 'none', fs: number, options: WelchOptions | undefined): { p: Prepared; avg: SpectralAverager } {
  checkFs(fs);
  const n = checkSamples(x, 'x');
  if (y !== 'none') checkSameLength(n, checkSamples(y, 'y'), 'x', 'y');
  const p = prepare(n, fs, options);
  return { p, avg: run(x, y === 'none' ? null : y, p) };
}

/**
 * Power spectral density of a random signal by Welch's method: segments of `segmentLength`
 * samples, `overlapSamples` apart less than a full step, each multiplied by the window, no
 * detrending, averaged |DFT|² (mean), scaled as a density 1/(fs·Σw²) and folded one-sided (×2 except
 * DC and, even segment length, Nyquist).
 *
 * In: x in [x], fs in Hz. Out: f (Hz), psd in [x]²/Hz, single-sided, and the number of segments.
 * Equals scipy.signal.welch(x, fs, window, nperseg, noverlap, detrend=False, scaling='density').
 * Source: Welch, IEEE Trans. Audio Electroacoust. AU-15 (1967); Bendat & Piersol 2010.
 */
export function welchPsd(
  x: ArrayLike<number>,
  fs: number,
  options?: WelchOptions,
): { f: Float64Array; psd: Float64Array; segments: number } {
  const { p, avg } = checkedRun(x, 'none', fs, options);
  return { f: frequencyAxis(p.nseg, fs, avg.bins), psd: oneSided(avg.refAuto, p.nseg, p.scale / avg.count), segments: avg.count };
}

/**
 * Cross spectral density by Welch's method, G_xy = E[conj(X)·Y] (x conjugated: the order of
 * scipy.signal.csd(x, y) and of G_fx = E[F*·X], docs/methods.md#conventions), single-sided density as
 * `welchPsd` (the one-sided doubling applied to the complex value, as scipy).
 *
 * In: x in [x], y in [y], equal lengths, fs in Hz. Out: f (Hz), re/im in [x]·[y]/Hz.
 * Equals scipy.signal.csd(x, y, fs, window, nperseg, noverlap, detrend=False).
 */
export function welchCsd(
  x: ArrayLike<number>,
  y: ArrayLike<number>,
  fs: number,
  options?: WelchOptions,
): { f: Float64Array; re: Float64Array; im: Float64Array; segments: number } {
  const { p, avg } = checkedRun(x, y, fs, options);
  const k = p.scale / avg.count;
  return {
    f: frequencyAxis(p.nseg, fs, avg.bins),
    re: oneSided(avg.crossRe[0], p.nseg, k),
    im: oneSided(avg.crossIm[0], p.nseg, k),
    segments: avg.count,
  };
}

/**
 * Magnitude-squared coherence by Welch's method, γ² = |G_xy|²/(G_xx·G_yy), dimensionless in [0, 1].
 * Lines where G_xx·G_yy = 0 (no signal at all) are returned as 0, never NaN.
 * With one segment γ² ≡ 1 (docs/methods.md#h1-h2-coherence). Equals scipy.signal.coherence(x, y, fs, window,
 * nperseg, noverlap, detrend=False). Source: Bendat & Piersol 2010; Carter, Knapp & Nuttall 1973.
 */
export function welchCoherence(
  x: ArrayLike<number>,
  y: ArrayLike<number>,
  fs: number,
  options?: WelchOptions,
): { f: Float64Array; coherence: Float64Array; segments: number } {
  const { p, avg } = checkedRun(x, y, fs, options);
  return { f: frequencyAxis(p.nseg, fs, avg.bins), coherence: coherenceFromSums(avg, 0), segments: avg.count };
}
