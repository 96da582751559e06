// The one error shape of every /api answer.
import { z } from 'zod';

export const errorBodySchema = z.object({
  error: z.object({
    code: z.string(),
    message: z.string(),
    details: z.unknown().optional(),
  }),
});
export type ErrorBody = z.infer<typeof errorBodySchema>;

/**
 * A refusal in the one error shape, on both sides of the wire: the API throws it for every 4xx
 * (apps/api/src/errors.ts), and the web's fetch wrapper turns every failed answer back into it
 * (apps/web/src/lib/api.ts, which adds the Retry-After it was given).
 */
export class HttpError extends Error {
  constructor(
    readonly status: number,
    readonly code: string,
    message: string,
    readonly details?: unknown,
  ) {
    super(message);
  }

  /** The answer body, `{ error: { code, message, details? } }` (details only when there are some). */
  body(): ErrorBody {
    return { error: this.details === undefined ? { code: this.code, message: this.message } : { code: this.code, message: this.message, details: this.details } };
  }
}
