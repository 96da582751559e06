// Campaign backup and restore. A backup is one zip:
//   manifest.json        { format: "resonote-campaign-backup", version: 1, exportedAt, sourceUrl,
//                          campaign: { id, name }, counts: { <table>: rows }, samples: { <hitId>: { sha256, bytes } } }
//   tables/<table>.json  every row of every campaign table (settings history, audit trail, results and fits included)
//   tables/users.json    the accounts the rows refer to ({ id, name, email }) so a restore can match them by e-mail
//   samples/<hitId>.f32  the stored float32 little-endian samples of each hit, byte for byte
// A restore makes a NEW campaign with new ids everywhere, in one transaction, after checking every
// sample blob against its SHA-256 in the manifest; raw samples are written back byte-identical.
// A backup is a file its holder can edit, so a restore grants no role from it: the restorer leads
// the new campaign, and (when asked) the backup's other members are sent invitations, which each
// person accepts or not. Nothing in the answer depends on whether an address has an account here.
import { createHash, randomUUID } from 'node:crypto';
import { and, asc, eq, getTableColumns, inArray, sql } from 'drizzle-orm';
import type { PgTable } from 'drizzle-orm/pg-core';
import { strToU8, unzipSync, zipSync, type Zippable } from 'fflate';
import { z } from 'zod';
import { dofNote, dofPhoto, kitPolicy, labItem } from '@resonote/db/schema';
import { liveInputRows, liveInputTables } from './backup-live.ts';
import { acquisitionSettings, auditEvent, calibrationRecord, campaign, campaignInvitation, campaignMember, channel, feMode, feModel, fePointLink, frfResult, hit, hitExclusion, kitItem, line, modalFit, modeTable, modeTableRow, noiseCheck, originalRecording, point, scheduleEntry, user, type CampaignRole } from '@resonote/db/schema';
import type { Db } from '@resonote/db/client';
import { audit } from '../http/audit.ts';
import { HttpError, notFound } from '../errors.ts';
import { INVITATION_DAYS, mailInvitation, newInvitationToken } from '../invitations.ts';
import type { Mailer } from '../mail.ts';

/** Most invitations one restore sends (a backup is editable; a real campaign has far fewer members). */
export const RESTORE_MAX_INVITATIONS = 100;

export const BACKUP_FORMAT = 'resonote-campaign-backup';
export const BACKUP_VERSION = 1;

interface TableSpec {
  name: string;
  table: PgTable;
  /** Columns that hold a user id (matched by e-mail on restore, else null). */
  userCols: string[];
  /** The table's own uuid primary key, remapped on restore. */
  hasUuidId: boolean;
  /** Added after the first backups were written: a backup without its file restores it as empty. */
  addedLater?: boolean;
}

