// The team around a campaign (design.md, "Who uses it"): a lead adds an existing account directly;
// the invited person answers invitations in the app (not only through the mailed link); a lead
// archives (read-only, everything kept), un-archives, or deletes a campaign that holds no recordings.
import { and, count, eq, gt, isNull, sql } from 'drizzle-orm';
import { z } from 'zod';
import { campaignArchiveSchema, campaignDeleteQuerySchema, campaignUnarchiveSchema, memberAddSchema } from '@resonote/contracts';
import { campaign, campaignArchive, campaignInvitation, campaignMember, hit, noiseCheck, originalRecording, user } from '@resonote/db/schema';
import type { Deps } from './deps.ts';
import { audit } from '../http/audit.ts';
import { staleWrite } from '../http/concurrency.ts';
import { archivedAt, campaignArchivedError } from '../http/archived.ts';
import { HttpError, notFound } from '../errors.ts';

export function registerTeamRoutes({ routes, db }: Deps): void {
  routes.add({
    method: 'post',
    path: '/campaigns/:campaignId/members',
    tag: 'Members',
    access: 'lead',
    summary: 'Add someone who already has an account here to the campaign, by the e-mail address they sign in with, with a role (no mail, no link)',
    body: memberAddSchema,
    status: 201,
    returns: '{ member: { userId, name, email, role, version, addedAt } }; 404 no-account when no account uses the address (send an invitation instead), 409 already-member',
    handler: async ({ body, campaign: access, user: me }) => {
      const [person] = await db.select({ id: user.id, name: user.name, email: user.email }).from(user).where(sql`lower(${user.email}) = ${body.email}`);
      if (!person) throw new HttpError(404, 'no-account', `No account here uses ${body.email}. Send an invitation instead: the mail lets them sign up and join.`);
      return db.transaction(async (tx) => {
        const [added] = await tx.insert(campaignMember).values({ campaignId: access.campaignId, userId: person.id, role: body.role }).onConflictDoNothing().returning();
        if (!added) throw new HttpError(409, 'already-member', `${person.name} (${person.email}) is already a member of this campaign; change their role in the list instead.`);
        // An open invitation to the same address has served its purpose.
        await tx
          .update(campaignInvitation)
          .set({ revokedAt: new Date() })
          .where(and(eq(campaignInvitation.campaignId, access.campaignId), sql`lower(${campaignInvitation.email}) = ${body.email}`, isNull(campaignInvitation.acceptedAt), isNull(campaignInvitation.revokedAt)));
        await audit(tx, { campaignId: access.campaignId, actorId: me.id, entity: 'member', entityId: person.id, action: 'add', after: { email: person.email, role: body.role, via: 'added-by-lead' } });
        return { member: { userId: person.id, name: person.name, email: person.email, role: added.role, version: added.version, addedAt: added.addedAt } };
      });
    },
  });

  /** Open invitations addressed to the signed-in person's address. */
  async function myOpenInvitations(email: string, invitationId?: string) {
    return db
      .select({
        id: campaignInvitation.id,
        campaignId: campaignInvitation.campaignId,
        campaignName: campaign.name,
        structure: campaign.structure,
        role: campaignInvitation.role,
        invitedBy: user.name,
        createdAt: campaignInvitation.createdAt,
        expiresAt: campaignInvitation.expiresAt,
      })
      .from(campaignInvitation)
      .innerJoin(campaign, eq(campaign.id, campaignInvitation.campaignId))
      .leftJoin(user, eq(user.id, campaignInvitation.invitedBy))
      .where(
        and(
          sql`lower(${campaignInvitation.email}) = ${email.toLowerCase()}`,
          isNull(campaignInvitation.acceptedAt),
          isNull(campaignInvitation.revokedAt),
          gt(campaignInvitation.expiresAt, new Date()),
          invitationId ? eq(campaignInvitation.id, invitationId) : undefined,
        ),
      )
      .orderBy(campaignInvitation.createdAt);
  }

  async function openOne(email: string, rawId: string) {
    const id = z.uuid().safeParse(rawId);
    if (!id.success) throw notFound('That invitation');
    const [row] = await myOpenInvitations(email, id.data);
    // Someone else's invitation answers the same as none, so invitation ids reveal nothing.
    if (!row) throw notFound('That invitation');
    return row;
  }

  routes.add({
    method: 'get',
    path: '/account/invitations',
    tag: 'Members',
    access: 'user',
    summary: 'Open invitations to the address of the signed-in account, so they can be answered in the app',
    returns: '{ invitations: [{ id, campaignId, campaignName, structure, role, invitedBy, createdAt, expiresAt }] }',
    handler: async ({ user: me }) => ({ invitations: await myOpenInvitations(me.email) }),
  });

  routes.add({
    method: 'post',
    path: '/account/invitations/:invitationId/accept',
    tag: 'Members',
    access: 'user',
    summary: 'Accept an open invitation to your address: you join the campaign with its role',
    returns: '{ campaignId, role }',
    handler: async ({ params, user: me }) => {
      const row = await openOne(me.email, params.invitationId!);
      return db.transaction(async (tx) => {
        const used = await tx
          .update(campaignInvitation)
          .set({ acceptedAt: new Date(), acceptedBy: me.id })
          .where(and(eq(campaignInvitation.id, row.id), isNull(campaignInvitation.acceptedAt), isNull(campaignInvitation.revokedAt)))
          .returning();
        if (!used.length) throw new HttpError(410, 'invitation-used', 'This invitation has already been answered.');
        await tx.insert(campaignMember).values({ campaignId: row.campaignId, userId: me.id, role: row.role }).onConflictDoNothing();
        await audit(tx, { campaignId: row.campaignId, actorId: me.id, entity: 'member', entityId: me.id, action: 'join', after: { role: row.role, via: 'invitation-in-app' } });
        return { campaignId: row.campaignId, role: row.role };
      });
    },
  });

  routes.add({
    method: 'post',
    path: '/account/invitations/:invitationId/decline',
    tag: 'Members',
    access: 'user',
    summary: 'Decline an open invitation to your address (the lead sees it in the audit trail)',
    handler: async ({ params, user: me }) => {
      const row = await openOne(me.email, params.invitationId!);
      await db.transaction(async (tx) => {
        const done = await tx
          .update(campaignInvitation)
          .set({ revokedAt: new Date() })
          .where(and(eq(campaignInvitation.id, row.id), isNull(campaignInvitation.acceptedAt), isNull(campaignInvitation.revokedAt)))
          .returning();
        if (!done.length) throw new HttpError(410, 'invitation-used', 'This invitation has already been answered.');
        await audit(tx, { campaignId: row.campaignId, actorId: me.id, entity: 'invitation', entityId: row.id, action: 'decline', before: { email: me.email, role: row.role } });
      });
      return undefined;
    },
  });

  /** Locks the campaign row and checks the version the caller read. */
  async function lockCampaign(tx: Parameters<Parameters<typeof db.transaction>[0]>[0], campaignId: string, version: number) {
    const [before] = await tx.select().from(campaign).where(eq(campaign.id, campaignId)).for('update');
    if (!before) throw notFound('That campaign');
    if (before.version !== version) throw staleWrite('The campaign', before);
    return before;
  }

  routes.add({
    method: 'post',
    path: '/campaigns/:campaignId/archive',
    tag: 'Campaigns',
    access: 'lead',
    whileArchived: 'allowed',
    summary: 'Archive the campaign: it stays readable by its members with everything in it, and every change is refused (409 campaign-archived) until a lead un-archives it',
    body: campaignArchiveSchema,
    returns: '{ campaign: { …, archivedAt } }',
    handler: async ({ body, campaign: access, user: me }) =>
      db.transaction(async (tx) => {
        const before = await lockCampaign(tx, access.campaignId, body.version);
        const at = await archivedAt(tx, access.campaignId);
        if (at) throw campaignArchivedError(at);
        const [row] = await tx.insert(campaignArchive).values({ campaignId: access.campaignId, archivedBy: me.id, reason: body.reason }).returning();
        const [after] = await tx.update(campaign).set({ version: before.version + 1, updatedAt: new Date() }).where(eq(campaign.id, access.campaignId)).returning();
        await audit(tx, { campaignId: access.campaignId, actorId: me.id, entity: 'campaign', entityId: access.campaignId, action: 'archive', after: { reason: body.reason, archivedAt: row!.archivedAt } });
        return { campaign: { ...after!, archivedAt: row!.archivedAt } };
      }),
  });

  routes.add({
    method: 'post',
    path: '/campaigns/:campaignId/unarchive',
    tag: 'Campaigns',
    access: 'lead',
    whileArchived: 'allowed',
    summary: 'Un-archive the campaign: changes are allowed again',
    body: campaignUnarchiveSchema,
    returns: '{ campaign: { …, archivedAt: null } }; 409 not-archived when it is not archived',
    handler: async ({ body, campaign: access, user: me }) =>
      db.transaction(async (tx) => {
        const before = await lockCampaign(tx, access.campaignId, body.version);
        const removed = await tx.delete(campaignArchive).where(eq(campaignArchive.campaignId, access.campaignId)).returning();
        if (!removed.length) throw new HttpError(409, 'not-archived', 'This campaign is not archived.');
        const [after] = await tx.update(campaign).set({ version: before.version + 1, updatedAt: new Date() }).where(eq(campaign.id, access.campaignId)).returning();
        await audit(tx, { campaignId: access.campaignId, actorId: me.id, entity: 'campaign', entityId: access.campaignId, action: 'unarchive', before: { archivedAt: removed[0]!.archivedAt, reason: removed[0]!.reason } });
        return { campaign: { ...after!, archivedAt: null } };
      }),
  });

  routes.add({
    method: 'delete',
    path: '/campaigns/:campaignId',
    tag: 'Campaigns',
    access: 'lead',
    whileArchived: 'allowed',
    summary: 'Delete a campaign that holds no recordings (no hits, no noise checks, no kept original files) with its plan, kit, settings and members; ?version= the version you read',
    query: campaignDeleteQuerySchema,
    returns: '204; 409 campaign-has-hits when it holds any recording (archive it instead: raw data is never deleted)',
    handler: async ({ query, campaign: access, user: me }) => {
      await db.transaction(async (tx) => {
        const before = await lockCampaign(tx, access.campaignId, query.version);
        const [hits] = await tx.select({ n: count() }).from(hit).where(eq(hit.campaignId, access.campaignId));
        const [noise] = await tx.select({ n: count() }).from(noiseCheck).where(eq(noiseCheck.campaignId, access.campaignId));
        const [originals] = await tx.select({ n: count() }).from(originalRecording).where(eq(originalRecording.campaignId, access.campaignId));
        const held = [hits!.n && `${hits!.n} hit${hits!.n === 1 ? '' : 's'}`, noise!.n && `${noise!.n} noise check${noise!.n === 1 ? '' : 's'}`, originals!.n && `${originals!.n} original recording${originals!.n === 1 ? '' : 's'}`].filter(Boolean);
        if (held.length) throw new HttpError(409, 'campaign-has-hits', `“${before.name}” holds ${held.join(', ')}; recordings are never deleted. Archive the campaign instead: it stays readable and nothing can change it.`, { hits: hits!.n, noiseChecks: noise!.n, originalRecordings: originals!.n });
        await tx.delete(campaign).where(eq(campaign.id, access.campaignId));
      });
      // The campaign's own audit trail goes with it; the server log keeps one line.
      console.info(`[resonote] campaign ${access.campaignId} deleted by ${me.email}`);
      return undefined;
    },
  });

}
