// How the hit checks write numbers in their plain-words reasons (three significant digits, whole
// percent from 10 % up).

/** v with `digits` significant digits (whole numbers from 100 up); '0' for zero. */
export function fmt(v: number, digits = 3): string {
  if (v === 0) return '0';
  const a = Math.abs(v);
  if (a >= 100) return v.toFixed(0);
  return Number(v.toPrecision(digits)).toString();
}

/** ratio as a percentage: whole from 10 % up, two significant digits below. */
export function pct(ratio: number): string {
  const p = ratio * 100;
  return p >= 10 ? p.toFixed(0) : Number(p.toPrecision(2)).toString();
}