/** In insertion order (parents before children). */
const TABLES: TableSpec[] = [
  { name: 'campaign', table: campaign, userCols: ['createdBy'], hasUuidId: true },
  { name: 'acquisition_settings', table: acquisitionSettings, userCols: ['createdBy'], hasUuidId: true },
  { name: 'point', table: point, userCols: [], hasUuidId: true },
  { name: 'line', table: line, userCols: [], hasUuidId: true },
  { name: 'kit_item', table: kitItem, userCols: [], hasUuidId: true },
  { name: 'calibration_record', table: calibrationRecord, userCols: ['recordedBy'], hasUuidId: true },
  { name: 'channel', table: channel, userCols: [], hasUuidId: true },
  { name: 'schedule_entry', table: scheduleEntry, userCols: ['assigneeId'], hasUuidId: true },
  // Input scaling and calibrator checks of the live input (backup-live.ts).
  ...liveInputTables,
  // Calibration policy and notes/photos per DOF; a backup from before them restores with none.
  { name: 'kit_policy', table: kitPolicy, userCols: [], hasUuidId: false, addedLater: true },
  { name: 'dof_note', table: dofNote, userCols: ['authorId'], hasUuidId: true, addedLater: true },
  { name: 'dof_photo', table: dofPhoto, userCols: [], hasUuidId: false, addedLater: true },
  { name: 'hit', table: hit, userCols: ['overriddenBy', 'recordedBy'], hasUuidId: true },
  // Hits set aside by a redo (routes/redo.ts); a backup from before them restores with none.
  { name: 'hit_exclusion', table: hitExclusion, userCols: ['excludedBy'], hasUuidId: false, addedLater: true },
  { name: 'noise_check', table: noiseCheck, userCols: ['recordedBy'], hasUuidId: true, addedLater: true },
  { name: 'original_recording', table: originalRecording, userCols: ['storedBy'], hasUuidId: true, addedLater: true },
  { name: 'frf_result', table: frfResult, userCols: [], hasUuidId: true },
  { name: 'modal_fit', table: modalFit, userCols: ['createdBy'], hasUuidId: true },
  // The campaign's mode table; a backup from before it existed restores with an empty table.
  { name: 'mode_table', table: modeTable, userCols: [], hasUuidId: false, addedLater: true },
  { name: 'mode_table_row', table: modeTableRow, userCols: ['addedBy'], hasUuidId: true, addedLater: true },
  // FE model versions (issue 19); a backup from before them restores with none.
  { name: 'fe_model', table: feModel, userCols: ['uploadedBy'], hasUuidId: true, addedLater: true },
  { name: 'fe_mode', table: feMode, userCols: [], hasUuidId: true, addedLater: true },
  { name: 'fe_point_link', table: fePointLink, userCols: [], hasUuidId: true, addedLater: true },
  { name: 'audit_event', table: auditEvent, userCols: ['actorId'], hasUuidId: false },
];

type Row = Record<string, unknown>;

const sha256 = (b: Uint8Array) => createHash('sha256').update(b).digest('hex');

function columnsOf(table: PgTable) {
  return Object.entries(getTableColumns(table)).map(([key, col]) => ({ key, type: (col as { columnType: string }).columnType }));
}

/** A row as JSON-safe values: timestamps as ISO text, bytea as base64. */
function serialize(table: PgTable, row: Row): Row {
  const out: Row = {};
  for (const { key, type } of columnsOf(table)) {
    const v = row[key];
    if (v instanceof Date) out[key] = v.toISOString();
    else if (Buffer.isBuffer(v)) out[key] = type === 'PgCustomColumn' ? v.toString('base64') : v;
    else out[key] = v;
  }
  return out;
}

export interface BackupResult {
  zip: Uint8Array;
  counts: Record<string, number>;
  fileName: string;
}

