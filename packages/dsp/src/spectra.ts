import { realFftPlan } from './fft.ts';
import { SpectralAverager, frequencyAxis, oneSided } from './spectral-engine.ts';
import type { SpectrumScaling, WindowName } from './types.ts';
import { checkFs, checkSamples } from './validate.ts';
import { analysisWindow } from './windows.ts';

function toFloat64(x: ArrayLike<number>): Float64Array {
  return x instanceof Float64Array ? x : Float64Array.from(x);
}

/**
 * Transient (continuous) Fourier spectrum of a sampled transient, X(f_k) ≈ Δt·Σ x_n e^{−j2πkn/N}.
 *
 * In: samples x (any unit [x], e.g. N), fs (Hz). Out: f (Hz), re/im in [x]·s (N·s for force),
 * one-sided lines k = 0 … ⌊N/2⌋, NOT doubled (this is the Fourier transform, not a power
 * quantity), so X(0) = Δt·Σx ≈ ∫x dt (the impulse in N·s for a force).
 * Sign e^{−j2πft}, as numpy.fft. Any N ≥ 1 (Bluestein for non-powers of two).
 * Source: Lalanne, Mechanical Vibration and Shock Analysis Vol. II, Ch. 1 §1.4 (docs/methods.md#transient-spectrum).
 */
export function transientSpectrum(x: ArrayLike<number>, fs: number): { f: Float64Array; re: Float64Array; im: Float64Array } {
  checkFs(fs);
  const n = checkSamples(x, 'x');
  const plan = realFftPlan(n);
  const re = new Float64Array(plan.bins);
  const im = new Float64Array(plan.bins);
  plan.forward(toFloat64(x), re, im);
  const dt = 1 / fs;
  for (let k = 0; k < plan.bins; k++) {
    re[k] *= dt;
    im[k] *= dt;
  }
  return { f: frequencyAxis(n, fs, plan.bins), re, im };
}

/**
 * Single-sided energy spectral density of a transient: G_k = 2·|X_k|² for 0 < f < fs/2, and |X_k|²
 * at DC and (even N) at Nyquist, with X = Δt·DFT as in `transientSpectrum`.
 *
 * In: x in [x], fs in Hz. Out: f (Hz) and esd in [x]²·s/Hz (N²·s/Hz for force), a density per
 * record (energy, not power). Parseval holds exactly: Σ esd·Δf = Σ x²·Δt with Δf = fs/N.
 * Source: Bendat & Piersol, Random Data, 4th ed. (2010), energy spectra of transients
 * (docs/methods.md#esd).
 */
export function energySpectralDensity(x: ArrayLike<number>, fs: number): { f: Float64Array; esd: Float64Array } {
  checkFs(fs);
  const n = checkSamples(x, 'x');
  const avg = new SpectralAverager(n, 0);
  avg.add(x, [], 0, null, null);
  const dt = 1 / fs;
  return { f: frequencyAxis(n, fs, avg.bins), esd: oneSided(avg.refAuto, n, dt * dt) };
}

export interface PeriodicSpectrumOptions {
  /** Analysis window (periodic definition), default 'hann'. */
  window?: WindowName;
  /** Amplitude convention: 'rms' or 'peak' (required: the scaling is never implied). */
  scaling: SpectrumScaling;
}

function periodicSpectrum(x: ArrayLike<number>, fs: number, options: PeriodicSpectrumOptions) {
  checkFs(fs);
  const n = checkSamples(x, 'x');
  if (!options || (options.scaling !== 'rms' && options.scaling !== 'peak')) {
    throw new RangeError(`scaling=${String(options?.scaling)} must be 'rms' or 'peak'`);
  }
  const windowName = options.window ?? 'hann';
  const w = analysisWindow(windowName, n);
  let sumW = 0;
  const xw = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    sumW += w[i];
    xw[i] = x[i] * w[i];
  }
  const plan = realFftPlan(n);
  const re = new Float64Array(plan.bins);
  const im = new Float64Array(plan.bins);
  plan.forward(xw, re, im);
  const last = plan.bins - 1;
  for (let k = 0; k < plan.bins; k++) {
    const edge = k === 0 || (n % 2 === 0 && k === last);
    // Peak: a sine A·cos(2πf_k t + φ) on line k gives |DFT| = A·Σw/2 (coherent gain); rms divides by √2.
    let g = (edge ? 1 : 2) / sumW;
    if (options.scaling === 'rms' && !edge) g /= Math.SQRT2;
    re[k] *= g;
    im[k] *= g;
  }
  return { f: frequencyAxis(n, fs, plan.bins), re, im, window: windowName, scaling: options.scaling };
}

/**
 * Linear (amplitude) spectrum of a periodic signal, one-sided, corrected for the window's coherent
 * gain Σw: |value| = 2|DFT(x·w)|/Σw ('peak') or √2|DFT(x·w)|/Σw ('rms') for 0 < f < fs/2, and
 * |DFT(x·w)|/Σw at DC and (even N) Nyquist for both. A sine of amplitude A on a line reads A
 * ('peak') or A/√2 ('rms'); between lines it reads lower (scalloping), least so with 'flattop'.
 *
 * In: x in [x], fs in Hz. Out: f (Hz), complex re/im and magnitude in [x] (peak or rms, as
 * `scaling` in the result says), `window`, `scaling`. Phase: sign e^{−j2πft} (numpy.fft), referred
 * to the first sample. Not a density. Source: Harris 1978 (Proc. IEEE 66(1)) for windows and
 * coherent gain; Bendat & Piersol 2010 for one-sided spectra.
 */
export function linearSpectrum(
  x: ArrayLike<number>,
  fs: number,
  options: PeriodicSpectrumOptions,
): {
  f: Float64Array;
  re: Float64Array;
  im: Float64Array;
  magnitude: Float64Array;
  window: WindowName;
  scaling: SpectrumScaling;
  unit: string;
} {
  const s = periodicSpectrum(x, fs, options);
  const magnitude = new Float64Array(s.re.length);
  for (let k = 0; k < magnitude.length; k++) magnitude[k] = Math.hypot(s.re[k], s.im[k]);
  return {
    ...s,
    magnitude,
    unit: s.scaling === 'rms' ? '[x] rms per line' : '[x] peak per line',
  };
}

/**
 * Autopower spectrum of a periodic signal, one-sided: the square of `linearSpectrum`'s magnitude.
 * 'rms': mean-square per line, [x]² (a sine of amplitude A on a line gives A²/2; with the
 * rectangular window the lines sum to the mean square of x). 'peak': peak² per line (A²).
 * Not a density (for random signals use `welchPsd`). Source: as `linearSpectrum`.
 */
export function autopowerSpectrum(
  x: ArrayLike<number>,
  fs: number,
  options: PeriodicSpectrumOptions,
): { f: Float64Array; power: Float64Array; window: WindowName; scaling: SpectrumScaling; unit: string } {
  const s = periodicSpectrum(x, fs, options);
  const power = new Float64Array(s.re.length);
  for (let k = 0; k < power.length; k++) power[k] = s.re[k] * s.re[k] + s.im[k] * s.im[k];
  return {
    f: s.f,
    power,
    window: s.window,
    scaling: s.scaling,
    unit: s.scaling === 'rms' ? '[x]² (mean square) per line' : '[x]² (peak squared) per line',
  };
}
