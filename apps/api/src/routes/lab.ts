// The lab's kit: an instance-wide inventory of hammers (with their tips), accelerometers (with
// per-axis sensitivities) and conditioners, each with its calibration history (design.md, "Lab
// kit"). Kept by admins and campaign leads; read by everyone signed in (kit/lab-inventory.ts says
// what each reader sees of the bookings). Campaign bookings: routes/lab-bookings.ts.
import { eq } from 'drizzle-orm';
import { axisSensitivitiesToBase, DEFAULT_CHANGE_TOLERANCE_PCT, labCalibrationCreateSchema, labItemCreateSchema, labItemPatchSchema, toBaseSensitivity, type SensitivityUnit } from '@resonote/contracts';
import { labItem } from '@resonote/db/schema';
import type { Deps } from './deps.ts';
import { audit } from '../http/audit.ts';
import { expectVersion, isUniqueViolation } from '../http/rows.ts';
import { badRequest, conflict } from '../errors.ts';
import { recordLabCalibration } from '../kit/lab-calibration.ts';
import { labInventory } from '../kit/lab-inventory.ts';
import { labItemView, labName, lockLabItem } from '../kit/lab-item.ts';

export function registerLabRoutes({ routes, db }: Deps): void {
  routes.add({
    method: 'get',
    path: '/lab/items',
    tag: 'Lab kit',
    access: 'user',
    summary: 'The lab inventory: hammers with tips, accelerometers with per-axis sensitivities, conditioners; each with its calibration history, state today and bookings',
    returns: '{ items: [{ …item, sensitivityBaseUnit, calibrations (newest first), calibration: { state, days, dueOn }, bookings: [{ id, fromOn, toOn, campaignId, campaignName, bookedByName, otherCampaign }] }], today, canEdit }; a booking of a campaign the caller is not a member of (admins see all) has campaignId, campaignName and bookedByName null and otherCampaign "booked by another campaign"',
    handler: ({ user: me }) => labInventory(db, me),
  });

  routes.add({
    method: 'post',
    path: '/lab/items',
    tag: 'Lab kit',
    access: 'kit-keeper',
    summary: 'Add a hammer (with tips), an accelerometer (axes, optional per-axis sensitivities) or a conditioner to the lab inventory',
    body: labItemCreateSchema,
    status: 201,
    handler: async ({ body, user: me }) => {
      const sensitive = body.kind === 'conditioner' ? null : { sensitivity: body.sensitivity, unit: body.sensitivityUnit as SensitivityUnit };
      const axes = body.kind === 'accelerometer' ? body.axes : [];
      if (body.kind === 'accelerometer') {
        const extra = Object.keys(body.axisSensitivities).filter((a) => !body.axes.includes(a as 'X' | 'Y' | 'Z'));
        if (extra.length) throw badRequest(`axisSensitivities: the sensor has no ${extra.join(', ')} axis (its axes: ${body.axes.join(', ')}).`, [{ path: 'axisSensitivities', message: 'an axis the sensor does not have' }]);
      }
      try {
        return await db.transaction(async (tx) => {
          const [row] = await tx
            .insert(labItem)
            .values({
              kind: body.kind,
              model: body.model,
              serial: body.serial,
              sensitivity: sensitive?.sensitivity ?? null,
              sensitivityUnit: sensitive?.unit ?? null,
              sensitivityBase: sensitive ? toBaseSensitivity(sensitive.sensitivity, sensitive.unit) : null,
              axisSensitivities: body.kind === 'accelerometer' ? axisSensitivitiesToBase(body.axisSensitivities, body.sensitivityUnit) : {},
              tips: body.kind === 'hammer' ? body.tips : [],
              axes,
              notes: body.notes,
              createdBy: me.id,
            })
            .returning();
          await audit(tx, { campaignId: null, actorId: me.id, entity: 'lab-item', entityId: row!.id, action: 'create', after: row });
          return { item: labItemView(row!) };
        });
      } catch (err) {
        if (isUniqueViolation(err)) throw conflict(`${labName(body)} is already in the lab inventory.`);
        throw err;
      }
    },
  });

  routes.add({
    method: 'patch',
    path: '/lab/items/:itemId',
    tag: 'Lab kit',
    access: 'kit-keeper',
    summary: 'Change a lab kit item (model, serial, tips, axes, notes, retired); sensitivities change only with a calibration',
    body: labItemPatchSchema,
    handler: async ({ body, params, user: me }) => {
      const { version, ...changes } = body;
      try {
        return await db.transaction(async (tx) => {
          const before = await lockLabItem(tx, params.itemId);
          expectVersion(before, version, labName(before));
          if (before.kind !== 'hammer' && changes.tips !== undefined) throw badRequest(`tips: only hammers have tips (${labName(before)}).`, [{ path: 'tips', message: 'only hammers have tips' }]);
          if (before.kind !== 'accelerometer' && changes.axes !== undefined) throw badRequest(`axes: only accelerometers have axes (${labName(before)}).`, [{ path: 'axes', message: 'only accelerometers have axes' }]);
          const [after] = await tx
            .update(labItem)
            .set({ ...changes, version: before.version + 1, updatedAt: new Date() })
            .where(eq(labItem.id, before.id))
            .returning();
          await audit(tx, { campaignId: null, actorId: me.id, entity: 'lab-item', entityId: before.id, action: 'update', before, after });
          return { item: labItemView(after!) };
        });
      } catch (err) {
        if (isUniqueViolation(err)) throw conflict('Another lab kit item of this kind already has that model and serial.');
        throw err;
      }
    },
  });

  routes.add({
    method: 'post',
    path: '/lab/items/:itemId/calibrations',
    tag: 'Lab kit',
    access: 'kit-keeper',
    summary: `Record a calibration of a lab kit item; a stated sensitivity (item's unit, per axis for a triaxial sensor) updates it and the campaigns booking it from the calibration day on. A change beyond ${DEFAULT_CHANGE_TOLERANCE_PCT} % needs confirmLargeChange: true`,
    body: labCalibrationCreateSchema,
    status: 201,
    handler: ({ body, params, user: me }) => db.transaction(async (tx) => recordLabCalibration(tx, await lockLabItem(tx, params.itemId), body, me)),
  });
}
