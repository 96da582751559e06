// Whose word names the client (TRUST_PROXY, Express's `trust proxy`): the per-IP sign-in limit, the
// address kept on a session and the request log line use req.ip. By default nobody's: a client that
// connects straight to the API and sends its own X-Forwarded-For is seen at its socket address. With
// TRUST_PROXY=loopback (nginx on the same host, scripts/cluster.mjs) the address the proxy wrote is
// used — only the last hop, the one the trusted proxy added, never a value the client put before it
// (Express 5 / proxy-addr: the nearest untrusted address in the chain).
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { eq } from 'drizzle-orm';
import { session, user } from '@resonote/db/schema';
import { loadConfig } from '@resonote/api/config';
import { startTestApp } from '../support/app.ts';
import { requestFrom } from '../support/client-address.ts';
import { API_TEMPLATE } from '../support/global-setup-api.ts';

type App = Awaited<ReturnType<typeof startTestApp>>;
let direct: App;
let proxied: App;
const directLog: string[] = [];
const proxiedLog: string[] = [];
// A loopback source address other than 127.0.0.1, and documentation addresses (RFC 5737) for forgeries.
const CLIENT = '127.0.0.23';
const FORGED = '203.0.113.9';

beforeAll(async () => {
  // Per-IP limit of 3 sign-ins per minute; the per-e-mail limit stays out of the way (one attempt per address).
  const env = { AUTH_RATE_LIMIT_MAX: '100', AUTH_RATE_LIMIT_IP_MAX: '3', LOG_REQUESTS: 'true' };
  direct = await startTestApp(API_TEMPLATE, env, { listen: true, log: (l) => directLog.push(l) });
  proxied = await startTestApp(API_TEMPLATE, { ...env, TRUST_PROXY: 'loopback' }, { listen: true, log: (l) => proxiedLog.push(l) });
});
afterAll(async () => {
  await direct?.close();
  await proxied?.close();
});

async function signUp(app: App, email: string, forwardedFor?: string) {
  return requestFrom(CLIENT, `${app.baseUrl}/api/auth/sign-up/email`, {
    headers: { origin: app.origin, ...(forwardedFor ? { 'x-forwarded-for': forwardedFor } : {}) },
    body: { name: 'Address Test', email, password: 'correct-horse-battery' },
  });
}

async function sessionAddress(app: App, email: string) {
  const db = app.handle.database.db;
  const [row] = await db.select({ ip: session.ipAddress }).from(session).innerJoin(user, eq(user.id, session.userId)).where(eq(user.email, email));
  return row?.ip;
}

describe('the client address behind a proxy', () => {
  it('ignores an X-Forwarded-For sent straight to an API that trusts no proxy: session and log show the socket address', async () => {
    const res = await signUp(direct, 'forger@lab.test', FORGED);
    expect(res.status).toBe(200);
    expect(await sessionAddress(direct, 'forger@lab.test')).toBe(CLIENT);
    expect(directLog.some((l) => l.startsWith('POST /api/auth/sign-up/email 200') && l.endsWith(` ${CLIENT}`))).toBe(true);
    expect(directLog.some((l) => l.includes(FORGED))).toBe(false);
  });

  it('counts a client that changes its forged X-Forwarded-For on every try against one per-IP limit', async () => {
    const statuses = [];
    for (let i = 0; i < 4; i++) {
      const res = await requestFrom(CLIENT, `${direct.baseUrl}/api/auth/sign-in/email`, {
        headers: { origin: direct.origin, 'x-forwarded-for': `198.51.100.${i + 1}` },
        body: { email: `nobody-${i}@lab.test`, password: 'wrong-password-1' },
      });
      statuses.push(res.status);
    }
    // AUTH_RATE_LIMIT_IP_MAX=3: three refused passwords (401), then the fourth try is limited.
    expect(statuses).toEqual([401, 401, 401, 429]);
  });

  it('uses the address a trusted loopback proxy wrote, and only the hop it added', async () => {
    expect((await signUp(proxied, 'behind-nginx@lab.test', FORGED)).status).toBe(200);
    expect(await sessionAddress(proxied, 'behind-nginx@lab.test')).toBe(FORGED);
    expect(proxiedLog.some((l) => l.startsWith('POST /api/auth/sign-up/email 200') && l.endsWith(` ${FORGED}`))).toBe(true);
    // A client's own value before the proxy's hop is not believed: 198.51.100.77 is not a trusted proxy.
    expect((await signUp(proxied, 'chain@lab.test', `192.0.2.66, 198.51.100.77`)).status).toBe(200);
    expect(await sessionAddress(proxied, 'chain@lab.test')).toBe('198.51.100.77');
    // No header: the socket address.
    expect((await signUp(proxied, 'no-header@lab.test')).status).toBe(200);
    expect(await sessionAddress(proxied, 'no-header@lab.test')).toBe(CLIENT);
  });

  it('reads TRUST_PROXY as names, addresses, ranges or a hop count, and refuses "true" and nonsense', () => {
    const base = { AUTH_SECRET: 's'.repeat(40) };
    expect(loadConfig(base).trustProxy).toBe(false);
    expect(loadConfig({ ...base, TRUST_PROXY: 'loopback, 10.0.0.0/8, fd00::1' }).trustProxy).toEqual(['loopback', '10.0.0.0/8', 'fd00::1']);
    expect(loadConfig({ ...base, TRUST_PROXY: '1' }).trustProxy).toBe(1);
    expect(() => loadConfig({ ...base, TRUST_PROXY: 'true' })).toThrow(/TRUST_PROXY: "true" would believe an X-Forwarded-For from any client/);
    expect(() => loadConfig({ ...base, TRUST_PROXY: 'nginx.local' })).toThrow(/TRUST_PROXY: "nginx.local" is not an address/);
    expect(() => loadConfig({ ...base, TRUST_PROXY: '10.0.0.0/33' })).toThrow(/TRUST_PROXY: "10.0.0.0\/33"/);
  });
});
