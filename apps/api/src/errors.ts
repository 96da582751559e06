// One error shape for every /api response: { error: { code, message, details? } }.
import type { ErrorRequestHandler, RequestHandler, Response } from 'express';
import { ZodError } from 'zod';
import { isDatabaseUnavailable, RETRY_AFTER_S, type DatabaseStatus } from './db-health.ts';

import { HttpError } from '@resonote/contracts';

// The class is shared with the web app (packages/contracts/src/errors.ts): one shape on both sides.
export { HttpError };

export const badRequest = (message: string, details?: unknown) => new HttpError(400, 'bad-request', message, details);
export const unauthorized = () => new HttpError(401, 'unauthorized', 'Sign in to continue.');
export const forbidden = (message = 'Your role does not allow this.') => new HttpError(403, 'forbidden', message);
export const notFound = (what = 'That resource') => new HttpError(404, 'not-found', `${what} was not found.`);
export const conflict = (message: string, details?: unknown) => new HttpError(409, 'conflict', message, details);

export function errorBody(code: string, message: string, details?: unknown) {
  return { error: details === undefined ? { code, message } : { code, message, details } };
}

/** Turns a zod failure into readable field messages ("name: Too small…"). */
export function zodDetails(error: ZodError) {
  return error.issues.map((i) => ({ path: i.path.join('.'), message: i.message }));
}

export function zodMessage(error: ZodError): string {
  return error.issues
    .slice(0, 5)
    .map((i) => (i.path.length ? `${i.path.join('.')}: ${i.message}` : i.message))
    .join('; ');
}

export const unknownApiRoute: RequestHandler = (req, _res, next) => {
  next(new HttpError(404, 'not-found', `No API route ${req.method} ${req.originalUrl.split('?')[0]}.`));
};

export const DATABASE_UNAVAILABLE_MESSAGE =
  'The database cannot be reached at the moment (it may be restarting). Try again in a few seconds; an upload retried with the same Idempotency-Key is stored once.';

/** The answer while the database is unreachable: 503, Retry-After, the one error shape. */
export function sendDatabaseUnavailable(res: Response): void {
  res.setHeader('retry-after', String(RETRY_AFTER_S));
  res.status(503).json(errorBody('database-unavailable', DATABASE_UNAVAILABLE_MESSAGE));
}

/**
 * The last middleware: known errors keep their status; a lost database connection is a 503 with
 * Retry-After (noted in `database`); anything else is a 500 without a stack.
 */
export function errorHandler(log: (message: string) => void, database?: DatabaseStatus): ErrorRequestHandler {
  return (err, req, res, _next) => {
    if (res.headersSent) return;
    if (isDatabaseUnavailable(err)) {
      database?.noteFailure(err);
      sendDatabaseUnavailable(res);
      return;
    }
    if (err instanceof HttpError) {
      res.status(err.status).json(errorBody(err.code, err.message, err.details));
      return;
    }
    if (err instanceof ZodError) {
      res.status(400).json(errorBody('invalid-input', zodMessage(err), zodDetails(err)));
      return;
    }
    // body-parser and multer errors carry a status and a type/code.
    const status = typeof err?.status === 'number' ? err.status : typeof err?.statusCode === 'number' ? err.statusCode : 500;
    if (err?.type === 'entity.too.large' || err?.code === 'LIMIT_FILE_SIZE') {
      res.status(413).json(errorBody('too-large', `The request body is larger than the limit${err.limit ? ` of ${err.limit} bytes` : ''}.`));
      return;
    }
    if (err?.type === 'entity.parse.failed') {
      res.status(400).json(errorBody('malformed-json', 'The request body is not valid JSON.'));
      return;
    }
    if (status >= 400 && status < 500) {
      res.status(status).json(errorBody('bad-request', String(err?.message ?? 'Bad request.')));
      return;
    }
    log(`500 on ${req.method} ${req.originalUrl}: ${err?.stack ?? err}`);
    res.status(500).json(errorBody('internal', 'Something went wrong on the server; the error was logged.'));
  };
}
