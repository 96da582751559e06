// The CSV writing of the hand-over bundle: file-name-safe DOF labels, cells quoted when needed,
// numbers at full precision (float32 samples as the shortest text that reads back the same).

/** A DOF label as a file-name part: `B21:+Z` → `B21+Z` (only letters, digits, + - _ . kept). */
export const fileSafe = (dof: string) => dof.replace(':', '').replace(/[^A-Za-z0-9+\-_.]/g, '_');

export type Cell = string | number | boolean | null | undefined;

function csvCell(v: Cell): string {
  if (v === null || v === undefined) return '';
  // String(number) is the shortest text that reads back as the same double: full precision.
  const s = typeof v === 'number' ? String(v) : String(v);
  return /[",\r\n]/.test(s) || /^\s|\s$/.test(s) ? `"${s.replace(/"/g, '""')}"` : s;
}

/** The shortest decimal text that reads back (through float32 rounding) as the same float32 value. */
export function f32Text(v: number): string {
  // Quantized samples can be −0; keep its sign so the float32 bytes come back identical.
  if (Object.is(v, -0)) return '-0';
  for (let p = 6; p < 9; p++) {
    const t = Number(v.toPrecision(p));
    if (Math.fround(t) === v) return String(t);
  }
  return String(Number(v.toPrecision(9)));
}

export function toCsv(header: string[], rows: Cell[][]): string {
  return [header, ...rows].map((r) => r.map(csvCell).join(',')).join('\r\n') + '\r\n';
}
