// Notes and photos per DOF: what the engineer saw at the structure (sensor mounting, the tip,
// anything odd), with an optional photo (JPEG, PNG or WebP, recognised by its first bytes).
// Stored in PostgreSQL beside the hits (docs/decisions/dof-photos-in-postgres.md) and audited.
// Each upload carries an Idempotency-Key (a retry stores the note once and answers the same) and
// may carry the photo's thumbnail, made in the browser (docs/decisions/dof-photo-thumbnails.md).
// Edit, delete and the thumbnail's route: dof-notes-edit.ts.
import { createHash } from 'node:crypto';
import { and, asc, eq, sql } from 'drizzle-orm';
import { z } from 'zod';
import { dofNoteFieldsSchema, PHOTO_MAX_BYTES, photoTypeOf, uuidSchema } from '@resonote/contracts';
import { dofNote, dofNoteKey, dofPhoto, dofPhotoThumb, user } from '@resonote/db/schema';
import type { Db } from '@resonote/db/client';
import type { Deps } from './deps.ts';
import { audit, type Tx } from '../http/audit.ts';
import { loadScheduleEntry } from '../hits/schedule-entry.ts';
import { isUniqueViolation } from '../hits/upload-keys.ts';
import { badRequest, HttpError, notFound } from '../errors.ts';
import { earlierNoteKey, noteKeyOf, noteRequestSha256, noteUpload, photoThumbnail } from './dof-note-upload.ts';

const MB = Math.round(PHOTO_MAX_BYTES / 1024 / 1024);

/** The notes of a campaign (one entry's, one note, or all), oldest first, without photo bytes. */
export async function notesOf(db: Db | Tx, campaignId: string, entryId?: string, noteId?: string) {
  return db
    .select({
      id: dofNote.id,
      entryId: dofNote.entryId,
      excitationDof: dofNote.excitationDof,
      responseDof: dofNote.responseDof,
      topic: dofNote.topic,
      text: dofNote.text,
      authorId: dofNote.authorId,
      authorName: user.name,
      createdAt: dofNote.createdAt,
      editedAt: dofNote.editedAt,
      version: dofNote.version,
      photo: sql<{ mime: string; size: number; thumbnail: boolean } | null>`case when ${dofPhoto.noteId} is null then null else json_build_object('mime', ${dofPhoto.mime}, 'size', ${dofPhoto.size}, 'thumbnail', ${dofPhotoThumb.noteId} is not null) end`,
    })
    .from(dofNote)
    .leftJoin(dofPhoto, eq(dofPhoto.noteId, dofNote.id))
    .leftJoin(dofPhotoThumb, eq(dofPhotoThumb.noteId, dofNote.id))
    .leftJoin(user, eq(user.id, dofNote.authorId))
    .where(and(eq(dofNote.campaignId, campaignId), entryId ? eq(dofNote.entryId, entryId) : undefined, noteId ? eq(dofNote.id, noteId) : undefined))
    .orderBy(asc(dofNote.createdAt), asc(dofNote.id));
}

/** A note's photo bytes (for the report), or null. */
export async function photoOf(db: Db, campaignId: string, noteId: string) {
  const [row] = await db
    .select({ mime: dofPhoto.mime, bytes: dofPhoto.bytes })
    .from(dofPhoto)
    .innerJoin(dofNote, eq(dofNote.id, dofPhoto.noteId))
    .where(and(eq(dofPhoto.noteId, noteId), eq(dofNote.campaignId, campaignId)));
  return row ?? null;
}

/** One note as the list shows it; a key whose note was deleted since answers 409. */
async function noteAnswer(db: Db, campaignId: string, noteId: string | null) {
  const [note] = noteId ? await notesOf(db, campaignId, undefined, noteId) : [];
  if (!note) throw new HttpError(409, 'idempotency-key-note-deleted', 'This Idempotency-Key stored a note that was deleted since; nothing was stored again. Send a new key to leave a new note.');
  return note;
}

/** A note's photo thumbnail bytes (lists and the report), or null when the photo came without one. */
export async function thumbnailOf(db: Db, campaignId: string, noteId: string) {
  const [row] = await db
    .select({ mime: dofPhotoThumb.mime, bytes: dofPhotoThumb.bytes })
    .from(dofPhotoThumb)
    .innerJoin(dofNote, eq(dofNote.id, dofPhotoThumb.noteId))
    .where(and(eq(dofPhotoThumb.noteId, noteId), eq(dofNote.campaignId, campaignId)));
  return row ?? null;
}

