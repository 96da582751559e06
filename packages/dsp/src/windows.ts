import type { ExponentialWindowOptions, ForceWindowOptions, WindowName } from './types.ts';
import { checkFinite, checkFs, checkInteger, checkNonNegative, checkPositive } from './validate.ts';

// Flat-top coefficients as in scipy.signal.windows.flattop (D'Antona & Ferrero, "Digital Signal
// Processing for Measurement Systems", Springer 2006, p. 70).
const FLATTOP = [0.21557895, 0.41663158, 0.277263158, 0.083578947, 0.006947368];

/**
 * Periodic ("DFT-even") analysis window of length n, for spectra of periodic or random signals.
 *
 * - `'hann'`: w[i] = 0.5 − 0.5·cos(2πi/n)
 * - `'rectangular'`: w[i] = 1 (scipy's 'boxcar')
 * - `'flattop'`: w[i] = Σ_k (−1)^k a_k cos(2πki/n) with scipy's five coefficients
 *
 * Same values as `scipy.signal.get_window(name, n)` (fftbins=True). Dimensionless.
 * Source: Harris, "On the use of windows for harmonic analysis with the DFT", Proc. IEEE 66(1), 1978.
 */
export function analysisWindow(name: WindowName, n: number): Float64Array {
  checkInteger(n, 'n', 1);
  const w = new Float64Array(n);
  if (n === 1 && (name === 'hann' || name === 'flattop')) {
    // scipy returns [1] for a one-point window of any kind.
    w[0] = 1;
  } else if (name === 'rectangular') {
    w.fill(1);
  } else if (name === 'hann') {
    for (let i = 0; i < n; i++) w[i] = 0.5 - 0.5 * Math.cos((2 * Math.PI * i) / n);
  } else if (name === 'flattop') {
    for (let i = 0; i < n; i++) {
      let s = 0;
      for (let k = 0; k < FLATTOP.length; k++) {
        s += (k % 2 === 0 ? 1 : -1) * FLATTOP[k] * Math.cos((2 * Math.PI * k * i) / n);
      }
      w[i] = s;
    }
  } else {
    throw new RangeError(`window=${String(name)} must be 'hann', 'rectangular' or 'flattop'`);
  }
  return w;
}

export function checkForceWindowOptions(o: ForceWindowOptions, name = 'forceWindow'): void {
  if (!o || typeof o !== 'object') throw new RangeError(`${name}=${String(o)} must be an object`);
  checkNonNegative(o.startS, `${name}.startS`);
  checkNonNegative(o.lengthS, `${name}.lengthS`);
  checkNonNegative(o.taperS, `${name}.taperS`);
}

export function checkExponentialWindowOptions(o: ExponentialWindowOptions, name = 'exponentialWindow'): void {
  if (!o || typeof o !== 'object') throw new RangeError(`${name}=${String(o)} must be an object`);
  checkNonNegative(o.startS, `${name}.startS`);
  checkPositive(o.tauS, `${name}.tauS`);
}

/**
 * Force (transient) window for the force channel of an impact record, n samples at fs (Hz).
 *
 * With t_i = i/fs (s, from the record start) and t_e = startS + lengthS:
 * - w = 1 for t_i ≤ t_e — the unity part runs from sample 0, so the pre-trigger is included;
 *   `startS` only sets where the unity length `lengthS` is counted from (usually the trigger time,
 *   so `lengthS` is "pulse plus margin" after the trigger);
 * - w = ½·(1 + cos(π·(t_i − t_e)/taperS)) for t_e < t_i < t_e + taperS (half-cosine taper);
 * - w = 0 from t_e + taperS to the end of the record (taperS = 0 gives a hard cut).
 *
 * Dimensionless. Source: Fladung, "Windows used for impact testing", IMAC XV (1997), pp. 1662–1666
 * (docs/methods.md#force-window); margin and taper lengths are common practice. Subtract the DC offset
 * (mean of the pre-trigger) before applying it.
 */
export function forceWindow(n: number, fs: number, options: ForceWindowOptions): Float64Array {
  checkInteger(n, 'n', 1);
  checkFs(fs);
  checkForceWindowOptions(options, 'options');
  const w = new Float64Array(n);
  // Work in samples; the 1e-9 slack keeps a sample that sits on t_e (up to rounding of the sum) in the unity part.
  const ie = (options.startS + options.lengthS) * fs;
  const taper = options.taperS * fs;
  for (let i = 0; i < n; i++) {
    if (i <= ie + 1e-9) w[i] = 1;
    else if (i < ie + taper) w[i] = 0.5 * (1 + Math.cos((Math.PI * (i - ie)) / taper));
    else w[i] = 0;
  }
  return w;
}

