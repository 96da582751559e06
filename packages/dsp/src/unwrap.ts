/**
 * Phase unwrapping: removes the jumps of a wrapped phase by adding multiples of 2π, so the curve
 * runs on through ±π. The same rule as numpy.unwrap (NumPy reference, `numpy.unwrap`, default
 * `discont = π`, `period = 2π`): each step d is brought into [−π, π) as dm = ((d + π) mod 2π) − π,
 * with dm = π when dm = −π and d > 0; the correction dm − d is applied only where |d| ≥ discont;
 * the corrections accumulate from the first sample, which stays as it is.
 *
 * @param phaseRad phase in radians (any length; a sample that is not finite is refused)
 * @param discont  the smallest jump that is taken for a wrap, radians (numpy: max(discont, π))
 * @returns        unwrapped phase in radians, a new Float64Array of the same length
 */
export function unwrapPhase(phaseRad: ArrayLike<number>, discont = Math.PI): Float64Array {
  if (!(discont > 0)) throw new RangeError(`discont=${discont} must be > 0`);
  const n = phaseRad.length;
  const out = new Float64Array(n);
  if (n === 0) return out;
  const period = 2 * Math.PI;
  const threshold = Math.max(discont, Math.PI);
  let correction = 0;
  out[0] = phaseRad[0]!;
  if (!Number.isFinite(out[0])) throw new RangeError(`phaseRad[0]=${out[0]} must be finite`);
  for (let i = 1; i < n; i++) {
    const p = phaseRad[i]!;
    if (!Number.isFinite(p)) throw new RangeError(`phaseRad[${i}]=${p} must be finite`);
    const d = p - phaseRad[i - 1]!;
    // Python's % has the sign of the divisor; JavaScript's has the sign of the dividend.
    const r = (d + Math.PI) % period;
    let dm = (r < 0 ? r + period : r) - Math.PI;
    if (dm === -Math.PI && d > 0) dm = Math.PI;
    if (Math.abs(d) >= threshold) correction += dm - d;
    out[i] = p + correction;
  }
  return out;
}

/** The same in degrees: unwraps a phase given in degrees (jumps of 360°). */
export function unwrapPhaseDeg(phaseDeg: ArrayLike<number>): Float64Array {
  const rad = Float64Array.from(phaseDeg, (v) => (v * Math.PI) / 180);
  const out = unwrapPhase(rad);
  for (let i = 0; i < out.length; i++) out[i] = (out[i]! * 180) / Math.PI;
  return out;
}
