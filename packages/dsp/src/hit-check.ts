// Per-hit quality checks for impact testing (docs/methods.md#hit-checks). Every threshold is common practice,
// not a standard, and is configurable through `HitLimits` (hit-limits.ts); the response channels are
// checked in hit-response-check.ts.
import { channelOffset } from './offsets.ts';
import { forcePulseSpectrum, rollOffFrequency, type ForcePulseGate } from './force-spectrum.ts';
import { resolveHitLimits, type HitLimits, type HitReason } from './hit-limits.ts';
import { checkResponses, type ResponseCheck } from './hit-response-check.ts';
import { fmt, pct } from './hit-wording.ts';
import { countAtOrAbove, flatRunAtExtreme, maxAbs, meanStd, prominentPeaks, spreadAround } from './record-stats.ts';
import { checkFs, checkSameLength, checkSamples } from './validate.ts';

export { defaultHitLimits, type HitLimits, type HitReason, type HitReasonCode } from './hit-limits.ts';
export type { ResponseCheck } from './hit-response-check.ts';

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
  const l = resolveHitLimits(limits, responses.length);
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

  result.responses = checkResponses(responses, n, fs, l, reasons);
  result.verdict = reasons.length > 0 ? 'reject' : 'accept';
  return result;
}
