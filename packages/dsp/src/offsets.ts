// Offset (DC) removal of triggered impact records before the windows (docs/methods.md#frf-averaging).
import { checkSamples } from './validate.ts';

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
  const m = Math.max(1, Math.round(preTriggerSamples));
  return channels.map((ch, c) => {
    checkSamples(ch, `channels[${c}]`);
    let mean = 0;
    const k = Math.min(m, ch.length);
    for (let i = 0; i < k; i++) mean += ch[i];
    mean /= k;
    const out = new Float64Array(ch.length);
    for (let i = 0; i < ch.length; i++) out[i] = ch[i] - mean;
    return out;
  });
}