/**
 * Exponential window, n samples at fs (Hz): w = 1 for t < t0 = startS, w = e^{−(t − t0)/τ} for t ≥ t0,
 * with t = i/fs (s) and τ = tauS (s). Dimensionless.
 *
 * Apply the same window to the force AND the responses: then H_w(s) = H(s + 1/τ), every pole moves
 * left by 1/τ (s⁻¹) and the added damping is removed with `correctExponentialDamping`.
 * Source: Fladung 1997 (docs/methods.md#exp-window).
 */
export function exponentialWindow(n: number, fs: number, options: ExponentialWindowOptions): Float64Array {
  checkInteger(n, 'n', 1);
  checkFs(fs);
  checkExponentialWindowOptions(options, 'options');
  const w = new Float64Array(n);
  const t0 = options.startS;
  const tau = options.tauS;
  for (let i = 0; i < n; i++) {
    const t = i / fs;
    w[i] = t < t0 ? 1 : Math.exp(-(t - t0) / tau);
  }
  return w;
}

/**
 * Time constant τ (s) of an exponential window that starts at `startS` (s) and has decayed to the
 * level p (0 < p < 1, e.g. 0.01 for 1 %) at the end of a record of `recordS` (s):
 * τ = −(T − t0)/ln p. Source: docs/methods.md#exp-window (Fladung 1997 recommends p ≈ 1 %).
 * Check: T = 1 s, t0 = 0, p = 0.01 → τ = 0.21715 s.
 */
export function tauFromEndLevel(recordS: number, startS: number, p: number): number {
  checkPositive(recordS, 'recordS');
  checkNonNegative(startS, 'startS');
  checkFinite(p, 'p');
  if (!(p > 0 && p < 1)) throw new RangeError(`p=${p} must be between 0 and 1 (exclusive)`);
  if (!(recordS > startS)) throw new RangeError(`recordS=${recordS} must be greater than startS=${startS}`);
  return -(recordS - startS) / Math.log(p);
}

/**
 * Removes the damping added by an exponential window (time constant tauS, s) from a pole estimated
 * on windowed data, exactly (docs/methods.md#exp-window):
 * σ_est = ζ_est·ω_n,est, ω_d = ω_n,est·√(1 − ζ_est²) (unchanged by the window),
 * σ_true = σ_est − 1/τ, ω_n,true = √(ω_d² + σ_true²), ζ_true = σ_true/ω_n,true.
 *
 * In: fnHz (Hz) and zeta (ratio of critical, 0.02 for 2 %) as estimated. Out: corrected
 * { fnHz (Hz), zeta (ratio) }. Throws a RangeError when the estimate holds less damping than the
 * window added (σ_true ≤ 0), since no physical pole corresponds to it.
 * Check: 2.000 % at 50 Hz, τ = 0.21715 s → 0.5342 %.
 */
export function correctExponentialDamping(input: { fnHz: number; zeta: number; tauS: number }): {
  fnHz: number;
  zeta: number;
} {
  checkPositive(input.fnHz, 'fnHz');
  checkFinite(input.zeta, 'zeta');
  if (!(input.zeta > 0 && input.zeta < 1)) throw new RangeError(`zeta=${input.zeta} must be between 0 and 1`);
  checkPositive(input.tauS, 'tauS');
  const wn = 2 * Math.PI * input.fnHz;
  const sigmaEst = input.zeta * wn;
  const wd = wn * Math.sqrt(1 - input.zeta * input.zeta);
  const sigma = sigmaEst - 1 / input.tauS;
  if (!(sigma > 0)) {
    throw new RangeError(
      `zeta=${input.zeta} at fnHz=${input.fnHz} is not above the damping the window adds ` +
        `(about ${(1 / (input.tauS * wn)).toPrecision(4)} for tauS=${input.tauS})`,
    );
  }
  const wnTrue = Math.sqrt(wd * wd + sigma * sigma);
  return { fnHz: wnTrue / (2 * Math.PI), zeta: sigma / wnTrue };
}
