// Kit: hammers and accelerometers with their calibration records, and the channel map.
import { z } from 'zod';
import { dofLabelSchema, uuidSchema, versionSchema } from './common.ts';

/** Standard acceleration of gravity, exact by definition (ISO 80000-3; docs/methods.md#units). */
export const STANDARD_GRAVITY = 9.80665;
/** One pound-force in newtons, exact (docs/methods.md#units). */
export const NEWTONS_PER_LBF = 4.4482216152605;

export const hammerUnits = ['mV/N', 'mV/lbf'] as const;
export const accelerometerUnits = ['mV/(m/s²)', 'mV/g'] as const;
export type SensitivityUnit = (typeof hammerUnits)[number] | (typeof accelerometerUnits)[number];

/**
 * Converts a sensitivity to Resonote's base units: mV/N for force, mV/(m/s²) for acceleration.
 * 100 mV/g → 10.1972 mV/(m/s²); 10 mV/lbf → 2.2481 mV/N (docs/methods.md#units).
 */
export function toBaseSensitivity(value: number, unit: SensitivityUnit): number {
  switch (unit) {
    case 'mV/N':
    case 'mV/(m/s²)':
      return value;
    case 'mV/g':
      return value / STANDARD_GRAVITY;
    case 'mV/lbf':
      return value / NEWTONS_PER_LBF;
  }
}

export const text = (max: number) => z.string().trim().max(max);
export const sensitivity = z.number({ error: 'sensitivity must be a number' }).finite().positive('sensitivity must be > 0').max(1e6);
/** The measuring axes of a sensor, each at most once. */
export const axisList = z
  .array(z.enum(['X', 'Y', 'Z']))
  .min(1, 'list at least one axis')
  .max(3)
  .refine((a) => new Set(a).size === a.length, 'an axis is listed twice');

/** What names every transducer and conditioner, campaign kit or lab kit: model and serial number. */
export const itemIdentityFields = {
  model: text(120).min(1, 'enter the model'),
  serial: text(80).min(1, 'enter the serial number'),
};
/** A hammer's tips, by name. */
export const hammerTips = z.array(text(60).min(1)).max(12);

export const hammerCreateSchema = z.strictObject({
  kind: z.literal('hammer'),
  ...itemIdentityFields,
  sensitivity,
  sensitivityUnit: z.enum(hammerUnits),
  tips: hammerTips.default([]),
  massG: z.number().positive().max(50_000).nullable().default(null),
  notes: text(2000).default(''),
});

export const accelerometerCreateSchema = z.strictObject({
  kind: z.literal('accelerometer'),
  ...itemIdentityFields,
  sensitivity,
  sensitivityUnit: z.enum(accelerometerUnits),
  axes: axisList.default(['Z']),
  massG: z.number().positive().max(50_000).nullable().default(null),
  notes: text(2000).default(''),
});

export const kitItemCreateSchema = z.discriminatedUnion('kind', [hammerCreateSchema, accelerometerCreateSchema]);
export type KitItemCreate = z.infer<typeof kitItemCreateSchema>;

/** The fields a change to any kit item may carry (campaign kit and lab kit), beside the version read. */
export const itemPatchFields = {
  version: versionSchema,
  model: text(120).min(1).optional(),
  serial: text(80).min(1).optional(),
  tips: hammerTips.optional(),
  axes: axisList.optional(),
  notes: text(2000).optional(),
  retired: z.boolean().optional(),
};

export const kitItemPatchSchema = z.strictObject({
  ...itemPatchFields,
  sensitivity: sensitivity.optional(),
  sensitivityUnit: z.enum([...hammerUnits, ...accelerometerUnits]).optional(),
  massG: z.number().positive().max(50_000).nullable().optional(),
  /** Confirms a sensitivity change beyond the campaign's tolerance (lab.ts largeSensitivityChange). */
  confirmLargeChange: z.boolean().optional(),
});

export const isoDate = z.iso.date('use a date written YYYY-MM-DD');

/** The fields of a calibration certificate, for a campaign's kit item and for a lab item (lab.ts). */
export const calibrationFields = {
  calibratedOn: isoDate,
  dueOn: isoDate,
  certificateRef: text(120).min(1, 'enter the certificate reference'),
  performedBy: text(120).min(1, 'enter who calibrated it (lab or person)'),
  /** The sensitivity the certificate states, in the item's unit; updates the item when given. */
  sensitivity: sensitivity.optional(),
  /** Confirms a sensitivity change beyond the campaign's tolerance (lab.ts largeSensitivityChange). */
  confirmLargeChange: z.boolean().optional(),
};

/** A certificate's due date comes after its calibration date. */
export function dueAfterCalibration<T extends z.ZodType<{ calibratedOn: string; dueOn: string }>>(schema: T) {
  return schema.refine((c) => c.dueOn > c.calibratedOn, { message: 'the due date must be after the calibration date', path: ['dueOn'] });
}

export const calibrationCreateSchema = dueAfterCalibration(z.strictObject(calibrationFields));

/** Days before the due date when Resonote starts warning (issue 4: 30 days). */
export const CALIBRATION_WARNING_DAYS = 30;

export type CalibrationState = 'ok' | 'due-soon' | 'overdue' | 'none';

/** Calibration status on `today` (YYYY-MM-DD) for a due date (YYYY-MM-DD) or none. */
export function calibrationState(dueOn: string | null, today: string): { state: CalibrationState; days: number | null } {
  if (!dueOn) return { state: 'none', days: null };
  const days = Math.round((Date.parse(`${dueOn}T00:00:00Z`) - Date.parse(`${today}T00:00:00Z`)) / 86_400_000);
  if (days < 0) return { state: 'overdue', days };
  if (days <= CALIBRATION_WARNING_DAYS) return { state: 'due-soon', days };
  return { state: 'ok', days };
}

export const channelCreateSchema = z.strictObject({
  channel: z.number().int().min(1, 'channels are numbered from 1').max(256),
  kitItemId: uuidSchema,
  /** Which axis of a triaxial sensor; the only axis of a uniaxial one. */
  axis: z.enum(['X', 'Y', 'Z']).nullable().default(null),
  /** The DOF this channel measures when it stays put; null when it follows the schedule (roving). */
  dof: dofLabelSchema.nullable().default(null),
  /** +1 when the sensor's axis points along the DOF's direction, −1 when against it. */
  sign: z.union([z.literal(1), z.literal(-1)]).default(1),
  label: text(60).default(''),
});

export const channelPatchSchema = z.strictObject({
  version: versionSchema,
  kitItemId: uuidSchema.optional(),
  axis: z.enum(['X', 'Y', 'Z']).nullable().optional(),
  dof: dofLabelSchema.nullable().optional(),
  sign: z.union([z.literal(1), z.literal(-1)]).optional(),
  label: text(60).optional(),
});
