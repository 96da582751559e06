// Multipart uploads (recordings, geometry CSV, backups): one file in the field "file", read into
// memory by multer. Its errors and those of the form parser under it (busboy) become answers in the
// one error shape that say what went wrong in the upload and what to do, never the parser's bare text.
import multer from 'multer';
import type { RequestHandler } from 'express';
import { HttpError } from '../errors.ts';

export interface MultipartOptions {
  /** Most bytes of the file. */
  fileSize: number;
  /** Most text fields beside the file. */
  fields: number;
  /** The 413 message ("The recording is larger than 64 MB; nothing was stored."). */
  tooLarge: string;
  /** What is not kept when the upload fails ("nothing was stored"). */
  nothingDone: string;
}

/** The answer to a multer or busboy error of an upload. */
export function multipartError(err: unknown, options: Pick<MultipartOptions, 'tooLarge' | 'nothingDone' | 'fields'>): HttpError {
  const e = err as { code?: string; message?: string; field?: string };
  const message = String(e?.message ?? '');
  const tail = ` ${options.nothingDone[0]!.toUpperCase()}${options.nothingDone.slice(1)}.`;
  switch (e?.code) {
    case 'LIMIT_FILE_SIZE':
      return new HttpError(413, 'too-large', options.tooLarge);
    case 'LIMIT_FILE_COUNT':
    case 'LIMIT_UNEXPECTED_FILE':
      return new HttpError(400, 'bad-upload', `Send exactly one file, in the form field "file"${e.field && e.field !== 'file' ? ` (this upload has a file in the field ${JSON.stringify(String(e.field).slice(0, 40))})` : ''}.${tail}`);
    case 'LIMIT_FIELD_COUNT':
    case 'LIMIT_PART_COUNT':
      return new HttpError(400, 'bad-upload', `The form has too many fields: at most ${options.fields} beside the file.${tail}`);
    case 'LIMIT_FIELD_KEY':
    case 'LIMIT_FIELD_VALUE':
    case 'MISSING_FIELD_NAME':
      return new HttpError(400, 'bad-upload', `A form field has no name, or its name or value is too long.${tail}`);
  }
  if (/unexpected end of (form|multipart)/i.test(message)) {
    return new HttpError(400, 'upload-cut-off', `The upload was cut off before it ended (the form's closing boundary never arrived); send it again.${tail}`);
  }
  if (/boundary not found|malformed part header|malformed/i.test(message)) {
    return new HttpError(400, 'bad-upload', `The upload is not a well-formed multipart form (${/boundary/i.test(message) ? 'its boundary is missing' : 'a part header is malformed'}); send the file as multipart/form-data in the field "file".${tail}`);
  }
  return new HttpError(400, 'bad-upload', `The upload could not be read as a multipart form; send the file as multipart/form-data in the field "file".${tail}`);
}

/** multer for one in-memory file in the field "file", with its errors answered by multipartError. */
export function singleFileUpload(options: MultipartOptions): RequestHandler {
  const parse = multer({ storage: multer.memoryStorage(), limits: { fileSize: options.fileSize, files: 1, fields: options.fields } }).single('file');
  return (req, res, next) => {
    parse(req, res, (err: unknown) => (err ? next(multipartError(err, options)) : next()));
  };
}
