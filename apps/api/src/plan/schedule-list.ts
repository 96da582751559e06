// The schedule of a campaign in working order, with DOF labels, assignee and hit counts — read by
// the schedule routes and by the hand-over report and bundles.
import { aliasedTable, and, asc, eq, inArray, sql } from 'drizzle-orm';
import { hit, point, scheduleEntry, user } from '@resonote/db/schema';
import type { Db } from '@resonote/db/client';
import { notExcluded } from '../hits/exclusion.ts';

const responsePoint = aliasedTable(point, 'response_point');
const excitationPoint = aliasedTable(point, 'excitation_point');

/** Entries ordered by position; `entryIds` limits them. */
export async function listScheduleEntries(db: Db, campaignId: string, entryIds?: string[]) {
  const counts = db
    .select({
      entryId: hit.scheduleEntryId,
      accepted: sql<number>`count(*) FILTER (WHERE ${hit.verdict} = 'accept')::int`.as('accepted'),
      rejected: sql<number>`count(*) FILTER (WHERE ${hit.verdict} = 'reject')::int`.as('rejected'),
    })
    .from(hit)
    .where(and(eq(hit.campaignId, campaignId), notExcluded))
    .groupBy(hit.scheduleEntryId)
    .as('counts');
  const rows = await db
    .select({
      id: scheduleEntry.id,
      position: scheduleEntry.position,
      responsePointId: scheduleEntry.responsePointId,
      responseLabel: responsePoint.label,
      responseDirection: scheduleEntry.responseDirection,
      excitationPointId: scheduleEntry.excitationPointId,
      excitationLabel: excitationPoint.label,
      excitationDirection: scheduleEntry.excitationDirection,
      drivingPoint: scheduleEntry.drivingPoint,
      status: scheduleEntry.status,
      requiredHits: scheduleEntry.requiredHits,
      assigneeId: scheduleEntry.assigneeId,
      assigneeName: user.name,
      note: scheduleEntry.note,
      version: scheduleEntry.version,
      updatedAt: scheduleEntry.updatedAt,
      acceptedHits: sql<number>`coalesce(${counts.accepted}, 0)::int`,
      rejectedHits: sql<number>`coalesce(${counts.rejected}, 0)::int`,
    })
    .from(scheduleEntry)
    .innerJoin(responsePoint, eq(responsePoint.id, scheduleEntry.responsePointId))
    .innerJoin(excitationPoint, eq(excitationPoint.id, scheduleEntry.excitationPointId))
    .leftJoin(user, eq(user.id, scheduleEntry.assigneeId))
    .leftJoin(counts, eq(counts.entryId, scheduleEntry.id))
    .where(and(eq(scheduleEntry.campaignId, campaignId), entryIds ? inArray(scheduleEntry.id, entryIds) : undefined))
    .orderBy(asc(scheduleEntry.position));
  return rows.map((r) => ({ ...r, responseDof: `${r.responseLabel}:${r.responseDirection}`, excitationDof: `${r.excitationLabel}:${r.excitationDirection}` }));
}
