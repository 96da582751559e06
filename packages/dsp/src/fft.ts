// Real-input FFT plans for any length N >= 1, built on fft.js (radix-4, power-of-two sizes).
//
// - N a power of two (>= 4): the N real samples are read as N/2 complex samples
//   z_n = x_{2n} + j·x_{2n+1}, transformed with one complex FFT of N/2 points and split into the
//   one-sided spectrum (the standard "real FFT via half-length complex FFT", e.g. Press et al.,
//   Numerical Recipes, 2nd ed., §12.3).
// - Any other N: Bluestein's chirp-z algorithm (Bluestein 1970; Rabiner, Schafer & Rader 1969),
//   i.e. a circular convolution of length M = 2^k >= 2N-1 computed with fft.js.
// Plans are cached per N, and each plan owns its work buffers, so a transform allocates nothing.
// Sign convention: X_k = Σ x_n e^{-j2πkn/N}, as numpy.fft.
import FFT from 'fft.js';

export interface RealFftPlan {
  readonly n: number;
  /** Number of one-sided bins, ⌊N/2⌋ + 1. */
  readonly bins: number;
  /**
   * One-sided DFT of `input` (exactly N samples long) into outRe/outIm (first `bins` entries).
   * The input buffer is not modified.
   */
  forward(input: Float64Array, outRe: Float64Array, outIm: Float64Array): void;
  /**
   * Transforms `input` (N samples) to X and adds, per one-sided line k, |X_k|² to auto[k] and
   * conj(R_k)·X_k to crossRe[k] + j·crossIm[k], where R (refRe, refIm) is an earlier spectrum of the
   * same length: the averaging engine's inner step, with X kept in the plan's own buffers (no
   * allocation per record). Returns X_0 (real), so the caller can check it is finite.
   */
  forwardCross: ForwardCross;
}

/** `RealFftPlan.forwardCross`: the input record, the reference spectrum R, and the sums it adds to. */
export type ForwardCross = (
  input: Float64Array,
  refRe: Float64Array,
  refIm: Float64Array,
  auto: Float64Array,
  crossRe: Float64Array,
  crossIm: Float64Array,
) => number;

/** Adds line k of X = a + jb to the sums: |X_k|² to auto[k], conj(R_k)·X_k to crossRe[k] + j·crossIm[k]. */
export function addCrossLine(k: number, a: number, b: number, refRe: Float64Array, refIm: Float64Array, auto: Float64Array, crossRe: Float64Array, crossIm: Float64Array): void {
  const p = refRe[k];
  const q = refIm[k];
  auto[k] += a * a + b * b;
  // conj(p + jq)·(a + jb) = (pa + qb) + j(pb − qa)
  crossRe[k] += p * a + q * b;
  crossIm[k] += p * b - q * a;
}

/** forwardCross for every plan: forward() into buffers the plan owns, then the sums. */
abstract class CrossSums {
  abstract readonly bins: number;
  abstract forward(input: Float64Array, outRe: Float64Array, outIm: Float64Array): void;
  private xr: Float64Array | null = null;
  private xi: Float64Array | null = null;
  forwardCross: ForwardCross = (input, refRe, refIm, auto, crossRe, crossIm) => {
    const bins = this.bins;
    const xr = (this.xr ??= new Float64Array(bins));
    const xi = (this.xi ??= new Float64Array(bins));
    this.forward(input, xr, xi);
    for (let k = 0; k < bins; k++) addCrossLine(k, xr[k], xi[k], refRe, refIm, auto, crossRe, crossIm);
    return xr[0];
  };
}

function isPowerOfTwo(n: number): boolean {
  return n > 0 && (n & (n - 1)) === 0;
}

class TinyPlan extends CrossSums implements RealFftPlan {
  readonly bins: number;
  constructor(readonly n: number) {
    super();
    this.bins = Math.floor(n / 2) + 1;
  }
  forward(input: Float64Array, outRe: Float64Array, outIm: Float64Array): void {
    if (this.n === 1) {
      outRe[0] = input[0];
      outIm[0] = 0;
    } else {
      outRe[0] = input[0] + input[1];
      outIm[0] = 0;
      outRe[1] = input[0] - input[1];
      outIm[1] = 0;
    }
  }
}

