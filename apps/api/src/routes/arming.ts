// Armed DOFs (issue 16): an engineer arms one schedule entry on Tap; the next hits they take — and
// the files their watched-folder bridge sends — go there. Everyone on the campaign sees who has
// armed what, and hears of a change on the campaign's event stream.
import { and, asc, eq } from 'drizzle-orm';
import { armSchema } from '@resonote/contracts';
import { armedDof, scheduleEntry, user } from '@resonote/db/schema';
import type { Deps } from './deps.ts';
import type { CampaignEvents } from '../hits/events.ts';
import { excitationPoint, loadScheduleEntry, responsePoint } from '../hits/schedule-entry.ts';

export function registerArmingRoutes({ routes, db }: Deps, events: CampaignEvents): void {
  async function armedList(campaignId: string, me: string) {
    const rows = await db
      .select({
        userId: armedDof.userId,
        name: user.name,
        entryId: armedDof.scheduleEntryId,
        armedAt: armedDof.armedAt,
        r: responsePoint.label,
        rd: scheduleEntry.responseDirection,
        e: excitationPoint.label,
        ed: scheduleEntry.excitationDirection,
        status: scheduleEntry.status,
      })
      .from(armedDof)
      .innerJoin(user, eq(user.id, armedDof.userId))
      .innerJoin(scheduleEntry, eq(scheduleEntry.id, armedDof.scheduleEntryId))
      .innerJoin(responsePoint, eq(responsePoint.id, scheduleEntry.responsePointId))
      .innerJoin(excitationPoint, eq(excitationPoint.id, scheduleEntry.excitationPointId))
      .where(eq(armedDof.campaignId, campaignId))
      .orderBy(asc(armedDof.armedAt));
    const armed = rows.map((r) => ({ userId: r.userId, name: r.name, entryId: r.entryId, responseDof: `${r.r}:${r.rd}`, excitationDof: `${r.e}:${r.ed}`, status: r.status, armedAt: r.armedAt }));
    return { armed, mine: armed.find((a) => a.userId === me) ?? null };
  }

  routes.add({
    method: 'get',
    path: '/campaigns/:campaignId/arming',
    tag: 'Hits',
    access: 'viewer',
    tokenAccess: true,
    summary: 'Who has armed which DOF (schedule entry) on Tap, and yours',
    returns: '{ armed: [{ userId, name, entryId, responseDof, excitationDof, status, armedAt }], mine }',
    handler: ({ campaign: access, user: me }) => armedList(access.campaignId, me.id),
  });

  routes.add({
    method: 'put',
    path: '/campaigns/:campaignId/arming',
    tag: 'Hits',
    access: 'engineer',
    summary: 'Arm a DOF: your next hits (and your bridge’s files) go to this schedule entry; arming another replaces it',
    body: armSchema,
    handler: async ({ body, campaign: access, user: me }) => {
      const entry = await loadScheduleEntry(db, access.campaignId, body.entryId);
      const now = new Date();
      await db
        .insert(armedDof)
        .values({ campaignId: access.campaignId, userId: me.id, scheduleEntryId: entry.id, armedAt: now })
        .onConflictDoUpdate({ target: [armedDof.campaignId, armedDof.userId], set: { scheduleEntryId: entry.id, armedAt: now } });
      events.publish(access.campaignId, { type: 'arming', entryId: entry.id });
      return armedList(access.campaignId, me.id);
    },
  });

  routes.add({
    method: 'delete',
    path: '/campaigns/:campaignId/arming',
    tag: 'Hits',
    access: 'engineer',
    summary: 'Disarm: nothing is armed for you any more (a bridge leaves files waiting)',
    handler: async ({ campaign: access, user: me }) => {
      const [gone] = await db.delete(armedDof).where(and(eq(armedDof.campaignId, access.campaignId), eq(armedDof.userId, me.id))).returning();
      if (gone) events.publish(access.campaignId, { type: 'arming', entryId: gone.scheduleEntryId });
      return armedList(access.campaignId, me.id);
    },
  });
}