export async function buildBackup(db: Db, campaignId: string, sourceUrl: string): Promise<BackupResult> {
  const snapshot = await db.transaction(
    async (tx) => {
      const [c] = await tx.select().from(campaign).where(eq(campaign.id, campaignId));
      if (!c) throw notFound('That campaign');
      const byCampaign = async (t: PgTable & { campaignId: unknown }, order?: unknown) => {
        const q = tx.select().from(t as typeof point).where(eq((t as typeof point).campaignId, campaignId));
        return (order ? q.orderBy(order as ReturnType<typeof asc>) : q) as unknown as Promise<Row[]>;
      };
      const kitIds = (await tx.select({ id: kitItem.id }).from(kitItem).where(eq(kitItem.campaignId, campaignId))).map((r) => r.id);
      const tables: Record<string, Row[]> = {
        campaign: [c as Row],
        acquisition_settings: await byCampaign(acquisitionSettings as never, asc(acquisitionSettings.version)),
        point: await byCampaign(point as never, asc(point.createdAt)),
        line: await byCampaign(line as never, asc(line.createdAt)),
        kit_item: await byCampaign(kitItem as never, asc(kitItem.createdAt)),
        calibration_record: kitIds.length ? ((await tx.select().from(calibrationRecord).where(inArray(calibrationRecord.kitItemId, kitIds)).orderBy(asc(calibrationRecord.createdAt))) as Row[]) : [],
        channel: await byCampaign(channel as never, asc(channel.channel)),
        schedule_entry: await byCampaign(scheduleEntry as never, asc(scheduleEntry.position)),
        kit_policy: await byCampaign(kitPolicy as never),
        dof_note: await byCampaign(dofNote as never, asc(dofNote.createdAt)),
        dof_photo: (await tx.select({ photo: dofPhoto }).from(dofPhoto).innerJoin(dofNote, eq(dofNote.id, dofPhoto.noteId)).where(eq(dofNote.campaignId, campaignId))).map((r) => r.photo as Row),
        hit: await byCampaign(hit as never, asc(hit.recordedAt)),
        hit_exclusion: await byCampaign(hitExclusion as never, asc(hitExclusion.excludedAt)),
        noise_check: await byCampaign(noiseCheck as never, asc(noiseCheck.recordedAt)),
        original_recording: await byCampaign(originalRecording as never, asc(originalRecording.storedAt)),
        frf_result: await byCampaign(frfResult as never),
        modal_fit: await byCampaign(modalFit as never, asc(modalFit.createdAt)),
        mode_table: await byCampaign(modeTable as never),
        mode_table_row: await byCampaign(modeTableRow as never, asc(modeTableRow.addedAt)),
        fe_model: await byCampaign(feModel as never, asc(feModel.uploadedAt)),
        fe_mode: await byCampaign(feMode as never),
        fe_point_link: await byCampaign(fePointLink as never),
        audit_event: await byCampaign(auditEvent as never, asc(auditEvent.id)),
        ...(await liveInputRows(tx, campaignId)),
      };
      const members = await tx
        .select({ userId: campaignMember.userId, role: campaignMember.role, email: user.email, name: user.name })
        .from(campaignMember)
        .innerJoin(user, eq(user.id, campaignMember.userId))
        .where(eq(campaignMember.campaignId, campaignId));
      return { c, tables, members };
    },
    { isolationLevel: 'repeatable read', accessMode: 'read only' },
  );

  const userIds = new Set<string>(snapshot.members.map((m) => m.userId));
  for (const spec of TABLES) for (const row of snapshot.tables[spec.name]!) for (const col of spec.userCols) if (typeof row[col] === 'string') userIds.add(row[col] as string);
  const users = userIds.size ? await db.select({ id: user.id, name: user.name, email: user.email }).from(user).where(inArray(user.id, [...userIds])) : [];

  const files: Zippable = {};
  const samples: Record<string, { sha256: string; bytes: number }> = {};
  const counts: Record<string, number> = {};
  for (const spec of TABLES) {
    const rows = snapshot.tables[spec.name]!;
    counts[spec.name] = rows.length;
    const json = rows.map((row) => {
      if (spec.name === 'hit') {
        const blob = row.samples as Buffer;
        const id = row.id as string;
        const bytes = new Uint8Array(blob.buffer, blob.byteOffset, blob.byteLength);
        samples[id] = { sha256: sha256(bytes), bytes: bytes.byteLength };
        files[`samples/${id}.f32`] = [bytes, { level: 0 }];
        const { samples: _s, ...rest } = row;
        return serialize(spec.table, rest);
      }
      return serialize(spec.table, row);
    });
    files[`tables/${spec.name}.json`] = strToU8(JSON.stringify(json));
  }
  counts.campaign_member = snapshot.members.length;
  files['tables/campaign_member.json'] = strToU8(JSON.stringify(snapshot.members));
  files['tables/users.json'] = strToU8(JSON.stringify(users));
  const manifest = {
    format: BACKUP_FORMAT,
    version: BACKUP_VERSION,
    exportedAt: new Date().toISOString(),
    sourceUrl,
    campaign: { id: snapshot.c.id, name: snapshot.c.name },
    counts,
    samples,
    notes: 'Tables are JSON arrays of rows with column names as in the Resonote schema; timestamps ISO 8601 UTC; frf_result.data base64 (float64 LE); noise_check.samples base64 (float32 LE, channel after channel, force first, engineering units); original_recording.bytes base64 (an uploaded file as made, kept when it was resampled). samples/<hitId>.f32: the hit samples as stored (float32 LE, channel after channel, force first, engineering units). Invitations and sessions are not included.',
  };
  files['manifest.json'] = strToU8(JSON.stringify(manifest, null, 2));
  const safeName = snapshot.c.name.replace(/[^A-Za-z0-9._-]+/g, '-').replace(/^-+|-+$/g, '').slice(0, 60) || 'campaign';
  return { zip: zipSync(files, { level: 6 }), counts, fileName: `${safeName}-${manifest.exportedAt.slice(0, 10)}.resonote-backup.zip` };
}

