// The channel map of a schedule entry as it stands now: which channel is the hammer, which are
// accelerometers, with which sensitivity, DOF and sign. A snapshot of it is stored with each hit,
// so every number stays traceable to the calibration that produced it.
import { desc, eq, inArray } from 'drizzle-orm';
import { calibrationRecord, channel, kitItem } from '@resonote/db/schema';
import type { Db } from '@resonote/db/client';
import { HttpError } from '../errors.ts';

export interface ChannelSnapshot {
  channel: number;
  role: 'force' | 'response';
  kitItemId: string;
  model: string;
  serial: string;
  /** mV/N for the hammer, mV/(m/s²) for accelerometers. */
  sensitivityBase: number;
  unit: 'N' | 'm/s²';
  /** The DOF this channel measured for this hit (the schedule's DOF for a roving channel). */
  dof: string;
  /** +1 when the sensor's axis points along the DOF direction, −1 against it. */
  sign: 1 | -1;
  calibration: { certificateRef: string; calibratedOn: string; dueOn: string } | null;
}

export async function channelMapFor(db: Db, campaignId: string, entry: { responseDof: string; excitationDof: string }): Promise<ChannelSnapshot[]> {
  const rows = await db
    .select({ ch: channel, item: kitItem })
    .from(channel)
    .innerJoin(kitItem, eq(kitItem.id, channel.kitItemId))
    .where(eq(channel.campaignId, campaignId))
    .orderBy(channel.channel);
  const hammers = rows.filter((r) => r.item.kind === 'hammer');
  const accels = rows.filter((r) => r.item.kind === 'accelerometer');
  if (hammers.length !== 1 || accels.length === 0) {
    throw new HttpError(
      409,
      'channel-map-incomplete',
      `Set up the channel map in Kit first: exactly one hammer channel and at least one accelerometer channel (now ${hammers.length} hammer and ${accels.length} accelerometer channels).`,
    );
  }
  const itemIds = rows.map((r) => r.item.id);
  const calibrations = await db
    .select()
    .from(calibrationRecord)
    .where(inArray(calibrationRecord.kitItemId, itemIds))
    .orderBy(desc(calibrationRecord.calibratedOn), desc(calibrationRecord.createdAt));
  const latest = new Map<string, (typeof calibrations)[number]>();
  for (const c of calibrations) if (!latest.has(c.kitItemId)) latest.set(c.kitItemId, c);
  return rows.map(({ ch, item }) => {
    const cal = latest.get(item.id);
    const isForce = item.kind === 'hammer';
    return {
      channel: ch.channel,
      role: isForce ? 'force' : 'response',
      kitItemId: item.id,
      model: item.model,
      serial: item.serial,
      sensitivityBase: item.sensitivityBase,
      unit: isForce ? 'N' : 'm/s²',
      dof: isForce ? entry.excitationDof : (ch.dof ?? entry.responseDof),
      sign: isForce ? 1 : ch.sign === -1 ? -1 : 1,
      calibration: cal ? { certificateRef: cal.certificateRef, calibratedOn: cal.calibratedOn, dueOn: cal.dueOn } : null,
    } satisfies ChannelSnapshot;
  });
}

/** Force channel first, then the responses in channel order: the order samples are stored in. */
export function storageOrder(map: ChannelSnapshot[]): ChannelSnapshot[] {
  return [...map.filter((c) => c.role === 'force'), ...map.filter((c) => c.role === 'response')];
}