class PowerOfTwoPlan extends CrossSums implements RealFftPlan {
  readonly bins: number;
  private readonly half: number;
  private readonly fft: FFT;
  private readonly spec: Float64Array;
  private readonly cosT: Float64Array;
  private readonly sinT: Float64Array;

  constructor(readonly n: number) {
    super();
    this.half = n >>> 1;
    this.bins = this.half + 1;
    this.fft = new FFT(this.half);
    this.spec = new Float64Array(n);
    this.cosT = new Float64Array(this.half + 1);
    this.sinT = new Float64Array(this.half + 1);
    for (let k = 0; k <= this.half; k++) {
      const a = (2 * Math.PI * k) / n;
      this.cosT[k] = Math.cos(a);
      this.sinT[k] = Math.sin(a);
    }
  }

  forward(input: Float64Array, outRe: Float64Array, outIm: Float64Array): void {
    const m = this.half;
    // The real samples, read as interleaved (re, im) pairs, are exactly z_n = x_{2n} + j·x_{2n+1}:
    // no packing copy is needed.
    this.fft.transform(this.spec, input);
    const z = this.spec;
    const cosT = this.cosT;
    const sinT = this.sinT;
    outRe[0] = z[0] + z[1];
    outIm[0] = 0;
    outRe[m] = z[0] - z[1];
    outIm[m] = 0;
    // Lines k and m − k come from the same two values Z_k, Z_{m−k}:
    // E_k = (Z_k + Z*_{m−k})/2, O_k = (Z_k − Z*_{m−k})/(2j), X_k = E_k + W^k·O_k,
    // X_{m−k} = conj(E_k − W^k·O_k), with W = e^{−j2π/N}.
    for (let k = 1; k <= m >> 1; k++) {
      const j = m - k;
      const zr = z[2 * k];
      const zi = z[2 * k + 1];
      const cr = z[2 * j];
      const ci = z[2 * j + 1];
      const er = 0.5 * (zr + cr);
      const ei = 0.5 * (zi - ci);
      const or = 0.5 * (zi + ci);
      const oi = -0.5 * (zr - cr);
      const wr = cosT[k];
      const wi = -sinT[k];
      const tr = wr * or - wi * oi;
      const ti = wr * oi + wi * or;
      outRe[k] = er + tr;
      outIm[k] = ei + ti;
      outRe[j] = er - tr;
      outIm[j] = ti - ei;
    }
  }
}

class BluesteinPlan extends CrossSums implements RealFftPlan {
  readonly bins: number;
  private readonly m: number;
  private readonly fft: FFT;
  private readonly chirpRe: Float64Array;
  private readonly chirpIm: Float64Array;
  private readonly kernel: Float64Array; // FFT of the conjugate chirp, interleaved
  private readonly work: Float64Array;
  private readonly work2: Float64Array;

  constructor(readonly n: number) {
    super();
    this.bins = Math.floor(n / 2) + 1;
    let m = 1;
    while (m < 2 * n - 1) m <<= 1;
    this.m = Math.max(m, 2);
    this.fft = new FFT(this.m);
    this.chirpRe = new Float64Array(n);
    this.chirpIm = new Float64Array(n);
    const twoN = 2 * n;
    for (let i = 0; i < n; i++) {
      // n² mod 2N keeps the angle small, so the chirp stays accurate for long records.
      const r = (i * i) % twoN;
      const a = (Math.PI * r) / n;
      this.chirpRe[i] = Math.cos(a);
      this.chirpIm[i] = -Math.sin(a);
    }
    const b = new Float64Array(2 * this.m);
    b[0] = this.chirpRe[0];
    b[1] = -this.chirpIm[0];
    for (let i = 1; i < n; i++) {
      b[2 * i] = this.chirpRe[i];
      b[2 * i + 1] = -this.chirpIm[i];
      b[2 * (this.m - i)] = this.chirpRe[i];
      b[2 * (this.m - i) + 1] = -this.chirpIm[i];
    }
    this.kernel = new Float64Array(2 * this.m);
    this.fft.transform(this.kernel, b);
    this.work = new Float64Array(2 * this.m);
    this.work2 = new Float64Array(2 * this.m);
  }

