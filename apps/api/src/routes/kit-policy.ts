// The campaign's calibration policy (warn or block on an overdue or missing calibration, and the
// tolerance beyond which a new sensitivity needs confirming), and the calibration readiness of
// its channels that Tap shows before the first hit (design.md "Kit", "Tap").
import { eq } from 'drizzle-orm';
import { kitPolicyPutSchema } from '@resonote/contracts';
import { campaign, kitPolicy } from '@resonote/db/schema';
import type { Deps } from './deps.ts';
import { audit } from '../http/audit.ts';
import { staleWrite } from '../http/concurrency.ts';
import { channelCalibrations, kitPolicyOf } from '../kit/policy.ts';

export function registerKitPolicyRoutes({ routes, db }: Deps): void {
  routes.add({
    method: 'get',
    path: '/campaigns/:campaignId/kit-policy',
    tag: 'Kit',
    access: 'viewer',
    summary: 'The calibration policy: warn or block on an overdue or missing calibration, and the sensitivity-change tolerance (%)',
    returns: '{ policy: { calibration, changeTolerancePct, version } } (version 0: the defaults, warn and 5 %)',
    handler: async ({ campaign: access }) => ({ policy: await kitPolicyOf(db, access.campaignId) }),
  });

  routes.add({
    method: 'put',
    path: '/campaigns/:campaignId/kit-policy',
    tag: 'Kit',
    access: 'lead',
    summary: 'Set the calibration policy (warn | block) and the sensitivity-change tolerance; baseVersion is the version read',
    body: kitPolicyPutSchema,
    handler: async ({ body, campaign: access, user: me }) =>
      db.transaction(async (tx) => {
        // The campaign row serialises the first write (no policy row to lock yet).
        await tx.select({ id: campaign.id }).from(campaign).where(eq(campaign.id, access.campaignId)).for('no key update');
        const before = await kitPolicyOf(tx, access.campaignId);
        if (before.version !== body.baseVersion) throw staleWrite('The calibration policy', before);
        const values = { calibration: body.calibration, changeTolerancePct: body.changeTolerancePct, version: before.version + 1, updatedAt: new Date() };
        const [row] = before.version === 0 ? await tx.insert(kitPolicy).values({ campaignId: access.campaignId, ...values }).returning() : await tx.update(kitPolicy).set(values).where(eq(kitPolicy.campaignId, access.campaignId)).returning();
        const policy = { calibration: row!.calibration, changeTolerancePct: row!.changeTolerancePct, version: row!.version };
        await audit(tx, { campaignId: access.campaignId, actorId: me.id, entity: 'kit-policy', entityId: access.campaignId, action: 'update', before, after: policy });
        return { policy };
      }),
  });

  routes.add({
    method: 'get',
    path: '/campaigns/:campaignId/kit-readiness',
    tag: 'Kit',
    access: 'viewer',
    summary: 'Each channel’s sensor with its calibration state today, and whether the policy blocks hits',
    returns: '{ policy, channels: [{ channel, kitItemId, kind, model, serial, axis, state, days, dueOn, problem }], problems: [message], blocking }',
    handler: async ({ campaign: access }) => {
      const policy = await kitPolicyOf(db, access.campaignId);
      const channels = await channelCalibrations(db, access.campaignId);
      const problems = channels.map((c) => c.problem).filter((p): p is string => p !== null);
      return { policy, channels, problems, blocking: policy.calibration === 'block' && problems.length > 0 };
    },
  });
}
