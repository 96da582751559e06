// The limits of the per-hit checks (docs/methods.md#hit-checks): their types, common-practice defaults
// and the validation that turns a partial set into a full one.
import { checkInteger } from './validate.ts';
import { checkExponentialWindowOptions } from './windows.ts';
import type { ExponentialWindowOptions } from './types.ts';

export type HitReasonCode = 'double-hit' | 'overload' | 'weak' | 'roll-off' | 'response-overload' | 'not-decayed';

export interface HitReason {
  code: HitReasonCode;
  /** Plain-words explanation with numbers and units, for the engineer at the structure. */
  message: string;
}

export interface HitLimits {
  /** Full-scale range of the force channel, ± N; null when unknown (then only the flat-top clipping test runs). */
  forceRangeN: number | null;
  /** Full-scale range of each response channel in its own unit: one number for all, one per channel, or null. */
  responseRange: number | readonly number[] | null;
  /** A sample at or above this fraction of the range counts as overload. Common practice: 0.99 (docs/methods.md#overload). */
  overloadFraction: number;
  /** This many equal samples in a row at the record's largest magnitude count as clipping. Common practice: 3 (docs/methods.md#overload). */
  flatRunLength: number;
  /**
   * A second pulse (or a second local maximum rising at least this fraction of the main peak above the
   * dip before it) marks a double hit. Default 0.04: below 5 %, so a second hit of 5 % of the first is
   * caught; docs/methods.md#double-hit quotes 10–20 % as an example. Common practice.
   */
  doubleHitRatio: number;
  /** Pulse start and end are where the force crosses this fraction of the peak. Common practice: 0.05 (docs/methods.md#double-hit). */
  pulseEdgeFraction: number;
  /**
   * Thresholds are never set below this many times the noise rms (estimated from the samples before the
   * pulse, or the last 10 % of the record). Common practice: 6 (Gaussian false-alarm odds ~2e-9 per sample).
   */
  noiseFactor: number;
  /** Weakest acceptable peak force, N; null = 10 % of forceRangeN (docs/methods.md#weak-hit under-range), skipped when both are null. Common practice. */
  minPeakN: number | null;
  /** Band of interest [lo, hi] in Hz; null = [0, fs/2.56] (analyser convention, docs/methods.md#decay-check). Common practice. */
  bandHz: readonly [number, number] | null;
  /** Reject when the force spectrum falls this many dB below its DC level inside the band. Common practice: 10–20 dB (docs/methods.md#roll-off); default 20. */
  rollOffDb: number;
  /** Fraction of the record, at its end, used for the decay check. Common practice: 0.05 (docs/methods.md#decay-check). */
  tailFraction: number;
  /** Reject when the response rms in the tail exceeds this fraction of its peak. Common practice: 0.01 after the exponential window (docs/methods.md#decay-check). */
  notDecayedRatio: number;
  /** Exponential window applied to the responses before the decay check (as it will be in the FRF), or null. */
  exponentialWindow: ExponentialWindowOptions | null;
  /**
   * Samples recorded before the trigger, round(preTriggerS·fs), or null. When there are 16 or more,
   * the force offset is their mean (`channelOffset`, the offset `removeOffsets` subtracts before the
   * FRF) and the noise rms is taken over them; otherwise both come from the samples before the pulse.
   */
  preTriggerSamples: number | null;
}

/** Default limits; each one is common practice (docs/methods.md#hit-checks), not a standard. */
export const defaultHitLimits: Readonly<HitLimits> = Object.freeze({
  forceRangeN: null,
  responseRange: null,
  overloadFraction: 0.99,
  flatRunLength: 3,
  doubleHitRatio: 0.04,
  pulseEdgeFraction: 0.05,
  noiseFactor: 6,
  minPeakN: null,
  bandHz: null,
  rollOffDb: 20,
  tailFraction: 0.05,
  notDecayedRatio: 0.01,
  exponentialWindow: null,
  preTriggerSamples: null,
});

/** `limits` over `defaultHitLimits`, each value checked (RangeError naming the bad value); `channels` is the response count. */
export function resolveHitLimits(limits: Partial<HitLimits> | undefined, channels: number): HitLimits {
  const l: HitLimits = { ...defaultHitLimits, ...(limits ?? {}) };
  const frac = (v: number, name: string, lo: number, hi: number) => {
    if (typeof v !== 'number' || !(v > lo && v <= hi)) throw new RangeError(`${name}=${String(v)} must be in (${lo}, ${hi}]`);
  };
  if (l.forceRangeN !== null && !(Number.isFinite(l.forceRangeN) && l.forceRangeN > 0)) {
    throw new RangeError(`forceRangeN=${String(l.forceRangeN)} must be > 0 and finite, or null`);
  }
  if (Array.isArray(l.responseRange)) {
    if (l.responseRange.length !== channels) {
      throw new RangeError(`responseRange has ${l.responseRange.length} entries but there are ${channels} response channels`);
    }
    l.responseRange.forEach((r, i) => {
      if (!(Number.isFinite(r) && r > 0)) throw new RangeError(`responseRange[${i}]=${String(r)} must be > 0 and finite`);
    });
  } else if (l.responseRange !== null && !(Number.isFinite(l.responseRange as number) && (l.responseRange as number) > 0)) {
    throw new RangeError(`responseRange=${String(l.responseRange)} must be > 0 and finite, or null`);
  }
  frac(l.overloadFraction, 'overloadFraction', 0, 1);
  checkInteger(l.flatRunLength, 'flatRunLength', 2);
  frac(l.doubleHitRatio, 'doubleHitRatio', 0, 1);
  frac(l.pulseEdgeFraction, 'pulseEdgeFraction', 0, 1);
  frac(l.tailFraction, 'tailFraction', 0, 1);
  if (!(Number.isFinite(l.noiseFactor) && l.noiseFactor >= 0)) throw new RangeError(`noiseFactor=${String(l.noiseFactor)} must be >= 0`);
  if (l.minPeakN !== null && !(Number.isFinite(l.minPeakN) && l.minPeakN >= 0)) {
    throw new RangeError(`minPeakN=${String(l.minPeakN)} must be >= 0 and finite, or null`);
  }
  if (!(Number.isFinite(l.rollOffDb) && l.rollOffDb > 0)) throw new RangeError(`rollOffDb=${String(l.rollOffDb)} must be > 0`);
  if (!(Number.isFinite(l.notDecayedRatio) && l.notDecayedRatio > 0)) {
    throw new RangeError(`notDecayedRatio=${String(l.notDecayedRatio)} must be > 0`);
  }
  if (l.bandHz !== null) {
    const [lo, hi] = l.bandHz;
    if (!(Number.isFinite(lo) && Number.isFinite(hi) && lo >= 0 && hi > lo)) {
      throw new RangeError(`bandHz=[${String(lo)}, ${String(hi)}] must satisfy 0 <= lo < hi`);
    }
  }
  if (l.exponentialWindow !== null) checkExponentialWindowOptions(l.exponentialWindow, 'exponentialWindow');
  if (l.preTriggerSamples !== null) checkInteger(l.preTriggerSamples, 'preTriggerSamples', 0);
  return l;
}
