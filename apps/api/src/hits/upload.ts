// The multipart side of a recording upload (hits or a background-noise recording): multer with
// the configured size limit, the form fields that say how to read the values, and the
// Idempotency-Key every upload must carry so a retry is never stored twice.
import multer from 'multer';
import type { Request, RequestHandler } from 'express';
import { z } from 'zod';
import { idempotencyKeySchema, IDEMPOTENCY_KEY_RULE } from '@resonote/contracts';
import { badRequest, HttpError } from '../errors.ts';

/** One file in the field "file", at most `limitBytes`; 413 above it, 400 for a broken form. */
export function recordingUpload(limitBytes: number): RequestHandler {
  return (req, res, next) => {
    multer({ storage: multer.memoryStorage(), limits: { fileSize: limitBytes, files: 1, fields: 10 } }).single('file')(req, res, (err: unknown) => {
      if (err) {
        const e = err as { code?: string };
        if (e.code === 'LIMIT_FILE_SIZE') return next(new HttpError(413, 'too-large', `The recording is larger than ${Math.round(limitBytes / 1024 / 1024)} MB; nothing was stored.`));
        return next(new HttpError(400, 'bad-upload', `The upload could not be read: ${(err as Error).message}`));
      }
      next();
    });
  };
}

/** Form fields shared by every recording upload. */
export const uploadFields = {
  units: z.enum(['volts', 'engineering']).default('volts'),
  sampleRateHz: z.coerce.number().positive().optional(),
  fullScaleVolts: z.coerce.number().positive().max(1000).default(1),
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
