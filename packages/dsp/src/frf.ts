import { SpectralAverager, coherenceFromSums, frequencyAxis, oneSided, pooledAverager } from './spectral-engine.ts';
import type { Complex, ExponentialWindowOptions, ForceWindowOptions } from './types.ts';
import { removeOffsets } from './offsets.ts';
import { checkFs, checkSameLength, checkSamples } from './validate.ts';
import { exponentialWindow, forceWindow } from './windows.ts';

/** One impact record: the force channel (N) and one or more response channels, equal lengths. */
export interface Hit {
  force: ArrayLike<number>;
  responses: readonly ArrayLike<number>[];
}

export interface AverageFrfOptions {
  /** Force window settings (applied to the force only), or null for none. */
  forceWindow: ForceWindowOptions | null;
  /** Exponential window settings (applied to force AND responses), or null for none. */
  exponentialWindow: ExponentialWindowOptions | null;
  /** Also compute the Hv (total least squares) estimator. Default false. */
  hv?: boolean;
  /**
   * Remove each channel's offset first: the mean of its first preTriggerSamples samples (`removeOffsets`,
   * docs/methods.md#frf-averaging). Omit when the records are already offset-free.
   */
  offsets?: { preTriggerSamples: number };
}

export interface AveragedFrf {
  /** Frequency lines k·fs/N (Hz), k = 0 … ⌊N/2⌋. */
  f: Float64Array;
  /** H1 = G_fx/G_ff per response channel, in [response]/N (e.g. (m/s²)/N for accelerance). */
  h1: Complex[];
  /** H2 = G_xx/G_xf per response channel, same unit. */
  h2: Complex[];
  /** Hv (total least squares) per response channel, only when requested. */
  hv?: Complex[];
  /** Ordinary coherence γ² per response channel, 0 … 1. */
  coherence: Float64Array[];
  /** Averaged single-sided force ESD per hit, (2/n_d)·Σ|F_i|² (DC/Nyquist not doubled), N²·s/Hz. */
  gff: Float64Array;
  /** Averaged single-sided response ESD per hit for each channel, [response]²·s/Hz. */
  gxx: Float64Array[];
  /** Averaged single-sided cross ESD per hit (2/n_d)·Σ conj(F_i)·X_i, [response]·N·s/Hz. */
  gfx: Complex[];
  /** Number of hits averaged (n_d). */
  averages: number;
}

/**
 * Averages impact hits into FRF estimates, one per response channel (docs/methods.md#frf-averaging).
 *
 * For each hit i the windows are applied (force window on the force only, exponential window on the
 * force and on every response, docs/methods.md#force-window, #exp-window), F_i and X_i are the transient spectra Δt·DFT, and
 *   G_ff = (2/n_d)Σ|F_i|², G_xx = (2/n_d)Σ|X_i|², G_fx = (2/n_d)Σ conj(F_i)·X_i (force conjugated),
 *   H1 = G_fx/G_ff, H2 = G_xx/G_xf with G_xf = conj(G_fx), γ² = |G_fx|²/(G_ff·G_xx),
 *   Hv = [G_xx − G_ff + √((G_xx − G_ff)² + 4|G_fx|²)]/(2·G_xf) (optional; depends on the units of the
 *   channels, which the caller records).
 * Exactly H1/H2 = γ², so |H1| ≤ |H2|; one hit gives γ² ≡ 1. Lines whose denominator is exactly 0
 * (no force or no response energy at all) return 0 for H and γ², never NaN.
 * Inputs: hits with equal-length records (force in N, responses in their unit), fs in Hz.
 * Offsets: with `options.offsets` each channel's pre-trigger mean is subtracted first (`removeOffsets`);
 * without it the records must already be offset-free.
 * Sources: Bendat & Piersol, Random Data (2010); Ewins, Modal Testing (2000) Ch. 3; Vold, Crowley &
 * Rocklin 1984 for Hv. Same sign as numpy.fft (e^{−j2πft}).
 */
export function averageFrf(hits: readonly Hit[], fs: number, options: AverageFrfOptions): AveragedFrf {
  checkFs(fs);
  if (!Array.isArray(hits) || hits.length === 0) throw new RangeError('hits is empty (length 0): at least one hit is needed');
  if (!options || typeof options !== 'object') throw new RangeError(`options=${String(options)} must be an object`);
  const first = hits[0];
  if (!first || !first.force || !first.responses) throw new RangeError('hits[0] must have force and responses');
  const n = first.force.length;
  if (n === 0) throw new RangeError('hits[0].force is empty (length 0)');
  const channels = first.responses.length;
  if (channels === 0) throw new RangeError('hits[0].responses is empty: at least one response channel is needed');
  hits.forEach((h, i) => checkHitShape(h, i, n, channels));

  const { fw, ew } = impactWindows(n, fs, options.forceWindow, options.exponentialWindow);
  const avg = pooledAverager(n, channels);
  hits.forEach((raw, i) => addHit(avg, raw, i, fw, ew, options.offsets?.preTriggerSamples));
  return frfFromSums(avg, fs, options.hv === true);
}

