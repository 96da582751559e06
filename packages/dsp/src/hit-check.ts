// Per-hit quality checks for impact testing (docs/methods.md#hit-checks). Every threshold is common practice,
// not a standard, and is configurable through `HitLimits`.
import { channelOffset } from './offsets.ts';
import { forcePulseSpectrum, rollOffFrequency, type ForcePulseGate } from './force-spectrum.ts';
import type { ExponentialWindowOptions } from './types.ts';
import { checkFs, checkInteger, checkSameLength, checkSamples } from './validate.ts';
import { checkExponentialWindowOptions, exponentialWindow } from './windows.ts';

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

export interface ResponseCheck {
  /** Largest |sample| of the response, in its unit. */
  peak: number;
  /** Samples at or above overloadFraction × range (0 when the range is unknown). */
  clippedSamples: number;
  /** Longest run of equal samples at the channel's largest magnitude. */
  flatRun: number;
  /** Tail rms ÷ peak (after the exponential window when one is set); 0 for a silent channel. */
  tailRatio: number;
}

export interface HitCheck {
  verdict: 'accept' | 'reject';
  reasons: HitReason[];
  /** Main pulse peak (N, magnitude, offset removed); 0 when no pulse was found. */
  peakForceN: number;
  /** Time of the main peak (s from the record start), or null. */
  peakTimeS: number | null;
  /** DC offset removed from the force (N) and the noise rms around it (N). */
  offsetN: number;
  noiseRmsN: number;
  /** Start of the main pulse (s), where it first rises through pulseEdgeFraction × peak; null when no pulse. */
  pulseStartS: number | null;
  /** Width of the main pulse between its crossings of pulseEdgeFraction × peak (s); null when no pulse. */
  pulseWidthS: number | null;
  /** Δt·Σ(force − offset) = X(0) of the whole record, N·s (signed). */
  impulseNs: number;
  /** First frequency (Hz) where |F(f)|² falls 10 dB / 20 dB below |F(0)|², interpolated; null when it never does. */
  rollOff10dBHz: number | null;
  rollOff20dBHz: number | null;
  /** Largest other pulse ÷ main peak, and its delay after the main peak (s, negative if before), or null. */
  secondPeakRatio: number | null;
  secondPeakDelayS: number | null;
  /** Force samples at or above overloadFraction × range (0 when the range is unknown), and the longest flat run at the extreme. */
  forceClippedSamples: number;
  forceFlatRun: number;
  /** The pulse's gate for its force spectrum (`forcePulseSpectrum`, the one the roll-off is read from); null when no pulse. */
  forceGate: ForcePulseGate | null;
  responses: ResponseCheck[];
}

function fmt(v: number, digits = 3): string {
  if (v === 0) return '0';
  const a = Math.abs(v);
  if (a >= 100) return v.toFixed(0);
  return Number(v.toPrecision(digits)).toString();
}

function pct(ratio: number): string {
  const p = ratio * 100;
  return p >= 10 ? p.toFixed(0) : Number(p.toPrecision(2)).toString();
}

/** Longest run of exactly equal samples whose magnitude equals the record's largest magnitude. */
function flatRunAtExtreme(x: ArrayLike<number>, peak: number): number {
  let best = 0;
  let run = 0;
  for (let i = 0; i < x.length; i++) {
    const v = x[i];
    if (peak > 0 && Math.abs(v) === peak) {
      run = i > 0 && x[i - 1] === v ? run + 1 : 1;
      if (run > best) best = run;
    } else {
      run = 0;
    }
  }
  return best;
}

function maxAbs(x: ArrayLike<number>): number {
  let m = 0;
  for (let i = 0; i < x.length; i++) {
    const a = Math.abs(x[i]);
    if (a > m) m = a;
  }
  return m;
}

function countAtOrAbove(x: ArrayLike<number>, level: number): number {
  let c = 0;
  for (let i = 0; i < x.length; i++) if (Math.abs(x[i]) >= level) c++;
  return c;
}

function meanStd(x: ArrayLike<number>, from: number, to: number): { mean: number; std: number } {
  const m = to - from;
  if (m <= 0) return { mean: 0, std: 0 };
  let s = 0;
  for (let i = from; i < to; i++) s += x[i];
  const mean = s / m;
  let v = 0;
  for (let i = from; i < to; i++) v += (x[i] - mean) * (x[i] - mean);
  return { mean, std: Math.sqrt(v / m) };
}