const manifestSchema = z.object({
  format: z.literal(BACKUP_FORMAT),
  version: z.literal(BACKUP_VERSION),
  exportedAt: z.string(),
  sourceUrl: z.string(),
  campaign: z.object({ id: z.uuid(), name: z.string() }),
  counts: z.record(z.string(), z.number().int().min(0)),
  samples: z.record(z.uuid(), z.object({ sha256: z.string().regex(/^[0-9a-f]{64}$/), bytes: z.number().int().min(0) })),
});

const rowsSchema = z.array(z.record(z.string(), z.unknown()));
const usersSchema = z.array(z.object({ id: z.string(), name: z.string(), email: z.string() }));
const membersSchema = z.array(z.object({ userId: z.string(), role: z.enum(['lead', 'engineer', 'viewer']), email: z.string(), name: z.string() }));

const notABackup = (why: string) => new HttpError(400, 'not-a-backup', `This file is not a Resonote campaign backup: ${why}. Nothing was restored.`);
const corrupt = (why: string) => new HttpError(400, 'backup-corrupt', `The backup does not check out: ${why}. Nothing was restored.`);

/** Replaces every string that is an old id (anywhere in a JSON value) with its new id. */
function remap(value: unknown, ids: Map<string, string>): unknown {
  if (typeof value === 'string') return ids.get(value) ?? value;
  if (Array.isArray(value)) return value.map((v) => remap(v, ids));
  if (value && typeof value === 'object' && !Buffer.isBuffer(value) && !(value instanceof Date)) {
    return Object.fromEntries(Object.entries(value as Row).map(([k, v]) => [k, remap(v, ids)]));
  }
  return value;
}

function isDbInputError(err: unknown): string | null {
  const e = err as { code?: string; message?: string; cause?: { code?: string; message?: string; detail?: string } } | null;
  const code = e?.cause?.code ?? e?.code;
  if (typeof code === 'string' && /^(22|23)/.test(code)) return e?.cause?.detail ?? e?.cause?.message ?? e?.message ?? code;
  return null;
}

/** A timestamp of a backup row (ISO text); anything that is no time is refused, not left for the driver to throw on. */
function timestampOf(v: unknown, table: string, key: string): Date {
  const d = typeof v === 'string' || typeof v === 'number' ? new Date(v) : null;
  if (!d || Number.isNaN(d.getTime())) throw corrupt(`tables/${table}.json has a ${key} that is not a timestamp (${JSON.stringify(v)?.slice(0, 40) ?? String(v)})`);
  return d;
}

export interface RestoreResult {
  campaignId: string;
  name: string;
  counts: Record<string, number>;
  /** The backup's members (other than the restorer) who were sent an invitation, with the backup's role. */
  invited: { email: string; role: CampaignRole }[];
  /** Members not invited, and why (a malformed address, a mail that could not be sent): never because of an account. */
  notInvited: { email: string; reason: string }[];
  sourceCampaignId: string;
}

export interface Restorer {
  id: string;
  email: string;
  name: string;
  role: 'admin' | 'member';
}