function checkHitShape(h: Hit, i: number, n: number, channels: number): void {
  if (!h || !h.force || !Array.isArray(h.responses)) throw new RangeError(`hits[${i}] must have force and responses`);
  checkSameLength(n, h.force.length, 'hits[0].force', `hits[${i}].force`);
  if (h.responses.length !== channels) {
    throw new RangeError(`hits[${i}] has ${h.responses.length} response channels but hits[0] has ${channels}`);
  }
  h.responses.forEach((r: ArrayLike<number>, c: number) => checkSameLength(n, r?.length ?? 0, `hits[${i}].force`, `hits[${i}].responses[${c}]`));
}

function addHit(avg: SpectralAverager, raw: Hit, i: number, fw: Float64Array | null, ew: Float64Array | null, pre: number | undefined): void {
  let h: Hit = raw;
  if (pre !== undefined) {
    const [force, ...responses] = removeOffsets([raw.force, ...raw.responses], pre);
    h = { force: force!, responses };
  }
  avg.add(h.force, h.responses, 0, fw, ew, {
    ref: `hits[${i}].force`,
    other: (c) => `hits[${i}].responses[${c}]`,
  });
}

/**
 * averageFrf one hit at a time: the raw sums of the hits added so far are kept, so a new hit costs
 * one record's transforms instead of all of them again. Adding the same hits in the same order
 * gives bit-for-bit the result of averageFrf (the same sums, accumulated in the same order).
 * Records must be n samples of `channels` response channels each.
 */
export class FrfAccumulator {
  private readonly avg: SpectralAverager;
  private readonly fw: Float64Array | null;
  private readonly ew: Float64Array | null;

  constructor(
    readonly n: number,
    readonly channels: number,
    readonly fs: number,
    readonly options: AverageFrfOptions,
    from?: SpectralAverager,
  ) {
    checkFs(fs);
    if (!Number.isInteger(n) || n < 1) throw new RangeError(`n=${n} must be a positive integer`);
    if (!Number.isInteger(channels) || channels < 1) throw new RangeError(`channels=${channels} must be a positive integer`);
    if (!options || typeof options !== 'object') throw new RangeError(`options=${String(options)} must be an object`);
    ({ fw: this.fw, ew: this.ew } = impactWindows(n, fs, options.forceWindow, options.exponentialWindow));
    this.avg = from ?? new SpectralAverager(n, channels);
  }

  /** Hits added so far. */
  get count(): number {
    return this.avg.count;
  }

  /** Adds one hit (validated as averageFrf validates hits[count]). */
  add(hit: Hit): void {
    const i = this.avg.count;
    checkHitShape(hit, i, this.n, this.channels);
    addHit(this.avg, hit, i, this.fw, this.ew, this.options.offsets?.preTriggerSamples);
  }

  /** A copy that goes on independently of this one. */
  copy(): FrfAccumulator {
    return new FrfAccumulator(this.n, this.channels, this.fs, this.options, this.avg.copy());
  }

  /** The averaged FRF of the hits added so far (at least one). */
  result(): AveragedFrf {
    if (this.avg.count === 0) throw new RangeError('hits is empty (length 0): at least one hit is needed');
    return frfFromSums(this.avg, this.fs, this.options.hv === true);
  }
}

const windowCache = new Map<string, { fw: Float64Array | null; ew: Float64Array | null }>();

/** Force-channel window (force × exponential) and response window (exponential), memoised per settings. */
function impactWindows(
  n: number,
  fs: number,
  fOpt: ForceWindowOptions | null,
  eOpt: ExponentialWindowOptions | null,
): { fw: Float64Array | null; ew: Float64Array | null } {
  const key = JSON.stringify([n, fs, fOpt && [fOpt.startS, fOpt.lengthS, fOpt.taperS], eOpt && [eOpt.startS, eOpt.tauS]]);
  let w = windowCache.get(key);
  if (!w) {
    const ew = eOpt ? exponentialWindow(n, fs, eOpt) : null;
    let fw = fOpt ? forceWindow(n, fs, fOpt) : null;
    if (fw && ew) for (let i = 0; i < n; i++) fw[i] *= ew[i];
    else if (ew) fw = ew;
    w = { fw, ew };
    if (windowCache.size >= 16) windowCache.clear();
    windowCache.set(key, w);
  }
  return w;
}

