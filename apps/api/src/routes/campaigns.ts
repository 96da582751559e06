// Campaign list for the signed-in user: their memberships, or every campaign for an admin.
import { Router } from 'express';
import { asc, eq } from 'drizzle-orm';
import { campaign, campaignMember } from '@resonote/db/schema';
import type { Db } from '@resonote/db/client';
import { requireUser } from '../context.ts';

export function campaignRoutes(db: Db): Router {
  const router = Router();

  router.get('/campaigns', requireUser, async (req, res) => {
    const user = req.user!;
    const columns = { id: campaign.id, name: campaign.name, structure: campaign.structure, client: campaign.client, status: campaign.status, updatedAt: campaign.updatedAt };
    const rows =
      user.role === 'admin'
        ? (await db.select(columns).from(campaign).orderBy(asc(campaign.name))).map((r) => ({ ...r, myRole: 'admin' as const }))
        : await db
            .select({ ...columns, myRole: campaignMember.role })
            .from(campaignMember)
            .innerJoin(campaign, eq(campaign.id, campaignMember.campaignId))
            .where(eq(campaignMember.userId, user.id))
            .orderBy(asc(campaign.name));
    res.json({ campaigns: rows });
  });

  return router;
}
