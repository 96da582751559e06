// Booking a lab kit item for a campaign: other bookings of the item on overlapping dates (answered,
// not refused), and the campaign's copy of a hammer or accelerometer in its Kit — the one linked
// already, one registered by hand with the same identity, or a new one with the calibration history.
import { and, asc, eq, gte, lte, ne, sql } from 'drizzle-orm';
import type { z } from 'zod';
import type { bookingCreateSchema } from '@resonote/contracts';
import { calibrationRecord, campaign, kitItem, labBooking, labCalibration, user } from '@resonote/db/schema';
import type { Db } from '@resonote/db/client';
import { audit, type Tx } from '../http/audit.ts';
import { conflict } from '../errors.ts';
import { labName, type LabRow } from './lab-item.ts';
import { bookingAsSeen, campaignsOf } from './lab-inventory.ts';
import type { SessionUser } from '../context.ts';

/**
 * Bookings of `labItemId` (other than `exceptCampaignId`'s) whose dates overlap [fromOn, toOn], as
 * `me` may see them: campaign and person only for a member of that campaign or an admin.
 */
export async function overlapping(db: Db | Tx, labItemId: string, fromOn: string, toOn: string, exceptCampaignId: string, me: Pick<SessionUser, 'id' | 'role'>) {
  const mine = await campaignsOf(db, me.id);
  const rows = await db
    .select({ id: labBooking.id, campaignId: labBooking.campaignId, campaignName: campaign.name, fromOn: labBooking.fromOn, toOn: labBooking.toOn, bookedByName: user.name })
    .from(labBooking)
    .innerJoin(campaign, eq(campaign.id, labBooking.campaignId))
    .leftJoin(user, eq(user.id, labBooking.bookedBy))
    .where(and(eq(labBooking.labItemId, labItemId), lte(labBooking.fromOn, toOn), gte(labBooking.toOn, fromOn), ne(labBooking.campaignId, exceptCampaignId)))
    .orderBy(asc(labBooking.fromOn));
  return rows.map((b) => bookingAsSeen(b, me, mine));
}

export async function bookLabItem(tx: Tx, campaignId: string, item: LabRow, body: z.infer<typeof bookingCreateSchema>, me: Pick<SessionUser, 'id' | 'role'>) {
  if (item.retired) throw conflict(`${labName(item)} is retired in the lab inventory; choose another item.`);
  const overlaps = await overlapping(tx, item.id, body.fromOn, body.toOn, campaignId, me);
  let kit: typeof kitItem.$inferSelect | null = null;
  if (item.kind !== 'conditioner') {
    // The campaign's copy: the one linked already, or one registered by hand with the same identity, or a new one.
    const [existing] = await tx
      .select()
      .from(kitItem)
      .where(and(eq(kitItem.campaignId, campaignId), eq(kitItem.kind, item.kind), sql`(${kitItem.labItemId} = ${item.id} or (lower(${kitItem.model}) = lower(${item.model}) and lower(${kitItem.serial}) = lower(${item.serial})))`))
      .for('update');
    if (existing) {
      if (existing.labItemId !== item.id) {
        [kit] = await tx.update(kitItem).set({ labItemId: item.id, version: existing.version + 1, updatedAt: new Date() }).where(eq(kitItem.id, existing.id)).returning();
        await audit(tx, { campaignId, actorId: me.id, entity: 'kit-item', entityId: existing.id, action: 'link-lab-item', before: existing, after: kit });
      } else kit = existing;
    } else {
      [kit] = await tx
        .insert(kitItem)
        .values({ campaignId, kind: item.kind, model: item.model, serial: item.serial, sensitivity: item.sensitivity!, sensitivityUnit: item.sensitivityUnit!, sensitivityBase: item.sensitivityBase!, axisSensitivities: item.axisSensitivities, tips: item.tips, axes: item.axes, notes: item.notes, labItemId: item.id })
        .returning();
      await audit(tx, { campaignId, actorId: me.id, entity: 'kit-item', entityId: kit!.id, action: 'borrow', after: kit });
      const history = await tx.select().from(labCalibration).where(eq(labCalibration.labItemId, item.id)).orderBy(asc(labCalibration.calibratedOn));
      for (const h of history) {
        await tx.insert(calibrationRecord).values({ kitItemId: kit!.id, calibratedOn: h.calibratedOn, dueOn: h.dueOn, certificateRef: h.certificateRef, performedBy: h.performedBy, sensitivity: h.sensitivity, sensitivityUnit: h.sensitivityUnit, recordedBy: h.recordedBy });
      }
    }
  }
  const [booking] = await tx.insert(labBooking).values({ labItemId: item.id, campaignId, fromOn: body.fromOn, toOn: body.toOn, kitItemId: kit?.id ?? null, bookedBy: me.id }).returning();
  await audit(tx, { campaignId, actorId: me.id, entity: 'lab-booking', entityId: booking!.id, action: 'create', after: { ...booking, overlaps } });
  return { booking, kitItem: kit, overlaps };
}
