// Mounts better-auth under /api/auth. The request is handed over as a Web Request and the
// answer copied back; error answers are rewritten into the API's one error shape.
import type { Request as ExpressRequest, RequestHandler } from 'express';
import type { Auth } from './auth.ts';
import { CLIENT_IP_HEADER } from './auth.ts';
import { errorBody, sendDatabaseUnavailable } from './errors.ts';
import type { DatabaseStatus } from './db-health.ts';

const MAX_AUTH_BODY = 64 * 1024;

/**
 * Reads the body up to MAX_AUTH_BODY bytes. Above it the rest is left unread (the stream is paused,
 * not destroyed: destroying it mid-body left the keep-alive connection with no answer to its next
 * request), and the caller answers 413 with `Connection: close`.
 */
function readBody(req: ExpressRequest): Promise<Buffer | 'too-large'> {
  const announced = Number(req.headers['content-length']);
  if (Number.isFinite(announced) && announced > MAX_AUTH_BODY) return Promise.resolve('too-large');
  return new Promise((resolve, reject) => {
    const chunks: Buffer[] = [];
    let size = 0;
    const done = () => {
      req.off('data', onData);
      req.off('end', onEnd);
      req.off('error', onError);
    };
    const onData = (chunk: Buffer) => {
      size += chunk.length;
      if (size > MAX_AUTH_BODY) {
        done();
        req.pause();
        resolve('too-large');
        return;
      }
      chunks.push(chunk);
    };
    const onEnd = () => {
      done();
      resolve(Buffer.concat(chunks));
    };
    const onError = (err: Error) => {
      done();
      reject(err);
    };
    req.on('data', onData);
    req.on('end', onEnd);
    req.on('error', onError);
  });
}

function codeFromAuth(status: number, raw: string | undefined): string {
  if (raw) return raw.toLowerCase().replace(/_/g, '-');
  if (status === 429) return 'rate-limited';
  if (status === 401) return 'unauthorized';
  if (status === 403) return 'forbidden';
  if (status === 404) return 'not-found';
  return 'bad-request';
}

const friendly: Record<string, string> = {
  'invalid-email-or-password': 'The e-mail address or the password is wrong.',
  'user-already-exists': 'An account with this e-mail address already exists. Sign in, or reset the password.',
  'user-already-exists-use-another-email': 'An account with this e-mail address already exists. Sign in, or reset the password.',
  'password-too-short': 'The password is too short: use at least 10 characters.',
  'password-too-long': 'The password is too long: use at most 128 characters.',
  'invalid-email': 'That is not a valid e-mail address.',
  'invalid-token': 'This reset link is invalid or has expired. Ask for a new one.',
  'email-not-verified': 'Confirm your e-mail address first: open the link in the mail we sent.',
  'rate-limited': 'Too many attempts. Wait a minute and try again.',
};

/** Routes whose attempts also count per e-mail address (the body's `email`). */
const PER_ADDRESS = new Set(['/api/auth/sign-in/email', '/api/auth/sign-up/email', '/api/auth/request-password-reset']);

function addressIn(body: Buffer): string | null {
  try {
    const parsed = JSON.parse(body.toString('utf8')) as { email?: unknown };
    return typeof parsed?.email === 'string' && parsed.email.trim() ? parsed.email.trim().toLowerCase().slice(0, 320) : null;
  } catch {
    return null;
  }
}

/**
 * better-auth counts attempts per client IP (a limit sized for an office behind one NAT address);
 * here each e-mail address gets its own stricter count, so guessing at one account slows that
 * account only and never locks out colleagues on the same network. Counted whether or not the
 * address has an account, so the limit tells nothing about which ones do.
 */
/** A check-and-count store (PostgreSQL in the app, so every API process counts against one limit). */
export interface AttemptStore {
  consume(key: string, rule: { window: number; max: number }): Promise<{ allowed: boolean; retryAfter: number | null }>;
}

export function authHandler(auth: Auth, limit: { max: number; windowS: number }, database: DatabaseStatus, perAddress: AttemptStore): RequestHandler {
  return async (req, res, next) => {
    try {
      const headers = new Headers();
      for (const [key, value] of Object.entries(req.headers)) {
        if (value === undefined || key === CLIENT_IP_HEADER) continue;
        if (Array.isArray(value)) value.forEach((v) => headers.append(key, v));
        else headers.set(key, value);
      }
      // req.ip: the socket address, or X-Forwarded-For as far as TRUST_PROXY's proxies vouch for it.
      headers.set(CLIENT_IP_HEADER, req.ip ?? req.socket.remoteAddress ?? 'unknown');
      let body: Buffer | undefined;
      if (req.method !== 'GET' && req.method !== 'HEAD') {
        const read = await readBody(req);
        if (read === 'too-large') {
          // The unread rest of the body would be taken for the next request: close the connection after the answer.
          res.setHeader('connection', 'close');
          res.status(413).json(errorBody('too-large', `The request body is larger than the limit of ${MAX_AUTH_BODY} bytes.`));
          return;
        }
        body = read;
        const path = req.originalUrl.split('?')[0]!;
        const address = PER_ADDRESS.has(path) ? addressIn(body) : null;
        if (address) {
          const verdict = await perAddress.consume(`address|${path}|${address}`, { window: limit.windowS, max: limit.max });
          if (!verdict.allowed) {
            res.setHeader('retry-after', String(verdict.retryAfter));
            res.status(429).json(errorBody('rate-limited', `Too many attempts for this e-mail address. Wait ${verdict.retryAfter} s and try again.`));
            return;
          }
        }
      }
      const url = new URL(req.originalUrl, `http://${req.headers.host ?? 'localhost'}`);
      const request = new Request(url, { method: req.method, headers, body: body && body.length ? new Uint8Array(body) : undefined });
      const response = await auth.handler(request);
      // better-auth answers 500 itself when its queries fail; its logger (auth.ts) has noted a
      // lost connection by then, so the caller gets the same 503 as every other route.
      if (response.status >= 500 && !database.reachable) {
        sendDatabaseUnavailable(res);
        return;
      }

      res.status(response.status);
      response.headers.forEach((value, key) => {
        if (key === 'set-cookie' || key === 'content-length') return;
        res.setHeader(key, value);
      });
      const cookies = response.headers.getSetCookie();
      if (cookies.length) res.setHeader('set-cookie', cookies);

      const text = await response.text();
      const isJson = (response.headers.get('content-type') ?? '').includes('json');
      if (response.status >= 400) {
        let parsed: { code?: string; message?: string } = {};
        if (isJson && text) {
          try {
            parsed = JSON.parse(text);
          } catch {
            parsed = {};
          }
        }
        const code = codeFromAuth(response.status, parsed.code);
        const message = friendly[code] ?? parsed.message ?? (text && !isJson ? text : 'The sign-in service refused the request.');
        res.type('application/json').send(JSON.stringify(errorBody(code, message)));
        return;
      }
      res.send(text);
    } catch (err) {
      next(err);
    }
  };
}
