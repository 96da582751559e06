// Kit: the campaign's hammers and accelerometers with their calibration records, and the channel
// map that says which sensor (and which axis of it) is on which acquisition channel
// (design.md, "Kit"; docs/methods.md#units, #traceability).
import { and, asc, desc, eq, inArray, ne, sql } from 'drizzle-orm';
import { z } from 'zod';
import {
  accelerometerUnits,
  calibrationCreateSchema,
  calibrationState,
  channelCreateSchema,
  channelPatchSchema,
  hammerUnits,
  kitItemCreateSchema,
  kitItemPatchSchema,
  toBaseSensitivity,
  type CalibrationState,
  type SensitivityUnit,
  kitItemName,
} from '@resonote/contracts';
import { calibrationRecord, campaign, channel, kitItem, user } from '@resonote/db/schema';
import type { Deps } from './deps.ts';
import { audit, type Tx } from '../http/audit.ts';
import { staleWrite } from '../http/concurrency.ts';
import { badRequest, conflict, notFound } from '../errors.ts';
import { kitPolicyOf, refuseLargeChange } from '../kit/policy.ts';

type KitItemRow = typeof kitItem.$inferSelect;
type ChannelRow = typeof channel.$inferSelect;
type Kind = KitItemRow['kind'];

/** Base units Resonote stores sensitivities in (docs/methods.md#units). */
const BASE_UNIT: Record<Kind, 'mV/N' | 'mV/(m/s²)'> = { hammer: 'mV/N', accelerometer: 'mV/(m/s²)' };
const UNITS: Record<Kind, readonly string[]> = { hammer: hammerUnits, accelerometer: accelerometerUnits };

const uuid = z.uuid();
/** A path id that is not a UUID names nothing: 404, like an id of another campaign. */
function pathId(value: string | undefined, what: string): string {
  const parsed = uuid.safeParse(value);
  if (!parsed.success) throw notFound(what);
  return parsed.data;
}

/** Today as YYYY-MM-DD (UTC), the reference day for calibration states. */
export const todayISO = () => new Date().toISOString().slice(0, 10);

/** PostgreSQL unique violation, whether or not the driver error is wrapped by Drizzle. */
function isUniqueViolation(err: unknown): boolean {
  const e = err as { code?: string; cause?: { code?: string } } | null;
  return e?.code === '23505' || e?.cause?.code === '23505';
}

const plural = (n: number, word: string) => `${n} ${word}${n === 1 ? '' : 's'}`;
const itemName = (item: Pick<KitItemRow, 'kind' | 'model' | 'serial'>) => kitItemName(item);

/** Plain-words calibration warning for an item, or null when nothing needs saying. */
function calibrationWarning(item: KitItemRow, state: CalibrationState, days: number | null, dueOn: string | null): string | null {
  const name = itemName(item);
  switch (state) {
    case 'overdue':
      return `${name} calibration is overdue by ${plural(-days!, 'day')} (due ${dueOn}).`;
    case 'due-soon':
      return days === 0 ? `${name} calibration is due today (${dueOn}).` : `${name} calibration is due in ${plural(days!, 'day')} (${dueOn}).`;
    case 'none':
      return `${name} has no calibration record; add the certificate before measuring with it.`;
    case 'ok':
      return null;
  }
}

