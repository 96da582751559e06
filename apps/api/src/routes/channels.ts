// The channel map: which sensor (and which axis of it) is on which acquisition channel, with its
// DOF and sign (design.md, "Kit"). The rules: kit/channels.ts.
import { eq } from 'drizzle-orm';
import { channelCreateSchema, channelPatchSchema } from '@resonote/contracts';
import { channel } from '@resonote/db/schema';
import type { Deps } from './deps.ts';
import { audit } from '../http/audit.ts';
import { staleWrite } from '../http/concurrency.ts';
import { isUniqueViolation } from '../http/rows.ts';
import { conflict } from '../errors.ts';
import { channelAnswer, channelAxis, channelView, checkUsable, lockChannel, refuseTakenNumber } from '../kit/channels.ts';
import { lockItem } from '../kit/kit-item.ts';

export function registerChannelRoutes({ routes, db }: Deps): void {
  routes.add({
    method: 'get',
    path: '/campaigns/:campaignId/channels',
    tag: 'Kit',
    access: 'viewer',
    summary: 'The channel map with each channel’s sensor, ordered by channel number',
    returns: '{ channels: [{ id, channel, kitItemId, axis, dof, sign, label, version, kind, model, serial, sensitivityBase, sensitivityBaseUnit, retired }] }',
    handler: async ({ campaign: access }) => {
      const rows = await channelView(db, access.campaignId);
      return { channels: rows.map(channelAnswer) };
    },
  });

  routes.add({
    method: 'post',
    path: '/campaigns/:campaignId/channels',
    tag: 'Kit',
    access: 'lead',
    summary: 'Assign a sensor (and axis) to an acquisition channel',
    body: channelCreateSchema,
    status: 201,
    handler: async ({ body, campaign: access, user: me }) => {
      try {
        return await db.transaction(async (tx) => {
          const item = await lockItem(tx, access.campaignId, body.kitItemId, 'share');
          checkUsable(item);
          const axis = channelAxis(item, body.axis);
          await refuseTakenNumber(tx, access.campaignId, body.channel);
          const [row] = await tx
            .insert(channel)
            .values({ campaignId: access.campaignId, channel: body.channel, kitItemId: item.id, axis, dof: body.dof, sign: body.sign, label: body.label })
            .returning();
          await audit(tx, { campaignId: access.campaignId, actorId: me.id, entity: 'channel', entityId: row!.id, action: 'create', after: row });
          const [view] = await channelView(tx, access.campaignId, row!.id);
          return { channel: channelAnswer(view!) };
        });
      } catch (err) {
        // Two leads taking the same number at once: the unique index decides.
        if (isUniqueViolation(err)) throw conflict(`Channel ${body.channel} is already assigned; choose another channel number.`);
        throw err;
      }
    },
  });

  routes.add({
    method: 'patch',
    path: '/campaigns/:campaignId/channels/:channelId',
    tag: 'Kit',
    access: 'lead',
    summary: 'Change a channel’s sensor, axis, DOF, sign or label',
    body: channelPatchSchema,
    handler: async ({ body, params, campaign: access, user: me }) => {
      const { version, ...changes } = body;
      return db.transaction(async (tx) => {
        const before = await lockChannel(tx, access.campaignId, params.channelId);
        if (before.version !== version) {
          const [current] = await channelView(tx, access.campaignId, before.id);
          throw staleWrite(`Channel ${before.channel}`, current);
        }
        const itemChanged = changes.kitItemId !== undefined && changes.kitItemId !== before.kitItemId;
        const item = await lockItem(tx, access.campaignId, changes.kitItemId ?? before.kitItemId, 'share');
        if (itemChanged) checkUsable(item);
        const wanted = changes.axis !== undefined ? changes.axis : itemChanged ? null : (before.axis as 'X' | 'Y' | 'Z' | null);
        const axis = channelAxis(item, wanted);
        const [after] = await tx
          .update(channel)
          .set({ ...changes, kitItemId: item.id, axis, version: before.version + 1, updatedAt: new Date() })
          .where(eq(channel.id, before.id))
          .returning();
        await audit(tx, { campaignId: access.campaignId, actorId: me.id, entity: 'channel', entityId: before.id, action: 'update', before, after });
        const [view] = await channelView(tx, access.campaignId, before.id);
        return { channel: channelAnswer(view!) };
      });
    },
  });

  routes.add({
    method: 'delete',
    path: '/campaigns/:campaignId/channels/:channelId',
    tag: 'Kit',
    access: 'lead',
    summary: 'Remove a channel from the channel map',
    handler: async ({ params, campaign: access, user: me }) => {
      await db.transaction(async (tx) => {
        const before = await lockChannel(tx, access.campaignId, params.channelId);
        await tx.delete(channel).where(eq(channel.id, before.id));
        await audit(tx, { campaignId: access.campaignId, actorId: me.id, entity: 'channel', entityId: before.id, action: 'delete', before });
      });
      return undefined;
    },
  });
}

