// The members of a campaign and their roles; a campaign always keeps a lead.
import { and, asc, eq } from 'drizzle-orm';
import { memberPatchSchema } from '@resonote/contracts';
import { campaignMember, user } from '@resonote/db/schema';
import type { Deps } from './deps.ts';
import { audit, type Tx } from '../http/audit.ts';
import { conflict } from '../errors.ts';
import { expectVersion, oneOr404 } from '../http/rows.ts';

export function registerMemberRoutes({ routes, db }: Deps): void {
  /** Refuses a change that would leave the campaign without a lead. Runs inside the transaction. */
  async function keepALead(tx: Tx, campaignId: string, leavingUserId: string) {
    const leads = await tx
      .select({ userId: campaignMember.userId })
      .from(campaignMember)
      .where(and(eq(campaignMember.campaignId, campaignId), eq(campaignMember.role, 'lead')))
      .for('update');
    if (leads.length === 1 && leads[0]!.userId === leavingUserId) throw conflict('A campaign always keeps a lead: make someone else lead first.');
  }

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

  routes.add({
    method: 'patch',
    path: '/campaigns/:campaignId/members/:userId',
    tag: 'Members',
    access: 'lead',
    summary: 'Change a member’s role',
    body: memberPatchSchema,
    handler: async ({ body, params, campaign: access, user: me }) => {
      return db.transaction(async (tx) => {
        const before = await oneOr404(tx.select().from(campaignMember).where(and(eq(campaignMember.campaignId, access.campaignId), eq(campaignMember.userId, params.userId!))).for('update'), 'That member');
        expectVersion(before, body.version, 'The membership');
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
        const before = await oneOr404(tx.select().from(campaignMember).where(and(eq(campaignMember.campaignId, access.campaignId), eq(campaignMember.userId, params.userId!))).for('update'), 'That member');
        if (before.role === 'lead') await keepALead(tx, access.campaignId, before.userId);
        await tx.delete(campaignMember).where(and(eq(campaignMember.campaignId, access.campaignId), eq(campaignMember.userId, before.userId)));
        await audit(tx, { campaignId: access.campaignId, actorId: me.id, entity: 'member', entityId: before.userId, action: 'remove', before });
      });
      return undefined;
    },
  });
}