/** The mean given and the rms spread of x[from, to) around it. */
function spreadAround(x: ArrayLike<number>, from: number, to: number, mean: number): { mean: number; std: number } {
  let v = 0;
  for (let i = from; i < to; i++) v += (x[i] - mean) * (x[i] - mean);
  return { mean, std: to > from ? Math.sqrt(v / (to - from)) : 0 };
}

/**
 * Peaks of s that stand at least `delta` above the dips on both sides (hysteresis peak detection),
 * returned as indices. A pulse still rising at the record's end counts if it rose `delta`.
 */
function prominentPeaks(s: Float64Array, delta: number): number[] {
  const peaks: number[] = [];
  let mx = -Infinity;
  let mxAt = -1;
  let mn = s[0];
  let lookForMax = true;
  for (let i = 0; i < s.length; i++) {
    const v = s[i];
    if (lookForMax) {
      if (v > mx) {
        mx = v;
        mxAt = i;
      }
      if (v < mx - delta && mx - mn >= delta) {
        peaks.push(mxAt);
        mn = v;
        lookForMax = false;
      } else if (v < mn) {
        // still before a qualifying rise: keep the lowest point as the reference dip
        mn = v;
        mx = v;
        mxAt = i;
      }
    } else {
      if (v < mn) mn = v;
      if (v > mn + delta) {
        mx = v;
        mxAt = i;
        lookForMax = true;
      }
    }
  }
  if (lookForMax && mxAt >= 0 && mx - mn >= delta && (peaks.length === 0 || peaks[peaks.length - 1] !== mxAt)) {
    peaks.push(mxAt);
  }
  return peaks;
}

