// The point schedule: one entry per measured DOF pair, in the order the engineer works.
import { z } from 'zod';
import { uuidSchema, versionSchema } from './common.ts';

export const scheduleStatuses = ['planned', 'in-progress', 'done', 'flagged', 'skipped'] as const;
export type ScheduleStatus = (typeof scheduleStatuses)[number];

export const scheduleGenerateSchema = z.strictObject({
  requiredHits: z.number().int().min(1).max(100).optional(),
});

export const scheduleEntryPatchSchema = z.strictObject({
  version: versionSchema,
  status: z.enum(scheduleStatuses).optional(),
  requiredHits: z.number().int().min(1).max(100).optional(),
  assigneeId: z.string().min(1).nullable().optional(),
  note: z.string().max(2000).optional(),
});

export const scheduleReorderSchema = z.strictObject({
  order: z.array(uuidSchema).min(1).max(50_000),
});
