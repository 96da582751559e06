// Sample statistics the hit checks read from a record (docs/methods.md#hit-checks): peaks, clipping
// counts, flat runs, noise spread, and hysteresis peak detection for double hits.

/** Longest run of exactly equal samples whose magnitude equals the record's largest magnitude. */
export function flatRunAtExtreme(x: ArrayLike<number>, peak: number): number {
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

/** Largest |x[i]|; 0 for an empty record. */
export function maxAbs(x: ArrayLike<number>): number {
  let m = 0;
  for (let i = 0; i < x.length; i++) {
    const a = Math.abs(x[i]);
    if (a > m) m = a;
  }
  return m;
}

/** How many samples have |x[i]| ≥ level. */
export function countAtOrAbove(x: ArrayLike<number>, level: number): number {
  let c = 0;
  for (let i = 0; i < x.length; i++) if (Math.abs(x[i]) >= level) c++;
  return c;
}

/** Mean and rms spread of x[from, to); zeros for an empty range. */
export function meanStd(x: ArrayLike<number>, from: number, to: number): { mean: number; std: number } {
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
export function spreadAround(x: ArrayLike<number>, from: number, to: number, mean: number): { mean: number; std: number } {
  let v = 0;
  for (let i = from; i < to; i++) v += (x[i] - mean) * (x[i] - mean);
  return { mean, std: to > from ? Math.sqrt(v / (to - from)) : 0 };
}

/**
 * Peaks of s that stand at least `delta` above the dips on both sides (hysteresis peak detection),
 * returned as indices. A pulse still rising at the record's end counts if it rose `delta`.
 */
export function prominentPeaks(s: Float64Array, delta: number): number[] {
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
