// A campaign's bookings of lab kit: what it has booked with the other bookings on overlapping
// dates, booking an item (kit/lab-booking.ts puts the campaign's copy into its Kit), cancelling.
import { and, asc, eq } from 'drizzle-orm';
import { bookingCreateSchema } from '@resonote/contracts';
import { labBooking, labItem, user } from '@resonote/db/schema';
import type { Deps } from './deps.ts';
import { audit } from '../http/audit.ts';
import { oneOr404, pathId } from '../http/rows.ts';
import { bookLabItem, overlapping } from '../kit/lab-booking.ts';
import { lockLabItem } from '../kit/lab-item.ts';

export function registerLabBookingRoutes({ routes, db }: Deps): void {
  routes.add({
    method: 'get',
    path: '/campaigns/:campaignId/bookings',
    tag: 'Lab kit',
    access: 'viewer',
    summary: 'The lab kit this campaign has booked, each with the other campaigns that book the same item on overlapping dates',
    returns: '{ bookings: [{ id, labItemId, kind, model, serial, fromOn, toOn, kitItemId, bookedByName, overlaps: [{ id, campaignId, campaignName, fromOn, toOn, bookedByName, otherCampaign }] }] } — campaign and person only to members of that campaign (and admins); others read otherCampaign',
    handler: async ({ campaign: access, user: me }) => {
      const rows = await db
        .select({ id: labBooking.id, labItemId: labBooking.labItemId, kind: labItem.kind, model: labItem.model, serial: labItem.serial, fromOn: labBooking.fromOn, toOn: labBooking.toOn, kitItemId: labBooking.kitItemId, bookedByName: user.name, createdAt: labBooking.createdAt })
        .from(labBooking)
        .innerJoin(labItem, eq(labItem.id, labBooking.labItemId))
        .leftJoin(user, eq(user.id, labBooking.bookedBy))
        .where(eq(labBooking.campaignId, access.campaignId))
        .orderBy(asc(labBooking.fromOn), asc(labItem.model));
      const bookings = [];
      for (const r of rows) bookings.push({ ...r, overlaps: await overlapping(db, r.labItemId, r.fromOn, r.toOn, access.campaignId, me) });
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
    returns: '{ booking, kitItem | null, overlaps: [{ id, campaignId, campaignName, fromOn, toOn, bookedByName, otherCampaign }] }',
    handler: ({ body, campaign: access, user: me }) => db.transaction(async (tx) => bookLabItem(tx, access.campaignId, await lockLabItem(tx, body.labItemId), body, me)),
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
        const before = await oneOr404(tx.select().from(labBooking).where(and(eq(labBooking.id, id), eq(labBooking.campaignId, access.campaignId))).for('update'), 'That booking');
        await tx.delete(labBooking).where(eq(labBooking.id, id));
        await audit(tx, { campaignId: access.campaignId, actorId: me.id, entity: 'lab-booking', entityId: id, action: 'delete', before });
      });
      return undefined;
    },
  });
}
