// The options the two pole groupings (clusters.ts for the picker, suggest.ts for suggested modes) share:
// how far a member's damping may stray and how many orders a group needs. Defaults are Resonote's
// (common practice, not a standard; docs/methods.md#stabilization).

export interface GroupKeepOptions {
  /** A member whose ζ differs from the group's median by more than this fraction is dropped; default 0.5. */
  dampingTolerance?: number;
  /** A group is kept when it has poles at this share of the diagram's orders (default 0.4) … */
  minShare?: number;
  /** … and at least this many orders (default 3). */
  minOrders?: number;
}

/**
 * The keep rules with their defaults, each checked, together with the caller's own fractions: every
 * [name, value, lo, hi] must be a finite number in (lo, hi]. Throws a RangeError naming the bad value.
 */
export function groupKeepRules(
  options: GroupKeepOptions,
  fractions: readonly (readonly [string, number, number, number])[],
): { dTol: number; minShare: number; minOrders: number } {
  const dTol = options.dampingTolerance ?? 0.5;
  const minShare = options.minShare ?? 0.4;
  const minOrders = options.minOrders ?? 3;
  for (const [name, v, lo, hi] of [...fractions, ['dampingTolerance', dTol, 0, 10], ['minShare', minShare, 0, 1]] as const) {
    if (typeof v !== 'number' || !(Number.isFinite(v) && v > lo && v <= hi)) throw new RangeError(`${name}=${String(v)} must be in (${lo}, ${hi}]`);
  }
  if (!Number.isInteger(minOrders) || minOrders < 1) throw new RangeError(`minOrders=${String(minOrders)} must be an integer ≥ 1`);
  return { dTol, minShare, minOrders };
}
