// The one averaging engine behind every averaged spectrum of the package (ESD, PSD, CSD, H1, H2,
// Hv, coherence): window each record, transform it, and accumulate the raw sums
//   Σ|R_i|², Σ|X_c,i|² and Σ conj(R_i)·X_c,i
// over records i, where R is the reference channel (the force, or x of a CSD) and X_c the other
// channels. The public functions only scale these sums (after scipy.signal's _spectral_helper,
// which is written the same way). Conjugation: the reference is conjugated, G_fx = E[F*·X]
// (docs/methods.md#conventions, #frf-averaging; scipy.signal.csd(x, y) order).
import { planGeneration, realFftPlan, type RealFftPlan } from './fft.ts';
import { checkSamples } from './validate.ts';

export class SpectralAverager {
  readonly n: number;
  readonly bins: number;
  readonly channels: number;
  /** Σ|R|² per bin (raw DFT units², no scaling). */
  readonly refAuto: Float64Array;
  /** Σ|X_c|² per bin for each other channel. */
  readonly auto: Float64Array[];
  /** Σ conj(R)·X_c per bin, real part. */
  readonly crossRe: Float64Array[];
  /** Σ conj(R)·X_c per bin, imaginary part. */
  readonly crossIm: Float64Array[];
  /** Number of records accumulated. */
  count = 0;

  /** The sums copied into a new averager of the same shape (its own buffers). */
  copy(): SpectralAverager {
    const out = new SpectralAverager(this.n, this.channels);
    out.refAuto.set(this.refAuto);
    for (let c = 0; c < this.channels; c++) {
      out.auto[c].set(this.auto[c]);
      out.crossRe[c].set(this.crossRe[c]);
      out.crossIm[c].set(this.crossIm[c]);
    }
    out.count = this.count;
    return out;
  }

  /** Clears the sums so the same buffers serve another average. */
  reset(): void {
    this.refAuto.fill(0);
    for (let c = 0; c < this.channels; c++) {
      this.auto[c].fill(0);
      this.crossRe[c].fill(0);
      this.crossIm[c].fill(0);
    }
    this.count = 0;
  }

  private readonly plan: RealFftPlan;
  private readonly scratch: Float64Array;
  private readonly refRe: Float64Array;
  private readonly refIm: Float64Array;

  /** n: record (segment) length in samples; channels: number of channels besides the reference. */
  constructor(n: number, channels: number) {
    this.n = n;
    this.channels = channels;
    this.plan = realFftPlan(n);
    this.bins = this.plan.bins;
    this.scratch = new Float64Array(n);
    this.refRe = new Float64Array(this.bins);
    this.refIm = new Float64Array(this.bins);
    this.refAuto = new Float64Array(this.bins);
    this.auto = [];
    this.crossRe = [];
    this.crossIm = [];
    for (let c = 0; c < channels; c++) {
      this.auto.push(new Float64Array(this.bins));
      this.crossRe.push(new Float64Array(this.bins));
      this.crossIm.push(new Float64Array(this.bins));
    }
  }

  /** Windows samples [offset, offset + n) of `src` into the scratch buffer. */
  private load(src: ArrayLike<number>, offset: number, window: Float64Array | null): void {
    const s = this.scratch;
    const n = this.n;
    if (window) {
      for (let i = 0; i < n; i++) s[i] = src[offset + i] * window[i];
    } else {
      for (let i = 0; i < n; i++) s[i] = src[offset + i];
    }
  }

  /**
   * A NaN or ±Infinity sample makes the DC line (the sum of all windowed samples) non-finite, so one
   * test per record replaces a test per sample; only then is the record scanned to name the sample.
   */
  private static ensureFinite(dc: number, src: ArrayLike<number>, name: string): void {
    if (Number.isFinite(dc)) return;
    checkSamples(src, name);
    throw new RangeError(`${name} holds values so large that its spectrum overflows`);
  }

  /**
   * Adds one record. `names` gives the names used in the RangeError if a sample is not finite
   * (checked through the transform, so no separate pass over the data is needed).
   */
  add(
    ref: ArrayLike<number>,
    others: readonly ArrayLike<number>[],
    offset: number,
    refWindow: Float64Array | null,
    otherWindow: Float64Array | null,
    names: { ref: string; other: (c: number) => string } = { ref: 'x', other: (c) => `y${c}` },
  ): void {
    const bins = this.bins;
    this.load(ref, offset, refWindow);
    this.plan.forward(this.scratch, this.refRe, this.refIm);
    SpectralAverager.ensureFinite(this.refRe[0], ref, names.ref);
    const rr = this.refRe;
    const ri = this.refIm;
    const ra = this.refAuto;
    for (let k = 0; k < bins; k++) ra[k] += rr[k] * rr[k] + ri[k] * ri[k];
    for (let c = 0; c < this.channels; c++) {
      this.load(others[c], offset, otherWindow);
      // Σ|X_c|² and Σ conj(R)·X_c, summed as the transform is split (nothing stored per record).
      const dc = this.plan.forwardCross(this.scratch, rr, ri, this.auto[c], this.crossRe[c], this.crossIm[c]);
      SpectralAverager.ensureFinite(dc, others[c], names.other(c));
    }
    this.count++;
  }
}

const pool = new Map<string, SpectralAverager>();

/**
 * A cleared averager for records of n samples and `channels` non-reference channels, reused across
 * calls (the package is synchronous, so one per shape is enough): a long campaign of equal-length
 * hits then allocates only its results. The caller must read the sums before the next call.
 */
export function pooledAverager(n: number, channels: number): SpectralAverager {
  // The plan generation is part of the key, so a change of FFT source (fast-fft.ts) is never bypassed.
  const key = `${n}:${channels}:${planGeneration()}`;
  let avg = pool.get(key);
  if (!avg) {
    if (pool.size >= 8) pool.clear();
    avg = new SpectralAverager(n, channels);
    pool.set(key, avg);
  } else {
    avg.reset();
  }
  return avg;
}

/**
 * Multiplies raw sums by `factor` and doubles every line except DC and, for even n, Nyquist:
 * the one-sided fold of a real signal's two-sided spectrum (docs/methods.md#conventions).
 */
export function oneSided(values: Float64Array, n: number, factor: number): Float64Array {
  const out = new Float64Array(values.length);
  const last = values.length - 1;
  for (let k = 0; k < values.length; k++) {
    const edge = k === 0 || (n % 2 === 0 && k === last);
    out[k] = values[k] * factor * (edge ? 1 : 2);
  }
  return out;
}

/** Frequency axis (Hz) of the one-sided lines k·fs/n, k = 0 … bins − 1. */
export function frequencyAxis(n: number, fs: number, bins: number): Float64Array {
  const f = new Float64Array(bins);
  for (let k = 0; k < bins; k++) f[k] = (k * fs) / n;
  return f;
}

/** γ² per line from the engine's raw sums (scalings cancel); 0 where the denominator is 0. */
export function coherenceFromSums(avg: SpectralAverager, c: number): Float64Array {
  const out = new Float64Array(avg.bins);
  const cr = avg.crossRe[c];
  const ci = avg.crossIm[c];
  const gxx = avg.auto[c];
  const gff = avg.refAuto;
  for (let k = 0; k < avg.bins; k++) {
    const den = gff[k] * gxx[k];
    // Clamp: rounding can put |G_fx|² a few ulps above G_ff·G_xx when γ² = 1.
    out[k] = den > 0 ? Math.min(1, (cr[k] * cr[k] + ci[k] * ci[k]) / den) : 0;
  }
  return out;
}