  forward(input: Float64Array, outRe: Float64Array, outIm: Float64Array): void {
    const n = this.n;
    const a = this.work;
    a.fill(0);
    for (let i = 0; i < n; i++) {
      a[2 * i] = input[i] * this.chirpRe[i];
      a[2 * i + 1] = input[i] * this.chirpIm[i];
    }
    const spec = this.work2;
    this.fft.transform(spec, a);
    const kern = this.kernel;
    for (let i = 0; i < 2 * this.m; i += 2) {
      const xr = spec[i];
      const xi = spec[i + 1];
      const yr = kern[i];
      const yi = kern[i + 1];
      spec[i] = xr * yr - xi * yi;
      spec[i + 1] = xr * yi + xi * yr;
    }
    this.fft.inverseTransform(a, spec);
    for (let k = 0; k < this.bins; k++) {
      const cr = a[2 * k];
      const ci = a[2 * k + 1];
      outRe[k] = cr * this.chirpRe[k] - ci * this.chirpIm[k];
      outIm[k] = cr * this.chirpIm[k] + ci * this.chirpRe[k];
    }
    outIm[0] = 0;
    if (n % 2 === 0) outIm[this.bins - 1] = 0;
  }
}

const plans = new Map<number, RealFftPlan>();

/**
 * A source of faster plans (e.g. the WebAssembly build of fast-fft.ts on the server: powers of two and
 * other lengths with factors 2, 3, 5). It returns null for a length it does not handle, and fft.js serves that length.
 */
export type FastPlanFactory = (n: number) => RealFftPlan | null;
let fastFactory: FastPlanFactory | null = null;
let fastName = '';
let generation = 0;

/** Increases whenever the plan source changes: holders of cached plans (the averager pool) compare it. */
export function planGeneration(): number {
  return generation;
}

/**
 * Installs (or with null removes) the fast power-of-two plan source and empties the plan cache, so
 * plans made afterwards use it. Objects already holding a plan keep theirs. Default: none (fft.js).
 */
export function setFastPlanFactory(factory: FastPlanFactory | null, name = 'fast'): void {
  fastFactory = factory;
  fastName = factory ? name : '';
  plans.clear();
  generation++;
}

/**
 * Which transform serves power-of-two lengths: 'fft.js-f64' by default, else the installed source's
 * name. Stored results include it in their key, since the two differ at float32 rounding level.
 */
export function fftPathName(): string {
  return fastFactory ? fastName : 'fft.js-f64';
}

/** Returns the cached real-FFT plan for length n (n >= 1). Not thread-safe across workers (each worker has its own cache). */
export function realFftPlan(n: number): RealFftPlan {
  let plan = plans.get(n);
  if (!plan) {
    if (n <= 2) plan = new TinyPlan(n);
    else if (isPowerOfTwo(n)) plan = fastFactory?.(n) ?? new PowerOfTwoPlan(n);
    // Other lengths: the fast source where it takes them (PFFFT: multiples of 32 with factors 2, 3, 5 only, e.g. 48 000), else Bluestein.
    else plan = fastFactory?.(n) ?? new BluesteinPlan(n);
    plans.set(n, plan);
  }
  return plan;
}

/** A new double-precision fft.js plan for length n, whatever fast source is installed: the reference in tests and benches. */
export function referenceRealFftPlan(n: number): RealFftPlan {
  if (n <= 2) return new TinyPlan(n);
  return isPowerOfTwo(n) ? new PowerOfTwoPlan(n) : new BluesteinPlan(n);
}
