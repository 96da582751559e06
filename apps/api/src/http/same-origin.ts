// Cross-site request forgery guard (docs/decisions/csrf-origin-check.md): every state-changing
// request that carries the session cookie must come from a page of this Resonote, as its Origin
// header says (or, when a browser leaves Origin out, its Referer). Mounted on /api before every
// route, the auth handler and any body parser, so JSON and multipart uploads get the same rule.
import type { Request, RequestHandler } from 'express';
import { HttpError } from '../errors.ts';

const WRITES = new Set(['POST', 'PUT', 'PATCH', 'DELETE']);

/** better-auth's session cookie (plain, or with the __Secure- prefix it uses on https). */
const SESSION_COOKIE = /(?:^|;\s*)(?:__Secure-)?better-auth\.session_(?:token|data)=/;

export const carriesSessionCookie = (req: Request) => SESSION_COOKIE.test(req.headers.cookie ?? '');

function originOf(value: string): string | null {
  try {
    const origin = new URL(value).origin;
    return origin === 'null' ? null : origin;
  } catch {
    return null;
  }
}

export interface SameOriginOptions {
  /** Origins whose pages may write (config.allowedOrigins). */
  allowedOrigins: string[];
  /**
   * Hook for callers that authenticate without the cookie (none today; an API bearer token may
   * come later). Return true only when the request is authenticated by that other means and the
   * cookie plays no part in it: such a request cannot be forged by a foreign page.
   */
  authenticatedOtherwise?: (req: Request) => boolean;
}

export function sameOriginWrites({ allowedOrigins, authenticatedOtherwise = () => false }: SameOriginOptions): RequestHandler {
  const allowed = new Set(allowedOrigins);
  const expected = allowedOrigins[0];
  return (req, _res, next) => {
    if (!WRITES.has(req.method) || !carriesSessionCookie(req) || authenticatedOtherwise(req)) return next();
    const origin = req.get('origin');
    const referer = req.get('referer');
    const claimed = origin !== undefined ? origin : referer;
    if (claimed === undefined) {
      return next(new HttpError(403, 'origin-missing', `This request changes data and carries a session cookie but names no Origin (nor Referer), so it may come from another site; it was refused and nothing was changed. Send it from ${expected}.`));
    }
    const found = originOf(claimed);
    if (!found || !allowed.has(found)) {
      return next(
        new HttpError(403, 'origin-mismatch', `This request changes data and carries a session cookie, but its ${origin !== undefined ? 'Origin' : 'Referer'} ${JSON.stringify(claimed.slice(0, 200))} is not this Resonote (${expected}); it was refused and nothing was changed.`),
      );
    }
    next();
  };
}

/** Answers under /api are per user and may hold campaign data: no cache (browser or proxy) keeps them. */
export const noStore: RequestHandler = (_req, res, next) => {
  res.setHeader('cache-control', 'no-store');
  next();
};
