// A calibration of a lab kit item: checked against the item (a conditioner has no sensitivity, a
// hammer no axes), a sensitivity change beyond the tolerance refused until confirmed, stored with
// the item's new sensitivity, and passed on to every campaign that books the item from the
// calibration day on.
import { and, eq, gte } from 'drizzle-orm';
import type { z } from 'zod';
import { axisSensitivitiesToBase, calibrationState, DEFAULT_CHANGE_TOLERANCE_PCT, toBaseSensitivity, type labCalibrationCreateSchema, type SensitivityUnit } from '@resonote/contracts';
import { calibrationRecord, kitItem, labBooking, labCalibration, labItem } from '@resonote/db/schema';
import { audit, type Tx } from '../http/audit.ts';
import { badRequest } from '../errors.ts';
import { refuseLargeChange } from './policy.ts';
import { labItemView, labName, todayISO, type LabRow } from './lab-item.ts';

export async function recordLabCalibration(tx: Tx, before: LabRow, body: z.infer<typeof labCalibrationCreateSchema>, me: { id: string }) {
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
  return { calibration: record, item: labItemView(item), state: { ...calibrationState(record!.dueOn, todayISO()), dueOn: record!.dueOn }, campaignsUpdated: seen.size };
}

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
