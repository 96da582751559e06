// Campaigns, their members and invitations, and the audit trail (design.md, "Who uses it").
import { and, asc, count, desc, eq, gt, inArray, isNotNull, isNull, lt, sql } from 'drizzle-orm';
import { z } from 'zod';
import { campaignCreateSchema, campaignListFilters, campaignPatchSchema, invitationCreateSchema, memberPatchSchema } from '@resonote/contracts';
import { auditEvent, campaign, campaignArchive, campaignInvitation, campaignMember, scheduleEntry, user } from '@resonote/db/schema';
import type { Deps } from './deps.ts';
import { audit } from '../http/audit.ts';
import { staleWrite } from '../http/concurrency.ts';
import { intQuery } from '../http/route.ts';
import { conflict, forbidden, HttpError, notFound } from '../errors.ts';
import { hashToken, INVITATION_DAYS, mailInvitation, newInvitationToken } from '../invitations.ts';

export function registerCampaignRoutes({ routes, db, config, mailer }: Deps): void {
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
    path: '/campaigns/:campaignId/members',
    tag: 'Members',
    access: 'viewer',
    summary: 'Members of the campaign with their roles',
    handler: async ({ campaign: access }) => {
      const members = await db
        .select({ userId: campaignMember.userId, name: user.name, email: user.email, role: campaignMember.role, version: campaignMember.version, addedAt: campaignMember.addedAt })
        .from(campaignMember)
        .innerJoin(user, eq(user.id, campaignMember.userId))
        .where(eq(campaignMember.campaignId, access.campaignId))
        .orderBy(asc(user.name));
      return { members };
    },
  });

  /** Refuses a change that would leave the campaign without a lead. Runs inside the transaction. */
  async function keepALead(tx: Parameters<Parameters<typeof db.transaction>[0]>[0], campaignId: string, leavingUserId: string) {
    const leads = await tx
      .select({ userId: campaignMember.userId })
      .from(campaignMember)
      .where(and(eq(campaignMember.campaignId, campaignId), eq(campaignMember.role, 'lead')))
      .for('update');
    if (leads.length === 1 && leads[0]!.userId === leavingUserId) throw conflict('A campaign always keeps a lead: make someone else lead first.');
  }

  routes.add({
    method: 'patch',
    path: '/campaigns/:campaignId/members/:userId',
    tag: 'Members',
    access: 'lead',
    summary: 'Change a member’s role',
    body: memberPatchSchema,
    handler: async ({ body, params, campaign: access, user: me }) => {
      return db.transaction(async (tx) => {
        const [before] = await tx.select().from(campaignMember).where(and(eq(campaignMember.campaignId, access.campaignId), eq(campaignMember.userId, params.userId!))).for('update');
        if (!before) throw notFound('That member');
        if (before.version !== body.version) throw staleWrite('The membership', before);
        if (before.role === 'lead' && body.role !== 'lead') await keepALead(tx, access.campaignId, before.userId);
        const [after] = await tx
          .update(campaignMember)
          .set({ role: body.role, version: before.version + 1 })
          .where(and(eq(campaignMember.campaignId, access.campaignId), eq(campaignMember.userId, before.userId)))
          .returning();
        await audit(tx, { campaignId: access.campaignId, actorId: me.id, entity: 'member', entityId: before.userId, action: 'change-role', before, after });
        return { member: after };
      });
    },
  });

  routes.add({
    method: 'delete',
    path: '/campaigns/:campaignId/members/:userId',
    tag: 'Members',
    access: 'lead',
    summary: 'Remove a member from the campaign (their hits stay)',
    handler: async ({ params, campaign: access, user: me }) => {
      await db.transaction(async (tx) => {
        const [before] = await tx.select().from(campaignMember).where(and(eq(campaignMember.campaignId, access.campaignId), eq(campaignMember.userId, params.userId!))).for('update');
        if (!before) throw notFound('That member');
        if (before.role === 'lead') await keepALead(tx, access.campaignId, before.userId);
        await tx.delete(campaignMember).where(and(eq(campaignMember.campaignId, access.campaignId), eq(campaignMember.userId, before.userId)));
        await audit(tx, { campaignId: access.campaignId, actorId: me.id, entity: 'member', entityId: before.userId, action: 'remove', before });
      });
      return undefined;
    },
  });

  routes.add({
    method: 'get',
    path: '/campaigns/:campaignId/invitations',
    tag: 'Members',
    access: 'lead',
    summary: 'Open invitations of the campaign',
    handler: async ({ campaign: access }) => {
      const rows = await db
        .select({ id: campaignInvitation.id, email: campaignInvitation.email, role: campaignInvitation.role, createdAt: campaignInvitation.createdAt, expiresAt: campaignInvitation.expiresAt })
        .from(campaignInvitation)
        .where(and(eq(campaignInvitation.campaignId, access.campaignId), isNull(campaignInvitation.acceptedAt), isNull(campaignInvitation.revokedAt), gt(campaignInvitation.expiresAt, new Date())))
        .orderBy(desc(campaignInvitation.createdAt));
      return { invitations: rows };
    },
  });

  routes.add({
    method: 'post',
    path: '/campaigns/:campaignId/invitations',
    tag: 'Members',
    access: 'lead',
    summary: 'Invite someone by e-mail with a role; the mail holds a link that signs up or joins',
    body: invitationCreateSchema,
    status: 201,
    handler: async ({ body, campaign: access, user: me }) => {
      const target = await loadCampaign(access.campaignId);
      const [already] = await db
        .select({ n: count() })
        .from(campaignMember)
        .innerJoin(user, eq(user.id, campaignMember.userId))
        .where(and(eq(campaignMember.campaignId, access.campaignId), sql`lower(${user.email}) = ${body.email}`));
      if (already?.n) throw conflict(`${body.email} is already a member of this campaign.`);
      const { token, tokenHash } = newInvitationToken();
      const expiresAt = new Date(Date.now() + INVITATION_DAYS * 86_400_000);
      const invitation = await db.transaction(async (tx) => {
        const [row] = await tx.insert(campaignInvitation).values({ campaignId: access.campaignId, email: body.email, role: body.role, tokenHash, invitedBy: me.id, expiresAt }).returning();
        await audit(tx, { campaignId: access.campaignId, actorId: me.id, entity: 'invitation', entityId: row!.id, action: 'create', after: { email: body.email, role: body.role, expiresAt } });
        return row!;
      });
      try {
        await mailInvitation(mailer, config.publicUrl, { to: body.email, token, role: body.role, inviterName: me.name, campaign: target });
      } catch (err) {
        await db.update(campaignInvitation).set({ revokedAt: new Date() }).where(eq(campaignInvitation.id, invitation.id));
        throw new HttpError(502, 'mail-failed', `The invitation mail could not be sent (${(err as Error).message}); nothing was kept. Try again.`);
      }
      return { invitation: { id: invitation.id, email: invitation.email, role: invitation.role, expiresAt: invitation.expiresAt } };
    },
  });

  routes.add({
    method: 'delete',
    path: '/campaigns/:campaignId/invitations/:invitationId',
    tag: 'Members',
    access: 'lead',
    summary: 'Withdraw an invitation',
    handler: async ({ params, campaign: access, user: me }) => {
      const id = z.uuid().safeParse(params.invitationId);
      if (!id.success) throw notFound('That invitation');
      const [row] = await db
        .update(campaignInvitation)
        .set({ revokedAt: new Date() })
        .where(and(eq(campaignInvitation.id, id.data), eq(campaignInvitation.campaignId, access.campaignId), isNull(campaignInvitation.acceptedAt), isNull(campaignInvitation.revokedAt)))
        .returning();
      if (!row) throw notFound('That invitation');
      await audit(db, { campaignId: access.campaignId, actorId: me.id, entity: 'invitation', entityId: row.id, action: 'revoke', before: { email: row.email, role: row.role } });
      return undefined;
    },
  });

  async function openInvitation(token: string) {
    const [row] = await db
      .select({ invitation: campaignInvitation, campaignName: campaign.name, structure: campaign.structure })
      .from(campaignInvitation)
      .innerJoin(campaign, eq(campaign.id, campaignInvitation.campaignId))
      .where(eq(campaignInvitation.tokenHash, hashToken(token)));
    if (!row || row.invitation.revokedAt) throw notFound('That invitation');
    if (row.invitation.acceptedAt) throw new HttpError(410, 'invitation-used', 'This invitation has already been used.');
    if (row.invitation.expiresAt < new Date()) throw new HttpError(410, 'invitation-expired', 'This invitation has expired. Ask the lead for a new one.');
    return row;
  }

  routes.add({
    method: 'get',
    path: '/invitations/:token',
    tag: 'Members',
    access: 'public',
    summary: 'What an invitation link offers (campaign name, role, address)',
    handler: async ({ params }) => {
      const row = await openInvitation(params.token!);
      return { campaignName: row.campaignName, structure: row.structure, role: row.invitation.role, email: row.invitation.email, expiresAt: row.invitation.expiresAt };
    },
  });

  routes.add({
    method: 'post',
    path: '/invitations/:token/accept',
    tag: 'Members',
    access: 'user',
    summary: 'Join the campaign of an invitation (signed in with the invited address)',
    handler: async ({ params, user: me }) => {
      const row = await openInvitation(params.token!);
      if (row.invitation.email.toLowerCase() !== me.email.toLowerCase()) throw forbidden(`This invitation is for ${row.invitation.email}; you are signed in as ${me.email}.`);
      return db.transaction(async (tx) => {
        const used = await tx
          .update(campaignInvitation)
          .set({ acceptedAt: new Date(), acceptedBy: me.id })
          .where(and(eq(campaignInvitation.id, row.invitation.id), isNull(campaignInvitation.acceptedAt)))
          .returning();
        if (!used.length) throw new HttpError(410, 'invitation-used', 'This invitation has already been used.');
        await tx.insert(campaignMember).values({ campaignId: row.invitation.campaignId, userId: me.id, role: row.invitation.role }).onConflictDoNothing();
        await audit(tx, { campaignId: row.invitation.campaignId, actorId: me.id, entity: 'member', entityId: me.id, action: 'join', after: { role: row.invitation.role, via: 'invitation' } });
        return { campaignId: row.invitation.campaignId, role: row.invitation.role };
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
