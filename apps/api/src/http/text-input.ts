// Reading numbers and names out of uploaded text files (recordings, geometry) strictly: a CSV cell
// is a plain decimal number or it is refused, binary bytes are recognised before they are parsed
// as CSV, and whatever of the file is echoed in a message is short and printable.

/** A plain decimal number: optional sign, digits with an optional point, optional exponent. No hex, no Infinity, no blanks. */
const DECIMAL = /^[+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?$/;

/** True for a plain decimal number (the same rule as parseDecimal, without the range check). */
export const isDecimal = (text: string) => DECIMAL.test(text.trim());

export type DecimalResult = { ok: true; value: number } | { ok: false; reason: string };

/**
 * Parses one CSV cell as a decimal number. `Number()` alone would take "0x10" as 16, " " as 0
 * and "Infinity" as a number; this refuses them, and "1e999" (beyond a double) too.
 */
export function parseDecimal(cell: string): DecimalResult {
  const raw = cell.trim();
  if (raw === '') return { ok: false, reason: 'is empty' };
  if (!DECIMAL.test(raw)) return { ok: false, reason: `${quoteForMessage(raw)} is not a decimal number` };
  const value = Number(raw);
  if (!Number.isFinite(value)) return { ok: false, reason: `${quoteForMessage(raw)} is beyond the range of a number` };
  return { ok: true, value };
}

/**
 * True when a text file is really binary (a WAV, a zip, an image…): a NUL byte, or more than 1 % of
 * control characters or undecodable bytes in its first 4096 characters.
 */
export function looksBinary(text: string): boolean {
  const head = text.slice(0, 4096);
  if (head.includes('\u0000')) return true;
  let odd = 0;
  for (let i = 0; i < head.length; i++) {
    const c = head.charCodeAt(i);
    if ((c < 32 && c !== 9 && c !== 10 && c !== 13) || c === 0x7f || c === 0xfffd) odd++;
  }
  return odd > Math.max(1, head.length * 0.01);
}

/** A piece of an uploaded file for a message: control characters shown as "?", at most 40 characters, in quotes. */
export function quoteForMessage(text: string, max = 40): string {
  // eslint-disable-next-line no-control-regex
  const printable = text.replace(/[\u0000-\u001f\u007f-\u009f\ufffd]/g, '?');
  return `"${printable.length > max ? `${printable.slice(0, max)}…` : printable}"`;
}
