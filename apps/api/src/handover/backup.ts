// Writes a campaign backup (the zip laid out in backup-format.ts) from one repeatable-read snapshot
// of the tables in backup-tables.ts. Restoring one is restore.ts.
import { eq, inArray } from 'drizzle-orm';
import { strToU8, zipSync, type Zippable } from 'fflate';
import { campaign, campaignMember, user } from '@resonote/db/schema';
import type { Db } from '@resonote/db/client';
import { notFound } from '../errors.ts';
import { BACKUP_FORMAT, BACKUP_VERSION, serialize, sha256 } from './backup-format.ts';
import { readCampaignTables, TABLES } from './backup-tables.ts';

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
      const tables = await readCampaignTables(tx, campaignId);
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
