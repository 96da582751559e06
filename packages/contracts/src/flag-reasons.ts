// Why a schedule entry is flagged, in words with numbers (the campaign's settings give the
// thresholds), and what to try at the structure. Pure: the API computes it from an entry's
// averaged result; Tap, Review and Overview show what the API sends.
//
// The checks follow the status rule of the schedule (design.md "Tap"; apps/api/src/hits/processing.ts
// `statusFrom`): an entry with its required accepted hits is done when the mean ordinary coherence
// γ² over the band of interest reaches the campaign's threshold, and flagged otherwise. Ordinary
// coherence and what lowers it (noise, leakage, non-linearity): docs/methods.md#h1-h2-coherence
// (Bendat & Piersol, Random Data, from memory). The remedies offered (hit nearer the point, another
// tip, the sensor mounting) are common practice in impact testing (Ewins 2000, Modal Testing, ch. 3).

export type FlagReasonCode = 'low-coherence' | 'hits-left-out' | 'no-average';

export interface FlagReason {
  code: FlagReasonCode;
  /** One sentence with the numbers, e.g. "coherence 0.62 mean over 5–75 Hz, below 0.9". */
  message: string;
  /** The measured figure the message quotes (mean γ², hits left out, averages). */
  value: number;
  /** The campaign's limit it was compared with. */
  threshold: number;
  /** What to try at the structure. */
  advice: string;
}

export interface FlagInput {
  /** Frequencies (Hz) of the averaged FRF's lines. */
  f: ArrayLike<number>;
  /** Ordinary coherence γ² per line of the channel that measures the entry's own response DOF. */
  coherence: ArrayLike<number> | null;
  bandHz: { low: number; high: number };
  /** The campaign's coherence threshold for "done" (settings `coherenceThreshold`). */
  threshold: number;
  requiredHits: number;
  /** Hits with an accept verdict at the entry. */
  acceptedHits: number;
  /** Accepted hits that went into the average (the others were recorded under other settings). */
  averages: number;
}

const fmt = (x: number, digits: number) => x.toFixed(digits);
const hz = (x: number) => (Number.isInteger(x) ? String(x) : x.toFixed(1));

/** The coherence over the band: mean, the share of lines below the threshold, and the lowest line. */
export function coherenceOverBand(f: ArrayLike<number>, coherence: ArrayLike<number>, band: { low: number; high: number }, threshold: number) {
  let sum = 0;
  let count = 0;
  let below = 0;
  let min = Infinity;
  let minAt = NaN;
  for (let k = 0; k < f.length; k++) {
    const fk = f[k]!;
    // The same lines as the status rule's mean (processing.ts meanOverBand): in the band, not 0 Hz.
    if (fk < band.low || fk > band.high || fk <= 0) continue;
    const g = coherence[k]!;
    sum += g;
    count++;
    if (g < threshold) below++;
    if (g < min) {
      min = g;
      minAt = fk;
    }
  }
  return count ? { mean: sum / count, lines: count, belowShare: below / count, min, minAt } : null;
}

/**
 * The reasons an entry with its required hits is not done. Empty while hits are missing (the entry
 * is in progress, not flagged) or when every check passes.
 */
export function flagReasons(input: FlagInput): FlagReason[] {
  if (input.acceptedHits < input.requiredHits) return [];
  const reasons: FlagReason[] = [];
  const band = `${hz(input.bandHz.low)}–${hz(input.bandHz.high)} Hz`;
  const leftOut = input.acceptedHits - input.averages;
  if (leftOut > 0) {
    reasons.push({
      code: 'hits-left-out',
      message: `${leftOut} of ${input.acceptedHits} accepted hits were recorded under other acquisition settings and are left out of the average (${input.averages} of ${input.requiredHits} required in it)`,
      value: leftOut,
      threshold: 0,
      advice: 'Redo the DOF under the current settings, or put the settings back to those the hits were recorded with.',
    });
  }
  if (input.averages === 0 || !input.coherence) {
    reasons.push({
      code: 'no-average',
      message: `no averaged FRF: none of the ${input.acceptedHits} accepted hits can be averaged under the current settings`,
      value: input.averages,
      threshold: input.requiredHits,
      advice: 'Redo the DOF under the current settings.',
    });
    return reasons;
  }
  const c = coherenceOverBand(input.f, input.coherence, input.bandHz, input.threshold);
  if (!c) {
    reasons.push({
      code: 'low-coherence',
      message: `no FRF line lies in the band of interest ${band}, so the coherence cannot reach ${fmt(input.threshold, 2)}`,
      value: 0,
      threshold: input.threshold,
      advice: 'Check the band of interest in the settings against the sample rate and record length.',
    });
    return reasons;
  }
  if (c.mean < input.threshold) {
    reasons.push({
      code: 'low-coherence',
      message: `coherence ${fmt(c.mean, 2)} mean over ${band}, below ${fmt(input.threshold, 2)}; γ² is under ${fmt(input.threshold, 2)} on ${Math.round(c.belowShare * 100)} % of the band, lowest ${fmt(c.min, 2)} at ${hz(Math.round(c.minAt * 10) / 10)} Hz`,
      value: c.mean,
      threshold: input.threshold,
      advice: 'Re-hit nearer the point, square to the surface; a harder tip if γ² drops at the top of the band, a softer one if at the bottom; check the sensor mounting and cable.',
    });
  }
  return reasons;
}
