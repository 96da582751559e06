// Geometry: points (mm) with their measured directions, and lines between points.
import { z } from 'zod';
import { coordinateSchema, directionSchema, pointLabelSchema, uuidSchema, versionSchema } from './common.ts';

const directionList = z
  .array(directionSchema)
  .max(6)
  .refine((list) => new Set(list).size === list.length, 'a direction is listed twice');

export const pointCreateSchema = z.strictObject({
  label: pointLabelSchema,
  x: coordinateSchema,
  y: coordinateSchema,
  z: coordinateSchema,
  directions: directionList.default([]),
});
export type PointCreate = z.infer<typeof pointCreateSchema>;

export const pointPatchSchema = z.strictObject({
  version: versionSchema,
  label: pointLabelSchema.optional(),
  x: coordinateSchema.optional(),
  y: coordinateSchema.optional(),
  z: coordinateSchema.optional(),
  directions: directionList.optional(),
  /** Retire (true) or bring back (false). A point with recorded hits is retired, never deleted. */
  retired: z.boolean().optional(),
});

export const lineCreateSchema = z
  .strictObject({ pointA: uuidSchema, pointB: uuidSchema })
  .refine((l) => l.pointA !== l.pointB, 'a line joins two different points');

/** Most points one CSV import may carry (a 100 000-row file is refused with this number). */
export const MAX_IMPORT_ROWS = 20_000;
/** Largest geometry CSV accepted, in bytes. */
export const MAX_IMPORT_BYTES = 5 * 1024 * 1024;

export const geometryImportSchema = z.strictObject({
  csv: z.string().max(MAX_IMPORT_BYTES, `the CSV is larger than ${MAX_IMPORT_BYTES / 1024 / 1024} MB`),
  /** replace: retire or delete points not in the file; merge: add new labels and update existing ones. */
  mode: z.enum(['merge', 'replace']).default('merge'),
  directions: directionList.default([]),
  /** refuse (default): any bad row refuses the whole file; skip: import the good rows only, the bad ones are listed in the answer. */
  badRows: z.enum(['refuse', 'skip']).default('refuse'),
});

/** The check of a CSV before import: which rows would be refused, nothing stored. */
export const geometryCheckSchema = z.strictObject({
  csv: z.string().max(MAX_IMPORT_BYTES, `the CSV is larger than ${MAX_IMPORT_BYTES / 1024 / 1024} MB`),
});
