// Personal API tokens (issue 16): a user creates, lists and revokes their own tokens, each for
// one campaign and a role no higher than theirs there. The secret is answered once, at creation;
// the table keeps its SHA-256 only. Creation and revocation are audited in the token's campaign.
import { and, desc, eq } from 'drizzle-orm';
import { apiTokenCreateSchema, uuidSchema, type CampaignRole } from '@resonote/contracts';
import { apiToken, campaign, campaignMember } from '@resonote/db/schema';
import type { Deps } from './deps.ts';
import { audit } from '../http/audit.ts';
import { hashTokenSecret, newTokenSecret, roleRank } from '../http/api-token.ts';
import { badRequest, forbidden, notFound } from '../errors.ts';

type TokenRow = typeof apiToken.$inferSelect;

function tokenState(t: TokenRow, now = Date.now()): 'active' | 'revoked' | 'expired' {
  if (t.revokedAt) return 'revoked';
  if (t.expiresAt && t.expiresAt.getTime() <= now) return 'expired';
  return 'active';
}

function tokenSummary(t: TokenRow, campaignName: string | null) {
  return {
    id: t.id,
    name: t.name,
    campaignId: t.campaignId,
    campaignName,
    role: t.role,
    prefix: t.prefix,
    createdAt: t.createdAt,
    expiresAt: t.expiresAt,
    lastUsedAt: t.lastUsedAt,
    revokedAt: t.revokedAt,
    state: tokenState(t),
  };
}

export function registerTokenRoutes({ routes, db }: Deps): void {
  routes.add({
    method: 'get',
    path: '/account/tokens',
    tag: 'Account',
    access: 'user',
    summary: 'Your personal API tokens (never their secrets), newest first, with state, expiry and last use',
    handler: async ({ user: me }) => {
      const rows = await db.select({ t: apiToken, campaignName: campaign.name }).from(apiToken).leftJoin(campaign, eq(campaign.id, apiToken.campaignId)).where(eq(apiToken.userId, me.id)).orderBy(desc(apiToken.createdAt));
      return { tokens: rows.map((r) => tokenSummary(r.t, r.campaignName)) };
    },
  });

  routes.add({
    method: 'post',
    path: '/account/tokens',
    tag: 'Account',
    access: 'user',
    summary: 'Create a personal API token for one campaign (for the watched-folder bridge). The secret is in this answer only; the role defaults to yours in the campaign and may not exceed it',
    body: apiTokenCreateSchema,
    status: 201,
    returns: '{ token: { id, name, campaignId, role, prefix, expiresAt, state }, secret: "rn_…" }',
    handler: async ({ body, user: me }) => {
      const [c] = await db.select({ id: campaign.id, name: campaign.name }).from(campaign).where(eq(campaign.id, body.campaignId));
      const [member] = c ? await db.select({ role: campaignMember.role }).from(campaignMember).where(and(eq(campaignMember.campaignId, c.id), eq(campaignMember.userId, me.id))) : [];
      const held: CampaignRole | undefined = member?.role ?? (c && me.role === 'admin' ? 'lead' : undefined);
      if (!c || !held) throw notFound('That campaign');
      const role = body.role ?? held;
      if (roleRank[role] > roleRank[held]) throw forbidden(`A token cannot have more rights than you: you are ${held === 'engineer' ? 'an' : 'a'} ${held} in "${c.name}", the token asked for ${role}.`);
      const secret = newTokenSecret();
      const expiresAt = body.expiresInDays ? new Date(Date.now() + body.expiresInDays * 86_400_000) : null;
      const created = await db.transaction(async (tx) => {
        const [row] = await tx.insert(apiToken).values({ userId: me.id, campaignId: c.id, name: body.name, role, secretHash: hashTokenSecret(secret), prefix: secret.slice(0, 9), expiresAt }).returning();
        await audit(tx, { campaignId: c.id, actorId: me.id, entity: 'api-token', entityId: row!.id, action: 'create', after: { name: row!.name, role, prefix: row!.prefix, expiresAt } });
        return row!;
      });
      return { token: tokenSummary(created, c.name), secret };
    },
  });

  routes.add({
    method: 'delete',
    path: '/account/tokens/:tokenId',
    tag: 'Account',
    access: 'user',
    summary: 'Revoke one of your API tokens: it stops working at once (the row stays, marked revoked)',
    handler: async ({ params, user: me }) => {
      if (!uuidSchema.safeParse(params.tokenId).success) throw notFound('That token');
      const revoked = await db.transaction(async (tx) => {
        const [row] = await tx.select().from(apiToken).where(and(eq(apiToken.id, params.tokenId!), eq(apiToken.userId, me.id))).for('update');
        if (!row) throw notFound('That token');
        if (row.revokedAt) return row;
        const [after] = await tx.update(apiToken).set({ revokedAt: new Date() }).where(eq(apiToken.id, row.id)).returning();
        await audit(tx, { campaignId: row.campaignId, actorId: me.id, entity: 'api-token', entityId: row.id, action: 'revoke', before: { name: row.name, role: row.role, prefix: row.prefix }, after: { revokedAt: after!.revokedAt } });
        return after!;
      });
      const [c] = await db.select({ name: campaign.name }).from(campaign).where(eq(campaign.id, revoked.campaignId));
      return { token: tokenSummary(revoked, c?.name ?? null) };
    },
  });

  routes.add({
    method: 'get',
    path: '/tokens/current',
    tag: 'Account',
    access: 'user',
    tokenAccess: true,
    summary: 'Called with an API token: which campaign and role it acts with, and for whom (the bridge reads this at start)',
    handler: async ({ req, user: me }) => {
      const t = req.apiToken;
      if (!t) throw badRequest('Call this with an API token (Authorization: Bearer rn_…); a signed-in session has no token.');
      const [c] = await db.select({ id: campaign.id, name: campaign.name }).from(campaign).where(eq(campaign.id, t.campaignId));
      return { token: { id: t.id, name: t.name, role: t.role }, campaign: c, user: { id: me.id, name: me.name, email: me.email } };
    },
  });
}
