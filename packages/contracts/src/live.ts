// Live input through an audio-class interface: the per-channel input scaling (volts at digital
// full scale, AC-coupling low cut-off) and the calibrator sensitivity check (docs/methods.md#input-scaling).
import { z } from 'zod';
import { uuidSchema } from './common.ts';

export const inputScalingSchema = z.strictObject({
  /** Volts at digital full scale (a sample of ±1.0). Audio interfaces: about 0.1–30 V. */
  fullScaleVolts: z.number({ error: 'fullScaleVolts is required (volts at digital full scale)' }).finite().positive('the full scale must be above 0 V').max(1000, 'a full scale above 1000 V is not an audio interface'),
  /** The interface's AC-coupling low cut-off (−3 dB) in Hz; null when unknown. */
  acLowCutHz: z.number().finite().min(0, 'the low cut-off cannot be negative').max(10_000).nullable().default(null),
  /** The version you last read (omit when the channel has no scaling yet). */
  version: z.number().int().positive().optional(),
});
export type InputScaling = z.infer<typeof inputScalingSchema>;

/** A common handheld calibrator: 10 m/s² RMS at 159.2 Hz (ω = 1000 rad/s), common practice. */
export const CALIBRATOR_DEFAULT = { levelMs2Rms: 10, frequencyHz: 159.2 } as const;

export const sensitivityCheckSchema = z.strictObject({
  channelId: uuidSchema,
  referenceMs2Rms: z.number().finite().positive('the calibrator level must be above 0 m/s²').max(1000),
  referenceHz: z.number().finite().positive('the calibrator frequency must be above 0 Hz').max(50_000),
  measuredVoltsRms: z.number().finite().positive('the recording held no signal (0 V RMS)').max(1000),
  measuredHz: z.number().finite().positive().max(100_000),
  sampleRateHz: z.number().finite().positive().max(1_000_000),
  durationS: z.number().finite().positive().max(600),
  note: z.string().trim().max(500).default(''),
});
export type SensitivityCheckInput = z.infer<typeof sensitivityCheckSchema>;

/**
 * Sensitivity found by a calibrator check and its deviation from the kit's value.
 * measured = V_rms / a_rms in mV/(m/s²); deviation % = 100 (measured − kit)/kit; dB = 20 log10(measured/kit).
 */
export function sensitivityDeviation(measuredVoltsRms: number, referenceMs2Rms: number, kitMvPerMs2: number) {
  if (!(referenceMs2Rms > 0)) throw new RangeError(`referenceMs2Rms=${referenceMs2Rms} must be > 0`);
  if (!(kitMvPerMs2 > 0)) throw new RangeError(`kitMvPerMs2=${kitMvPerMs2} must be > 0`);
  const measured = (measuredVoltsRms * 1000) / referenceMs2Rms;
  return { measured, percent: (100 * (measured - kitMvPerMs2)) / kitMvPerMs2, db: 20 * Math.log10(measured / kitMvPerMs2) };
}
