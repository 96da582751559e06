// The live input's tables in a campaign backup (backup.ts): each channel's input scaling
// (channel_input) and the calibrator checks made through it (sensitivity_check). Both came after
// the first backups were written, so a backup without them restores with none. Kept apart from
// backup.ts so the live input's part of the format is read in one place.
import { asc, eq } from 'drizzle-orm';
import type { PgTable } from 'drizzle-orm/pg-core';
import { channelInput, sensitivityCheck } from '@resonote/db/schema';
import type { Db } from '@resonote/db/client';

/** Table specs in insertion order (after channel and kit_item, whose ids they hold). */
export const liveInputTables: { name: string; table: PgTable; userCols: string[]; hasUuidId: boolean; addedLater: true }[] = [
  { name: 'channel_input', table: channelInput, userCols: [], hasUuidId: true, addedLater: true },
  { name: 'sensitivity_check', table: sensitivityCheck, userCols: ['checkedBy'], hasUuidId: true, addedLater: true },
];

/** The campaign's rows of both tables, oldest first, for the backup's snapshot transaction. */
export async function liveInputRows(tx: Pick<Db, 'select'>, campaignId: string): Promise<Record<string, Record<string, unknown>[]>> {
  return {
    channel_input: (await tx.select().from(channelInput).where(eq(channelInput.campaignId, campaignId)).orderBy(asc(channelInput.updatedAt))) as Record<string, unknown>[],
    sensitivity_check: (await tx.select().from(sensitivityCheck).where(eq(sensitivityCheck.campaignId, campaignId)).orderBy(asc(sensitivityCheck.checkedAt))) as Record<string, unknown>[],
  };
}