/**
 * The accounts whose ids a restore may write into user columns (recorded by, created by, actor):
 * the restorer and the people who share a campaign with them — whose addresses the restorer sees
 * anyway — or everyone for an admin. Any other address in the backup's users.json is recorded as
 * nobody, so the restored campaign cannot show whether an address has an account here.
 */
async function knownAccounts(db: Db, restorer: Restorer, emails: string[]): Promise<Map<string, string>> {
  if (!emails.length) return new Map();
  const rows =
    restorer.role === 'admin'
      ? await db.select({ id: user.id, email: user.email }).from(user).where(inArray(sql`lower(${user.email})`, emails))
      : await db
          .selectDistinct({ id: user.id, email: user.email })
          .from(user)
          .where(
            and(
              inArray(sql`lower(${user.email})`, emails),
              sql`(${user.id} = ${restorer.id} OR ${user.id} IN (SELECT theirs.user_id FROM ${campaignMember} theirs JOIN ${campaignMember} mine ON mine.campaign_id = theirs.campaign_id WHERE mine.user_id = ${restorer.id}))`,
            ),
          );
  return new Map(rows.map((u) => [u.email.toLowerCase(), u.id]));
}

export async function restoreBackup(db: Db, file: Buffer, restorer: Restorer, options: { members: boolean; mailer: Mailer; publicUrl: string }): Promise<RestoreResult> {
  let entries: Record<string, Uint8Array>;
  try {
    entries = unzipSync(new Uint8Array(file.buffer, file.byteOffset, file.byteLength));
  } catch {
    throw notABackup('it is not a zip file');
  }
  const text = (name: string) => {
    const bytes = entries[name];
    if (!bytes) throw notABackup(`${name} is missing`);
    try {
      return JSON.parse(Buffer.from(bytes).toString('utf8')) as unknown;
    } catch {
      throw notABackup(`${name} is not valid JSON`);
    }
  };
  const manifestParsed = manifestSchema.safeParse(text('manifest.json'));
  if (!manifestParsed.success) throw notABackup(`manifest.json does not describe a ${BACKUP_FORMAT} version ${BACKUP_VERSION} (${manifestParsed.error.issues[0]?.path.join('.') || 'format'}: ${manifestParsed.error.issues[0]?.message})`);
  const manifest = manifestParsed.data;

  const tables: Record<string, Row[]> = {};
  for (const spec of TABLES) {
    if (spec.addedLater && !entries[`tables/${spec.name}.json`] && manifest.counts[spec.name] === undefined) {
      tables[spec.name] = [];
      continue;
    }
    const rows = rowsSchema.safeParse(text(`tables/${spec.name}.json`));
    if (!rows.success) throw notABackup(`tables/${spec.name}.json is not a list of rows`);
    if (manifest.counts[spec.name] !== rows.data.length) throw corrupt(`tables/${spec.name}.json holds ${rows.data.length} rows, the manifest says ${manifest.counts[spec.name] ?? 'none'}`);
    if (spec.hasUuidId && rows.data.some((r) => !z.uuid().safeParse(r.id).success)) throw corrupt(`a row of tables/${spec.name}.json has no valid id`);
    tables[spec.name] = rows.data;
  }
  if (tables.campaign!.length !== 1) throw corrupt('tables/campaign.json must hold exactly one campaign');
  const users = usersSchema.safeParse(text('tables/users.json'));
  if (!users.success) throw notABackup('tables/users.json is not a list of accounts');
  const members = membersSchema.safeParse(text('tables/campaign_member.json'));
  if (!members.success) throw notABackup('tables/campaign_member.json is not a list of members');

  // Every sample blob must be present and match its manifest hash before anything is written.
  const blobs = new Map<string, Buffer>();
  for (const row of tables.hit!) {
    const id = row.id as string;
    const bytes = entries[`samples/${id}.f32`];
    const expected = manifest.samples[id];
    if (!bytes) throw corrupt(`the samples of hit ${id} (samples/${id}.f32) are missing`);
    if (!expected) throw corrupt(`the manifest has no hash for hit ${id}`);
    const actual = sha256(bytes);
    if (actual !== expected.sha256 || bytes.byteLength !== expected.bytes) throw corrupt(`the samples of hit ${id} have SHA-256 ${actual}, the manifest says ${expected.sha256}`);
    const channels = Array.isArray(row.channels) ? row.channels.length : 0;
    if (typeof row.samplesPerChannel !== 'number' || bytes.byteLength !== channels * row.samplesPerChannel * 4) throw corrupt(`hit ${id} should hold ${channels} × ${String(row.samplesPerChannel)} float32 samples, the blob has ${bytes.byteLength} bytes`);
    blobs.set(id, Buffer.from(bytes));
  }

  // The backup's other members become invitations (checked before anything is written).
  const invitations: { email: string; role: CampaignRole }[] = [];
  const notInvited: { email: string; reason: string }[] = [];
  if (options.members) {
    const seen = new Set<string>([restorer.email.toLowerCase()]);
    for (const m of members.data) {
      const email = m.email.trim().toLowerCase();
      if (seen.has(email)) continue;
      seen.add(email);
      if (!z.email().safeParse(email).success) notInvited.push({ email: m.email.slice(0, 200), reason: 'not a valid e-mail address' });
      else invitations.push({ email, role: m.role });
    }
    if (invitations.length > RESTORE_MAX_INVITATIONS) throw new HttpError(400, 'too-many-members', `The backup lists ${invitations.length} members to invite; a restore invites at most ${RESTORE_MAX_INVITATIONS}. Restore without members and invite people from the restored campaign. Nothing was restored.`);
  }

  // New ids everywhere; user references matched by e-mail among the accounts the restorer knows, else null.
  const ids = new Map<string, string>();
  for (const spec of TABLES) if (spec.hasUuidId) for (const row of tables[spec.name]!) ids.set(row.id as string, randomUUID());
  const emails = [...new Set(users.data.map((u) => u.email.toLowerCase()))];
  const localByEmail = await knownAccounts(db, restorer, emails);
  const userMap = new Map<string, string>();
  for (const u of users.data) {
    const mine = localByEmail.get(u.email.toLowerCase());
    if (mine) userMap.set(u.id, mine);
  }

  const source = tables.campaign![0]!;
  const newCampaignId = ids.get(source.id as string)!;
  const now = new Date();
  const prepared: Record<string, Row[]> = {};
  for (const spec of TABLES) {
    const cols = columnsOf(spec.table);
    prepared[spec.name] = tables[spec.name]!.map((row) => {
      const out: Row = {};
      for (const { key, type } of cols) {
        if (!(key in row) && !(spec.name === 'hit' && key === 'samples')) continue;
        if (spec.name === 'audit_event' && key === 'id') continue; // a new serial id
        const v = row[key];
        if (spec.userCols.includes(key)) out[key] = typeof v === 'string' ? (userMap.get(v) ?? null) : null;
        else if (spec.name === 'hit' && key === 'samples') out[key] = blobs.get(row.id as string)!;
        else if (type === 'PgTimestamp') out[key] = v === null || v === undefined ? v : timestampOf(v, spec.name, key);
        else if (type === 'PgCustomColumn') out[key] = typeof v === 'string' ? Buffer.from(v, 'base64') : v;
        else out[key] = remap(v, ids);
      }
      return out;
    });
  }
  // Kit borrowed from a lab inventory stays linked only to an item of this instance's inventory.
  const labIds = [...new Set(prepared.kit_item!.map((k) => k.labItemId).filter((v): v is string => typeof v === 'string' && z.uuid().safeParse(v).success))];
  const localLab = new Set(labIds.length ? (await db.select({ id: labItem.id }).from(labItem).where(inArray(labItem.id, labIds))).map((r) => r.id) : []);
  for (const k of prepared.kit_item!) if (k.labItemId !== undefined && !localLab.has(k.labItemId as string)) k.labItemId = null;
  const c = prepared.campaign![0]!;
  c.name = `${String(source.name)} (restored)`;
  c.updatedAt = now;
  c.version = 1;
  for (const f of prepared.modal_fit!) {
    if (f.status === 'queued' || f.status === 'running') Object.assign(f, { status: 'failed', message: 'The fit was still running when the backup was taken; run it again.' });
  }

  const counts: Record<string, number> = {};
  const expiresAt = new Date(Date.now() + INVITATION_DAYS * 86_400_000);
  let pending: { id: string; email: string; role: CampaignRole; token: string }[] = [];
  try {
    await db.transaction(async (tx) => {
      for (const spec of TABLES) {
        const rows = prepared[spec.name]!;
        counts[spec.name] = rows.length;
        // Hits carry their samples: insert a few at a time to keep each statement small.
        const chunk = spec.name === 'hit' ? 8 : spec.name === 'noise_check' ? 1 : 200;
        for (let i = 0; i < rows.length; i += chunk) await tx.insert(spec.table).values(rows.slice(i, i + chunk) as never);
      }
      await tx.insert(campaignMember).values({ campaignId: newCampaignId, userId: restorer.id, role: 'lead' });
      pending = [];
      for (const inv of invitations) {
        const { token, tokenHash } = newInvitationToken();
        const [row] = await tx.insert(campaignInvitation).values({ campaignId: newCampaignId, email: inv.email, role: inv.role, tokenHash, invitedBy: restorer.id, expiresAt }).returning({ id: campaignInvitation.id });
        await audit(tx, { campaignId: newCampaignId, actorId: restorer.id, entity: 'invitation', entityId: row!.id, action: 'create', after: { email: inv.email, role: inv.role, expiresAt, via: 'restore' } });
        pending.push({ id: row!.id, email: inv.email, role: inv.role, token });
      }
      await audit(tx, {
        campaignId: newCampaignId,
        actorId: restorer.id,
        entity: 'campaign',
        entityId: newCampaignId,
        action: 'restore',
        after: { from: { campaignId: manifest.campaign.id, name: manifest.campaign.name, sourceUrl: manifest.sourceUrl, exportedAt: manifest.exportedAt }, counts, members: options.members ? { invited: invitations, notInvited } : 'not copied' },
      });
    });
  } catch (err) {
    if (err instanceof HttpError) throw err;
    const why = isDbInputError(err);
    if (why) throw corrupt(`its rows do not fit this instance's schema (${why})`);
    throw err;
  }

  // Mailed after the commit, one by one, as POST …/invitations does; an invitation whose mail did
  // not go out is withdrawn so no dead invitation stays open.
  const invited: { email: string; role: CampaignRole }[] = [];
  for (const p of pending) {
    try {
      await mailInvitation(options.mailer, options.publicUrl, {
        to: p.email,
        token: p.token,
        role: p.role,
        inviterName: restorer.name,
        campaign: { name: String(c.name), structure: typeof c.structure === 'string' ? c.structure : null },
        context: 'The campaign was restored from a backup that lists you as a member; you join it only if you accept.',
      });
      invited.push({ email: p.email, role: p.role });
    } catch {
      await db.update(campaignInvitation).set({ revokedAt: new Date() }).where(eq(campaignInvitation.id, p.id));
      notInvited.push({ email: p.email, reason: 'the invitation mail could not be sent; invite this person from the campaign' });
    }
  }
  return { campaignId: newCampaignId, name: String(c.name), counts, invited, notInvited, sourceCampaignId: manifest.campaign.id };
}

/** Whether the user may restore: an admin, or someone who leads at least one campaign (like creating one). */
export async function mayRestore(db: Db, me: { id: string; role: string }): Promise<boolean> {
  if (me.role === 'admin') return true;
  const [row] = await db.select({ n: sql<number>`count(*)::int` }).from(campaignMember).where(and(eq(campaignMember.userId, me.id), eq(campaignMember.role, 'lead')));
  return (row?.n ?? 0) > 0;
}
