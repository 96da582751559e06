// Personal API tokens on the wire: `Authorization: Bearer rn_…`. Resolves the token to its user
// and campaign before the session lookup, refuses an unknown, revoked or expired token with a
// 401 that says which, and caps the token's role at the role its user holds in the campaign now
// (a user who left the campaign has a token that no longer works). Failures are rate-limited per
// client address so secrets cannot be guessed at speed.
import { createHash, randomBytes } from 'node:crypto';
import type { RequestHandler } from 'express';
import { and, eq } from 'drizzle-orm';
import { API_TOKEN_PREFIX, type CampaignRole } from '@resonote/contracts';
import { apiToken, campaignMember, user } from '@resonote/db/schema';
import type { Db } from '@resonote/db/client';
import { HttpError } from '../errors.ts';

export interface ApiTokenAccess {
  id: string;
  name: string;
  campaignId: string;
  /** The token's role capped at its user's present role in the campaign. */
  role: CampaignRole;
}

declare global {
  // eslint-disable-next-line @typescript-eslint/no-namespace
  namespace Express {
    interface Request {
      apiToken?: ApiTokenAccess;
    }
  }
}

/** 32 random bytes (256 bits) as base64url behind the `rn_` prefix. */
export function newTokenSecret(): string {
  return API_TOKEN_PREFIX + randomBytes(32).toString('base64url');
}

/** SHA-256 hex of the whole secret: what the table stores (docs/decisions/bridge-and-api-tokens.md). */
export function hashTokenSecret(secret: string): string {
  return createHash('sha256').update(secret, 'utf8').digest('hex');
}

export const roleRank: Record<CampaignRole, number> = { viewer: 1, engineer: 2, lead: 3 };

/** The lower of two roles. */
export function lowerRole(a: CampaignRole, b: CampaignRole): CampaignRole {
  return roleRank[a] <= roleRank[b] ? a : b;
}

/**
 * Failed token attempts per client address in a sliding window. Common practice for secrets that
 * cannot be guessed anyway (256 bits): a small allowance that still stops a flood.
 */
export class TokenFailureLimiter {
  private readonly failures = new Map<string, number[]>();
  constructor(
    readonly maxFailures = 10,
    readonly windowMs = 5 * 60_000,
  ) {}
  private recent(key: string, now: number): number[] {
    const list = (this.failures.get(key) ?? []).filter((t) => now - t < this.windowMs);
    if (list.length) this.failures.set(key, list);
    else this.failures.delete(key);
    return list;
  }
  /** Seconds until the address may try again, or 0 when it may now. */
  blockedFor(key: string, now = Date.now()): number {
    const list = this.recent(key, now);
    if (list.length < this.maxFailures) return 0;
    return Math.ceil((this.windowMs - (now - list[0]!)) / 1000);
  }
  fail(key: string, now = Date.now()): void {
    const list = this.recent(key, now);
    list.push(now);
    this.failures.set(key, list);
  }
}

const tokenError = (code: string, message: string) => new HttpError(401, code, message);

export function resolveApiToken(db: Db, limiter: TokenFailureLimiter): RequestHandler {
  return async (req, res, next) => {
    const header = req.headers.authorization ?? '';
    const match = /^Bearer\s+(rn_\S*)\s*$/i.exec(header);
    if (!match) return next();
    const client = req.ip ?? req.socket.remoteAddress ?? 'unknown';
    try {
      const wait = limiter.blockedFor(client);
      if (wait > 0) {
        res.setHeader('retry-after', String(wait));
        throw new HttpError(429, 'too-many-token-failures', `Too many requests with an invalid API token from this address; try again in ${wait} s.`);
      }
      const refuse = (code: string, message: string) => {
        limiter.fail(client);
        return tokenError(code, message);
      };
      const secret = match[1]!;
      const [row] = await db
        .select({ token: apiToken, user: { id: user.id, email: user.email, name: user.name, role: user.role } })
        .from(apiToken)
        .innerJoin(user, eq(user.id, apiToken.userId))
        .where(eq(apiToken.secretHash, hashTokenSecret(secret)));
      if (!row) throw refuse('token-unknown', 'This API token is not known to Resonote (mistyped, or never created here). Create one on your Account page.');
      const t = row.token;
      if (t.revokedAt) throw refuse('token-revoked', `This API token ("${t.name}") was revoked on ${t.revokedAt.toISOString()}. Create a new one on your Account page.`);
      if (t.expiresAt && t.expiresAt.getTime() <= Date.now()) throw refuse('token-expired', `This API token ("${t.name}") expired on ${t.expiresAt.toISOString()}. Create a new one on your Account page.`);
      const [member] = await db
        .select({ role: campaignMember.role })
        .from(campaignMember)
        .where(and(eq(campaignMember.campaignId, t.campaignId), eq(campaignMember.userId, t.userId)));
      // Admins act as leads in every campaign (context.ts), so their tokens keep the role they were made with.
      const held: CampaignRole | undefined = member?.role ?? (row.user.role === 'admin' ? 'lead' : undefined);
      if (!held) throw refuse('token-role-lost', `This API token ("${t.name}") no longer works: its owner is no longer a member of the campaign it was made for.`);
      req.user = { id: row.user.id, email: row.user.email, name: row.user.name, role: row.user.role === 'admin' ? 'admin' : 'member' };
      req.apiToken = { id: t.id, name: t.name, campaignId: t.campaignId, role: lowerRole(t.role, held) };
      await db.update(apiToken).set({ lastUsedAt: new Date() }).where(eq(apiToken.id, t.id));
      next();
    } catch (err) {
      next(err);
    }
  };
}
