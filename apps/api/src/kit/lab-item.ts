// One lab kit item: its name in words, its base unit, and reading it locked for a change.
import { eq } from 'drizzle-orm';
import { labItem } from '@resonote/db/schema';
import type { Tx } from '../http/audit.ts';
import { oneOr404, pathId } from '../http/rows.ts';

export type LabRow = typeof labItem.$inferSelect;
const KIND_NAME = { hammer: 'Hammer', accelerometer: 'Accelerometer', conditioner: 'Conditioner' } as const;
export const BASE_UNIT = { hammer: 'mV/N', accelerometer: 'mV/(m/s²)', conditioner: null } as const;
export const labName = (i: Pick<LabRow, 'kind' | 'model' | 'serial'>) => `${KIND_NAME[i.kind]} ${i.model} (SN ${i.serial})`;
export const todayISO = () => new Date().toISOString().slice(0, 10);

/** The item with its base unit, as every answer carries it. */
export const labItemView = (item: LabRow) => ({ ...item, sensitivityBaseUnit: BASE_UNIT[item.kind] });

export function lockLabItem(tx: Tx, rawId: string | undefined): Promise<LabRow> {
  const id = pathId(rawId, 'That lab kit item');
  return oneOr404(tx.select().from(labItem).where(eq(labItem.id, id)).for('update'), 'That lab kit item');
}
