// Live input (issue "Live capture"): the scaling of each channel of an audio-class interface —
// volts at digital full scale and the AC-coupling low cut-off, entered in Kit beside the channel
// map — and the calibrator checks of a response sensor's sensitivity made through it, each stored
// and audited (docs/methods.md#input-scaling).
import { and, asc, desc, eq } from 'drizzle-orm';
import { z } from 'zod';
import { inputScalingSchema, sensitivityCheckSchema, sensitivityDeviation } from '@resonote/contracts';
import { channel, channelInput, kitItem, sensitivityCheck, user } from '@resonote/db/schema';
import type { Deps } from './deps.ts';
import { audit } from '../http/audit.ts';
import { staleWrite } from '../http/concurrency.ts';
import { badRequest, conflict, notFound } from '../errors.ts';

const uuid = z.uuid();

export function registerLiveInputRoutes({ routes, db }: Deps): void {
  async function scalingList(campaignId: string) {
    const rows = await db
      .select({ channelId: channelInput.channelId, channel: channel.channel, fullScaleVolts: channelInput.fullScaleVolts, acLowCutHz: channelInput.acLowCutHz, version: channelInput.version, updatedAt: channelInput.updatedAt })
      .from(channelInput)
      .innerJoin(channel, eq(channel.id, channelInput.channelId))
      .where(eq(channelInput.campaignId, campaignId))
      .orderBy(asc(channel.channel));
    return { scaling: rows };
  }

  routes.add({
    method: 'get',
    path: '/campaigns/:campaignId/input-scaling',
    tag: 'Kit',
    access: 'viewer',
    summary: 'Per channel of the channel map: volts at digital full scale and the AC-coupling low cut-off of the live input',
    returns: '{ scaling: [{ channelId, channel, fullScaleVolts, acLowCutHz, version, updatedAt }] }',
    handler: ({ campaign: access }) => scalingList(access.campaignId),
  });

  routes.add({
    method: 'put',
    path: '/campaigns/:campaignId/channels/:channelId/input-scaling',
    tag: 'Kit',
    access: 'lead',
    summary: 'Set a channel’s volts at digital full scale and AC-coupling low cut-off (send the version you read when changing one)',
    body: inputScalingSchema,
    handler: async ({ params, body, campaign: access, user: me }) => {
      const id = uuid.safeParse(params.channelId);
      if (!id.success) throw notFound('That channel');
      return db.transaction(async (tx) => {
        const [ch] = await tx.select().from(channel).where(and(eq(channel.id, id.data), eq(channel.campaignId, access.campaignId))).for('share');
        if (!ch) throw notFound('That channel');
        const [before] = await tx.select().from(channelInput).where(eq(channelInput.channelId, ch.id)).for('update');
        if (before) {
          if (body.version === undefined) throw conflict(`Channel ${ch.channel} already has an input scaling (version ${before.version}); send that version to change it.`, { current: before });
          if (body.version !== before.version) throw staleWrite(`The input scaling of channel ${ch.channel}`, before);
        } else if (body.version !== undefined) {
          throw badRequest(`version: channel ${ch.channel} has no input scaling yet; leave version out to create it.`, [{ path: 'version', message: 'no scaling to change yet' }]);
        }
        const values = { fullScaleVolts: body.fullScaleVolts, acLowCutHz: body.acLowCutHz, updatedAt: new Date() };
        const [after] = before
          ? await tx.update(channelInput).set({ ...values, version: before.version + 1 }).where(eq(channelInput.id, before.id)).returning()
          : await tx.insert(channelInput).values({ campaignId: access.campaignId, channelId: ch.id, ...values }).returning();
        await audit(tx, { campaignId: access.campaignId, actorId: me.id, entity: 'channel-input', entityId: after!.id, action: before ? 'update' : 'create', before, after });
        return { scaling: { channelId: ch.id, channel: ch.channel, fullScaleVolts: after!.fullScaleVolts, acLowCutHz: after!.acLowCutHz, version: after!.version, updatedAt: after!.updatedAt } };
      });
    },
  });

  routes.add({
    method: 'get',
    path: '/campaigns/:campaignId/sensitivity-checks',
    tag: 'Kit',
    access: 'viewer',
    summary: 'Calibrator checks of sensor sensitivities made through the live input, newest first',
    returns: '{ checks: [{ id, channelNumber, kitItemId, referenceMs2Rms, referenceHz, measuredVoltsRms, measuredHz, measuredSensitivity, kitSensitivity, deviationPercent, deviationDb, checkedBy, checkedAt, … }] }',
    handler: async ({ campaign: access }) => {
      const rows = await db
        .select({ check: sensitivityCheck, by: user.name })
        .from(sensitivityCheck)
        .leftJoin(user, eq(user.id, sensitivityCheck.checkedBy))
        .where(eq(sensitivityCheck.campaignId, access.campaignId))
        .orderBy(desc(sensitivityCheck.checkedAt));
      return { checks: rows.map((r) => ({ ...r.check, checkedByName: r.by })) };
    },
  });

  routes.add({
    method: 'post',
    path: '/campaigns/:campaignId/sensitivity-checks',
    tag: 'Kit',
    access: 'engineer',
    summary: 'Store a calibrator check of a response channel: the RMS volts measured at the calibrator’s level and frequency against the kit’s sensitivity (deviation in % and dB)',
    body: sensitivityCheckSchema,
    status: 201,
    handler: async ({ body, campaign: access, user: me }) => {
      return db.transaction(async (tx) => {
        const [row] = await tx
          .select({ ch: channel, item: kitItem })
          .from(channel)
          .innerJoin(kitItem, eq(kitItem.id, channel.kitItemId))
          .where(and(eq(channel.id, body.channelId), eq(channel.campaignId, access.campaignId)));
        if (!row) throw badRequest('channelId: no such channel in this campaign’s channel map.', [{ path: 'channelId', message: 'not a channel of this campaign' }]);
        if (row.item.kind !== 'accelerometer') throw badRequest(`channelId: channel ${row.ch.channel} carries the hammer; a calibrator checks an accelerometer (a response channel).`, [{ path: 'channelId', message: 'not a response channel' }]);
        const [scaling] = await tx.select().from(channelInput).where(eq(channelInput.channelId, row.ch.id));
        if (!scaling) throw conflict(`Channel ${row.ch.channel} has no input scaling (volts at full scale) yet; the lead enters it in Kit first.`);
        // The calibrator's frequency must be the tone that was measured: 2 % covers the frequency
        // resolution of a short recording (common practice, not a standard's figure).
        if (Math.abs(body.measuredHz - body.referenceHz) > 0.02 * body.referenceHz) {
          throw badRequest(`measuredHz: the strongest tone was at ${body.measuredHz.toFixed(1)} Hz, not the calibrator's ${body.referenceHz} Hz. Check that the calibrator runs and sits on this channel's sensor.`, [{ path: 'measuredHz', message: 'not the calibrator frequency' }]);
        }
        const dev = sensitivityDeviation(body.measuredVoltsRms, body.referenceMs2Rms, row.item.sensitivityBase);
        const [stored] = await tx
          .insert(sensitivityCheck)
          .values({
            campaignId: access.campaignId,
            channelId: row.ch.id,
            channelNumber: row.ch.channel,
            kitItemId: row.item.id,
            referenceMs2Rms: body.referenceMs2Rms,
            referenceHz: body.referenceHz,
            measuredVoltsRms: body.measuredVoltsRms,
            measuredHz: body.measuredHz,
            fullScaleVolts: scaling.fullScaleVolts,
            sampleRateHz: body.sampleRateHz,
            durationS: body.durationS,
            measuredSensitivity: dev.measured,
            kitSensitivity: row.item.sensitivityBase,
            deviationPercent: dev.percent,
            deviationDb: dev.db,
            note: body.note,
            checkedBy: me.id,
          })
          .returning();
        await audit(tx, { campaignId: access.campaignId, actorId: me.id, entity: 'sensitivity-check', entityId: stored!.id, action: 'create', after: stored });
        return { check: stored };
      });
    },
  });
}
