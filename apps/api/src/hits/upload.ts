// The multipart side of a recording upload (hits or a background-noise recording): multer with
// the configured size limit, the form fields that say how to read the values, and the
// Idempotency-Key every upload must carry so a retry is never stored twice.
import type { Request, RequestHandler } from 'express';
import { z } from 'zod';
import { idempotencyKeySchema, IDEMPOTENCY_KEY_RULE } from '@resonote/contracts';
import { badRequest, HttpError } from '../errors.ts';
import { singleFileUpload } from '../http/multipart.ts';
import { isDecimal } from '../http/text-input.ts';

/** One file in the field "file", at most `limitBytes`; 413 above it, 400 that says what was wrong for a broken or cut-off form. */
export function recordingUpload(limitBytes: number): RequestHandler {
  return singleFileUpload({ fileSize: limitBytes, fields: 10, tooLarge: `The recording is larger than ${Math.round(limitBytes / 1024 / 1024)} MB; nothing was stored.`, nothingDone: 'nothing was stored' });
}

/** A number in a form field, written as a plain decimal number ("0x10", "Infinity" and blanks are refused, as in CSV cells). */
const decimalField = z
  .string()
  .refine(isDecimal, 'must be a plain decimal number')
  .transform(Number)
  .pipe(z.number({ error: 'is beyond the range of a number' }));

/** Form fields shared by every recording upload. */
export const uploadFields = {
  units: z.enum(['volts', 'engineering']).default('volts'),
  sampleRateHz: decimalField.pipe(z.number().positive()).optional(),
  fullScaleVolts: decimalField.pipe(z.number().positive().max(1000)).default(1),
  /** The key may come as this field (a plain HTML form cannot set headers); checked in readUploadForm. */
  idempotencyKey: z.string().optional(),
};

/** Parses the form fields with `schema` (400 listing every problem) and takes the Idempotency-Key (header or field). */
export function readUploadForm<T extends z.ZodType<{ idempotencyKey?: string }>>(req: Request, schema: T): { fields: z.infer<T>; key: string; file: Express.Multer.File } {
  const parsed = schema.safeParse(req.body ?? {});
  if (!parsed.success) throw badRequest(parsed.error.issues.map((i) => `${i.path.join('.')}: ${i.message}`).join('; '));
  const header = req.get('idempotency-key');
  const field = parsed.data.idempotencyKey;
  if (header !== undefined && field !== undefined && header !== field) throw badRequest('The Idempotency-Key header and the idempotencyKey field differ; send one key for one recording. Nothing was stored.');
  const key = header ?? field;
  if (key === undefined || key === '') throw badRequest(`Send an Idempotency-Key header (${IDEMPOTENCY_KEY_RULE}) so a retried upload is never stored twice.`);
  if (!idempotencyKeySchema.safeParse(key).success) throw badRequest(`The Idempotency-Key ${JSON.stringify(key.slice(0, 60))}${key.length > 60 ? '…' : ''} (${key.length} characters) is not usable: a key is ${IDEMPOTENCY_KEY_RULE}. Nothing was stored.`);
  if (!req.file) throw badRequest('Attach the recording as the form field "file".');
  return { fields: parsed.data, key, file: req.file };
}
