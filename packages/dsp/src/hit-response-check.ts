// The response-channel part of the per-hit checks (docs/methods.md#hit-checks): overload against the
// channel's range or a flat top (docs/methods.md#overload), and whether the response died away within
// the record (docs/methods.md#decay-check).
import type { HitLimits, HitReason } from './hit-limits.ts';
import { fmt, pct } from './hit-wording.ts';
import { countAtOrAbove, flatRunAtExtreme, maxAbs } from './record-stats.ts';
import { exponentialWindow } from './windows.ts';

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

/**
 * Checks each response channel (same length n as the force, fs in Hz, limits already resolved) and
 * appends its `response-overload` / `not-decayed` reasons to `reasons`; returns one `ResponseCheck`
 * per channel in channel order.
 */
export function checkResponses(responses: readonly ArrayLike<number>[], n: number, fs: number, l: HitLimits, reasons: HitReason[]): ResponseCheck[] {
  const out: ResponseCheck[] = [];
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
    out.push({ peak: pk, clippedSamples: clipped, flatRun: flat, tailRatio });
  });
  return out;
}
