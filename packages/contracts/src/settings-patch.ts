// PATCH of the acquisition settings: send only the fields that change, the rest stays. The nested
// groups (forceWindow, bandHz) may be sent in part; the exponential window is one choice and is
// sent whole. The merged settings go through the full acquisitionSettingsSchema (its rules across
// fields included) before a new version is stored.
import { z } from 'zod';
import { acquisitionSettingsSchema, exponentialWindowSchema, type AcquisitionSettings } from './settings.ts';

const s = acquisitionSettingsSchema.shape;
/** A field with a default would fill itself in when absent; a patch must leave absent fields alone. */
const noDefault = <T extends z.ZodType>(schema: T) => (schema instanceof z.ZodDefault ? (schema.unwrap() as z.ZodType) : schema).optional();

export const acquisitionSettingsPatchSchema = z
  .strictObject({
    sampleRateHz: noDefault(s.sampleRateHz),
    recordLengthS: noDefault(s.recordLengthS),
    preTriggerS: noDefault(s.preTriggerS),
    triggerLevelN: noDefault(s.triggerLevelN),
    forceWindow: s.forceWindow.partial().optional(),
    exponentialWindow: exponentialWindowSchema.optional(),
    hitsToAverage: noDefault(s.hitsToAverage),
    bandHz: s.bandHz.partial().optional(),
    estimator: noDefault(s.estimator),
    doubleHitRatio: noDefault(s.doubleHitRatio),
    overloadPercent: noDefault(s.overloadPercent),
    rollOffDb: noDefault(s.rollOffDb),
    coherenceThreshold: noDefault(s.coherenceThreshold),
    minPeakN: noDefault(s.minPeakN),
    forceRangeN: noDefault(s.forceRangeN),
    responseRangeMs2: noDefault(s.responseRangeMs2),
    resampleUploads: noDefault(s.resampleUploads),
    bridgeFilePattern: noDefault(s.bridgeFilePattern),
  })
  .refine((p) => Object.keys(p).length > 0, { message: 'send at least one setting to change' });

export type AcquisitionSettingsPatch = z.output<typeof acquisitionSettingsPatchSchema>;

export const settingsPatchSchema = z.strictObject({
  /** The version the change is based on; a newer version on the server answers 409. */
  baseVersion: z.number().int().min(0),
  settings: acquisitionSettingsPatchSchema,
  reason: z.string().trim().max(500).default(''),
});

/** The current settings with the patch laid over them (not yet validated as a whole). */
export function applySettingsPatch(current: AcquisitionSettings, patch: AcquisitionSettingsPatch): Record<string, unknown> {
  const merged: Record<string, unknown> = { ...current };
  for (const [k, v] of Object.entries(patch)) {
    if (v === undefined) continue;
    merged[k] = k === 'forceWindow' || k === 'bandHz' ? { ...(current[k] as object), ...(v as object) } : v;
  }
  return merged;
}
