// The hand-over's kit: each item with its newest calibration and its calibration state on the last
// test day and today, and the channel map as it stands.
import { asc, desc, eq, sql } from 'drizzle-orm';
import { calibrationState } from '@resonote/contracts';
import { calibrationRecord, channel, kitItem } from '@resonote/db/schema';
import type { Db } from '@resonote/db/client';
import type { HandoverData, HandoverKitItem } from './handover-data.ts';

const day = (d: Date) => d.toISOString().slice(0, 10);

/** The campaign's kit; `lastHitAt` is the day the calibration state "at test" is read on (today without hits). */
export async function kitOf(db: Db, campaignId: string, lastHitAt: Date | null): Promise<HandoverKitItem[]> {
  const items = await db.select().from(kitItem).where(eq(kitItem.campaignId, campaignId)).orderBy(sql`case ${kitItem.kind} when 'hammer' then 0 else 1 end`, asc(kitItem.model), asc(kitItem.serial));
  const cals = items.length
    ? await db
        .select()
        .from(calibrationRecord)
        .innerJoin(kitItem, eq(kitItem.id, calibrationRecord.kitItemId))
        .where(eq(kitItem.campaignId, campaignId))
        .orderBy(desc(calibrationRecord.calibratedOn), desc(calibrationRecord.createdAt))
    : [];
  const today = day(new Date());
  const testDay = lastHitAt ? day(lastHitAt) : today;
  return items.map((item) => {
    const mine = cals.filter((r) => r.calibration_record.kitItemId === item.id).map((r) => r.calibration_record);
    const latest = mine[0] ?? null;
    // At test time: the newest calibration made on or before the last test day.
    const atTest = mine.find((r) => r.calibratedOn <= testDay) ?? null;
    return {
      id: item.id,
      kind: item.kind,
      model: item.model,
      serial: item.serial,
      sensitivity: item.sensitivity,
      sensitivityUnit: item.sensitivityUnit,
      sensitivityBase: item.sensitivityBase,
      sensitivityBaseUnit: item.kind === 'hammer' ? 'mV/N' : 'mV/(m/s²)',
      tips: item.tips,
      axes: item.axes,
      retired: item.retired,
      latest: latest ? { calibratedOn: latest.calibratedOn, dueOn: latest.dueOn, certificateRef: latest.certificateRef, performedBy: latest.performedBy } : null,
      calibrationCount: mine.length,
      stateAtTest: { ...calibrationState(atTest?.dueOn ?? null, testDay), on: testDay },
      stateToday: { ...calibrationState(latest?.dueOn ?? null, today), on: today },
    };
  });
}

export function channelsOf(db: Db, campaignId: string): Promise<HandoverData['channels']> {
  return db
    .select({ channel: channel.channel, kind: kitItem.kind, model: kitItem.model, serial: kitItem.serial, axis: channel.axis, dof: channel.dof, sign: channel.sign, label: channel.label })
    .from(channel)
    .innerJoin(kitItem, eq(kitItem.id, channel.kitItemId))
    .where(eq(channel.campaignId, campaignId))
    .orderBy(asc(channel.channel));
}
