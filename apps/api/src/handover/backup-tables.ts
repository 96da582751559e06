// The tables a campaign backup carries, in insertion order (parents before children), each with the
// query that reads its rows for one campaign. A new campaign table joins backups with one entry here.
import { asc, eq, inArray } from 'drizzle-orm';
import type { PgColumn, PgTable } from 'drizzle-orm/pg-core';
import { channelInput, dofNote, dofNoteKey, dofPhoto, dofPhotoThumb, kitPolicy, sensitivityCheck } from '@resonote/db/schema';
import { acquisitionSettings, auditEvent, calibrationRecord, campaign, channel, feMode, feModel, fePointLink, frfResult, hit, hitExclusion, kitItem, line, modalFit, modeTable, modeTableRow, noiseCheck, originalRecording, point, scheduleEntry } from '@resonote/db/schema';
import type { Tx } from '../http/audit.ts';

export type Row = Record<string, unknown>;

/** What a table's reader gets: the read-only transaction, the campaign, and a "rows of this campaign" query. */
export interface TableReader {
  tx: Tx;
  campaignId: string;
  /** Every row of `table` whose campaign_id is the campaign's, in `order` when given. */
  byCampaign: (table: PgTable, order?: PgColumn) => Promise<Row[]>;
}

export interface TableSpec {
  name: string;
  table: PgTable;
  /** Columns that hold a user id (matched by e-mail on restore, else null). */
  userCols: string[];
  /** The table's own uuid primary key, remapped on restore. */
  hasUuidId: boolean;
  /** Added after the first backups were written: a backup without its file restores it as empty. */
  addedLater?: boolean;
  /** The campaign's rows of this table. */
  read: (r: TableReader) => Promise<Row[]>;
}

/** Rows of a campaign table, read through its campaign_id column. */
const own = (table: PgTable, order?: PgColumn) => (r: TableReader) => r.byCampaign(table, order);