export function registerKitRoutes({ routes, db }: Deps): void {
  /** Locks a kit item of the campaign for update (or share) inside a transaction; 404 otherwise. */
  async function lockItem(tx: Tx, campaignId: string, rawId: string | undefined, mode: 'update' | 'share' = 'update') {
    const id = pathId(rawId, 'That kit item');
    const [row] = await tx
      .select()
      .from(kitItem)
      .where(and(eq(kitItem.id, id), eq(kitItem.campaignId, campaignId)))
      .for(mode);
    if (!row) throw notFound('That kit item');
    return row;
  }

  async function refuseDuplicate(tx: Tx, campaignId: string, item: { kind: Kind; model: string; serial: string }, exceptId?: string) {
    const [dup] = await tx
      .select({ id: kitItem.id })
      .from(kitItem)
      .where(
        and(
          eq(kitItem.campaignId, campaignId),
          eq(kitItem.kind, item.kind),
          sql`lower(${kitItem.model}) = lower(${item.model})`,
          sql`lower(${kitItem.serial}) = lower(${item.serial})`,
          exceptId ? ne(kitItem.id, exceptId) : undefined,
        ),
      );
    if (dup) throw conflict(`${itemName(item)} is already in this campaign's kit.`, { existingId: dup.id });
  }

  /**
   * The axis a channel records for an item: none for a hammer, one of the sensor's axes for an
   * accelerometer (its only axis when it has one and none was named).
   */
  function channelAxis(item: KitItemRow, axis: 'X' | 'Y' | 'Z' | null): 'X' | 'Y' | 'Z' | null {
    if (item.kind === 'hammer') {
      if (axis !== null) throw badRequest(`axis: a hammer channel has no axis (${itemName(item)} measures force along its own line); leave axis empty.`, [{ path: 'axis', message: 'a hammer channel has no axis' }]);
      return null;
    }
    if (axis === null) {
      if (item.axes.length === 1) return item.axes[0] as 'X' | 'Y' | 'Z';
      throw badRequest(`axis: ${itemName(item)} has axes ${item.axes.join(', ')}; choose which one this channel records.`, [{ path: 'axis', message: 'choose an axis' }]);
    }
    if (!item.axes.includes(axis)) {
      throw badRequest(`axis: ${itemName(item)} has no ${axis} axis (its axes: ${item.axes.join(', ')}).`, [{ path: 'axis', message: `not one of the sensor's axes (${item.axes.join(', ')})` }]);
    }
    return axis;
  }

  function checkUsable(item: KitItemRow) {
    if (item.retired) throw conflict(`${itemName(item)} is retired; un-retire it or choose another sensor for this channel.`);
  }

  async function channelView(tx: Tx | typeof db, campaignId: string, channelId?: string) {
    return tx
      .select({
        id: channel.id,
        channel: channel.channel,
        kitItemId: channel.kitItemId,
        axis: channel.axis,
        dof: channel.dof,
        sign: channel.sign,
        label: channel.label,
        version: channel.version,
        updatedAt: channel.updatedAt,
        kind: kitItem.kind,
        model: kitItem.model,
        serial: kitItem.serial,
        sensitivityBase: kitItem.sensitivityBase,
        retired: kitItem.retired,
      })
      .from(channel)
      .innerJoin(kitItem, eq(kitItem.id, channel.kitItemId))
      .where(and(eq(channel.campaignId, campaignId), channelId ? eq(channel.id, channelId) : undefined))
      .orderBy(asc(channel.channel));
  }

  const withBaseUnit = (row: KitItemRow) => ({ ...row, sensitivityBaseUnit: BASE_UNIT[row.kind] });

  routes.add({
    method: 'get',
    path: '/campaigns/:campaignId/kit',
    tag: 'Kit',
    access: 'viewer',
    summary: 'Hammers and accelerometers with calibration records, calibration state and warnings',
    returns:
      '{ items: [{ …item, sensitivityBase, sensitivityBaseUnit, calibrations (newest first), calibration: { state, days, dueOn } }], warnings: [{ kitItemId, state, message }], today }',
    handler: async ({ campaign: access }) => {
      const items = await db
        .select()
        .from(kitItem)
        .where(eq(kitItem.campaignId, access.campaignId))
        .orderBy(asc(kitItem.retired), sql`case ${kitItem.kind} when 'hammer' then 0 else 1 end`, asc(kitItem.model), asc(kitItem.serial), asc(kitItem.createdAt));
      const ids = items.map((i) => i.id);
      const records = ids.length
        ? await db
            .select({
              id: calibrationRecord.id,
              kitItemId: calibrationRecord.kitItemId,
              calibratedOn: calibrationRecord.calibratedOn,
              dueOn: calibrationRecord.dueOn,
              certificateRef: calibrationRecord.certificateRef,
              performedBy: calibrationRecord.performedBy,
              sensitivity: calibrationRecord.sensitivity,
              sensitivityUnit: calibrationRecord.sensitivityUnit,
              recordedBy: calibrationRecord.recordedBy,
              recordedByName: user.name,
              createdAt: calibrationRecord.createdAt,
            })
            .from(calibrationRecord)
            .leftJoin(user, eq(user.id, calibrationRecord.recordedBy))
            .where(inArray(calibrationRecord.kitItemId, ids))
            .orderBy(desc(calibrationRecord.calibratedOn), desc(calibrationRecord.createdAt))
        : [];
      const today = todayISO();
      const warnings: { kitItemId: string; state: CalibrationState; message: string }[] = [];
      const out = items.map((item) => {
        const calibrations = records.filter((r) => r.kitItemId === item.id);
        const dueOn = calibrations[0]?.dueOn ?? null;
        const { state, days } = calibrationState(dueOn, today);
        const message = item.retired ? null : calibrationWarning(item, state, days, dueOn);
        if (message) warnings.push({ kitItemId: item.id, state, message });
        return { ...withBaseUnit(item), calibrations, calibration: { state, days, dueOn } };
      });
      return { items: out, warnings, today };
    },
  });

  routes.add({
    method: 'post',
    path: '/campaigns/:campaignId/kit',
    tag: 'Kit',
    access: 'lead',
    summary: 'Register a hammer or an accelerometer; its sensitivity is also stored in base units',
    body: kitItemCreateSchema,
    status: 201,
    handler: async ({ body, campaign: access, user: me }) => {
      return db.transaction(async (tx) => {
        // Serialises kit registrations of this campaign so the duplicate check cannot race.
        await tx.select({ id: campaign.id }).from(campaign).where(eq(campaign.id, access.campaignId)).for('no key update');
        await refuseDuplicate(tx, access.campaignId, body);
        const [row] = await tx
          .insert(kitItem)
          .values({
            campaignId: access.campaignId,
            kind: body.kind,
            model: body.model,
            serial: body.serial,
            sensitivity: body.sensitivity,
            sensitivityUnit: body.sensitivityUnit,
            sensitivityBase: toBaseSensitivity(body.sensitivity, body.sensitivityUnit),
            tips: body.kind === 'hammer' ? body.tips : [],
            axes: body.kind === 'accelerometer' ? body.axes : [],
            massG: body.massG,
            notes: body.notes,
          })
          .returning();
        await audit(tx, { campaignId: access.campaignId, actorId: me.id, entity: 'kit-item', entityId: row!.id, action: 'create', after: row });
        return { item: withBaseUnit(row!) };
      });
    },
  });

  routes.add({
    method: 'patch',
    path: '/campaigns/:campaignId/kit/:itemId',
    tag: 'Kit',
    access: 'lead',
    summary: 'Change a kit item (model, serial, sensitivity, tips or axes, mass, notes, retired)',
    body: kitItemPatchSchema,
    handler: async ({ body, params, campaign: access, user: me }) => {
      const { version, confirmLargeChange, ...changes } = body;
      return db.transaction(async (tx) => {
        const before = await lockItem(tx, access.campaignId, params.itemId);
        if (before.version !== version) throw staleWrite(`${itemName(before)}`, withBaseUnit(before));
        const name = itemName(before);
        if (changes.sensitivityUnit !== undefined && !UNITS[before.kind].includes(changes.sensitivityUnit)) {
          throw badRequest(`sensitivityUnit: ${changes.sensitivityUnit} is not a unit for a ${before.kind}; use ${UNITS[before.kind].join(' or ')}.`, [
            { path: 'sensitivityUnit', message: `not a ${before.kind} unit` },
          ]);
        }
        if (changes.sensitivityUnit !== undefined && changes.sensitivityUnit !== before.sensitivityUnit && changes.sensitivity === undefined) {
          throw badRequest(`sensitivity: give the sensitivity in ${changes.sensitivityUnit} together with the new unit, so the stored value is not misread.`, [
            { path: 'sensitivity', message: 'required when the unit changes' },
          ]);
        }
        if (before.kind === 'hammer' && changes.axes !== undefined) throw badRequest('axes: a hammer has tips, not axes.', [{ path: 'axes', message: 'only accelerometers have axes' }]);
        if (before.kind === 'accelerometer' && changes.tips !== undefined) throw badRequest('tips: an accelerometer has axes, not tips.', [{ path: 'tips', message: 'only hammers have tips' }]);

        const used = await tx.select({ channel: channel.channel, axis: channel.axis }).from(channel).where(eq(channel.kitItemId, before.id)).orderBy(asc(channel.channel));
        if (changes.retired === true && !before.retired && used.length) {
          throw conflict(`${name} is on channel ${used.map((u) => u.channel).join(', ')}; reassign or remove the channel before retiring it.`);
        }
        if (changes.axes) {
          const lost = used.filter((u) => u.axis && !changes.axes!.includes(u.axis as 'X' | 'Y' | 'Z'));
          if (lost.length) throw conflict(`Channel ${lost.map((u) => `${u.channel} records axis ${u.axis}`).join(', ')} of ${name}; change that channel before removing the axis.`);
        }
        const next = { kind: before.kind, model: changes.model ?? before.model, serial: changes.serial ?? before.serial };
        if (changes.model !== undefined || changes.serial !== undefined) await refuseDuplicate(tx, access.campaignId, next, before.id);

        const sensitivity = changes.sensitivity ?? before.sensitivity;
        const unit = (changes.sensitivityUnit ?? before.sensitivityUnit) as SensitivityUnit;
        let confirmedChange: ReturnType<typeof refuseLargeChange> = null;
        if (changes.sensitivity !== undefined) {
          const policy = await kitPolicyOf(tx, access.campaignId);
          confirmedChange = refuseLargeChange(name, before.kind, before.sensitivityBase, toBaseSensitivity(sensitivity, unit), policy.changeTolerancePct, confirmLargeChange);
        }
        const [after] = await tx
          .update(kitItem)
          .set({ ...changes, sensitivity, sensitivityUnit: unit, sensitivityBase: toBaseSensitivity(sensitivity, unit), version: before.version + 1, updatedAt: new Date() })
          .where(eq(kitItem.id, before.id))
          .returning();
        await audit(tx, { campaignId: access.campaignId, actorId: me.id, entity: 'kit-item', entityId: before.id, action: 'update', before, after: confirmedChange ? { ...after, confirmedLargeChange: confirmedChange } : after });
        return { item: withBaseUnit(after!) };
      });
    },
  });

  routes.add({
    method: 'post',
    path: '/campaigns/:campaignId/kit/:itemId/calibrations',
    tag: 'Kit',
    access: 'lead',
    summary: 'Record a calibration certificate; a stated sensitivity (in the item’s unit) updates the item',
    body: calibrationCreateSchema,
    status: 201,
    handler: async ({ body, params, campaign: access, user: me }) => {
      return db.transaction(async (tx) => {
        const before = await lockItem(tx, access.campaignId, params.itemId);
        let confirmedChange: ReturnType<typeof refuseLargeChange> = null;
        if (body.sensitivity !== undefined) {
          const policy = await kitPolicyOf(tx, access.campaignId);
          confirmedChange = refuseLargeChange(itemName(before), before.kind, before.sensitivityBase, toBaseSensitivity(body.sensitivity, before.sensitivityUnit as SensitivityUnit), policy.changeTolerancePct, body.confirmLargeChange);
        }
        const [record] = await tx
          .insert(calibrationRecord)
          .values({
            kitItemId: before.id,
            calibratedOn: body.calibratedOn,
            dueOn: body.dueOn,
            certificateRef: body.certificateRef,
            performedBy: body.performedBy,
            sensitivity: body.sensitivity ?? null,
            sensitivityUnit: body.sensitivity === undefined ? null : before.sensitivityUnit,
            recordedBy: me.id,
          })
          .returning();
        await audit(tx, { campaignId: access.campaignId, actorId: me.id, entity: 'calibration', entityId: record!.id, action: 'create', after: { ...record, kitItemId: before.id, unit: before.sensitivityUnit } });
        let item = before;
        if (body.sensitivity !== undefined) {
          const unit = before.sensitivityUnit as SensitivityUnit;
          const [after] = await tx
            .update(kitItem)
            .set({ sensitivity: body.sensitivity, sensitivityBase: toBaseSensitivity(body.sensitivity, unit), version: before.version + 1, updatedAt: new Date() })
            .where(eq(kitItem.id, before.id))
            .returning();
          item = after!;
          await audit(tx, { campaignId: access.campaignId, actorId: me.id, entity: 'kit-item', entityId: before.id, action: 'calibrate', before, after: confirmedChange ? { ...after, confirmedLargeChange: confirmedChange } : after });
        }
        const { state, days } = calibrationState(record!.dueOn, todayISO());
        return { calibration: record, item: withBaseUnit(item), state: { state, days, dueOn: record!.dueOn } };
      });
    },
  });

  routes.add({
    method: 'get',
    path: '/campaigns/:campaignId/channels',
    tag: 'Kit',
    access: 'viewer',
    summary: 'The channel map with each channel’s sensor, ordered by channel number',
    returns: '{ channels: [{ id, channel, kitItemId, axis, dof, sign, label, version, kind, model, serial, sensitivityBase, sensitivityBaseUnit, retired }] }',
    handler: async ({ campaign: access }) => {
      const rows = await channelView(db, access.campaignId);
      return { channels: rows.map((r) => ({ ...r, sensitivityBaseUnit: BASE_UNIT[r.kind] })) };
    },
  });

  async function refuseTakenNumber(tx: Tx, campaignId: string, number: number) {
    const [taken] = await tx
      .select({ id: channel.id, model: kitItem.model, serial: kitItem.serial, kind: kitItem.kind })
      .from(channel)
      .innerJoin(kitItem, eq(kitItem.id, channel.kitItemId))
      .where(and(eq(channel.campaignId, campaignId), eq(channel.channel, number)));
    if (taken) throw conflict(`Channel ${number} is already assigned (to ${itemName(taken)}); choose another channel number or change that channel.`, { channelId: taken.id });
  }

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
          return { channel: { ...view!, sensitivityBaseUnit: BASE_UNIT[view!.kind] } };
        });
      } catch (err) {
        // Two leads taking the same number at once: the unique index decides.
        if (isUniqueViolation(err)) throw conflict(`Channel ${body.channel} is already assigned; choose another channel number.`);
        throw err;
      }
    },
  });

  async function lockChannel(tx: Tx, campaignId: string, rawId: string | undefined): Promise<ChannelRow> {
    const id = pathId(rawId, 'That channel');
    const [row] = await tx
      .select()
      .from(channel)
      .where(and(eq(channel.id, id), eq(channel.campaignId, campaignId)))
      .for('update');
    if (!row) throw notFound('That channel');
    return row;
  }

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
        return { channel: { ...view!, sensitivityBaseUnit: BASE_UNIT[view!.kind] } };
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