function resolveLimits(limits: Partial<HitLimits> | undefined, channels: number): HitLimits {
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

/**
 * Checks one impact record and returns a verdict with reasons in plain words (docs/methods.md#hit-checks).
 *
 * In: force (N, raw, offset not yet removed), responses (each in its own unit, same length), fs (Hz),
 * and `limits` (any subset of `HitLimits`; the rest from `defaultHitLimits`). Checks:
 * - `weak`: no pulse above the noise, or peak below minPeakN (docs/methods.md#weak-hit under-range);
 * - `double-hit`: the force, offset-removed and turned to the main pulse's polarity, has another
 *   peak that rises at least max(doubleHitRatio·peak, noiseFactor·noise) above the dip before it
 *   and reaches that level — a second pulse after (or before) the main one, or a second local
 *   maximum inside it (time-domain method of docs/methods.md#double-hit); a lobe within 4 pulse widths that is mirrored
 *   at half its height or more on the other side of the main peak is anti-alias filter ringing
 *   (docs/methods.md#trigger) and not counted;
 * - `overload`: force samples at ≥ overloadFraction × forceRangeN, or ≥ flatRunLength equal samples
 *   at the largest magnitude (docs/methods.md#overload);
 * - `roll-off`: |F(f)|² of the offset-removed pulse (gated to ±4 pulse widths, as a force window
 *   would) first falls rollOffDb below |F(0)|² inside bandHz (docs/methods.md#roll-off; the 10 and 20 dB frequencies
 *   are always reported);
 * - `response-overload`: as overload, per response channel, against responseRange;
 * - `not-decayed`: rms of the last tailFraction of a response (after the exponential window if set)
 *   above notDecayedRatio × its peak (docs/methods.md#decay-check).
 * The offset and noise rms come from the samples before the pulse (≥ 16 of them), else from the last
 * 10 % of the record. A hardware overload flag, when the front end has one, should be checked as well.
 */
export function checkHit(
  force: ArrayLike<number>,
  responses: readonly ArrayLike<number>[],
  fs: number,
  limits?: Partial<HitLimits>,
): HitCheck {
  checkFs(fs);
  const n = checkSamples(force, 'force');
  if (!Array.isArray(responses)) throw new RangeError(`responses=${String(responses)} must be an array of channels`);
  responses.forEach((r, c) => checkSameLength(n, checkSamples(r, `responses[${c}]`), 'force', `responses[${c}]`));
  const l = resolveLimits(limits, responses.length);
  const reasons: HitReason[] = [];
  const dt = 1 / fs;

  // --- overload on the raw force (clipping happens on the converter's value, offset included)
  const rawPeak = maxAbs(force);
  const forceFlatRun = flatRunAtExtreme(force, rawPeak);
  let forceClipped = 0;
  if (l.forceRangeN !== null) forceClipped = countAtOrAbove(force, l.overloadFraction * l.forceRangeN);
  const flatCounts = forceFlatRun >= l.flatRunLength && (l.forceRangeN === null || rawPeak >= 0.5 * l.forceRangeN);
  if (forceClipped > 0) {
    reasons.push({
      code: 'overload',
      message: `force channel clipped: ${forceClipped} sample${forceClipped === 1 ? '' : 's'} at ${pct(l.overloadFraction)} % or more of the ${fmt(l.forceRangeN as number)} N range: use a higher range or hit softer`,
    });
  } else if (flatCounts) {
    reasons.push({
      code: 'overload',
      message: `force channel clipped: ${forceFlatRun} equal samples in a row at ${fmt(rawPeak)} N (flat top): use a higher range or hit softer`,
    });
  }

  // --- main pulse, offset and noise
  let p0 = 0;
  for (let i = 0; i < n; i++) if (Math.abs(force[i]) > Math.abs(force[p0])) p0 = i;
  let s0 = p0;
  const edge0 = l.pulseEdgeFraction * Math.abs(force[p0]);
  while (s0 > 0 && Math.abs(force[s0 - 1]) > edge0) s0--;
  const guard = Math.max(0, s0 - 2);
  const pre = l.preTriggerSamples !== null ? Math.min(l.preTriggerSamples, n) : 0;
  const noise = pre >= 16 ? spreadAround(force, 0, pre, channelOffset(force, pre)) : guard >= 16 ? meanStd(force, 0, guard) : meanStd(force, n - Math.max(1, Math.floor(n / 10)), n);
  const offset = noise.mean;
  const polarity = force[p0] - offset >= 0 ? 1 : -1;
  const s = new Float64Array(n);
  let impulse = 0;
  for (let i = 0; i < n; i++) {
    s[i] = polarity * (force[i] - offset);
    impulse += force[i] - offset;
  }
  let p = 0;
  for (let i = 1; i < n; i++) if (s[i] > s[p]) p = i;
  const peak = s[p];

  const result: HitCheck = {
    verdict: 'accept',
    reasons,
    peakForceN: 0,
    peakTimeS: null,
    offsetN: offset,
    noiseRmsN: noise.std,
    pulseStartS: null,
    pulseWidthS: null,
    impulseNs: impulse * dt,
    rollOff10dBHz: null,
    rollOff20dBHz: null,
    secondPeakRatio: null,
    secondPeakDelayS: null,
    forceClippedSamples: forceClipped,
    forceFlatRun,
    forceGate: null,
    responses: [],
  };

  const pulseFound = peak > 0 && peak > l.noiseFactor * noise.std;
  if (!pulseFound) {
    reasons.push({
      code: 'weak',
      message: `no impact found: the force peak ${fmt(Math.max(peak, 0))} N does not stand out of the ${fmt(noise.std)} N rms noise`,
    });
  } else {
    result.peakForceN = peak;
    result.peakTimeS = p * dt;
    const minPeak = l.minPeakN ?? (l.forceRangeN !== null ? 0.1 * l.forceRangeN : null);
    if (minPeak !== null && peak < minPeak) {
      reasons.push({
        code: 'weak',
        message: `weak hit: peak force ${fmt(peak)} N is below the ${fmt(minPeak)} N minimum: hit harder`,
      });
    }

    // pulse edges with linear interpolation of the crossing times
    const edge = l.pulseEdgeFraction * peak;
    let a = p;
    while (a > 0 && s[a - 1] > edge) a--;
    let b = p;
    while (b < n - 1 && s[b + 1] > edge) b++;
    const tStart = a > 0 ? a - 1 + (edge - s[a - 1]) / (s[a] - s[a - 1]) : 0;
    const tEnd = b < n - 1 ? b + (s[b] - edge) / (s[b] - s[b + 1]) : n - 1;
    result.pulseStartS = tStart * dt;
    result.pulseWidthS = (tEnd - tStart) * dt;

    // double hit
    const thr = Math.max(l.doubleHitRatio * peak, l.noiseFactor * noise.std);
    let second = -1;
    for (const q of prominentPeaks(s, thr)) {
      if (q === p || s[q] < thr) continue;
      // A linear-phase anti-alias filter rings symmetrically around a pulse it band-limits
      // (docs/methods.md#trigger: "early ringing from linear-phase anti-alias filters"): a lobe
      // mirrored on the other side of the main peak at the same level is that ringing, not a
      // second impact, which has no mirror image before the first.
      const mirror = 2 * p - q;
      if (mirror >= 0 && mirror < n && Math.abs(q - p) * dt < 4 * ((b - a + 1) * dt) && s[mirror] >= 0.5 * s[q]) continue;
      if (second < 0 || s[q] > s[second]) second = q;
    }
    if (second >= 0) {
      const ratio = s[second] / peak;
      const delay = (second - p) * dt;
      result.secondPeakRatio = ratio;
      result.secondPeakDelayS = delay;
      reasons.push({
        code: 'double-hit',
        message:
          delay > 0
            ? `second impact ${fmt(delay * 1000, 2)} ms after the first, ${pct(ratio)} % of its peak`
            : `another impact ${fmt(-delay * 1000, 2)} ms before the main one, ${pct(ratio)} % of its peak`,
      });
    }

    // roll-off of the force spectrum relative to DC
    // The spectrum of the pulse alone: samples further than 4 pulse widths from it are noise and
    // after-ringing, which a force window removes before any FRF (docs/methods.md#force-window), so they are gated out here
    // too; over a long record their integrated offset error would otherwise dominate |F(0)|.
    const width = b - a + 1;
    result.forceGate = { offsetN: offset, fromIndex: Math.max(0, a - 4 * width - 8), toIndex: Math.min(n, b + 4 * width + 8) };
    const spectrum = forcePulseSpectrum(force, fs, result.forceGate);
    if (spectrum) {
      const crossing = (db: number) => rollOffFrequency(spectrum, db);
      result.rollOff10dBHz = crossing(10);
      result.rollOff20dBHz = crossing(20);
      const band = l.bandHz ?? [0, fs / 2.56];
      const hi = Math.min(band[1], fs / 2);
      const fDrop = crossing(l.rollOffDb);
      if (fDrop !== null && fDrop < hi) {
        reasons.push({
          code: 'roll-off',
          message: `force spectrum falls ${fmt(l.rollOffDb)} dB by ${fDrop.toFixed(0)} Hz, inside the ${fmt(band[0])}–${fmt(hi)} Hz band: use a harder tip`,
        });
      }
    }
  }

  // --- responses
  const ew = l.exponentialWindow ? exponentialWindow(n, fs, l.exponentialWindow) : null;
  const tailN = Math.max(1, Math.ceil(l.tailFraction * n));
  responses.forEach((x, c) => {
    const range = Array.isArray(l.responseRange) ? l.responseRange[c] : (l.responseRange as number | null);
    const pk = maxAbs(x);
    const clipped = range !== null ? countAtOrAbove(x, l.overloadFraction * range) : 0;
    const flat = flatRunAtExtreme(x, pk);
    if (clipped > 0) {
      reasons.push({
        code: 'response-overload',
        message: `response ${c + 1} clipped: ${clipped} sample${clipped === 1 ? '' : 's'} at ${pct(l.overloadFraction)} % or more of its ${fmt(range as number)} range: use a higher range or hit softer`,
      });
    } else if (flat >= l.flatRunLength && (range === null || pk >= 0.5 * range)) {
      reasons.push({
        code: 'response-overload',
        message: `response ${c + 1} clipped: ${flat} equal samples in a row at ${fmt(pk)} (flat top): use a higher range or hit softer`,
      });
    }
    let wPeak = 0;
    let tail = 0;
    for (let i = 0; i < n; i++) {
      const v = ew ? x[i] * ew[i] : x[i];
      const av = Math.abs(v);
      if (av > wPeak) wPeak = av;
      if (i >= n - tailN) tail += v * v;
    }
    const tailRatio = wPeak > 0 ? Math.sqrt(tail / tailN) / wPeak : 0;
    if (tailRatio > l.notDecayedRatio) {
      reasons.push({
        code: 'not-decayed',
        message: `response ${c + 1} has not died away: the last ${pct(l.tailFraction)} % of the record is at ${pct(tailRatio)} % of its peak (limit ${pct(l.notDecayedRatio)} %): use a longer record or an exponential window`,
      });
    }
    result.responses.push({ peak: pk, clippedSamples: clipped, flatRun: flat, tailRatio });
  });

  result.verdict = reasons.length > 0 ? 'reject' : 'accept';
  return result;
}