/** In insertion order (parents before children). */
export const TABLES: TableSpec[] = [
  { name: 'campaign', table: campaign, userCols: ['createdBy'], hasUuidId: true, read: async ({ tx, campaignId }) => (await tx.select().from(campaign).where(eq(campaign.id, campaignId))) as Row[] },
  { name: 'acquisition_settings', table: acquisitionSettings, userCols: ['createdBy'], hasUuidId: true, read: own(acquisitionSettings, acquisitionSettings.version) },
  { name: 'point', table: point, userCols: [], hasUuidId: true, read: own(point, point.createdAt) },
  { name: 'line', table: line, userCols: [], hasUuidId: true, read: own(line, line.createdAt) },
  { name: 'kit_item', table: kitItem, userCols: [], hasUuidId: true, read: own(kitItem, kitItem.createdAt) },
  {
    name: 'calibration_record',
    table: calibrationRecord,
    userCols: ['recordedBy'],
    hasUuidId: true,
    read: async ({ tx, campaignId }) => {
      const kitIds = (await tx.select({ id: kitItem.id }).from(kitItem).where(eq(kitItem.campaignId, campaignId))).map((r) => r.id);
      return kitIds.length ? ((await tx.select().from(calibrationRecord).where(inArray(calibrationRecord.kitItemId, kitIds)).orderBy(asc(calibrationRecord.createdAt))) as Row[]) : [];
    },
  },
  { name: 'channel', table: channel, userCols: [], hasUuidId: true, read: own(channel, channel.channel) },
  { name: 'schedule_entry', table: scheduleEntry, userCols: ['assigneeId'], hasUuidId: true, read: own(scheduleEntry, scheduleEntry.position) },
  // The live input's scaling per channel and the calibrator checks made through it; a backup from
  // before them restores with none.
  { name: 'channel_input', table: channelInput, userCols: [], hasUuidId: true, addedLater: true, read: own(channelInput, channelInput.updatedAt) },
  { name: 'sensitivity_check', table: sensitivityCheck, userCols: ['checkedBy'], hasUuidId: true, addedLater: true, read: own(sensitivityCheck, sensitivityCheck.checkedAt) },
  // Calibration policy and notes/photos per DOF; a backup from before them restores with none.
  { name: 'kit_policy', table: kitPolicy, userCols: [], hasUuidId: false, addedLater: true, read: own(kitPolicy) },
  { name: 'dof_note', table: dofNote, userCols: ['authorId'], hasUuidId: true, addedLater: true, read: own(dofNote, dofNote.createdAt) },
  {
    name: 'dof_photo',
    table: dofPhoto,
    userCols: [],
    hasUuidId: false,
    addedLater: true,
    read: async ({ tx, campaignId }) => (await tx.select({ photo: dofPhoto }).from(dofPhoto).innerJoin(dofNote, eq(dofNote.id, dofPhoto.noteId)).where(eq(dofNote.campaignId, campaignId))).map((r) => r.photo as Row),
  },
  {
    name: 'dof_photo_thumb',
    table: dofPhotoThumb,
    userCols: [],
    hasUuidId: false,
    addedLater: true,
    read: async ({ tx, campaignId }) => (await tx.select({ thumb: dofPhotoThumb }).from(dofPhotoThumb).innerJoin(dofNote, eq(dofNote.id, dofPhotoThumb.noteId)).where(eq(dofNote.campaignId, campaignId))).map((r) => r.thumb as Row),
  },
  // The Idempotency-Key of each note (routes/dof-note-upload.ts): a restored campaign answers a
  // retried note upload with the note it already holds instead of storing it twice. Its entry and
  // note ids are remapped like every id; a key whose note was deleted keeps a null note.
  { name: 'dof_note_key', table: dofNoteKey, userCols: [], hasUuidId: false, addedLater: true, read: own(dofNoteKey, dofNoteKey.createdAt) },
  { name: 'hit', table: hit, userCols: ['overriddenBy', 'recordedBy'], hasUuidId: true, read: own(hit, hit.recordedAt) },
  // Hits set aside by a redo (routes/redo.ts); a backup from before them restores with none.
  { name: 'hit_exclusion', table: hitExclusion, userCols: ['excludedBy'], hasUuidId: false, addedLater: true, read: own(hitExclusion, hitExclusion.excludedAt) },
  { name: 'noise_check', table: noiseCheck, userCols: ['recordedBy'], hasUuidId: true, addedLater: true, read: own(noiseCheck, noiseCheck.recordedAt) },
  { name: 'original_recording', table: originalRecording, userCols: ['storedBy'], hasUuidId: true, addedLater: true, read: own(originalRecording, originalRecording.storedAt) },
  { name: 'frf_result', table: frfResult, userCols: [], hasUuidId: true, read: own(frfResult) },
  { name: 'modal_fit', table: modalFit, userCols: ['createdBy'], hasUuidId: true, read: own(modalFit, modalFit.createdAt) },
  // The campaign's mode table; a backup from before it existed restores with an empty table.
  { name: 'mode_table', table: modeTable, userCols: [], hasUuidId: false, addedLater: true, read: own(modeTable) },
  { name: 'mode_table_row', table: modeTableRow, userCols: ['addedBy'], hasUuidId: true, addedLater: true, read: own(modeTableRow, modeTableRow.addedAt) },
  // FE model versions (issue 19); a backup from before them restores with none.
  { name: 'fe_model', table: feModel, userCols: ['uploadedBy'], hasUuidId: true, addedLater: true, read: own(feModel, feModel.uploadedAt) },
  { name: 'fe_mode', table: feMode, userCols: [], hasUuidId: true, addedLater: true, read: own(feMode) },
  { name: 'fe_point_link', table: fePointLink, userCols: [], hasUuidId: true, addedLater: true, read: own(fePointLink) },
  { name: 'audit_event', table: auditEvent, userCols: ['actorId'], hasUuidId: false, read: own(auditEvent, auditEvent.id) },
];

/** Every backed-up table's rows of one campaign (run inside one repeatable-read transaction). */
export async function readCampaignTables(tx: Tx, campaignId: string): Promise<Record<string, Row[]>> {
  const byCampaign = async (t: PgTable, order?: PgColumn) => {
    const table = t as typeof point;
    const q = tx.select().from(table).where(eq(table.campaignId, campaignId));
    return (await (order ? q.orderBy(asc(order)) : q)) as Row[];
  };
  const reader: TableReader = { tx, campaignId, byCampaign };
  const tables: Record<string, Row[]> = {};
  for (const spec of TABLES) tables[spec.name] = await spec.read(reader);
  return tables;
}
