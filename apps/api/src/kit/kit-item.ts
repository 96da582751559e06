// One kit item of a campaign: its kind's base unit and allowed units, its name and calibration
// warning in words, reading it locked for a change, and the refusal of a second item with the same
// kind, model and serial (docs/methods.md#units).
import { and, eq, ne, sql } from 'drizzle-orm';
import { accelerometerUnits, hammerUnits, kitItemName, type CalibrationState } from '@resonote/contracts';
import { channel, kitItem } from '@resonote/db/schema';
import type { Tx } from '../http/audit.ts';
import { oneOr404, pathId } from '../http/rows.ts';
import { conflict } from '../errors.ts';

export type KitItemRow = typeof kitItem.$inferSelect;
export type ChannelRow = typeof channel.$inferSelect;
export type Kind = KitItemRow['kind'];

/** Base units Resonote stores sensitivities in (docs/methods.md#units). */
export const BASE_UNIT: Record<Kind, 'mV/N' | 'mV/(m/s²)'> = { hammer: 'mV/N', accelerometer: 'mV/(m/s²)' };
export const UNITS: Record<Kind, readonly string[]> = { hammer: hammerUnits, accelerometer: accelerometerUnits };

/** Today as YYYY-MM-DD (UTC), the reference day for calibration states. */
export const todayISO = () => new Date().toISOString().slice(0, 10);

export const plural = (n: number, word: string) => `${n} ${word}${n === 1 ? '' : 's'}`;
export const itemName = (item: Pick<KitItemRow, 'kind' | 'model' | 'serial'>) => kitItemName(item);

/** Plain-words calibration warning for an item, or null when nothing needs saying. */
export function calibrationWarning(item: KitItemRow, state: CalibrationState, days: number | null, dueOn: string | null): string | null {
  const name = itemName(item);
  switch (state) {
    case 'overdue':
      return `${name} calibration is overdue by ${plural(-days!, 'day')} (due ${dueOn}).`;
    case 'due-soon':
      return days === 0 ? `${name} calibration is due today (${dueOn}).` : `${name} calibration is due in ${plural(days!, 'day')} (${dueOn}).`;
    case 'none':
      return `${name} has no calibration record; add the certificate before measuring with it.`;
    case 'ok':
      return null;
  }
}

export const withBaseUnit = (row: KitItemRow) => ({ ...row, sensitivityBaseUnit: BASE_UNIT[row.kind] });

/** Locks a kit item of the campaign for update (or share) inside a transaction; 404 otherwise. */
export async function lockItem(tx: Tx, campaignId: string, rawId: string | undefined, mode: 'update' | 'share' = 'update') {
  const id = pathId(rawId, 'That kit item');
  return oneOr404(tx.select().from(kitItem).where(and(eq(kitItem.id, id), eq(kitItem.campaignId, campaignId))).for(mode), 'That kit item');
}

export async function refuseDuplicate(tx: Tx, campaignId: string, item: { kind: Kind; model: string; serial: string }, exceptId?: string) {
  const [dup] = await tx
    .select({ id: kitItem.id })
    .from(kitItem)
    .where(
      and(
        eq(kitItem.campaignId, campaignId),
        eq(kitItem.kind, item.kind),
        sql`lower(${kitItem.model}) = lower(${item.model})`,
        sql`lower(${kitItem.serial}) = lower(${item.serial})`,
        exceptId ? ne(kitItem.id, exceptId) : undefined,
      ),
    );
  if (dup) throw conflict(`${itemName(item)} is already in this campaign's kit.`, { existingId: dup.id });
}
