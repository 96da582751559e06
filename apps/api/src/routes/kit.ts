// Kit: the campaign's hammers and accelerometers with their calibration records (design.md, "Kit";
// docs/methods.md#units, #traceability). The item's rules: kit/kit-item.ts; the channel map's
// routes: routes/channels.ts.
import { asc, desc, eq, inArray, sql } from 'drizzle-orm';
import { calibrationCreateSchema, calibrationState, kitItemCreateSchema, kitItemPatchSchema, toBaseSensitivity, type CalibrationState, type SensitivityUnit } from '@resonote/contracts';
import { calibrationRecord, campaign, channel, kitItem, user } from '@resonote/db/schema';
import type { Deps } from './deps.ts';
import { audit } from '../http/audit.ts';
import { staleWrite } from '../http/concurrency.ts';
import { badRequest, conflict } from '../errors.ts';
import { kitPolicyOf, refuseLargeChange } from '../kit/policy.ts';
import { UNITS, calibrationWarning, itemName, lockItem, refuseDuplicate, todayISO, withBaseUnit } from '../kit/kit-item.ts';

export function registerKitRoutes({ routes, db }: Deps): void {
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
}
