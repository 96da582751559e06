import { describe, expect, it } from 'vitest';
import { formatWhen, isoUtc } from './format-date.ts';

// 2026-12-03T14:05:09.250Z; expected strings are the CLDR patterns of Intl.DateTimeFormat (ECMA-402).
const at = '2026-12-03T14:05:09.250Z';

describe('formatWhen', () => {
  it('writes date and time in the reader’s locale and time zone, with the same fields everywhere', () => {
    expect(formatWhen(at, 'dateTime', { locale: 'en-GB', timeZone: 'UTC' })).toBe('3 Dec 2026, 14:05');
    expect(formatWhen(at, 'dateTime', { locale: 'de-DE', timeZone: 'Europe/Berlin' })).toBe('3. Dez. 2026, 15:05');
    expect(formatWhen(at, 'date', { locale: 'en-US', timeZone: 'UTC' })).toBe('Dec 3, 2026');
    expect(formatWhen(at, 'time', { locale: 'en-GB', timeZone: 'UTC' })).toBe('14:05:09');
  });

  it('says "—" (or the fallback given) for a missing or unreadable date instead of "Invalid Date"', () => {
    expect(formatWhen(null)).toBe('—');
    expect(formatWhen('not a date')).toBe('—');
    expect(formatWhen(undefined, 'date', { fallback: 'never' })).toBe('never');
  });
});

describe('isoUtc', () => {
  it('gives ISO 8601 in UTC to the second whatever the input’s zone', () => {
    expect(isoUtc(at)).toBe('2026-12-03T14:05:09Z');
    expect(isoUtc('2026-12-03T15:05:09+01:00')).toBe('2026-12-03T14:05:09Z');
    expect(isoUtc(null)).toBe('');
  });
});
