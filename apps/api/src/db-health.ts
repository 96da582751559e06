// What the API knows about its database connection: which errors mean "the database is not
// reachable" (answered 503 with Retry-After, never 500), and since when it has been unreachable
// (reported by /api/health). pg's Pool opens a fresh connection at every checkout after a broken
// one is discarded, so recovery needs no action here; the status only follows what happens.

/** Seconds a client is told to wait before retrying while the database is unreachable. */
export const RETRY_AFTER_S = 3;

const networkCodes = new Set(['ECONNREFUSED', 'ECONNRESET', 'ETIMEDOUT', 'EPIPE', 'ENOTFOUND', 'EAI_AGAIN', 'EHOSTUNREACH', 'ENETUNREACH', 'ECONNABORTED']);
// SQLSTATE 57P01 admin_shutdown, 57P02 crash_shutdown, 57P03 cannot_connect_now (starting up or
// shutting down), 53300 too_many_connections; class 08 is "connection exception" (PostgreSQL
// documentation, Appendix A "PostgreSQL Error Codes").
const sqlStates = new Set(['57P01', '57P02', '57P03', '53300']);
// node-postgres reports a socket closed under it, a client used after that, and a checkout that
// timed out with these messages (pg/lib/client.js, pg-pool/index.js).
const pgMessages = /Connection terminated|connection error and is not queryable|Client was closed and is not queryable|timeout exceeded when trying to connect|Connection terminated due to connection timeout/i;

/**
 * True when `err` (or an error it wraps: Drizzle's `cause`, better-auth's `cause`, an
 * AggregateError's `errors`) says the database connection is lost or cannot be made.
 */
export function isDatabaseUnavailable(err: unknown, depth = 0): boolean {
  if (!err || typeof err !== 'object' || depth > 6) return false;
  const e = err as { code?: unknown; message?: unknown; cause?: unknown; errors?: unknown };
  if (typeof e.code === 'string') {
    if (networkCodes.has(e.code) || sqlStates.has(e.code) || /^08[0-9A-Z]{3}$/.test(e.code)) return true;
  }
  if (typeof e.message === 'string' && pgMessages.test(e.message)) return true;
  if (Array.isArray(e.errors) && e.errors.some((x) => isDatabaseUnavailable(x, depth + 1))) return true;
  return isDatabaseUnavailable(e.cause, depth + 1);
}

/** The innermost error's message (Drizzle's "Failed query: …" wraps the one that says what happened). */
function rootMessage(err: unknown): string {
  let e: unknown = err;
  for (let i = 0; i < 6; i++) {
    const next = (e as { cause?: unknown; errors?: unknown[] } | null)?.cause ?? (e as { errors?: unknown[] } | null)?.errors?.[0];
    if (!(next instanceof Error)) break;
    e = next;
  }
  return e instanceof Error ? e.message : String(e);
}

export interface DatabaseState {
  reachable: boolean;
  /** When the current outage was first noticed (ISO time); null while reachable. */
  since: string | null;
  /** The error that showed the outage. */
  lastError: string | null;
}

/** Follows outages and recoveries of the database, and logs each change once. */
export class DatabaseStatus {
  private downSince: Date | null = null;
  private lastError: string | null = null;

  constructor(private readonly log: (message: string) => void = (m) => console.log(m)) {}

  get reachable(): boolean {
    return this.downSince === null;
  }

  /** A connection broke or could not be made. */
  noteFailure(err: unknown): void {
    const message = rootMessage(err);
    this.lastError = message;
    if (this.downSince) return;
    this.downSince = new Date();
    this.log(`[resonote] database unreachable (${message}); answering 503 with Retry-After until it is back`);
  }

  /** A query or a new connection succeeded. */
  noteSuccess(): void {
    if (!this.downSince) return;
    const seconds = ((Date.now() - this.downSince.getTime()) / 1000).toFixed(1);
    this.downSince = null;
    this.lastError = null;
    this.log(`[resonote] database reachable again after ${seconds} s`);
  }

  state(): DatabaseState {
    return { reachable: this.reachable, since: this.downSince?.toISOString() ?? null, lastError: this.lastError };
  }
}
