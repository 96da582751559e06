// Editing and deleting a note per DOF, and its photo's thumbnail. The author or a lead (or an
// admin) may edit or delete a note; another engineer gets 403. Every change carries the version
// the editor loaded (409 with the current note when someone changed it since) and is audited with
// the note before and after; a deleted note's text and photo details stay in the audit trail.
import { and, eq, sql } from 'drizzle-orm';
import { dofNoteDeleteQuerySchema, dofNoteEditSchema, uuidSchema } from '@resonote/contracts';
import { dofNote, dofPhoto } from '@resonote/db/schema';
import type { CampaignAccess, SessionUser } from '../context.ts';
import type { Deps } from './deps.ts';
import { audit, type Tx } from '../http/audit.ts';
import { staleWrite } from '../http/concurrency.ts';
import { HttpError, notFound } from '../errors.ts';
import { notesOf, thumbnailOf } from './notes.ts';

/** The note, locked for the change, after the checks: it exists here (404), the caller may change it (403), the version is current (409). */
async function noteForChange(tx: Tx, access: CampaignAccess, me: SessionUser, noteId: string | undefined, version: number) {
  if (!uuidSchema.safeParse(noteId).success) throw notFound('That note');
  const [row] = await tx.select().from(dofNote).where(and(eq(dofNote.id, noteId!), eq(dofNote.campaignId, access.campaignId))).for('update');
  if (!row) throw notFound('That note');
  const lead = access.role === 'lead' || access.role === 'admin';
  if (!lead && row.authorId !== me.id) throw new HttpError(403, 'not-note-author', 'Only the note’s author or a lead of the campaign can change or delete it. Leave a note of your own instead.');
  if (row.version !== version) {
    const [current] = await notesOf(tx, access.campaignId, undefined, row.id);
    throw staleWrite('This note', current);
  }
  return row;
}

export function registerDofNoteEditRoutes({ routes, db }: Deps): void {
  routes.add({
    method: 'patch',
    path: '/campaigns/:campaignId/notes/:noteId',
    tag: 'Notes',
    access: 'engineer',
    summary: 'Edit a note’s text or topic (its author or a lead); send the version you loaded: 409 with the current note when it changed since. The photo stays as it is',
    body: dofNoteEditSchema,
    returns: '{ note }',
    handler: async ({ body, params, campaign: access, user: me }) => {
      const id = await db.transaction(async (tx) => {
        const before = await noteForChange(tx, access, me, params.noteId, body.version);
        const change = { ...(body.topic !== undefined ? { topic: body.topic } : {}), ...(body.text !== undefined ? { text: body.text } : {}) };
        const [after] = await tx
          .update(dofNote)
          .set({ ...change, version: sql`${dofNote.version} + 1`, editedAt: new Date() })
          .where(eq(dofNote.id, before.id))
          .returning();
        const [photo] = await tx.select({ noteId: dofPhoto.noteId }).from(dofPhoto).where(eq(dofPhoto.noteId, before.id));
        if (!after!.text && !photo) throw new HttpError(400, 'invalid-input', 'A note without a photo needs text; delete the note instead of emptying it. Nothing was changed.', [{ path: 'text', message: 'empty' }]);
        await audit(tx, { campaignId: access.campaignId, actorId: me.id, entity: 'dof-note', entityId: before.id, action: 'update', before: { topic: before.topic, text: before.text, version: before.version }, after: { topic: after!.topic, text: after!.text, version: after!.version } });
        return before.id;
      });
      const [note] = await notesOf(db, access.campaignId, undefined, id);
      return { note };
    },
  });

  routes.add({
    method: 'delete',
    path: '/campaigns/:campaignId/notes/:noteId',
    tag: 'Notes',
    access: 'engineer',
    summary: 'Delete a note and its photo (its author or a lead); ?version= as loaded: 409 with the current note when it changed since. The audit trail keeps the text and the photo’s type, size and SHA-256',
    query: dofNoteDeleteQuerySchema,
    handler: async ({ query, params, campaign: access, user: me }) => {
      await db.transaction(async (tx) => {
        const before = await noteForChange(tx, access, me, params.noteId, query.version);
        const [photo] = await tx.select({ mime: dofPhoto.mime, size: dofPhoto.size, sha256: dofPhoto.sha256 }).from(dofPhoto).where(eq(dofPhoto.noteId, before.id));
        await tx.delete(dofNote).where(eq(dofNote.id, before.id));
        await audit(tx, { campaignId: access.campaignId, actorId: me.id, entity: 'dof-note', entityId: before.id, action: 'delete', before: { ...before, photo: photo ?? null } });
      });
      return undefined;
    },
  });

  routes.add({
    method: 'get',
    path: '/campaigns/:campaignId/notes/:noteId/thumbnail',
    tag: 'Notes',
    access: 'viewer',
    summary: 'The small thumbnail of a note’s photo (made in the browser before upload, at most 96 kB); 404 no-thumbnail when the photo came without one',
    produces: 'image/*',
    handler: async ({ res, params, campaign: access }) => {
      if (!uuidSchema.safeParse(params.noteId).success) throw notFound('That photo');
      const row = await thumbnailOf(db, access.campaignId, params.noteId!);
      if (!row) throw new HttpError(404, 'no-thumbnail', 'That note has no photo thumbnail here (the photo came without one, or there is no such note); open the photo itself.');
      res.setHeader('Content-Type', row.mime);
      res.setHeader('X-Content-Type-Options', 'nosniff');
      res.setHeader('Content-Disposition', 'inline');
      res.status(200).end(row.bytes);
      return undefined;
    },
  });
}
