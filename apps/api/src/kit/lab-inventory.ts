// The lab inventory as a signed-in person sees it: every item with its calibration history, its
// state today and its bookings. Which campaign booked an item is shown only to members of that
// campaign (and to admins, who see every campaign); anyone else sees that another campaign has it
// booked, with the dates, so campaign names stay inside their teams.
import { asc, desc, eq, inArray, sql } from 'drizzle-orm';
import { calibrationState } from '@resonote/contracts';
import { campaign, campaignMember, labBooking, labCalibration, labItem, user } from '@resonote/db/schema';
import type { Db } from '@resonote/db/client';
import type { Tx } from '../http/audit.ts';
import type { SessionUser } from '../context.ts';
import { labItemView, todayISO } from './lab-item.ts';

/** The words a booking of a campaign the reader is not in carries instead of the campaign. */
export const OTHER_CAMPAIGN = 'booked by another campaign';

interface BookingRow {
  id: string;
  campaignId: string;
  campaignName: string;
  fromOn: string;
  toOn: string;
  bookedByName: string | null;
}

/** A booking as `me` may see it: whole to a member of its campaign or an admin, else only its dates. */
export function bookingAsSeen(b: BookingRow, me: Pick<SessionUser, 'role'>, myCampaigns: ReadonlySet<string>) {
  return me.role === 'admin' || myCampaigns.has(b.campaignId)
    ? { id: b.id, campaignId: b.campaignId, campaignName: b.campaignName, fromOn: b.fromOn, toOn: b.toOn, bookedByName: b.bookedByName, otherCampaign: null }
    : { id: b.id, campaignId: null, campaignName: null, fromOn: b.fromOn, toOn: b.toOn, bookedByName: null, otherCampaign: OTHER_CAMPAIGN };
}

/** The campaigns `userId` is a member of. */
export async function campaignsOf(db: Db | Tx, userId: string): Promise<Set<string>> {
  return new Set((await db.select({ campaignId: campaignMember.campaignId }).from(campaignMember).where(eq(campaignMember.userId, userId))).map((m) => m.campaignId));
}

export async function labInventory(db: Db, me: Pick<SessionUser, 'id' | 'role'>) {
  const memberships = await db.select({ campaignId: campaignMember.campaignId, role: campaignMember.role }).from(campaignMember).where(eq(campaignMember.userId, me.id));
  const mine = new Set(memberships.map((m) => m.campaignId));
  const canEdit = me.role === 'admin' || memberships.some((m) => m.role === 'lead');
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
  const seen = bookings.map((b) => ({ labItemId: b.labItemId, ...bookingAsSeen(b, me, mine) }));
  const today = todayISO();
  return {
    today,
    canEdit,
    items: items.map((item) => {
      const cals = calibrations.filter((c) => c.cal.labItemId === item.id).map((c) => ({ ...c.cal, recordedByName: c.recordedByName }));
      const dueOn = cals[0]?.dueOn ?? null;
      return { ...labItemView(item), calibrations: cals, calibration: { ...calibrationState(dueOn, today), dueOn }, bookings: seen.filter((b) => b.labItemId === item.id) };
    }),
  };
}
