// Reads a backup file before a restore writes anything: the zip, the manifest, every table's rows
// (a table added later may be absent) and every hit's samples checked against the manifest's SHA-256.
import { unzipSync } from 'fflate';
import { z } from 'zod';
import { BACKUP_FORMAT, BACKUP_VERSION, corrupt, manifestSchema, membersSchema, notABackup, rowsSchema, sha256, usersSchema, type Manifest } from './backup-format.ts';
import { TABLES, type Row } from './backup-tables.ts';

export interface BackupContents {
  manifest: Manifest;
  tables: Record<string, Row[]>;
  users: z.infer<typeof usersSchema>;
  members: z.infer<typeof membersSchema>;
  /** Each hit's samples, byte for byte, by the backup's hit id. */
  blobs: Map<string, Buffer>;
}

export function readBackup(file: Buffer): BackupContents {
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
  return { manifest, tables, users: users.data, members: members.data, blobs };
}
