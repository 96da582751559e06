// Planning a reciprocity pair (design.md "Review": reciprocity H_ij against H_ji; Ewins 2000, ch. 3):
// the lead adds the reciprocal of an entry — response and excitation swapped — to the schedule from
// Plan. The new entry is marked in schedule_extra so "generate" keeps it.
import { and, desc, eq, max } from 'drizzle-orm';
import { uuidSchema } from '@resonote/contracts';
import { acquisitionSettings, scheduleEntry, scheduleExtra } from '@resonote/db/schema';
import type { Deps } from './deps.ts';
import { audit } from '../http/audit.ts';
import { HttpError, notFound } from '../errors.ts';
import { listScheduleEntries } from '../plan/schedule-list.ts';

export function registerReciprocalRoutes({ routes, db, events }: Deps): void {
  routes.add({
    method: 'post',
    path: '/campaigns/:campaignId/schedule/:entryId/reciprocal',
    tag: 'Schedule',
    access: 'lead',
    status: 201,
    summary: 'Add the reciprocal of an entry to the schedule (response and excitation swapped), at the end, for a reciprocity check; generate keeps it',
    returns: '{ entry }; 409 reciprocal-exists with details.entryId when the schedule has it already; 400 driving-point for a driving point (its own reciprocal)',
    handler: async ({ params, campaign: access, user: me }) => {
      if (!uuidSchema.safeParse(params.entryId).success) throw notFound('That schedule entry');
      const id = await db.transaction(async (tx) => {
        const [e] = await tx.select().from(scheduleEntry).where(and(eq(scheduleEntry.id, params.entryId!), eq(scheduleEntry.campaignId, access.campaignId))).for('update');
        if (!e) throw notFound('That schedule entry');
        if (e.responsePointId === e.excitationPointId && e.responseDirection[1] === e.excitationDirection[1]) throw new HttpError(400, 'driving-point', 'A driving point is its own reciprocal: the response and the excitation are the same DOF.');
        const swapped = { responsePointId: e.excitationPointId, responseDirection: e.excitationDirection, excitationPointId: e.responsePointId, excitationDirection: e.responseDirection };
        const [twin] = await tx
          .select({ id: scheduleEntry.id })
          .from(scheduleEntry)
          .where(and(eq(scheduleEntry.campaignId, access.campaignId), eq(scheduleEntry.responsePointId, swapped.responsePointId), eq(scheduleEntry.responseDirection, swapped.responseDirection), eq(scheduleEntry.excitationPointId, swapped.excitationPointId), eq(scheduleEntry.excitationDirection, swapped.excitationDirection)));
        if (twin) throw new HttpError(409, 'reciprocal-exists', 'The schedule has the reciprocal of this entry already.', { entryId: twin.id });
        const [{ last } = { last: 0 }] = await tx.select({ last: max(scheduleEntry.position) }).from(scheduleEntry).where(eq(scheduleEntry.campaignId, access.campaignId));
        const [settings] = await tx.select({ s: acquisitionSettings.settings }).from(acquisitionSettings).where(eq(acquisitionSettings.campaignId, access.campaignId)).orderBy(desc(acquisitionSettings.version)).limit(1);
        const requiredHits = (settings?.s as { hitsToAverage?: number } | undefined)?.hitsToAverage ?? e.requiredHits;
        const [row] = await tx.insert(scheduleEntry).values({ campaignId: access.campaignId, position: (last ?? 0) + 1, ...swapped, drivingPoint: false, requiredHits }).returning();
        await tx.insert(scheduleExtra).values({ entryId: row!.id, purpose: 'reciprocal', ofEntryId: e.id, addedBy: me.id });
        await audit(tx, { campaignId: access.campaignId, actorId: me.id, entity: 'schedule', entityId: row!.id, action: 'add-reciprocal', after: { of: e.id, ...swapped } });
        return row!.id;
      });
      void events.publish(access.campaignId, { type: 'schedule', entryId: id });
      const [entry] = await listScheduleEntries(db, access.campaignId, [id]);
      return { entry };
    },
  });
}
