// Idempotency-Keys of recordings (hits and background-noise checks). A key is bound, in the table
// upload_key, to its campaign, what it stored, its schedule entry and the SHA-256 of the request
// that carried it, and matched exactly (never with a pattern). A retry of the same request with
// the same key replays the first answer; the same key with another recording or at another entry
// is refused, so a client that reuses keys by mistake learns it instead of losing a recording.
import { createHash } from 'node:crypto';
import { and, eq } from 'drizzle-orm';
import { uploadKey } from '@resonote/db/schema';
import type { Db } from '@resonote/db/client';
import { HttpError } from '../errors.ts';
import { loadScheduleEntry } from './schedule-entry.ts';

export type UploadKeyRow = typeof uploadKey.$inferSelect;

export interface KeyBinding {
  campaignId: string;
  key: string;
  purpose: UploadKeyRow['purpose'];
  /** The schedule entry the hits are for; null for a background-noise check. */
  scheduleEntryId: string | null;
  /** requestSha256() of what the request asks to store. */
  requestSha256: string;
}

/** JSON with object keys sorted, so the same fields always hash the same. */
function canonical(value: unknown): string {
  if (value === undefined) return 'null';
  if (value === null || typeof value !== 'object') return JSON.stringify(value);
  if (Array.isArray(value)) return `[${value.map(canonical).join(',')}]`;
  const entries = Object.entries(value as Record<string, unknown>).filter(([, v]) => v !== undefined);
  entries.sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0));
  return `{${entries.map(([k, v]) => `${JSON.stringify(k)}:${canonical(v)}`).join(',')}}`;
}

/**
 * SHA-256 (hex) of what a request asks to store: what kind of request it is, the fields that change
 * what is stored (not the answer's presentation, such as the FRF kind), and the file's bytes.
 */
export function requestSha256(what: string, fields: Record<string, unknown>, file?: Buffer): string {
  const hash = createHash('sha256').update(what).update('\n').update(canonical(fields)).update('\n');
  if (file) hash.update(file);
  return hash.digest('hex');
}

async function entryLabel(db: Db, campaignId: string, entryId: string | null): Promise<string> {
  if (!entryId) return 'no schedule entry';
  try {
    const e = await loadScheduleEntry(db, campaignId, entryId);
    return `response ${e.responseDof}, excitation ${e.excitationDof}`;
  } catch {
    return 'another schedule entry';
  }
}

const purposeWords: Record<UploadKeyRow['purpose'], string> = { hits: 'hits', 'noise-check': 'a background-noise check' };

/**
 * The earlier use of this key when the request is a retry of it (replay that), null when the key
 * is new; a 409 when it was used for something else or at another entry, a 422 when it was used
 * for a different recording.
 */
export async function earlierUse(db: Db, binding: KeyBinding): Promise<UploadKeyRow | null> {
  const [row] = await db
    .select()
    .from(uploadKey)
    .where(and(eq(uploadKey.campaignId, binding.campaignId), eq(uploadKey.key, binding.key)));
  if (!row) return null;
  const again = 'Nothing was stored; send a new key with each new recording, and the same key only to retry the same upload.';
  if (row.purpose !== binding.purpose) {
    throw new HttpError(409, 'idempotency-key-reused', `This Idempotency-Key was already used in this campaign for ${purposeWords[row.purpose]}. ${again}`, { key: binding.key, usedFor: row.purpose });
  }
  if (row.scheduleEntryId !== binding.scheduleEntryId) {
    throw new HttpError(409, 'idempotency-key-other-entry', `This Idempotency-Key was already used for a recording at another schedule entry (${await entryLabel(db, binding.campaignId, row.scheduleEntryId)}). ${again}`, {
      key: binding.key,
      scheduleEntryId: row.scheduleEntryId,
    });
  }
  // Keys stored before request hashes were kept replay by key and entry, as they did then.
  if (row.requestSha256 !== null && row.requestSha256 !== binding.requestSha256) {
    throw new HttpError(422, 'idempotency-key-reused', `This Idempotency-Key was already used for a different recording (another file or other fields) at this entry. ${again}`, { key: binding.key });
  }
  return row;
}

export const isUniqueViolation = (err: unknown) => ((err as { cause?: { code?: string } }).cause?.code ?? (err as { code?: string }).code) === '23505';
