// Cutting a continuous recording into triggered impact records (docs/methods.md#trigger).
import { findTrigger } from './trigger.ts';
import { channelOffset } from './offsets.ts';
import { checkFs, checkInteger, checkNonNegative, checkPositive, checkSamples } from './validate.ts';

export interface SplitOptions {
  /** Samples per record (the record length × fs), ≥ 1. */
  recordSamples: number;
  /** Samples kept before the trigger sample, round(preTriggerS·fs), ≥ 0. */
  preTriggerSamples: number;
  /** Trigger level on |force − offset| (N, > 0). */
  level: number;
}

export interface SplitRecords {
  /** Each record: where it starts in the recording and its channels (float32, as stored). */
  records: { startIndex: number; channels: Float32Array[] }[];
  /**
   * Hits found but not cut out: `short-pre-trigger` when the trigger comes before a full
   * pre-trigger could be recorded, `cut-short` when the recording ends inside the record.
   */
  skipped: { timeS: number; kind: 'short-pre-trigger' | 'cut-short' }[];
}

/**
 * Cuts a recording into triggered records of `recordSamples` each.
 *
 * In: channels of one recording (force first, in N; responses in their own unit; same length), fs (Hz).
 * Method: the force offset is the mean of the first max(1, preTriggerSamples) samples (`channelOffset`,
 * the same estimate `removeOffsets` makes; the recording must start before any hit), the trigger is
 * the first sample with |force − offset| ≥ level (`findTrigger`), and the record starts
 * preTriggerSamples before it (docs/methods.md#trigger, common practice). A recording that is a
 * whole number of records back to back, each with its trigger at or after half the pre-trigger
 * (what a front end exports when it triggers itself), is taken block by block as it is.
 * Out: the records (channels copied, inputs not changed) and the hits that could not be cut out.
 */
export function splitRecords(channels: readonly ArrayLike<number>[], fs: number, options: SplitOptions): SplitRecords {
  checkFs(fs);
  if (!Array.isArray(channels) || channels.length === 0) throw new RangeError('channels must hold the force channel at least');
  const length = checkSamples(channels[0]!, 'channels[0]');
  channels.forEach((c, i) => {
    if (checkSamples(c, `channels[${i}]`) !== length) throw new RangeError(`channels[${i}] has ${c.length} samples, channels[0] has ${length}`);
  });
  checkInteger(options.recordSamples, 'recordSamples', 1);
  checkNonNegative(options.preTriggerSamples, 'preTriggerSamples');
  checkPositive(options.level, 'level');
  const n = options.recordSamples;
  const pre = Math.round(options.preTriggerSamples);
  const force = channels[0]!;
  const offset = channelOffset(force, pre);
  const centred = new Float64Array(length);
  for (let i = 0; i < length; i++) centred[i] = force[i]! - offset;
  // One float32 block per record, channel after channel (the stored layout): the channels are views of it.
  const cut = (start: number) => {
    const block = new Float32Array(channels.length * n);
    channels.forEach((c, k) => {
      const base = k * n;
      for (let i = 0; i < n; i++) block[base + i] = c[start + i]!;
    });
    return channels.map((_, k) => block.subarray(k * n, (k + 1) * n));
  };
  const records: SplitRecords['records'] = [];
  const skipped: SplitRecords['skipped'] = [];

  if (length % n === 0) {
    const starts = Array.from({ length: length / n }, (_, b) => b * n);
    const triggered = starts.every((start) => {
      const t = findTrigger(centred.subarray(start, start + n), fs, { level: options.level, preTriggerS: 0 });
      return t !== null && t.index >= Math.floor(pre / 2);
    });
    if (triggered) return { records: starts.map((start) => ({ startIndex: start, channels: cut(start) })), skipped };
  }

  let p = 0;
  while (p < length) {
    const trig = findTrigger(centred.subarray(p), fs, { level: options.level, preTriggerS: 0 });
    if (!trig) break;
    const triggerIndex = p + trig.index;
    const start = triggerIndex - pre;
    if (start < p) {
      skipped.push({ timeS: triggerIndex / fs, kind: 'short-pre-trigger' });
      p = triggerIndex + n;
      continue;
    }
    if (start + n > length) {
      skipped.push({ timeS: triggerIndex / fs, kind: 'cut-short' });
      break;
    }
    records.push({ startIndex: start, channels: cut(start) });
    p = start + n;
  }
  return { records, skipped };
}
