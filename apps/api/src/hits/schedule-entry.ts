// One schedule entry of a campaign with its DOF labels, as every hit route reads it.
import { aliasedTable, and, eq } from 'drizzle-orm';
import { uuidSchema } from '@resonote/contracts';
import { point, scheduleEntry } from '@resonote/db/schema';
import type { Db } from '@resonote/db/client';
import { notFound } from '../errors.ts';

export const responsePoint = aliasedTable(point, 'response_point');
export const excitationPoint = aliasedTable(point, 'excitation_point');

/** A schedule entry of the campaign with its DOF labels ("P07:+Z"); 404 for an unknown id or another campaign's. */
export async function loadScheduleEntry(db: Db, campaignId: string, entryId: string) {
  if (!uuidSchema.safeParse(entryId).success) throw notFound('That schedule entry');
  const [row] = await db
    .select({
      entry: scheduleEntry,
      responseLabel: responsePoint.label,
      excitationLabel: excitationPoint.label,
    })
    .from(scheduleEntry)
    .innerJoin(responsePoint, eq(responsePoint.id, scheduleEntry.responsePointId))
    .innerJoin(excitationPoint, eq(excitationPoint.id, scheduleEntry.excitationPointId))
    .where(and(eq(scheduleEntry.id, entryId), eq(scheduleEntry.campaignId, campaignId)));
  if (!row) throw notFound('That schedule entry');
  return { ...row.entry, responseDof: `${row.responseLabel}:${row.entry.responseDirection}`, excitationDof: `${row.excitationLabel}:${row.entry.excitationDirection}` };
}

export type ScheduleEntry = Awaited<ReturnType<typeof loadScheduleEntry>>;
