// The one way a date or time reaches the screen: the reader's locale (the browser's language) and
// time zone, always with the same fields, through Intl.DateTimeFormat. Exports and files carry
// ISO 8601 in UTC instead (`isoUtc`), so they read the same everywhere.
type When = string | number | Date | null | undefined;

function toDate(v: When): Date | null {
  if (v === null || v === undefined || v === '') return null;
  const d = v instanceof Date ? v : new Date(v);
  return Number.isNaN(d.getTime()) ? null : d;
}

const formats = {
  dateTime: { year: 'numeric', month: 'short', day: 'numeric', hour: '2-digit', minute: '2-digit' },
  date: { year: 'numeric', month: 'short', day: 'numeric' },
  time: { hour: '2-digit', minute: '2-digit', second: '2-digit' },
} satisfies Record<string, Intl.DateTimeFormatOptions>;

export type DateStyle = keyof typeof formats;

/**
 * A date and/or time for the screen, e.g. "3 Dec 2026, 14:05" (en-GB) or "Dec 3, 2026, 02:05 PM"
 * (en-US); `fallback` ("—") when there is none or it does not parse. `locale` and `timeZone` are
 * for tests; the screens use the reader's.
 */
export function formatWhen(v: When, style: DateStyle = 'dateTime', opts: { locale?: string; timeZone?: string; fallback?: string } = {}): string {
  const d = toDate(v);
  if (!d) return opts.fallback ?? '—';
  return new Intl.DateTimeFormat(opts.locale, { ...formats[style], timeZone: opts.timeZone }).format(d);
}

/** ISO 8601 in UTC to the second, e.g. "2026-12-03T14:05:09Z": for exports, file names and logs. */
export function isoUtc(v: When): string {
  const d = toDate(v);
  if (!d) return '';
  return d.toISOString().replace(/\.\d{3}Z$/, 'Z');
}
