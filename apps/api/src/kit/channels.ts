// The channel map's rules: which axis a channel records for its sensor, a retired sensor refused,
// a channel number taken once, a channel read locked for a change, and the channel with its
// sensor as every answer shows it.
import { and, asc, eq } from 'drizzle-orm';
import { channel, kitItem } from '@resonote/db/schema';
import type { Db } from '@resonote/db/client';
import type { Tx } from '../http/audit.ts';
import { oneOr404, pathId } from '../http/rows.ts';
import { badRequest, conflict } from '../errors.ts';
import { BASE_UNIT, itemName, type ChannelRow, type KitItemRow } from './kit-item.ts';

/**
 * The axis a channel records for an item: none for a hammer, one of the sensor's axes for an
 * accelerometer (its only axis when it has one and none was named).
 */
export function channelAxis(item: KitItemRow, axis: 'X' | 'Y' | 'Z' | null): 'X' | 'Y' | 'Z' | null {
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

export function checkUsable(item: KitItemRow) {
  if (item.retired) throw conflict(`${itemName(item)} is retired; un-retire it or choose another sensor for this channel.`);
}

export async function channelView(tx: Tx | Db, campaignId: string, channelId?: string) {
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

/** A channel as answered, with its sensor's base unit. */
export const channelAnswer = (view: Awaited<ReturnType<typeof channelView>>[number]) => ({ ...view, sensitivityBaseUnit: BASE_UNIT[view.kind] });

export async function refuseTakenNumber(tx: Tx, campaignId: string, number: number) {
  const [taken] = await tx
    .select({ id: channel.id, model: kitItem.model, serial: kitItem.serial, kind: kitItem.kind })
    .from(channel)
    .innerJoin(kitItem, eq(kitItem.id, channel.kitItemId))
    .where(and(eq(channel.campaignId, campaignId), eq(channel.channel, number)));
  if (taken) throw conflict(`Channel ${number} is already assigned (to ${itemName(taken)}); choose another channel number or change that channel.`, { channelId: taken.id });
}

export async function lockChannel(tx: Tx, campaignId: string, rawId: string | undefined): Promise<ChannelRow> {
  const id = pathId(rawId, 'That channel');
  return oneOr404(tx.select().from(channel).where(and(eq(channel.id, id), eq(channel.campaignId, campaignId))).for('update'), 'That channel');
}
