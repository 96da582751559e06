// The upload side of a note per DOF: the multipart form (the photo in "file", its thumbnail in
// "thumbnail"), the Idempotency-Key (as for hit uploads: header or field, matched exactly, bound
// to the request's SHA-256 in dof_note_key) and the checks of the thumbnail.
import type { RequestHandler } from 'express';
import multer from 'multer';
import { and, eq } from 'drizzle-orm';
import { DOF_THUMB_MAX_BYTES, IDEMPOTENCY_KEY_RULE, idempotencyKeySchema, PHOTO_MAX_BYTES, photoTypeOf } from '@resonote/contracts';
import { dofNoteKey } from '@resonote/db/schema';
import type { Db } from '@resonote/db/client';
import { multipartError } from '../http/multipart.ts';
import { requestSha256 } from '../hits/upload-keys.ts';
import { badRequest, HttpError } from '../errors.ts';

/** multer for a note: at most one photo ("file") and one thumbnail ("thumbnail"), in memory. */
export function noteUpload(tooLarge: string): RequestHandler {
  const options = { tooLarge, nothingDone: 'nothing was stored', fields: 4 };
  const parse = multer({ storage: multer.memoryStorage(), limits: { fileSize: PHOTO_MAX_BYTES, files: 2, fields: options.fields } }).fields([
    { name: 'file', maxCount: 1 },
    { name: 'thumbnail', maxCount: 1 },
  ]);
  return (req, res, next) => parse(req, res, (err: unknown) => (err ? next(multipartError(err, options)) : next()));
}

/** The Idempotency-Key from the header or the form field (400 when missing, malformed or the two differ). */
export function noteKeyOf(header: string | undefined, field: unknown): string {
  if (field !== undefined && typeof field !== 'string') throw badRequest('The idempotencyKey field must be one text value. Nothing was stored.');
  if (header !== undefined && field !== undefined && header !== field) throw badRequest('The Idempotency-Key header and the idempotencyKey field differ; send one key for one note. Nothing was stored.');
  const key = header ?? field;
  if (key === undefined || key === '') throw badRequest(`Send an Idempotency-Key header (${IDEMPOTENCY_KEY_RULE}) so a retried note is never stored twice.`);
  if (!idempotencyKeySchema.safeParse(key).success) throw badRequest(`The Idempotency-Key ${JSON.stringify(key.slice(0, 60))}${key.length > 60 ? '…' : ''} (${key.length} characters) is not usable: a key is ${IDEMPOTENCY_KEY_RULE}. Nothing was stored.`);
  return key;
}

/** SHA-256 of what a note stores: topic, text and the photo's bytes (not the thumbnail, made from the photo). */
export const noteRequestSha256 = (fields: { topic: string; text: string }, photo?: Buffer) => requestSha256('dof-note', fields, photo);

export interface NoteKeyBinding {
  campaignId: string;
  key: string;
  entryId: string;
  requestSha256: string;
}

/**
 * The note an earlier use of this key stored (replay it), null when the key is new (undefined
 * never); 409 when it was used at another entry, 422 when for another note.
 */
export async function earlierNoteKey(db: Db, b: NoteKeyBinding): Promise<{ noteId: string | null } | null> {
  const [row] = await db.select().from(dofNoteKey).where(and(eq(dofNoteKey.campaignId, b.campaignId), eq(dofNoteKey.key, b.key)));
  if (!row) return null;
  const again = 'Nothing was stored; send a new key with each new note, and the same key only to retry the same upload.';
  if (row.entryId !== b.entryId) throw new HttpError(409, 'idempotency-key-other-entry', `This Idempotency-Key was already used for a note at another schedule entry. ${again}`, { key: b.key });
  if (row.requestSha256 !== b.requestSha256) throw new HttpError(422, 'idempotency-key-reused', `This Idempotency-Key was already used for a different note (other text, topic or photo) at this entry. ${again}`, { key: b.key });
  return { noteId: row.noteId };
}

/** The thumbnail beside a photo, checked: JPEG, PNG or WebP by its first bytes, at most DOF_THUMB_MAX_BYTES. */
export function photoThumbnail(file: Express.Multer.File | undefined): { mime: string; bytes: Buffer; size: number } | null {
  if (!file) return null;
  if (file.size > DOF_THUMB_MAX_BYTES) throw new HttpError(413, 'thumbnail-too-large', `The thumbnail is ${Math.round(file.size / 1024)} kB; a thumbnail is at most ${DOF_THUMB_MAX_BYTES / 1024} kB (320 px on the longer side is plenty). Nothing was stored.`);
  const mime = photoTypeOf(file.buffer);
  if (!mime) throw new HttpError(415, 'unsupported-photo', 'The thumbnail is not a JPEG, PNG or WebP image (judged by its first bytes). Nothing was stored.', { accepted: ['image/jpeg', 'image/png', 'image/webp'] });
  return { mime, bytes: file.buffer, size: file.size };
}
