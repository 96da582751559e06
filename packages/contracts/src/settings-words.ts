// A change of the acquisition settings in words, with the unit a test engineer reads it in:
// "force window length 20 → 40 ms", not "forceWindow.lengthS: 0.02 → 0.04". The Kit history and
// anything else that lists settings changes use this one table.
export interface SettingsChangeLike {
  /** Dotted path as diffSettings gives it, e.g. `forceWindow.lengthS`. */
  field: string;
  before: unknown;
  after: unknown;
}

interface FieldWords {
  label: string;
  /** Unit shown after the values; '' for none. */
  unit: string;
  /** Stored value → shown value (e.g. s → ms). */
  scale?: number;
  /** Words for the values of a choice. */
  choices?: Record<string, string>;
}

export const settingsFieldWords: Record<string, FieldWords> = {
  sampleRateHz: { label: 'sample rate', unit: 'Hz' },
  recordLengthS: { label: 'record length', unit: 's' },
  preTriggerS: { label: 'pre-trigger', unit: 'ms', scale: 1000 },
  triggerLevelN: { label: 'trigger level', unit: 'N' },
  'forceWindow.lengthS': { label: 'force window length', unit: 'ms', scale: 1000 },
  'forceWindow.taperS': { label: 'force window taper', unit: 'ms', scale: 1000 },
  'exponentialWindow.mode': { label: 'exponential window', unit: '', choices: { none: 'none', tau: 'by time constant', 'end-level': 'by end level' } },
  'exponentialWindow.tauS': { label: 'exponential window time constant τ', unit: 'ms', scale: 1000 },
  'exponentialWindow.endLevelPercent': { label: 'exponential window end level', unit: '%' },
  hitsToAverage: { label: 'hits to average', unit: '' },
  'bandHz.low': { label: 'band lower edge', unit: 'Hz' },
  'bandHz.high': { label: 'band upper edge', unit: 'Hz' },
  estimator: { label: 'estimator', unit: '' },
  doubleHitRatio: { label: 'double-hit threshold (second peak / first)', unit: '%', scale: 100 },
  overloadPercent: { label: 'overload threshold', unit: '% of range' },
  rollOffDb: { label: 'force spectrum roll-off limit', unit: 'dB' },
  coherenceThreshold: { label: 'coherence needed for done', unit: '' },
  minPeakN: { label: 'weakest peak force', unit: 'N' },
  forceRangeN: { label: 'force input range', unit: 'N' },
  responseRangeMs2: { label: 'response input range', unit: 'm/s²' },
  resampleUploads: { label: 'resample uploads at other rates', unit: '', choices: { true: 'on', false: 'off' } },
  bridgeFilePattern: { label: 'bridge file name pattern', unit: '' },
};

/** A number without float noise: 0.02 s × 1000 reads "20", not "20.000000000000004". */
function numberText(v: number): string {
  return String(Number(v.toPrecision(6)));
}

function valueText(v: unknown, words: FieldWords | undefined): string {
  if (v === null || v === undefined) return 'not set';
  if (words?.choices && String(v) in words.choices) return words.choices[String(v)]!;
  if (typeof v === 'number') return numberText(v * (words?.scale ?? 1));
  if (typeof v === 'string') return v === '' ? 'none' : `“${v}”`;
  return JSON.stringify(v);
}

/**
 * One settings change in words: label, before → after, unit.
 * Example: { field: 'forceWindow.lengthS', before: 0.02, after: 0.04 } → "force window length 20 → 40 ms".
 * A field this table does not know is shown by its path, values as they are.
 */
export function settingsChangeInWords(change: SettingsChangeLike): string {
  const words = settingsFieldWords[change.field];
  const label = words?.label ?? change.field;
  const unit = words?.unit && (typeof change.before === 'number' || typeof change.after === 'number') ? ` ${words.unit}` : '';
  return `${label} ${valueText(change.before, words)} → ${valueText(change.after, words)}${unit}`;
}
