// The point schedule: generated from the test type and the reference DOFs, ordered, with status,
// required hits and assignee.
import { aliasedTable, and, eq, sql } from 'drizzle-orm';
import { z } from 'zod';
import { scheduleEntryPatchSchema, scheduleGenerateSchema, scheduleReorderSchema, uuidSchema } from '@resonote/contracts';
import { campaign, campaignMember, point, scheduleEntry, user } from '@resonote/db/schema';
import type { Deps } from './deps.ts';
import { listScheduleEntries } from '../plan/schedule-list.ts';
import { withFlagReasons } from '../hits/entry-flags.ts';
import { audit } from '../http/audit.ts';
import { staleWrite } from '../http/concurrency.ts';
import { badRequest, forbidden, HttpError, notFound } from '../errors.ts';
import { generateSchedule } from '../plan/schedule-generate.ts';

const responsePoint = aliasedTable(point, 'response_point');
const excitationPoint = aliasedTable(point, 'excitation_point');

export function registerScheduleRoutes({ routes, db, events }: Deps): void {
  const listSchedule = async (campaignId: string, entryIds?: string[]) => withFlagReasons(db, campaignId, await listScheduleEntries(db, campaignId, entryIds));

  routes.add({
    method: 'get',
    path: '/campaigns/:campaignId/schedule',
    tag: 'Schedule',
    access: 'viewer',
    tokenAccess: true,
    summary: 'The schedule in working order: each entry is H(response DOF, excitation DOF) with status, hits and assignee',
    handler: async ({ campaign: access }) => ({ entries: await listSchedule(access.campaignId) }),
  });

  routes.add({
    method: 'get',
    path: '/campaigns/:campaignId/schedule/next',
    tag: 'Schedule',
    access: 'viewer',
    summary: 'The entry to work on next: the first in progress, else the first planned (optionally among those assigned to the caller)',
    query: z.strictObject({ mine: z.enum(['true', 'false']).optional() }),
    handler: async ({ query, user: me, campaign: access }) => {
      const entries = await listSchedule(access.campaignId);
      const pool = query.mine === 'true' ? entries.filter((e) => e.assigneeId === me.id || e.assigneeId === null) : entries;
      const next = pool.find((e) => e.status === 'in-progress') ?? pool.find((e) => e.status === 'planned') ?? null;
      return { next, remaining: entries.filter((e) => e.status === 'planned' || e.status === 'in-progress').length };
    },
  });

  routes.add({
    method: 'post',
    path: '/campaigns/:campaignId/schedule/generate',
    tag: 'Schedule',
    access: 'lead',
    summary: 'Build the schedule from the test type, the reference DOFs and the points’ directions. Keeps existing entries; adds the missing ones at the end; removes planned entries that no longer apply and have no hits',
    body: scheduleGenerateSchema,
    returns: '{ added, removed, kept, entries }',
    handler: async ({ body, campaign: access, user: me }) => {
      const summary = await db.transaction((tx) => generateSchedule(tx, access.campaignId, me.id, body.requiredHits));
      void events.publish(access.campaignId, { type: 'schedule' });
      return { ...summary, entries: await listSchedule(access.campaignId) };
    },
  });

  routes.add({
    method: 'patch',
    path: '/campaigns/:campaignId/schedule/:entryId',
    tag: 'Schedule',
    access: 'engineer',
    summary: 'Change an entry: status and note (engineers and leads); required hits and assignee (leads)',
    body: scheduleEntryPatchSchema,
    handler: async ({ body, params, campaign: access, user: me }) => {
      if (!uuidSchema.safeParse(params.entryId).success) throw notFound('That schedule entry');
      const isLead = access.role === 'lead' || access.role === 'admin';
      if (!isLead && (body.requiredHits !== undefined || body.assigneeId !== undefined)) throw forbidden('Only a lead changes the required hits or the assignee.');
      if (body.assigneeId) {
        const [m] = await db.select({ userId: campaignMember.userId }).from(campaignMember).where(and(eq(campaignMember.campaignId, access.campaignId), eq(campaignMember.userId, body.assigneeId)));
        if (!m) throw badRequest('The assignee must be a member of this campaign.');
      }
      const { version, ...changes } = body;
      await db.transaction(async (tx) => {
        const [before] = await tx.select().from(scheduleEntry).where(and(eq(scheduleEntry.id, params.entryId!), eq(scheduleEntry.campaignId, access.campaignId))).for('update');
        if (!before) throw notFound('That schedule entry');
        if (before.version !== version) throw staleWrite('The schedule entry', before);
        const [after] = await tx.update(scheduleEntry).set({ ...changes, version: before.version + 1, updatedAt: new Date() }).where(eq(scheduleEntry.id, before.id)).returning();
        await audit(tx, { campaignId: access.campaignId, actorId: me.id, entity: 'schedule-entry', entityId: before.id, action: 'update', before, after });
      });
      void events.publish(access.campaignId, { type: 'schedule', entryId: params.entryId! });
      const [entry] = await listSchedule(access.campaignId, [params.entryId!]);
      return { entry };
    },
  });

  routes.add({
    method: 'post',
    path: '/campaigns/:campaignId/schedule/reorder',
    tag: 'Schedule',
    access: 'lead',
    summary: 'Put the schedule in a new order: send every entry id once, in the wanted order',
    body: scheduleReorderSchema,
    handler: async ({ body, campaign: access, user: me }) => {
      await db.transaction(async (tx) => {
        await tx.select({ id: campaign.id }).from(campaign).where(eq(campaign.id, access.campaignId)).for('update');
        const existing = await tx.select({ id: scheduleEntry.id, position: scheduleEntry.position }).from(scheduleEntry).where(eq(scheduleEntry.campaignId, access.campaignId));
        const ids = new Set(existing.map((e) => e.id));
        if (new Set(body.order).size !== body.order.length) throw badRequest('An entry appears twice in the order.');
        if (body.order.length !== existing.length || body.order.some((id) => !ids.has(id))) {
          throw new HttpError(409, 'schedule-changed', `The order must list all ${existing.length} entries of the schedule exactly once; reload the schedule and try again.`);
        }
        // Two steps so the positions never collide half-way.
        await tx.update(scheduleEntry).set({ position: sql`-${scheduleEntry.position}` }).where(eq(scheduleEntry.campaignId, access.campaignId));
        const values = body.order.map((id, i) => sql`(${id}::uuid, ${i + 1}::int)`);
        await tx.execute(sql`UPDATE ${scheduleEntry} SET position = v.pos, version = ${scheduleEntry.version} + 1, updated_at = now() FROM (VALUES ${sql.join(values, sql`, `)}) AS v(id, pos) WHERE ${scheduleEntry.id} = v.id`);
        await audit(tx, { campaignId: access.campaignId, actorId: me.id, entity: 'schedule', entityId: access.campaignId, action: 'reorder', before: existing.sort((a, b) => a.position - b.position).map((e) => e.id), after: body.order });
      });
      void events.publish(access.campaignId, { type: 'schedule' });
      return { entries: await listSchedule(access.campaignId) };
    },
  });
}
