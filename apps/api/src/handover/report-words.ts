// The words and number formats of the hand-over report: labels of stored codes, numbers in
// monospace with units, dates in UTC, the shade of a MAC cell.
import { esc } from './svg-frame.ts';

export const DB_REFERENCE = 'dB re 1 (m/s²)/N';

export const PURPOSE: Record<string, string> = { 'calibrated-frf': 'Calibrated FRF measurement', 'quick-survey': 'Quick survey (uncalibrated bump test)' };
export const TEST_TYPE: Record<string, string> = { 'roving-hammer': 'Roving hammer (accelerometer(s) fixed at the reference DOF, the hammer moves)', 'roving-response': 'Roving response (hammer fixed at the reference DOF, the accelerometer moves)' };
export const STATUS: Record<string, string> = { planning: 'Planning', testing: 'Testing', analysis: 'Analysis', 'handed-over': 'Handed over' };
export const REASON: Record<string, string> = {
  'double-hit': 'double hit',
  overload: 'force overload (clipping)',
  'response-overload': 'response overload (clipping)',
  weak: 'weak hit (too soft)',
  'roll-off': 'force spectrum roll-off across the band',
  'not-decayed': 'response not decayed by the end of the record',
};
export const CAL_STATE: Record<string, string> = { ok: '✓ valid', 'due-soon': '! due soon', overdue: '✗ overdue', none: '✗ no record' };

/** A number in monospace with its unit. */
export const n = (v: number | null | undefined, digits = 3, unit = '') =>
  v === null || v === undefined || !Number.isFinite(v) ? '<span class="n">–</span>' : `<span class="n">${esc(formatNumber(v, digits))}${unit ? `&#8239;${esc(unit)}` : ''}</span>`;

export function formatNumber(v: number, digits = 3): string {
  if (v === 0) return '0';
  const a = Math.abs(v);
  if (a >= 1e6 || a < 1e-3) return v.toExponential(digits - 1);
  return Number(v.toPrecision(Math.max(digits, Math.ceil(Math.log10(a + 1))))).toString();
}

export const dateTime = (d: Date | string | null) => (d ? new Date(d).toISOString().replace('T', ' ').slice(0, 16) + ' UTC' : '–');
export const mono = (s: unknown) => `<span class="n">${esc(s)}</span>`;

export function shade(v: number): string {
  const g = Math.round(255 - 175 * Math.max(0, Math.min(1, v)));
  return `background:rgb(${g},${g},${g});color:${v > 0.55 ? '#fff' : '#111'}`;
}
