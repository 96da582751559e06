// Offset (DC) removal of triggered impact records before the windows (docs/methods.md#frf-averaging).
import { checkSamples } from './validate.ts';

/**
 * The offset of one channel: the mean of its first max(1, preTriggerSamples) samples (at most its
 * length), the estimate `removeOffsets` subtracts and `splitRecords` triggers from (common practice;
 * docs/methods.md#frf-averaging). In: samples in any unit; out: the mean in the same unit.
 */
export function channelOffset(ch: ArrayLike<number>, preTriggerSamples: number): number {
  const k = Math.min(Math.max(1, Math.round(preTriggerSamples)), ch.length);
  let mean = 0;
  for (let i = 0; i < k; i++) mean += ch[i]!;
  return mean / k;
}

/**
 * Subtracts each channel's pre-trigger mean from that channel.
 *
 * In: channels of one record (any unit: force in N, responses in their own unit, same or different
 * lengths), preTriggerSamples = round(preTriggerS·fs), the samples recorded before the trigger.
 * Method: mean of the first max(1, preTriggerSamples) samples of each channel (at most its length),
 * subtracted from every sample — the pre-trigger holds no hit, so its mean is the channel's offset
 * (common practice; docs/methods.md#frf-averaging).
 * Out: new Float64Arrays in the channel's unit; the inputs are not changed. A zero pre-trigger uses
 * the first sample alone.
 */
export function removeOffsets(channels: readonly ArrayLike<number>[], preTriggerSamples: number): Float64Array[] {
  if (!Number.isFinite(preTriggerSamples) || preTriggerSamples < 0) {
    throw new RangeError(`preTriggerSamples=${preTriggerSamples} must be a finite number ≥ 0`);
  }
  return channels.map((ch, c) => {
    checkSamples(ch, `channels[${c}]`);
    const mean = channelOffset(ch, preTriggerSamples);
    const out = new Float64Array(ch.length);
    for (let i = 0; i < ch.length; i++) out[i] = ch[i] - mean;
    return out;
  });
}
