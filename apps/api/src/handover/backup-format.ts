// The campaign backup file's format: one zip of
//   manifest.json        { format: "resonote-campaign-backup", version: 1, exportedAt, sourceUrl,
//                          campaign: { id, name }, counts: { <table>: rows }, samples: { <hitId>: { sha256, bytes } } }
//   tables/<table>.json  every row of every campaign table (settings history, audit trail, results and fits included)
//   tables/users.json    the accounts the rows refer to ({ id, name, email }) so a restore can match them by e-mail
//   samples/<hitId>.f32  the stored float32 little-endian samples of each hit, byte for byte
// This module holds what writing (backup.ts) and reading (backup-read.ts) share: the schemas, the
// row encoding and the two refusals.
import { createHash } from 'node:crypto';
import { getTableColumns } from 'drizzle-orm';
import type { PgTable } from 'drizzle-orm/pg-core';
import { z } from 'zod';
import { HttpError } from '../errors.ts';
import type { Row } from './backup-tables.ts';

export const BACKUP_FORMAT = 'resonote-campaign-backup';
export const BACKUP_VERSION = 1;

export const sha256 = (b: Uint8Array) => createHash('sha256').update(b).digest('hex');

export function columnsOf(table: PgTable) {
  return Object.entries(getTableColumns(table)).map(([key, col]) => ({ key, type: (col as { columnType: string }).columnType }));
}

/** A row as JSON-safe values: timestamps as ISO text, bytea as base64. */
export function serialize(table: PgTable, row: Row): Row {
  const out: Row = {};
  for (const { key, type } of columnsOf(table)) {
    const v = row[key];
    if (v instanceof Date) out[key] = v.toISOString();
    else if (Buffer.isBuffer(v)) out[key] = type === 'PgCustomColumn' ? v.toString('base64') : v;
    else out[key] = v;
  }
  return out;
}

export const manifestSchema = z.object({
  format: z.literal(BACKUP_FORMAT),
  version: z.literal(BACKUP_VERSION),
  exportedAt: z.string(),
  sourceUrl: z.string(),
  campaign: z.object({ id: z.uuid(), name: z.string() }),
  counts: z.record(z.string(), z.number().int().min(0)),
  samples: z.record(z.uuid(), z.object({ sha256: z.string().regex(/^[0-9a-f]{64}$/), bytes: z.number().int().min(0) })),
});
export type Manifest = z.infer<typeof manifestSchema>;

export const rowsSchema = z.array(z.record(z.string(), z.unknown()));
export const usersSchema = z.array(z.object({ id: z.string(), name: z.string(), email: z.string() }));
export const membersSchema = z.array(z.object({ userId: z.string(), role: z.enum(['lead', 'engineer', 'viewer']), email: z.string(), name: z.string() }));

export const notABackup = (why: string) => new HttpError(400, 'not-a-backup', `This file is not a Resonote campaign backup: ${why}. Nothing was restored.`);
export const corrupt = (why: string) => new HttpError(400, 'backup-corrupt', `The backup does not check out: ${why}. Nothing was restored.`);

/** A timestamp of a backup row (ISO text); anything that is no time is refused, not left for the driver to throw on. */
export function timestampOf(v: unknown, table: string, key: string): Date {
  const d = typeof v === 'string' || typeof v === 'number' ? new Date(v) : null;
  if (!d || Number.isNaN(d.getTime())) throw corrupt(`tables/${table}.json has a ${key} that is not a timestamp (${JSON.stringify(v)?.slice(0, 40) ?? String(v)})`);
  return d;
}
