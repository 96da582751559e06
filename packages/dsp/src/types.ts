/** A complex spectrum held as two parallel arrays (real and imaginary parts), one value per frequency line. */
export interface Complex {
  re: Float64Array;
  im: Float64Array;
}

/** Window names accepted by the periodic-signal and random-signal spectra (periodic definitions, as scipy.signal.get_window). */
export type WindowName = 'hann' | 'rectangular' | 'flattop';

/** Amplitude convention of a linear spectrum or an autopower spectrum. */
export type SpectrumScaling = 'rms' | 'peak';

/** Settings of the force window (see `forceWindow`). All times in s. */
export interface ForceWindowOptions {
  /** Time (s, from the record start) where the unity part's length is counted from; usually the trigger time. */
  startS: number;
  /** Length (s) of the unity part counted from `startS`. */
  lengthS: number;
  /** Length (s) of the half-cosine taper from 1 down to 0 after the unity part. */
  taperS: number;
}

/** Settings of the exponential window (see `exponentialWindow`). All times in s. */
export interface ExponentialWindowOptions {
  /** Window origin t0 (s, from the record start); the window is 1 before it. */
  startS: number;
  /** Time constant τ (s) of the decay e^{-(t-t0)/τ}. */
  tauS: number;
}
