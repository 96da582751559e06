// The lab's kit inventory, bookings, the campaign's calibration policy, sensitivity-change
// confirmation and notes/photos per DOF: schemas shared by the API and the web app.
import { z } from 'zod';
import { accelerometerUnits, axisList, calibrationFields, dueAfterCalibration, hammerTips, hammerUnits, isoDate, itemIdentityFields, itemPatchFields, NEWTONS_PER_LBF, sensitivity, text, STANDARD_GRAVITY, toBaseSensitivity, type SensitivityUnit } from './kit.ts';
import { uuidSchema, versionSchema } from './common.ts';

export const labKinds = ['hammer', 'accelerometer', 'conditioner'] as const;
export type LabKind = (typeof labKinds)[number];

/** Per-axis sensitivities of a triaxial sensor, in the item's unit. */
const axisSensitivities = z.strictObject({ X: sensitivity.optional(), Y: sensitivity.optional(), Z: sensitivity.optional() });

export const labItemCreateSchema = z.discriminatedUnion('kind', [
  z.strictObject({
    kind: z.literal('hammer'),
    ...itemIdentityFields,
    sensitivity,
    sensitivityUnit: z.enum(hammerUnits),
    tips: hammerTips.default([]),
    notes: text(2000).default(''),
  }),
  z.strictObject({
    kind: z.literal('accelerometer'),
    ...itemIdentityFields,
    sensitivity,
    sensitivityUnit: z.enum(accelerometerUnits),
    axes: axisList.default(['Z']),
    axisSensitivities: axisSensitivities.default({}),
    notes: text(2000).default(''),
  }),
  z.strictObject({
    kind: z.literal('conditioner'),
    ...itemIdentityFields,
    notes: text(2000).default(''),
  }),
]);
export type LabItemCreate = z.infer<typeof labItemCreateSchema>;

export const labItemPatchSchema = z.strictObject(itemPatchFields);

/** A lab item's certificate: a campaign item's fields (kit.ts), and per-axis values for a triaxial sensor. When a
 * sensitivity is given it updates the item and every campaign that borrows it. */
export const labCalibrationCreateSchema = dueAfterCalibration(z.strictObject({ ...calibrationFields, axisSensitivities: axisSensitivities.optional() }));

export const bookingCreateSchema = z
  .strictObject({
    labItemId: uuidSchema,
    fromOn: isoDate,
    toOn: isoDate,
  })
  .refine((b) => b.toOn >= b.fromOn, { message: 'the booking ends on or after the day it starts', path: ['toOn'] });

export const calibrationPolicies = ['warn', 'block'] as const;
export type CalibrationPolicy = (typeof calibrationPolicies)[number];

/**
 * Default tolerance between a new and the previous sensitivity before Resonote asks to confirm:
 * 5 %, common practice (a sensor's recalibration normally moves by a few per cent; a bigger step
 * is usually a unit or a typing mistake).
 */
export const DEFAULT_CHANGE_TOLERANCE_PCT = 5;

export const kitPolicyPutSchema = z.strictObject({
  /** The version read (0 when the campaign still has the defaults). */
  baseVersion: z.number().int().min(0),
  calibration: z.enum(calibrationPolicies),
  changeTolerancePct: z.number().finite().min(0.1, 'the tolerance is at least 0.1 %').max(100, 'the tolerance is at most 100 %'),
});

/** A sensitivity in both units of its kind: [base unit, the other unit]. */
export function inBothUnits(base: number, kind: 'hammer' | 'accelerometer'): { value: number; unit: SensitivityUnit }[] {
  // 1 lbf = 4.4482216152605 N and g_n = 9.80665 m/s², both exact by definition (docs/methods.md#units).
  return kind === 'hammer'
    ? [
        { value: base, unit: 'mV/N' },
        { value: base * NEWTONS_PER_LBF, unit: 'mV/lbf' },
      ]
    : [
        { value: base, unit: 'mV/(m/s²)' },
        { value: base * STANDARD_GRAVITY, unit: 'mV/g' },
      ];
}

export interface SensitivityChange {
  /** |new − old| / old × 100, on base units. */
  changePct: number;
  tolerancePct: number;
  previous: { value: number; unit: SensitivityUnit }[];
  next: { value: number; unit: SensitivityUnit }[];
}

/** The change from `previousBase` to `nextBase` (both base units), or null when within tolerance. */
export function largeSensitivityChange(previousBase: number, nextBase: number, kind: 'hammer' | 'accelerometer', tolerancePct: number): SensitivityChange | null {
  const changePct = (Math.abs(nextBase - previousBase) / previousBase) * 100;
  if (!(changePct > tolerancePct)) return null;
  return { changePct, tolerancePct, previous: inBothUnits(previousBase, kind), next: inBothUnits(nextBase, kind) };
}

/** Per-axis sensitivities in the item's unit → base units. */
export function axisSensitivitiesToBase(values: Partial<Record<'X' | 'Y' | 'Z', number>> | undefined, unit: SensitivityUnit): Partial<Record<'X' | 'Y' | 'Z', number>> {
  const out: Partial<Record<'X' | 'Y' | 'Z', number>> = {};
  for (const axis of ['X', 'Y', 'Z'] as const) {
    const v = values?.[axis];
    if (v !== undefined) out[axis] = toBaseSensitivity(v, unit);
  }
  return out;
}

export const noteTopics = ['sensor-mounting', 'tip', 'other'] as const;
export type NoteTopic = (typeof noteTopics)[number];
export const NOTE_TOPIC_NAMES: Record<NoteTopic, string> = { 'sensor-mounting': 'Sensor mounting', tip: 'Tip', other: 'Other' };

/** The text fields of a note's multipart form (the photo, optional, in the field "file"). */
export const dofNoteFieldsSchema = z.strictObject({
  topic: z.enum(noteTopics).default('other'),
  text: text(2000).default(''),
});

/** Largest photo accepted: 8 MB (a phone photo at 12 MP as JPEG is 2–5 MB). */
export const PHOTO_MAX_BYTES = 8 * 1024 * 1024;
export const photoTypes = ['image/jpeg', 'image/png', 'image/webp'] as const;
export type PhotoType = (typeof photoTypes)[number];

/**
 * The image type from the file's first bytes (its signature), never from its name or the
 * browser's content type: JPEG FF D8 FF; PNG 89 50 4E 47 0D 0A 1A 0A; WebP "RIFF" …. "WEBP"
 * (the formats' specifications: ITU-T T.81 Annex B, ISO/IEC 15948 §5.2, Google's RIFF container).
 */
export function photoTypeOf(bytes: Uint8Array): PhotoType | null {
  if (bytes.length >= 3 && bytes[0] === 0xff && bytes[1] === 0xd8 && bytes[2] === 0xff) return 'image/jpeg';
  const png = [0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a];
  if (bytes.length >= 8 && png.every((b, i) => bytes[i] === b)) return 'image/png';
  const ascii = (from: number, to: number) => String.fromCharCode(...bytes.subarray(from, to));
  if (bytes.length >= 12 && ascii(0, 4) === 'RIFF' && ascii(8, 12) === 'WEBP') return 'image/webp';
  return null;
}
