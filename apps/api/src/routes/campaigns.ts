// Campaigns: list, create, read, change, and the audit trail (design.md, "Who uses it"). Members:
// routes/members.ts; invitations: routes/invitations.ts.
import { and, asc, count, desc, eq, inArray, isNotNull, isNull, lt, sql } from 'drizzle-orm';
import { z } from 'zod';
import { campaignCreateSchema, campaignListFilters, campaignPatchSchema } from '@resonote/contracts';
import { auditEvent, campaign, campaignArchive, campaignMember, scheduleEntry, user } from '@resonote/db/schema';
import type { Deps } from './deps.ts';
import { audit } from '../http/audit.ts';
import { staleWrite } from '../http/concurrency.ts';
import { intQuery } from '../http/route.ts';
import {  forbidden, notFound } from '../errors.ts';


export function registerCampaignRoutes({ routes, db }: Deps): void {
  async function loadCampaign(id: string) {
    const [row] = await db.select().from(campaign).where(eq(campaign.id, id));
    if (!row) throw notFound('That campaign');
    return row;
  }

  routes.add({
    method: 'get',
    path: '/campaigns',
    tag: 'Campaigns',
    access: 'user',
    summary: 'Campaigns the caller belongs to (every campaign for an admin), with progress and leads; ?status= active (default: not archived), archived, all, or one workflow status (not archived)',
    query: z.strictObject({ q: z.string().trim().max(100).optional(), status: z.enum(campaignListFilters).default('active') }),
    handler: async ({ user: me, query }) => {
      const mine = db.select({ campaignId: campaignMember.campaignId, role: campaignMember.role }).from(campaignMember).where(eq(campaignMember.userId, me.id)).as('mine');
      const rows = await db
        .select({
          id: campaign.id,
          name: campaign.name,
          structure: campaign.structure,
          client: campaign.client,
          status: campaign.status,
          purpose: campaign.purpose,
          testType: campaign.testType,
          updatedAt: campaign.updatedAt,
          archivedAt: campaignArchive.archivedAt,
          myRole: mine.role,
        })
        .from(campaign)
        .leftJoin(mine, eq(mine.campaignId, campaign.id))
        .leftJoin(campaignArchive, eq(campaignArchive.campaignId, campaign.id))
        .where(
          and(
            me.role === 'admin' ? undefined : sql`${mine.role} IS NOT NULL`,
            query.status === 'all' ? undefined : query.status === 'archived' ? isNotNull(campaignArchive.campaignId) : isNull(campaignArchive.campaignId),
            query.status !== 'all' && query.status !== 'archived' && query.status !== 'active' ? eq(campaign.status, query.status) : undefined,
            query.q ? sql`(${campaign.name} ILIKE ${'%' + query.q + '%'} OR ${campaign.structure} ILIKE ${'%' + query.q + '%'} OR ${campaign.client} ILIKE ${'%' + query.q + '%'})` : undefined,
          ),
        )
        .orderBy(asc(campaign.name));
      const ids = rows.map((r) => r.id);
      const progress = ids.length
        ? await db.select({ campaignId: scheduleEntry.campaignId, status: scheduleEntry.status, n: count() }).from(scheduleEntry).where(inArray(scheduleEntry.campaignId, ids)).groupBy(scheduleEntry.campaignId, scheduleEntry.status)
        : [];
      const leads = ids.length
        ? await db.select({ campaignId: campaignMember.campaignId, name: user.name }).from(campaignMember).innerJoin(user, eq(user.id, campaignMember.userId)).where(and(inArray(campaignMember.campaignId, ids), eq(campaignMember.role, 'lead')))
        : [];
      return {
        campaigns: rows.map((r) => {
          const counts: Record<string, number> = { planned: 0, 'in-progress': 0, done: 0, flagged: 0, skipped: 0 };
          for (const p of progress) if (p.campaignId === r.id) counts[p.status] = p.n;
          const total = Object.values(counts).reduce((a, b) => a + b, 0);
          return { ...r, myRole: r.myRole ?? (me.role === 'admin' ? 'admin' : null), progress: { ...counts, total }, leads: leads.filter((l) => l.campaignId === r.id).map((l) => l.name) };
        }),
      };
    },
  });

  routes.add({
    method: 'post',
    path: '/campaigns',
    tag: 'Campaigns',
    access: 'user',
    summary: 'Create a campaign; the creator becomes its lead (admins, and people who lead a campaign already)',
    body: campaignCreateSchema,
    status: 201,
    handler: async ({ body, user: me }) => {
      if (me.role !== 'admin') {
        const [lead] = await db.select({ n: count() }).from(campaignMember).where(and(eq(campaignMember.userId, me.id), eq(campaignMember.role, 'lead')));
        if (!lead?.n) throw forbidden('Only admins and campaign leads can create campaigns. Ask an admin to create one and invite you as its lead.');
      }
      return db.transaction(async (tx) => {
        const [row] = await tx.insert(campaign).values({ ...body, createdBy: me.id }).returning();
        await tx.insert(campaignMember).values({ campaignId: row!.id, userId: me.id, role: 'lead' });
        await audit(tx, { campaignId: row!.id, actorId: me.id, entity: 'campaign', entityId: row!.id, action: 'create', after: row });
        return { campaign: row, myRole: 'lead' };
      });
    },
  });

  routes.add({
    method: 'get',
    path: '/campaigns/:campaignId',
    tag: 'Campaigns',
    access: 'viewer',
    summary: 'One campaign with the caller’s role; archivedAt is set while it is archived (read-only)',
    handler: async ({ campaign: access }) => {
      const row = await loadCampaign(access.campaignId);
      const [archived] = await db.select().from(campaignArchive).where(eq(campaignArchive.campaignId, access.campaignId));
      return { campaign: { ...row, archivedAt: archived?.archivedAt ?? null, archiveReason: archived?.reason ?? null }, myRole: access.role };
    },
  });

  routes.add({
    method: 'patch',
    path: '/campaigns/:campaignId',
    tag: 'Campaigns',
    access: 'lead',
    summary: 'Change a campaign (name, structure, client, purpose, status, test type, reference DOFs, notes)',
    body: campaignPatchSchema,
    handler: async ({ body, campaign: access, user: me }) => {
      const { version, ...changes } = body;
      return db.transaction(async (tx) => {
        const [before] = await tx.select().from(campaign).where(eq(campaign.id, access.campaignId)).for('update');
        if (!before) throw notFound('That campaign');
        if (before.version !== version) throw staleWrite('The campaign', before);
        const [after] = await tx
          .update(campaign)
          .set({ ...changes, version: before.version + 1, updatedAt: new Date() })
          .where(eq(campaign.id, access.campaignId))
          .returning();
        await audit(tx, { campaignId: access.campaignId, actorId: me.id, entity: 'campaign', entityId: access.campaignId, action: 'update', before, after });
        return { campaign: after };
      });
    },
  });

  routes.add({
    method: 'get',
    path: '/campaigns/:campaignId/audit',
    tag: 'Audit',
    access: 'lead',
    summary: 'The audit trail of the campaign, newest first',
    query: z.strictObject({ limit: intQuery(100, 1000), before: z.coerce.number().int().positive().optional(), entity: z.string().max(40).optional() }),
    returns: '{ events: [{ id, at, actor, entity, entityId, action, before, after }] }; page with ?before=<id>',
    handler: async ({ query, campaign: access }) => {
      const events = await db
        .select({ id: auditEvent.id, at: auditEvent.at, actorId: auditEvent.actorId, actor: user.name, entity: auditEvent.entity, entityId: auditEvent.entityId, action: auditEvent.action, before: auditEvent.before, after: auditEvent.after })
        .from(auditEvent)
        .leftJoin(user, eq(user.id, auditEvent.actorId))
        .where(and(eq(auditEvent.campaignId, access.campaignId), query.before ? lt(auditEvent.id, query.before) : undefined, query.entity ? eq(auditEvent.entity, query.entity) : undefined))
        .orderBy(desc(auditEvent.id))
        .limit(query.limit);
      return { events };
    },
  });
}
