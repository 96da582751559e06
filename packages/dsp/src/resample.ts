// Rational-ratio resampling by a polyphase windowed-sinc FIR: the method of
// scipy.signal.resample_poly (Kaiser window, β = 5, half-length 10 × max(up, down) input-rate
// samples, cut-off at the lower of the two Nyquist frequencies), written out here so a recording
// made at another rate can join a campaign (docs/decisions/bridge-and-api-tokens.md).
// Method: Crochiere & Rabiner, "Multirate Digital Signal Processing" (1983), ch. 2–3; the Kaiser
// window: Kaiser (1974).

function gcd(a: number, b: number): number {
  while (b) [a, b] = [b, a % b];
  return a;
}

/** Modified Bessel function of the first kind, order 0 (power series; converges for all x). */
function besselI0(x: number): number {
  let sum = 1;
  let term = 1;
  const q = (x / 2) ** 2;
  for (let k = 1; k < 500; k++) {
    term *= q / (k * k);
    sum += term;
    if (term < 1e-17 * sum) break;
  }
  return sum;
}

export interface ResampleRatio {
  /** Interpolation factor L. */
  up: number;
  /** Decimation factor M; output rate = input rate × up / down. */
  down: number;
}

/**
 * The reduced integer ratio that takes `fromHz` to `toHz`. Both rates must be whole numbers of Hz
 * (every audio and acquisition rate in use is), and the reduced factors at most 100 000 so the
 * filter stays a practical size.
 */
export function resampleRatio(fromHz: number, toHz: number): ResampleRatio {
  if (!(fromHz > 0) || !Number.isInteger(fromHz)) throw new RangeError(`fromHz=${fromHz} must be a positive whole number of Hz`);
  if (!(toHz > 0) || !Number.isInteger(toHz)) throw new RangeError(`toHz=${toHz} must be a positive whole number of Hz`);
  const g = gcd(fromHz, toHz);
  const ratio = { up: toHz / g, down: fromHz / g };
  if (Math.max(ratio.up, ratio.down) > 100_000) throw new RangeError(`the ratio ${toHz}/${fromHz} reduces to ${ratio.up}/${ratio.down}: too large a filter (factors must be ≤ 100 000)`);
  return ratio;
}

/**
 * The anti-aliasing low-pass FIR of resample_poly: 2·half + 1 taps of a Kaiser-windowed
 * (β = 5) sinc with cut-off 1/max(up, down) of the upsampled Nyquist, normalised to unit DC gain
 * and multiplied by `up` (the gain lost by zero-stuffing). Same as
 * `scipy.signal.firwin(2*half+1, 1/max(up,down), window=('kaiser', 5.0)) * up`.
 */
export function resampleFilter(up: number, down: number): Float64Array {
  const maxRate = Math.max(up, down);
  const fc = 1 / maxRate;
  const half = 10 * maxRate;
  const taps = 2 * half + 1;
  const h = new Float64Array(taps);
  const beta = 5;
  const i0b = besselI0(beta);
  let sum = 0;
  for (let m = 0; m < taps; m++) {
    const t = m - half;
    const arg = Math.PI * fc * t;
    const sinc = t === 0 ? 1 : Math.sin(arg) / arg;
    const r = (2 * m) / (taps - 1) - 1;
    const w = besselI0(beta * Math.sqrt(Math.max(0, 1 - r * r))) / i0b;
    h[m] = fc * sinc * w;
    sum += h[m]!;
  }
  for (let m = 0; m < taps; m++) h[m] = (h[m]! / sum) * up;
  return h;
}

/**
 * Resamples one channel by up/down (output rate = input rate × up / down) exactly as
 * `scipy.signal.resample_poly(x, up, down)` does with its defaults (zero padding outside the
 * record): ceil(n·up/down) output samples, the first aligned with the first input sample, no
 * delay. Units in = units out. Pass every channel of a recording through the same call so they
 * keep their relative timing and gain (an FRF is a ratio of channels).
 */
export function resamplePoly(x: ArrayLike<number>, up: number, down: number): Float64Array {
  if (!Number.isInteger(up) || up < 1) throw new RangeError(`up=${up} must be a whole number ≥ 1`);
  if (!Number.isInteger(down) || down < 1) throw new RangeError(`down=${down} must be a whole number ≥ 1`);
  const nIn = x.length;
  if (nIn === 0) throw new RangeError('x is empty');
  const g = gcd(up, down);
  up /= g;
  down /= g;
  if (up === 1 && down === 1) return Float64Array.from(x);
  const nOut = Math.ceil((nIn * up) / down);
  const hp = paddedFilter(up, down);
  const lenH = hp.length;
  const half = (lenH - hp.prePad - 1) / 2;
  const preRemove = Math.floor((half + hp.prePad) / down);
  // A typed copy of the input, so the inner loop reads one kind of array (no copy when it already is one).
  const xs = x instanceof Float64Array ? x : Float64Array.from(x);
  const out = new Float64Array(nOut);
  // y[k] = Σ_j x[j] · h[k·down − j·up] over 0 ≤ k·down − j·up < lenH (upfirdn).
  for (let k = 0; k < nOut; k++) {
    const m = (k + preRemove) * down;
    const jHi = Math.min(nIn - 1, Math.floor(m / up));
    const jLo = Math.max(0, Math.ceil((m - lenH + 1) / up));
    let acc = 0;
    for (let j = jLo, t = m - jLo * up; j <= jHi; j++, t -= up) acc += xs[j]! * hp[t]!;
    out[k] = acc;
  }
  return out;
}

/** resampleFilter(up, down) behind `prePad` zeros (output sample 0 at the filter's centre, as resample_poly does), made once per ratio. */
const paddedFilters = new Map<string, Float64Array & { prePad: number }>();
function paddedFilter(up: number, down: number): Float64Array & { prePad: number } {
  const key = `${up}/${down}`;
  let hp = paddedFilters.get(key);
  if (!hp) {
    const core = resampleFilter(up, down);
    const half = (core.length - 1) / 2;
    const prePad = down - (half % down);
    hp = Object.assign(new Float64Array(core.length + prePad), { prePad });
    hp.set(core, prePad);
    if (paddedFilters.size >= 16) paddedFilters.delete(paddedFilters.keys().next().value!);
    paddedFilters.set(key, hp);
  }
  return hp;
}
