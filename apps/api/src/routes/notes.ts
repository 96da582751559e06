// Notes and photos per DOF: what the engineer saw at the structure (sensor mounting, the tip,
// anything odd), with an optional photo (JPEG, PNG or WebP, recognised by its first bytes).
// Stored in PostgreSQL beside the hits (docs/decisions/dof-photos-in-postgres.md) and audited.
import { createHash } from 'node:crypto';
import { and, asc, eq, sql } from 'drizzle-orm';
import { z } from 'zod';
import { dofNoteFieldsSchema, PHOTO_MAX_BYTES, photoTypeOf, uuidSchema } from '@resonote/contracts';
import { dofNote, dofPhoto, user } from '@resonote/db/schema';
import type { Db } from '@resonote/db/client';
import type { Deps } from './deps.ts';
import { audit } from '../http/audit.ts';
import { singleFileUpload } from '../http/multipart.ts';
import { loadScheduleEntry } from '../hits/schedule-entry.ts';
import { badRequest, HttpError, notFound } from '../errors.ts';

const MB = Math.round(PHOTO_MAX_BYTES / 1024 / 1024);

/** The notes of a campaign (one entry's, or all), oldest first, without photo bytes. */
export async function notesOf(db: Db, campaignId: string, entryId?: string) {
  return db
    .select({
      id: dofNote.id,
      entryId: dofNote.entryId,
      excitationDof: dofNote.excitationDof,
      responseDof: dofNote.responseDof,
      topic: dofNote.topic,
      text: dofNote.text,
      authorName: user.name,
      createdAt: dofNote.createdAt,
      photo: sql<{ mime: string; size: number } | null>`case when ${dofPhoto.noteId} is null then null else json_build_object('mime', ${dofPhoto.mime}, 'size', ${dofPhoto.size}) end`,
    })
    .from(dofNote)
    .leftJoin(dofPhoto, eq(dofPhoto.noteId, dofNote.id))
    .leftJoin(user, eq(user.id, dofNote.authorId))
    .where(and(eq(dofNote.campaignId, campaignId), entryId ? eq(dofNote.entryId, entryId) : undefined))
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

export function registerNoteRoutes({ routes, db }: Deps): void {
  const upload = singleFileUpload({ fileSize: PHOTO_MAX_BYTES, fields: 4, tooLarge: `The photo is larger than ${MB} MB; make it smaller (a phone's "medium" size is plenty). Nothing was stored.`, nothingDone: 'nothing was stored' });

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
    summary: `Leave a note at a schedule entry: multipart fields topic (sensor-mounting | tip | other) and text, and optionally a photo (JPEG, PNG or WebP up to ${MB} MB) in the field "file"`,
    before: [upload],
    status: 201,
    returns: '{ note }',
    handler: async ({ req, params, campaign: access, user: me }) => {
      if (!req.is('multipart/form-data')) throw new HttpError(415, 'unsupported-media-type', 'Send the note as multipart/form-data (fields topic and text, the photo in the field "file").');
      const entry = await loadScheduleEntry(db, access.campaignId, params.entryId!);
      const parsed = dofNoteFieldsSchema.safeParse(req.body ?? {});
      if (!parsed.success) throw badRequest(parsed.error.issues.map((i) => `${i.path.join('.') || 'form'}: ${i.message}`).join('; '), parsed.error.issues.map((i) => ({ path: i.path.join('.'), message: i.message })));
      const { topic, text } = parsed.data;
      const file = req.file;
      if (!text && !file) throw badRequest('Write a note or attach a photo (or both); an empty note was not stored.', [{ path: 'text', message: 'empty' }]);
      let photo: { mime: string; bytes: Buffer } | null = null;
      if (file) {
        const mime = photoTypeOf(file.buffer);
        if (!mime) {
          throw new HttpError(415, 'unsupported-photo', `The file ${JSON.stringify(file.originalname.slice(0, 80))} is not a JPEG, PNG or WebP image (judged by its first bytes, not its name). Take or export the photo as JPEG, PNG or WebP. Nothing was stored.`, { accepted: ['image/jpeg', 'image/png', 'image/webp'] });
        }
        photo = { mime, bytes: file.buffer };
      }
      return db.transaction(async (tx) => {
        const [note] = await tx.insert(dofNote).values({ campaignId: access.campaignId, entryId: entry.id, excitationDof: entry.excitationDof, responseDof: entry.responseDof, topic, text, authorId: me.id }).returning();
        const photoMeta = photo ? { mime: photo.mime, size: photo.bytes.length, sha256: createHash('sha256').update(photo.bytes).digest('hex') } : null;
        if (photo && photoMeta) await tx.insert(dofPhoto).values({ noteId: note!.id, bytes: photo.bytes, ...photoMeta });
        await audit(tx, { campaignId: access.campaignId, actorId: me.id, entity: 'dof-note', entityId: note!.id, action: 'create', after: { ...note, photo: photoMeta } });
        return { note: { ...note, authorName: me.name, photo: photoMeta && { mime: photoMeta.mime, size: photoMeta.size } } };
      });
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
