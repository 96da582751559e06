// The lab's kit: an instance-wide inventory of hammers (with their tips), accelerometers (with
// per-axis sensitivities) and conditioners, each with its calibration history; a campaign
// borrows an item by booking it for dates, which puts a copy into the campaign's Kit (design.md,
// "Lab kit"). Kept by admins and campaign leads; read by everyone signed in.
import { and, asc, desc, eq, gte, inArray, lte, ne, sql } from 'drizzle-orm';
import {
  axisSensitivitiesToBase,
  bookingCreateSchema,
  calibrationState,
  DEFAULT_CHANGE_TOLERANCE_PCT,
  labCalibrationCreateSchema,
  labItemCreateSchema,
  labItemPatchSchema,
  toBaseSensitivity,
  uuidSchema,
  type SensitivityUnit,
} from '@resonote/contracts';
import { calibrationRecord, campaign, campaignMember, kitItem, labBooking, labCalibration, labItem, user } from '@resonote/db/schema';
import type { Db } from '@resonote/db/client';
import type { Deps } from './deps.ts';
import { audit, type Tx } from '../http/audit.ts';
import { staleWrite } from '../http/concurrency.ts';
import { badRequest, conflict, notFound } from '../errors.ts';
import { refuseLargeChange } from '../kit/policy.ts';

type LabRow = typeof labItem.$inferSelect;
const KIND_NAME = { hammer: 'Hammer', accelerometer: 'Accelerometer', conditioner: 'Conditioner' } as const;
const BASE_UNIT = { hammer: 'mV/N', accelerometer: 'mV/(m/s²)', conditioner: null } as const;
const labName = (i: Pick<LabRow, 'kind' | 'model' | 'serial'>) => `${KIND_NAME[i.kind]} ${i.model} (SN ${i.serial})`;
const todayISO = () => new Date().toISOString().slice(0, 10);

function pathId(value: string | undefined, what: string): string {
  const parsed = uuidSchema.safeParse(value);
  if (!parsed.success) throw notFound(what);
  return parsed.data;
}

function isUniqueViolation(err: unknown): boolean {
  const e = err as { code?: string; cause?: { code?: string } } | null;
  return e?.code === '23505' || e?.cause?.code === '23505';
}

/** Bookings of `labItemId` (other than `exceptId`) whose dates overlap [fromOn, toOn], with campaign and person. */
async function overlapping(db: Db | Tx, labItemId: string, fromOn: string, toOn: string, exceptCampaignId?: string) {
  return db
    .select({ id: labBooking.id, campaignId: labBooking.campaignId, campaignName: campaign.name, fromOn: labBooking.fromOn, toOn: labBooking.toOn, bookedByName: user.name })
    .from(labBooking)
    .innerJoin(campaign, eq(campaign.id, labBooking.campaignId))
    .leftJoin(user, eq(user.id, labBooking.bookedBy))
    .where(and(eq(labBooking.labItemId, labItemId), lte(labBooking.fromOn, toOn), gte(labBooking.toOn, fromOn), exceptCampaignId ? ne(labBooking.campaignId, exceptCampaignId) : undefined))
    .orderBy(asc(labBooking.fromOn));
}

