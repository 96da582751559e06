import { checkFs, checkNonNegative, checkPositive, checkSamples } from './validate.ts';

export interface TriggerOptions {
  /** Trigger level (N, > 0); common practice: a few % of the expected peak (docs/methods.md#trigger). */
  level: number;
  /** Pre-trigger length (s, ≥ 0) kept before the trigger sample. */
  preTriggerS: number;
}

export interface TriggerResult {
  /** Index of the first sample with |force| ≥ level. */
  index: number;
  /** Time of that sample, index/fs (s, from the start of `force`). */
  timeS: number;
  /** Index where the record starts: index − round(preTriggerS·fs), clamped at 0. */
  startIndex: number;
  /** True when fewer pre-trigger samples than requested were available (startIndex was clamped to 0). */
  clamped: boolean;
}

/**
 * Finds the trigger of an impact in a stream of force samples: the first sample whose magnitude
 * reaches the level, |force[i]| ≥ level (so a gauge wired with either polarity triggers; a
 * level-crossing on the magnitude, not a slope test). Returns null when the level is never reached.
 * The record then starts `preTriggerS` earlier: startIndex = max(0, index − round(preTriggerS·fs));
 * when the stream holds fewer samples before the trigger, startIndex is 0 and `clamped` is true
 * (a hit that starts that early should be treated with suspicion, docs/methods.md#trigger).
 * In: force (N, remove any DC offset first), fs (Hz). Source: docs/methods.md#trigger (common practice).
 */
export function findTrigger(force: ArrayLike<number>, fs: number, options: TriggerOptions): TriggerResult | null {
  checkFs(fs);
  const n = checkSamples(force, 'force');
  if (!options || typeof options !== 'object') throw new RangeError(`options=${String(options)} must be an object`);
  checkPositive(options.level, 'level');
  checkNonNegative(options.preTriggerS, 'preTriggerS');
  for (let i = 0; i < n; i++) {
    if (Math.abs(force[i]) >= options.level) {
      const want = i - Math.round(options.preTriggerS * fs);
      return { index: i, timeS: i / fs, startIndex: Math.max(0, want), clamped: want < 0 };
    }
  }
  return null;
}
