// The one averaging engine behind every averaged spectrum of the package (ESD, PSD, CSD, H1, H2,
// Hv, coherence): window each record, transform it, and accumulate the raw sums
//   Σ|R_i|², Σ|X_c,i|² and Σ conj(R_i)·X_c,i
// over records i, where R is the reference channel (the force, or x of a CSD) and X_c the other
// channels. The public functions only scale these sums (after scipy.signal's _spectral_helper,
// which is written the same way). Conjugation: the reference is conjugated, G_fx = E[F*·X]
// (field-reference §0, §2.1; scipy.signal.csd(x, y) order).
import { realFftPlan, type RealFftPlan } from './fft.ts';
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

  private readonly plan: RealFftPlan;
  private readonly scratch: Float64Array;
  private readonly refRe: Float64Array;
  private readonly refIm: Float64Array;
  private readonly chRe: Float64Array;
  private readonly chIm: Float64Array;

  /** n: record (segment) length in samples; channels: number of channels besides the reference. */
  constructor(n: number, channels: number) {
    this.n = n;
    this.channels = channels;
    this.plan = realFftPlan(n);
    this.bins = this.plan.bins;
    this.scratch = new Float64Array(n);
    this.refRe = new Float64Array(this.bins);
    this.refIm = new Float64Array(this.bins);
    this.chRe = new Float64Array(this.bins);
    this.chIm = new Float64Array(this.bins);
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

  /**
   * Windows samples [offset, offset + n) of `src` into the scratch buffer. Returns a probe that is
   * 0 when every sample was finite (x·0 is NaN for NaN and ±Infinity).
   */
  private load(src: ArrayLike<number>, offset: number, window: Float64Array | null): number {
    const s = this.scratch;
    const n = this.n;
    let probe = 0;
    if (window) {
      for (let i = 0; i < n; i++) {
        const v = src[offset + i];
        probe += v * 0;
        s[i] = v * window[i];
      }
    } else {
      for (let i = 0; i < n; i++) {
        const v = src[offset + i];
        probe += v * 0;
        s[i] = v;
      }
    }
    return probe;
  }

  /**
   * Adds one record. `names` gives the names used in the RangeError if a sample is not finite
   * (the data are checked while they are windowed, so no separate pass over them is needed).
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
    if (this.load(ref, offset, refWindow) !== 0) checkSamples(ref, names.ref);
    this.plan.forward(this.scratch, this.refRe, this.refIm);
    const rr = this.refRe;
    const ri = this.refIm;
    const ra = this.refAuto;
    for (let k = 0; k < bins; k++) ra[k] += rr[k] * rr[k] + ri[k] * ri[k];
    const xr = this.chRe;
    const xi = this.chIm;
    for (let c = 0; c < this.channels; c++) {
      if (this.load(others[c], offset, otherWindow) !== 0) checkSamples(others[c], names.other(c));
      this.plan.forward(this.scratch, xr, xi);
      const au = this.auto[c];
      const cr = this.crossRe[c];
      const ci = this.crossIm[c];
      for (let k = 0; k < bins; k++) {
        const a = xr[k];
        const b = xi[k];
        const p = rr[k];
        const q = ri[k];
        au[k] += a * a + b * b;
        // conj(p + jq)·(a + jb) = (pa + qb) + j(pb − qa)
        cr[k] += p * a + q * b;
        ci[k] += p * b - q * a;
      }
    }
    this.count++;
  }
}

/**
 * Multiplies raw sums by `factor` and doubles every line except DC and, for even n, Nyquist:
 * the one-sided fold of a real signal's two-sided spectrum (field-reference §0).
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
