// Editing and deleting notes per DOF, and the photo thumbnails lists and the report show.
import { z } from 'zod';
import { text } from './kit.ts';
import { noteTopics } from './lab.ts';

/** Largest thumbnail accepted beside a photo: 96 kB (a 320 px JPEG at quality 0.8 is 15–40 kB). */
export const DOF_THUMB_MAX_BYTES = 96 * 1024;
/** The longer side of the thumbnail the web app makes before upload, in px. */
export const DOF_THUMB_MAX_PX = 320;

/** PATCH of a note: the fields to change and the version the editor loaded. */
export const dofNoteEditSchema = z
  .strictObject({
    topic: z.enum(noteTopics).optional(),
    text: text(2000).optional(),
    version: z.number().int().min(1),
  })
  .refine((v) => v.topic !== undefined || v.text !== undefined, { message: 'send topic or text (or both) to change' });

/** DELETE of a note: the version the person deleting it saw. */
export const dofNoteDeleteQuerySchema = z.strictObject({ version: z.coerce.number().int().min(1) });
