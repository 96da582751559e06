import { requireInteger } from './validate.ts';

/**
 * Anti-alias (decimation) filter of the simulated front end.
 *
 * A real acquisition front end never samples the analogue signal directly: a sigma-delta
 * converter oversamples it and a sharp linear-phase digital filter removes everything above the
 * output Nyquist frequency before decimating. Without that, the part of a hammer pulse's spectrum
 * above fs/2 folds back into the band and biases H1 wherever the accelerance at the folded
 * frequency differs from the in-band one. The simulator copies the real arrangement: the exact
 * signals are computed at R·fs, filtered with the FIR below and kept every R-th sample. The same
 * filter is applied to force and responses, so its passband ripple cancels in any FRF.
 *
 * FIR: windowed sinc, cut-off at the output Nyquist frequency fs/2, Kaiser window (Kaiser &
 * Schafer 1980; β and length from Kaiser's design formulas, as in Oppenheim & Schafer,
 * *Discrete-Time Signal Processing*, §7.5): transition band 0.4·fs … 0.6·fs, 100 dB stop-band
 * attenuation, taps normalised to unit DC gain. The taps are symmetric and the output is taken
 * at the centre tap, so the filter adds no delay (its ringing shows symmetrically, a few samples
 * before and after the pulse — the reason for a pre-trigger, docs/methods.md#trigger).
 */
export function decimationFilter(oversample: number): Float64Array {
  requireInteger('oversample', oversample, 2, 64);
  const attenuationDb = 100;
  const beta = 0.1102 * (attenuationDb - 8.7); // Kaiser's formula for A > 50 dB
  const transition = (2 * Math.PI * 0.2) / oversample; // rad/sample at the high rate
  let length = Math.ceil((attenuationDb - 8) / (2.285 * transition)) + 1;
  if (length % 2 === 0) length++;
  const centre = (length - 1) / 2;
  const cutoff = 0.5 / oversample; // cycles/sample at the high rate
  const taps = new Float64Array(length);
  const i0Beta = besselI0(beta);
  let sum = 0;
  for (let k = 0; k < length; k++) {
    const m = k - centre;
    const sinc = m === 0 ? 2 * cutoff : Math.sin(2 * Math.PI * cutoff * m) / (Math.PI * m);
    const r = m / centre;
    const window = besselI0(beta * Math.sqrt(Math.max(0, 1 - r * r))) / i0Beta;
    taps[k] = sinc * window;
    sum += taps[k];
  }
  for (let k = 0; k < length; k++) taps[k] /= sum;
  return taps;
}

/** Modified Bessel function I₀ by its power series (converges for all x; ample for β ≤ 20). */
function besselI0(x: number): number {
  let term = 1;
  let sum = 1;
  const q = (x * x) / 4;
  for (let k = 1; k < 200; k++) {
    term *= q / (k * k);
    sum += term;
    if (term < 1e-17 * sum) break;
  }
  return sum;
}

/**
 * y[n] = Σ_k taps[k]·x[n·R + k], n = 0…out.length−1: the filtered, decimated signal, where the
 * high-rate input x has (taps.length − 1)/2 extra samples before and after the output span.
 */
export function filterDecimate(x: Float64Array, taps: Float64Array, oversample: number, out: Float64Array): void {
  const L = taps.length;
  for (let n = 0; n < out.length; n++) {
    const start = n * oversample;
    let acc = 0;
    for (let k = 0; k < L; k++) acc += taps[k] * x[start + k];
    out[n] = acc;
  }
}
