// Invitations to a campaign: a lead invites an address with a role (mailed link, expiring); the
// invited person opens and accepts it signed in with that address.
import { and, count, desc, eq, gt, isNull, sql } from 'drizzle-orm';
import { z } from 'zod';
import { invitationCreateSchema } from '@resonote/contracts';
import {  campaign, campaignInvitation, campaignMember, user } from '@resonote/db/schema';
import type { Deps } from './deps.ts';
import { audit } from '../http/audit.ts';
import { conflict, forbidden, HttpError, notFound } from '../errors.ts';
import { hashToken, INVITATION_DAYS, mailInvitation, newInvitationToken } from '../invitations.ts';


export function registerInvitationRoutes({ routes, db, config, mailer }: Deps): void {
  async function loadCampaign(id: string) {
    const [row] = await db.select().from(campaign).where(eq(campaign.id, id));
    if (!row) throw notFound('That campaign');
    return row;
  }

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
}