/** The estimator layer: H1, H2, Hv, γ² and the ESD-per-hit spectra from the engine's raw sums. */
function frfFromSums(avg: SpectralAverager, fs: number, withHv: boolean): AveragedFrf {
  const bins = avg.bins;
  const n = avg.n;
  const dt = 1 / fs;
  const esdScale = (dt * dt) / avg.count;
  const h1: Complex[] = [];
  const h2: Complex[] = [];
  const hv: Complex[] = [];
  const gfx: Complex[] = [];
  const gxx: Float64Array[] = [];
  const coherence: Float64Array[] = [];
  const ffs = avg.refAuto;
  for (let c = 0; c < avg.channels; c++) {
    const crs = avg.crossRe[c];
    const cis = avg.crossIm[c];
    const xxs = avg.auto[c];
    const h1r = new Float64Array(bins);
    const h1i = new Float64Array(bins);
    const h2r = new Float64Array(bins);
    const h2i = new Float64Array(bins);
    const hvr = withHv ? new Float64Array(bins) : null;
    const hvi = withHv ? new Float64Array(bins) : null;
    for (let k = 0; k < bins; k++) {
      const ff = ffs[k];
      const xx = xxs[k];
      const cr = crs[k];
      const ci = cis[k];
      const p = cr * cr + ci * ci; // |G_fx|²
      // H1 = G_fx / G_ff (G_ff real); 0 where no force energy
      const inv = ff > 0 ? 1 / ff : 0;
      h1r[k] = cr * inv;
      h1i[k] = ci * inv;
      // H2 = G_xx / conj(G_fx) = G_xx·G_fx / |G_fx|²
      const q = p > 0 ? xx / p : 0;
      h2r[k] = q * cr;
      h2i[k] = q * ci;
      if (hvr && hvi) {
        // Hv = [G_xx − G_ff + √((G_xx − G_ff)² + 4|G_fx|²)] / (2·conj(G_fx))
        const d = xx - ff;
        const r = p > 0 ? (d + Math.sqrt(d * d + 4 * p)) / (2 * p) : 0;
        hvr[k] = r * cr;
        hvi[k] = r * ci;
      }
    }
    h1.push({ re: h1r, im: h1i });
    h2.push({ re: h2r, im: h2i });
    if (hvr && hvi) hv.push({ re: hvr, im: hvi });
    // γ² = |G_fx|²/(G_ff·G_xx) and the one-sided ESD-per-hit fold: the engine's own (spectral-engine.ts)
    coherence.push(coherenceFromSums(avg, c));
    gxx.push(oneSided(xxs, n, esdScale));
    gfx.push({ re: oneSided(crs, n, esdScale), im: oneSided(cis, n, esdScale) });
  }
  const result: AveragedFrf = {
    f: frequencyAxis(n, fs, bins),
    h1,
    h2,
    coherence,
    gff: oneSided(ffs, n, esdScale),
    gxx,
    gfx,
    averages: avg.count,
  };
  if (withHv) result.hv = hv;
  return result;
}

export type FrfKind = 'receptance' | 'mobility' | 'accelerance';

const ORDER: Record<FrfKind, number> = { receptance: 0, mobility: 1, accelerance: 2 };

/**
 * Converts an FRF between receptance (m/N), mobility ((m/s)/N) and accelerance ((m/s²)/N) by
 * multiplying by jω once per step up (receptance → mobility → accelerance) or dividing by jω once per
 * step down, ω = 2πf (docs/methods.md#frf-kinds: Y = jω·α, A = −ω²·α; time dependence e^{+jωt}).
 *
 * In: h (complex, per line), f (Hz, same length). Out: a new complex array.
 * At f = 0 a division has no finite value (a free structure's receptance is unbounded there): that
 * line is set to 0 (never NaN or Infinity); a multiplication gives 0 at f = 0 naturally.
 */
export function convertFrf(h: Complex, f: ArrayLike<number>, from: FrfKind, to: FrfKind): Complex {
  if (!(from in ORDER)) throw new RangeError(`from=${String(from)} must be 'receptance', 'mobility' or 'accelerance'`);
  if (!(to in ORDER)) throw new RangeError(`to=${String(to)} must be 'receptance', 'mobility' or 'accelerance'`);
  if (!h || !h.re || !h.im) throw new RangeError('h must have re and im arrays');
  const n = checkSamples(h.re, 'h.re');
  checkSameLength(n, checkSamples(h.im, 'h.im'), 'h.re', 'h.im');
  checkSameLength(n, checkSamples(f, 'f'), 'h.re', 'f');
  const steps = ORDER[to] - ORDER[from];
  const re = new Float64Array(n);
  const im = new Float64Array(n);
  for (let k = 0; k < n; k++) {
    const w = 2 * Math.PI * f[k];
    let r = h.re[k];
    let i = h.im[k];
    if (steps > 0) {
      for (let s = 0; s < steps; s++) {
        // (r + ji)·jω = −ωi + jωr
        const t = -w * i;
        i = w * r;
        r = t;
      }
    } else if (steps < 0) {
      if (w === 0) {
        r = 0;
        i = 0;
      } else {
        for (let s = 0; s < -steps; s++) {
          // (r + ji)/(jω) = i/ω − j·r/ω
          const t = i / w;
          i = -r / w;
          r = t;
        }
      }
    }
    re[k] = r;
    im[k] = i;
  }
  return { re, im };
}
