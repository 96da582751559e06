// Beside the notes and photos per DOF (lab.ts): the Idempotency-Key that stored each note, so a
// retried upload stores the note once and answers the same, and the small thumbnail of each photo
// that lists and the report show instead of the full image (docs/decisions/dof-photo-thumbnails.md).
import { integer, pgTable, primaryKey, text, timestamp, uuid } from 'drizzle-orm/pg-core';
import { campaign } from './campaign.ts';
import { dofNote } from './lab.ts';
import { bytea } from './hits.ts';

/** One Idempotency-Key per campaign for notes, matched exactly, with the SHA-256 of the request that carried it. */
export const dofNoteKey = pgTable(
  'dof_note_key',
  {
    campaignId: uuid('campaign_id')
      .notNull()
      .references(() => campaign.id, { onDelete: 'cascade' }),
    key: text('key').notNull(),
    /** The schedule entry the note was left at. */
    entryId: uuid('entry_id'),
    requestSha256: text('request_sha256').notNull(),
    /** The note stored; null once that note was deleted (the key stays used). */
    noteId: uuid('note_id').references(() => dofNote.id, { onDelete: 'set null' }),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [primaryKey({ name: 'dof_note_key_pk', columns: [t.campaignId, t.key] })],
);

/** The thumbnail of a note's photo (made in the browser before upload), at most DOF_THUMB_MAX_BYTES. */
export const dofPhotoThumb = pgTable('dof_photo_thumb', {
  noteId: uuid('note_id')
    .primaryKey()
    .references(() => dofNote.id, { onDelete: 'cascade' }),
  mime: text('mime').notNull(),
  bytes: bytea('bytes').notNull(),
  size: integer('size').notNull(),
});