export function registerNoteRoutes({ routes, db }: Deps): void {
  const upload = noteUpload(`The photo is larger than ${MB} MB; make it smaller (a phone's "medium" size is plenty). Nothing was stored.`);

  routes.add({
    method: 'get',
    path: '/campaigns/:campaignId/notes',
    tag: 'Notes',
    access: 'viewer',
    summary: 'Notes per DOF (sensor mounting, tip, anything odd), oldest first; ?entryId= for one schedule entry',
    query: z.strictObject({ entryId: uuidSchema.optional() }),
    returns: '{ notes: [{ id, entryId, excitationDof, responseDof, topic, text, authorName, createdAt, photo: { mime, size } | null }] }',
    handler: async ({ query, campaign: access }) => ({ notes: await notesOf(db, access.campaignId, query.entryId) }),
  });

  routes.add({
    method: 'post',
    path: '/campaigns/:campaignId/schedule/:entryId/notes',
    tag: 'Notes',
    access: 'engineer',
    summary: `Leave a note at a schedule entry: multipart fields topic (sensor-mounting | tip | other) and text, optionally a photo (JPEG, PNG or WebP up to ${MB} MB) in the field "file" and its thumbnail in the field "thumbnail". Header Idempotency-Key (or field idempotencyKey) required: a retry with the same key stores the note once and answers 200 with replayed: true`,
    before: [upload],
    status: 201,
    returns: '{ note, replayed }',
    handler: async ({ req, res, params, campaign: access, user: me }) => {
      if (!req.is('multipart/form-data')) throw new HttpError(415, 'unsupported-media-type', 'Send the note as multipart/form-data (fields topic and text, the photo in the field "file").');
      const entry = await loadScheduleEntry(db, access.campaignId, params.entryId!);
      const { idempotencyKey: keyField, ...fields } = (req.body ?? {}) as Record<string, unknown>;
      const key = noteKeyOf(req.get('idempotency-key'), keyField);
      const parsed = dofNoteFieldsSchema.safeParse(fields);
      if (!parsed.success) throw badRequest(parsed.error.issues.map((i) => `${i.path.join('.') || 'form'}: ${i.message}`).join('; '), parsed.error.issues.map((i) => ({ path: i.path.join('.'), message: i.message })));
      const { topic, text } = parsed.data;
      const files = (req.files ?? {}) as Record<string, Express.Multer.File[] | undefined>;
      const file = files.file?.[0];
      if (!file && files.thumbnail?.length) throw badRequest('A thumbnail came without its photo; send the photo in the field "file" beside it. Nothing was stored.', [{ path: 'thumbnail', message: 'without a photo' }]);
      if (!text && !file) throw badRequest('Write a note or attach a photo (or both); an empty note was not stored.', [{ path: 'text', message: 'empty' }]);
      let photo: { mime: string; bytes: Buffer } | null = null;
      if (file) {
        const mime = photoTypeOf(file.buffer);
        if (!mime) {
          throw new HttpError(415, 'unsupported-photo', `The file ${JSON.stringify(file.originalname.slice(0, 80))} is not a JPEG, PNG or WebP image (judged by its first bytes, not its name). Take or export the photo as JPEG, PNG or WebP. Nothing was stored.`, { accepted: ['image/jpeg', 'image/png', 'image/webp'] });
        }
        photo = { mime, bytes: file.buffer };
      }
      const thumb = photoThumbnail(files.thumbnail?.[0]);
      const binding = { campaignId: access.campaignId, key, entryId: entry.id, requestSha256: noteRequestSha256({ topic, text }, photo?.bytes) };
      const replay = async () => {
        const earlier = await earlierNoteKey(db, binding);
        if (!earlier) return null;
        res.locals.status = 200;
        return { note: await noteAnswer(db, access.campaignId, earlier.noteId), replayed: true };
      };
      const first = await replay();
      if (first) return first;
      try {
        const noteId = await db.transaction(async (tx) => {
          const [note] = await tx.insert(dofNote).values({ campaignId: access.campaignId, entryId: entry.id, excitationDof: entry.excitationDof, responseDof: entry.responseDof, topic, text, authorId: me.id }).returning();
          const photoMeta = photo ? { mime: photo.mime, size: photo.bytes.length, sha256: createHash('sha256').update(photo.bytes).digest('hex') } : null;
          if (photo && photoMeta) await tx.insert(dofPhoto).values({ noteId: note!.id, bytes: photo.bytes, ...photoMeta });
          if (photo && thumb) await tx.insert(dofPhotoThumb).values({ noteId: note!.id, ...thumb });
          await tx.insert(dofNoteKey).values({ ...binding, noteId: note!.id });
          await audit(tx, { campaignId: access.campaignId, actorId: me.id, entity: 'dof-note', entityId: note!.id, action: 'create', after: { ...note, photo: photoMeta, thumbnail: thumb && { mime: thumb.mime, size: thumb.size }, idempotencyKey: key } });
          return note!.id;
        });
        return { note: await noteAnswer(db, access.campaignId, noteId), replayed: false };
      } catch (err) {
        // A simultaneous twin with the same key stored first: answer as its replay.
        if (isUniqueViolation(err)) {
          const again = await replay();
          if (again) return again;
        }
        throw err;
      }
    },
  });

  routes.add({
    method: 'get',
    path: '/campaigns/:campaignId/notes/:noteId/photo',
    tag: 'Notes',
    access: 'viewer',
    summary: 'The photo of a note, as stored (image/jpeg, image/png or image/webp)',
    produces: 'image/*',
    handler: async ({ res, params, campaign: access }) => {
      if (!uuidSchema.safeParse(params.noteId).success) throw notFound('That photo');
      const row = await photoOf(db, access.campaignId, params.noteId!);
      if (!row) throw notFound('That photo');
      res.setHeader('Content-Type', row.mime);
      res.setHeader('X-Content-Type-Options', 'nosniff');
      res.setHeader('Content-Disposition', 'inline');
      res.status(200).end(row.bytes);
      return undefined;
    },
  });
}