export function registerLabRoutes({ routes, db }: Deps): void {
  async function lockLabItem(tx: Tx, rawId: string | undefined) {
    const id = pathId(rawId, 'That lab kit item');
    const [row] = await tx.select().from(labItem).where(eq(labItem.id, id)).for('update');
    if (!row) throw notFound('That lab kit item');
    return row;
  }

  routes.add({
    method: 'get',
    path: '/lab/items',
    tag: 'Lab kit',
    access: 'user',
    summary: 'The lab inventory: hammers with tips, accelerometers with per-axis sensitivities, conditioners; each with its calibration history, state today and bookings',
    returns: '{ items: [{ …item, sensitivityBaseUnit, calibrations (newest first), calibration: { state, days, dueOn }, bookings: [{ campaignId, campaignName, fromOn, toOn, bookedByName }] }], today, canEdit }',
    handler: async ({ user: me }) => {
      const canEdit = me.role === 'admin' || (await db.select({ id: campaignMember.campaignId }).from(campaignMember).where(and(eq(campaignMember.userId, me.id), eq(campaignMember.role, 'lead'))).limit(1)).length > 0;
      const items = await db.select().from(labItem).orderBy(asc(labItem.retired), sql`case ${labItem.kind} when 'hammer' then 0 when 'accelerometer' then 1 else 2 end`, asc(labItem.model), asc(labItem.serial));
      const ids = items.map((i) => i.id);
      const calibrations = ids.length
        ? await db.select({ cal: labCalibration, recordedByName: user.name }).from(labCalibration).leftJoin(user, eq(user.id, labCalibration.recordedBy)).where(inArray(labCalibration.labItemId, ids)).orderBy(desc(labCalibration.calibratedOn), desc(labCalibration.createdAt))
        : [];
      const bookings = ids.length
        ? await db
            .select({ id: labBooking.id, labItemId: labBooking.labItemId, campaignId: labBooking.campaignId, campaignName: campaign.name, fromOn: labBooking.fromOn, toOn: labBooking.toOn, bookedByName: user.name })
            .from(labBooking)
            .innerJoin(campaign, eq(campaign.id, labBooking.campaignId))
            .leftJoin(user, eq(user.id, labBooking.bookedBy))
            .where(inArray(labBooking.labItemId, ids))
            .orderBy(asc(labBooking.fromOn))
        : [];
      const today = todayISO();
      return {
        today,
        canEdit,
        items: items.map((item) => {
          const cals = calibrations.filter((c) => c.cal.labItemId === item.id).map((c) => ({ ...c.cal, recordedByName: c.recordedByName }));
          const dueOn = cals[0]?.dueOn ?? null;
          return { ...item, sensitivityBaseUnit: BASE_UNIT[item.kind], calibrations: cals, calibration: { ...calibrationState(dueOn, today), dueOn }, bookings: bookings.filter((b) => b.labItemId === item.id) };
        }),
      };
    },
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
          return { item: { ...row!, sensitivityBaseUnit: BASE_UNIT[row!.kind] } };
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
          if (before.version !== version) throw staleWrite(labName(before), before);
          if (before.kind !== 'hammer' && changes.tips !== undefined) throw badRequest(`tips: only hammers have tips (${labName(before)}).`, [{ path: 'tips', message: 'only hammers have tips' }]);
          if (before.kind !== 'accelerometer' && changes.axes !== undefined) throw badRequest(`axes: only accelerometers have axes (${labName(before)}).`, [{ path: 'axes', message: 'only accelerometers have axes' }]);
          const [after] = await tx
            .update(labItem)
            .set({ ...changes, version: before.version + 1, updatedAt: new Date() })
            .where(eq(labItem.id, before.id))
            .returning();
          await audit(tx, { campaignId: null, actorId: me.id, entity: 'lab-item', entityId: before.id, action: 'update', before, after });
          return { item: { ...after!, sensitivityBaseUnit: BASE_UNIT[after!.kind] } };
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
    handler: async ({ body, params, user: me }) =>
      db.transaction(async (tx) => {
        const before = await lockLabItem(tx, params.itemId);
        const unit = before.sensitivityUnit as SensitivityUnit | null;
        if (before.kind === 'conditioner' && (body.sensitivity !== undefined || body.axisSensitivities !== undefined)) {
          throw badRequest(`sensitivity: a conditioner's calibration has no sensitivity in Resonote (its gain is part of the chain the sensors' certificates state).`, [{ path: 'sensitivity', message: 'not for a conditioner' }]);
        }
        if (before.kind === 'hammer' && body.axisSensitivities !== undefined) throw badRequest('axisSensitivities: a hammer has no axes.', [{ path: 'axisSensitivities', message: 'only accelerometers have axes' }]);
        const axisBase = body.axisSensitivities && unit ? axisSensitivitiesToBase(body.axisSensitivities, unit) : undefined;
        if (axisBase) {
          const extra = Object.keys(axisBase).filter((a) => !before.axes.includes(a));
          if (extra.length) throw badRequest(`axisSensitivities: ${labName(before)} has no ${extra.join(', ')} axis (its axes: ${before.axes.join(', ')}).`, [{ path: 'axisSensitivities', message: 'an axis the sensor does not have' }]);
        }
        // The lab's own tolerance is the common-practice default; campaigns set their own for their kit.
        const changes = [];
        if (body.sensitivity !== undefined && unit && before.sensitivityBase !== null) {
          changes.push(refuseLargeChange(labName(before), before.kind as 'hammer' | 'accelerometer', before.sensitivityBase, toBaseSensitivity(body.sensitivity, unit), DEFAULT_CHANGE_TOLERANCE_PCT, body.confirmLargeChange));
        }
        for (const [axis, value] of Object.entries(axisBase ?? {})) {
          const previous = before.axisSensitivities[axis as 'X'] ?? before.sensitivityBase;
          if (previous) changes.push(refuseLargeChange(`${labName(before)}, axis ${axis}`, 'accelerometer', previous, value!, DEFAULT_CHANGE_TOLERANCE_PCT, body.confirmLargeChange));
        }
        const [record] = await tx
          .insert(labCalibration)
          .values({
            labItemId: before.id,
            calibratedOn: body.calibratedOn,
            dueOn: body.dueOn,
            certificateRef: body.certificateRef,
            performedBy: body.performedBy,
            sensitivity: body.sensitivity ?? null,
            sensitivityUnit: body.sensitivity === undefined ? null : unit,
            axisSensitivities: axisBase ?? {},
            recordedBy: me.id,
          })
          .returning();
        const confirmed = changes.filter((c) => c !== null);
        await audit(tx, { campaignId: null, actorId: me.id, entity: 'lab-calibration', entityId: record!.id, action: 'create', after: { ...record, confirmedLargeChanges: confirmed } });
        let item = before;
        if (body.sensitivity !== undefined || axisBase) {
          const sensitivity = body.sensitivity ?? before.sensitivity;
          const [after] = await tx
            .update(labItem)
            .set({ sensitivity, sensitivityBase: sensitivity !== null && unit ? toBaseSensitivity(sensitivity, unit) : null, axisSensitivities: { ...before.axisSensitivities, ...(axisBase ?? {}) }, version: before.version + 1, updatedAt: new Date() })
            .where(eq(labItem.id, before.id))
            .returning();
          item = after!;
          await audit(tx, { campaignId: null, actorId: me.id, entity: 'lab-item', entityId: before.id, action: 'calibrate', before, after });
        }
        // Campaigns that have it booked on or after the calibration day get the certificate too.
        const borrowers = await tx
          .select({ kitItem })
          .from(labBooking)
          .innerJoin(kitItem, eq(kitItem.id, labBooking.kitItemId))
          .where(and(eq(labBooking.labItemId, before.id), gte(labBooking.toOn, body.calibratedOn)));
        const seen = new Set<string>();
        for (const { kitItem: k } of borrowers) {
          if (seen.has(k.id)) continue;
          seen.add(k.id);
          await copyCalibration(tx, k, item, record!, me.id);
        }
        return { calibration: record, item: { ...item, sensitivityBaseUnit: BASE_UNIT[item.kind] }, state: { ...calibrationState(record!.dueOn, todayISO()), dueOn: record!.dueOn }, campaignsUpdated: seen.size };
      }),
  });

  /** Puts a lab calibration into a campaign's kit item (certificate and, when stated, sensitivity), audited in that campaign. */
  async function copyCalibration(tx: Tx, k: typeof kitItem.$inferSelect, item: LabRow, record: typeof labCalibration.$inferSelect, actorId: string) {
    const [copied] = await tx
      .insert(calibrationRecord)
      .values({ kitItemId: k.id, calibratedOn: record.calibratedOn, dueOn: record.dueOn, certificateRef: record.certificateRef, performedBy: record.performedBy, sensitivity: record.sensitivity, sensitivityUnit: record.sensitivityUnit, recordedBy: record.recordedBy })
      .returning();
    await audit(tx, { campaignId: k.campaignId, actorId, entity: 'calibration', entityId: copied!.id, action: 'create', after: { ...copied, fromLabCalibration: record.id } });
    if (item.sensitivityBase !== null && (item.sensitivityBase !== k.sensitivityBase || JSON.stringify(item.axisSensitivities) !== JSON.stringify(k.axisSensitivities))) {
      const [after] = await tx
        .update(kitItem)
        .set({ sensitivity: item.sensitivity!, sensitivityUnit: item.sensitivityUnit!, sensitivityBase: item.sensitivityBase, axisSensitivities: item.axisSensitivities, version: k.version + 1, updatedAt: new Date() })
        .where(eq(kitItem.id, k.id))
        .returning();
      await audit(tx, { campaignId: k.campaignId, actorId, entity: 'kit-item', entityId: k.id, action: 'calibrate', before: k, after: { ...after, fromLabCalibration: record.id } });
    }
  }

  routes.add({
    method: 'get',
    path: '/campaigns/:campaignId/bookings',
    tag: 'Lab kit',
    access: 'viewer',
    summary: 'The lab kit this campaign has booked, each with the other campaigns that book the same item on overlapping dates',
    returns: '{ bookings: [{ id, labItemId, kind, model, serial, fromOn, toOn, kitItemId, bookedByName, overlaps: [{ campaignName, fromOn, toOn, bookedByName }] }] }',
    handler: async ({ campaign: access }) => {
      const rows = await db
        .select({ id: labBooking.id, labItemId: labBooking.labItemId, kind: labItem.kind, model: labItem.model, serial: labItem.serial, fromOn: labBooking.fromOn, toOn: labBooking.toOn, kitItemId: labBooking.kitItemId, bookedByName: user.name, createdAt: labBooking.createdAt })
        .from(labBooking)
        .innerJoin(labItem, eq(labItem.id, labBooking.labItemId))
        .leftJoin(user, eq(user.id, labBooking.bookedBy))
        .where(eq(labBooking.campaignId, access.campaignId))
        .orderBy(asc(labBooking.fromOn), asc(labItem.model));
      const bookings = [];
      for (const r of rows) bookings.push({ ...r, overlaps: await overlapping(db, r.labItemId, r.fromOn, r.toOn, access.campaignId) });
      return { bookings };
    },
  });

  routes.add({
    method: 'post',
    path: '/campaigns/:campaignId/bookings',
    tag: 'Lab kit',
    access: 'lead',
    summary: 'Book a lab kit item for dates; a hammer or accelerometer joins the campaign’s Kit (with its calibration history) the first time. Overlapping bookings elsewhere are answered, not refused',
    body: bookingCreateSchema,
    status: 201,
    returns: '{ booking, kitItem | null, overlaps: [{ campaignName, fromOn, toOn, bookedByName }] }',
    handler: async ({ body, campaign: access, user: me }) =>
      db.transaction(async (tx) => {
        const item = await lockLabItem(tx, body.labItemId);
        if (item.retired) throw conflict(`${labName(item)} is retired in the lab inventory; choose another item.`);
        const overlaps = await overlapping(tx, item.id, body.fromOn, body.toOn, access.campaignId);
        let kit: typeof kitItem.$inferSelect | null = null;
        if (item.kind !== 'conditioner') {
          // The campaign's copy: the one linked already, or one registered by hand with the same identity, or a new one.
          const [existing] = await tx
            .select()
            .from(kitItem)
            .where(and(eq(kitItem.campaignId, access.campaignId), eq(kitItem.kind, item.kind), sql`(${kitItem.labItemId} = ${item.id} or (lower(${kitItem.model}) = lower(${item.model}) and lower(${kitItem.serial}) = lower(${item.serial})))`))
            .for('update');
          if (existing) {
            if (existing.labItemId !== item.id) {
              [kit] = await tx.update(kitItem).set({ labItemId: item.id, version: existing.version + 1, updatedAt: new Date() }).where(eq(kitItem.id, existing.id)).returning();
              await audit(tx, { campaignId: access.campaignId, actorId: me.id, entity: 'kit-item', entityId: existing.id, action: 'link-lab-item', before: existing, after: kit });
            } else kit = existing;
          } else {
            [kit] = await tx
              .insert(kitItem)
              .values({ campaignId: access.campaignId, kind: item.kind, model: item.model, serial: item.serial, sensitivity: item.sensitivity!, sensitivityUnit: item.sensitivityUnit!, sensitivityBase: item.sensitivityBase!, axisSensitivities: item.axisSensitivities, tips: item.tips, axes: item.axes, notes: item.notes, labItemId: item.id })
              .returning();
            await audit(tx, { campaignId: access.campaignId, actorId: me.id, entity: 'kit-item', entityId: kit!.id, action: 'borrow', after: kit });
            const history = await tx.select().from(labCalibration).where(eq(labCalibration.labItemId, item.id)).orderBy(asc(labCalibration.calibratedOn));
            for (const h of history) {
              await tx.insert(calibrationRecord).values({ kitItemId: kit!.id, calibratedOn: h.calibratedOn, dueOn: h.dueOn, certificateRef: h.certificateRef, performedBy: h.performedBy, sensitivity: h.sensitivity, sensitivityUnit: h.sensitivityUnit, recordedBy: h.recordedBy });
            }
          }
        }
        const [booking] = await tx.insert(labBooking).values({ labItemId: item.id, campaignId: access.campaignId, fromOn: body.fromOn, toOn: body.toOn, kitItemId: kit?.id ?? null, bookedBy: me.id }).returning();
        await audit(tx, { campaignId: access.campaignId, actorId: me.id, entity: 'lab-booking', entityId: booking!.id, action: 'create', after: { ...booking, overlaps } });
        return { booking, kitItem: kit, overlaps };
      }),
  });

  routes.add({
    method: 'delete',
    path: '/campaigns/:campaignId/bookings/:bookingId',
    tag: 'Lab kit',
    access: 'lead',
    summary: 'Cancel a booking; the campaign’s Kit keeps its copy of the item (hits measured with it stay traceable)',
    handler: async ({ params, campaign: access, user: me }) => {
      const id = pathId(params.bookingId, 'That booking');
      await db.transaction(async (tx) => {
        const [before] = await tx.select().from(labBooking).where(and(eq(labBooking.id, id), eq(labBooking.campaignId, access.campaignId))).for('update');
        if (!before) throw notFound('That booking');
        await tx.delete(labBooking).where(eq(labBooking.id, id));
        await audit(tx, { campaignId: access.campaignId, actorId: me.id, entity: 'lab-booking', entityId: id, action: 'delete', before });
      });
      return undefined;
    },
  });
}

