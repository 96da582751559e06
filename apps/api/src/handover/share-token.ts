// Signed, expiring report links without a database row: the token is
// base64url(JSON { campaignId, exp, nonce }) "." base64url(HMAC-SHA256(secret, purpose + payload)).
// `exp` is in seconds since 1970 (UTC). The purpose prefix keeps these signatures from being valid
// for anything else signed with the same secret.
import { createHmac, randomBytes, timingSafeEqual } from 'node:crypto';
import { z } from 'zod';

const PURPOSE = 'resonote.report-link.v1.';

export interface ReportLinkPayload {
  campaignId: string;
  /** Expiry, seconds since the epoch (UTC). */
  exp: number;
  nonce: string;
}

const payloadSchema = z.strictObject({ campaignId: z.uuid(), exp: z.number().int().positive(), nonce: z.string().min(8).max(64) });

function signature(secret: string, body: string): Buffer {
  return createHmac('sha256', secret).update(PURPOSE + body).digest();
}

export function signReportLink(secret: string, campaignId: string, expiresAt: Date): { token: string; payload: ReportLinkPayload } {
  const payload: ReportLinkPayload = { campaignId, exp: Math.floor(expiresAt.getTime() / 1000), nonce: randomBytes(12).toString('base64url') };
  const body = Buffer.from(JSON.stringify(payload)).toString('base64url');
  return { token: `${body}.${signature(secret, body).toString('base64url')}`, payload };
}

export type VerifyResult = { ok: true; payload: ReportLinkPayload } | { ok: false; reason: 'invalid' } | { ok: false; reason: 'expired'; payload: ReportLinkPayload };

export function verifyReportLink(secret: string, token: string, now = new Date()): VerifyResult {
  const m = /^([A-Za-z0-9_-]{10,2000})\.([A-Za-z0-9_-]{43})$/.exec(token);
  if (!m) return { ok: false, reason: 'invalid' };
  const given = Buffer.from(m[2]!, 'base64url');
  const expected = signature(secret, m[1]!);
  if (given.length !== expected.length || !timingSafeEqual(given, expected)) return { ok: false, reason: 'invalid' };
  let parsed: unknown;
  try {
    parsed = JSON.parse(Buffer.from(m[1]!, 'base64url').toString('utf8'));
  } catch {
    return { ok: false, reason: 'invalid' };
  }
  const payload = payloadSchema.safeParse(parsed);
  if (!payload.success) return { ok: false, reason: 'invalid' };
  if (payload.data.exp * 1000 <= now.getTime()) return { ok: false, reason: 'expired', payload: payload.data };
  return { ok: true, payload: payload.data };
}
