// Building blocks shared by every schema: DOF labels, versions, ids.
import { z } from 'zod';

export const directions = ['+X', '-X', '+Y', '-Y', '+Z', '-Z'] as const;
export type Direction = (typeof directions)[number];
export const directionSchema = z.enum(directions);

/** Point labels: letters, digits and . _ - (so DOF labels like `B01:+Z` stay unambiguous). */
export const pointLabelSchema = z
  .string()
  .trim()
  .min(1, 'a point label cannot be empty')
  .max(32, 'a point label has at most 32 characters')
  .regex(/^[A-Za-z0-9][A-Za-z0-9._-]*$/, 'a point label uses letters, digits, ".", "_" or "-" and starts with a letter or digit');

/** A DOF: node label, a colon, a signed axis — `12:+Z` (docs/methods.md#dof-signs). */
export const dofLabelSchema = z
  .string()
  .trim()
  .regex(/^[A-Za-z0-9][A-Za-z0-9._-]*:[+-][XYZ]$/, 'a DOF is written point:±axis, for example B01:+Z');

export function parseDof(label: string): { point: string; direction: Direction } {
  const [point, direction] = label.split(':');
  return { point: point!, direction: direction as Direction };
}

export const uuidSchema = z.uuid('not a valid id');

/** Optimistic concurrency: the row version the client last saw. */
export const versionSchema = z.number({ error: 'version is required (the version you last read)' }).int().positive();

/** Millimetres, finite, within ±100 m. */
export const coordinateSchema = z.number({ error: 'a coordinate must be a number (mm)' }).finite().min(-100_000).max(100_000);

/**
 * An Idempotency-Key (header or field of an upload, field of a simulated take): 8–200 characters
 * of letters, digits and . _ : ~ - — a UUID fits. Compared exactly; one key names one recording.
 */
export const IDEMPOTENCY_KEY_RULE = '8–200 characters of letters, digits and . _ : ~ - (a UUID fits)';
export const idempotencyKeySchema = z
  .string()
  .regex(/^[A-Za-z0-9._:~-]{8,200}$/, `an Idempotency-Key is ${IDEMPOTENCY_KEY_RULE}`);
