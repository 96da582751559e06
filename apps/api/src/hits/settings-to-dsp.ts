// The one adapter from the campaign's acquisition settings to the dsp window options. Every path that
// windows hits (verdicts, entry FRFs, the linearity check, the hit plot, modal damping correction, the
// hand-over report) takes its windows from here, so they cannot drift apart.
import { defaultHitLimits, tauFromEndLevel, type ExponentialWindowOptions, type ForceWindowOptions, type HitLimits } from '@resonote/dsp';
import type { AcquisitionSettings } from '@resonote/contracts';

/** Force window on the force channel: unity from the record start (pre-trigger included), then the taper (docs/methods.md#force-window). */
export function forceWindowOf(s: AcquisitionSettings): ForceWindowOptions {
  return { startS: 0, lengthS: s.forceWindow.lengthS, taperS: s.forceWindow.taperS };
}

/**
 * Exponential window on every channel from the trigger point (docs/methods.md#exp-window), or null; with
 * the level it leaves at the record end (%), e^{−(T − t0)/τ}, for display.
 */
export function exponentialWindowOf(s: AcquisitionSettings): (ExponentialWindowOptions & { endLevelPercent: number }) | null {
  const w = s.exponentialWindow;
  if (w.mode === 'none') return null;
  const startS = s.preTriggerS;
  const tauS = w.mode === 'tau' ? w.tauS : tauFromEndLevel(s.recordLengthS, startS, w.endLevelPercent / 100);
  return { startS, tauS, endLevelPercent: 100 * Math.exp(-(s.recordLengthS - startS) / tauS) };
}

/** The exponential window as dsp takes it ({ startS, tauS } only), or null. */
export function dspExponentialWindowOf(s: AcquisitionSettings): ExponentialWindowOptions | null {
  const exp = exponentialWindowOf(s);
  return exp ? { startS: exp.startS, tauS: exp.tauS } : null;
}

/** Both windows as `averageFrf` takes them (docs/methods.md#force-window, #exp-window). */
export function frfWindowsOf(s: AcquisitionSettings): { forceWindow: ForceWindowOptions; exponentialWindow: ExponentialWindowOptions | null } {
  return { forceWindow: forceWindowOf(s), exponentialWindow: dspExponentialWindowOf(s) };
}

/**
 * The limits of the hit checks (docs/methods.md#hit-checks) from the settings, for records at fs; the
 * rest are dsp's defaults. The pre-trigger makes the check take the force offset the FRF removes.
 */
export function hitLimitsOf(s: AcquisitionSettings, fs = s.sampleRateHz): HitLimits {
  return {
    ...defaultHitLimits,
    forceRangeN: s.forceRangeN,
    responseRange: s.responseRangeMs2,
    overloadFraction: s.overloadPercent / 100,
    doubleHitRatio: s.doubleHitRatio,
    minPeakN: s.minPeakN,
    bandHz: [s.bandHz.low, s.bandHz.high],
    rollOffDb: s.rollOffDb,
    exponentialWindow: dspExponentialWindowOf(s),
    preTriggerSamples: Math.round(s.preTriggerS * fs),
  };
}
