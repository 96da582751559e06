// Turns zod issues into one message per field path ("bandHz.high"), shown beside the field.
import type { z } from 'zod';

export type FieldErrors = Record<string, string>;

export function issuesToErrors(error: z.ZodError): FieldErrors {
  const out: FieldErrors = {};
  for (const issue of error.issues) {
    const key = issue.path.map(String).join('.') || '_';
    if (!out[key]) out[key] = capitalise(issue.message);
  }
  return out;
}

export const capitalise = (s: string) => (s ? s[0]!.toUpperCase() + s.slice(1) : s);

/** A number typed into a form: empty stays undefined (so the schema says "required"), text becomes NaN. */
export function numberOrUndefined(text: string | FormDataEntryValue | null): number | undefined {
  const s = String(text ?? '').trim().replace(',', '.');
  return s === '' ? undefined : Number(s);
}

/** Splits "B21:+Z, B03:+Z" or "steel; plastic" into trimmed parts. */
export const splitList = (text: string) => text.split(/[\s,;]+/).map((s) => s.trim()).filter(Boolean);
