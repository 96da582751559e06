// Small statistics shared by the checks (noise floor, pole clusters).

/** Median of the values (mean of the middle two for an even count); NaN for none. Does not reorder the input. */
export function median(values: readonly number[]): number {
  if (values.length === 0) return NaN;
  const s = [...values].sort((a, b) => a - b);
  const m = s.length >> 1;
  return s.length % 2 ? s[m]! : 0.5 * (s[m - 1]! + s[m]!);
}
