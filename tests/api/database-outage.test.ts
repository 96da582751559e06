// The API through a lost database connection, in process: the app reaches PostgreSQL through a TCP
// relay the test cuts (every connection closed, new ones refused, as during a PostgreSQL restart)
// and restores, and a backend the test terminates as an administrator would (57P01). Meanwhile
// every request answers 503 with Retry-After in the one error shape, /api/health says since when
// the database is unreachable, nothing of a cut-off upload is stored, and the pool reconnects by
// itself once the database is back.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { eq, sql } from 'drizzle-orm';
import pg from 'pg';
import request from 'supertest';
import { hit } from '@resonote/db/schema';
import { startTestApp, type TestApp } from '../support/app.ts';
import { PASSWORD, signUp } from '../support/accounts.ts';
import { invite, type Person } from '../support/campaign.ts';
import { barCampaign, type RigCampaign } from '../support/rig.ts';
import { barHitsWav } from '../support/bar-wav.ts';
import { startTcpProxy, type TcpProxy } from '../support/tcp-proxy.ts';
import { adminUrl } from '../support/db.ts';
import { API_TEMPLATE } from '../support/global-setup-api.ts';
import { isDatabaseUnavailable } from '@resonote/api/db-health';

let proxy: TcpProxy;
let app: TestApp;
let lead: Person;
let rig: RigCampaign;
let directUrl: string;

beforeAll(async () => {
  const admin = new URL(adminUrl);
  proxy = await startTcpProxy({ host: admin.hostname, port: Number(admin.port) });
  app = await startTestApp(API_TEMPLATE, {}, {
    databaseUrl: (direct) => {
      directUrl = direct;
      return proxy.url(direct);
    },
  });
  const first = await signUp(app, 'Ada Admin', 'admin@lab.test');
  lead = await signUp(app, 'Lena Lead', 'lead@lab.test');
  const seedCampaign = (await first.agent.post('/api/campaigns').send({ name: 'Seed' })).body.campaign.id;
  await invite(app, first, seedCampaign, lead, 'lead');
  rig = await barCampaign(app, lead);
}, 120_000);
afterAll(async () => {
  await proxy?.restore();
  await app?.close();
  await proxy?.close();
});

function expectUnavailable(res: request.Response) {
  expect(res.status).toBe(503);
  expect(res.headers['retry-after']).toBe('3');
  expect(res.body).toEqual({ error: { code: 'database-unavailable', message: expect.stringMatching(/database cannot be reached/) } });
}

describe('a lost database connection', () => {
  it('keeps the process alive when the connection of an open transaction breaks, answers 503 with Retry-After meanwhile, and recovers alone', async () => {
    expect((await request(app.handle.app).get('/api/health')).body).toMatchObject({ status: 'ok', database: { status: 'up' } });

    // A transaction holds its connection between two queries when the relay is cut: pg emits
    // 'error' on that checked-out client; without a listener the process would end here.
    const db = app.handle.database.db;
    const uncaught: unknown[] = [];
    const onUncaught = (err: unknown) => uncaught.push(err);
    process.on('uncaughtException', onUncaught);
    const cutInside = db.transaction(async (tx) => {
      await tx.execute(sql`SELECT 1`);
      await proxy.cut();
      await new Promise((r) => setTimeout(r, 200));
      await tx.execute(sql`SELECT 2`);
    });
    await expect(cutInside).rejects.toThrow();
    await new Promise((r) => setTimeout(r, 100));
    process.off('uncaughtException', onUncaught);
    expect(uncaught).toEqual([]);
    const cutAt = Date.now();

    const health = await request(app.handle.app).get('/api/health');
    expect(health.status).toBe(503);
    expect(health.headers['retry-after']).toBe('3');
    // Public: when, not why (hosts and ports stay in the server's log).
    expect(health.body).toEqual({ status: 'degraded', database: { status: 'unreachable', since: expect.any(String) } });
    const since = Date.parse(health.body.database.since);
    expect(Math.abs(since - cutAt)).toBeLessThan(5_000);

    // A signed-in request (its session lookup already needs the database), an API route and a sign-in.
    expectUnavailable(await lead.agent.get('/api/me'));
    expectUnavailable(await lead.agent.get(`/api/campaigns/${rig.campaignId}/schedule`));
    expectUnavailable(await app.agent().post('/api/auth/sign-in/email').send({ email: lead.email, password: PASSWORD }));
    // The outage is noted once, with the time it began.
    expect((await request(app.handle.app).get('/api/health')).body.database.since).toBe(health.body.database.since);

    await proxy.restore();
    const back = await request(app.handle.app).get('/api/health');
    expect(back.status).toBe(200);
    expect(back.body).toMatchObject({ status: 'ok', database: { status: 'up' } });
    expect((await lead.agent.get('/api/me')).status).toBe(200);
    expect(app.handle.databaseStatus.state()).toEqual({ reachable: true, since: null, lastError: null });
  });

  it('tells a lost connection from other failures: pg and network codes, SQLSTATE 57P0x and class 08, pg messages, through wrapping causes', () => {
    // SQLSTATE values from the PostgreSQL documentation, Appendix A "PostgreSQL Error Codes".
    const lost = [
      Object.assign(new Error('terminating connection due to administrator command'), { code: '57P01' }),
      Object.assign(new Error('the database system is starting up'), { code: '57P03' }),
      Object.assign(new Error('connection failure'), { code: '08006' }),
      Object.assign(new Error('connect ECONNREFUSED 127.0.0.1:5432'), { code: 'ECONNREFUSED' }),
      new Error('Connection terminated unexpectedly'),
      new Error('Failed query: SELECT 1', { cause: Object.assign(new Error('x'), { code: '57P01' }) }),
      new AggregateError([Object.assign(new Error('refused'), { code: 'ECONNREFUSED' })], 'all attempts failed'),
    ];
    for (const err of lost) expect(isDatabaseUnavailable(err), err.message).toBe(true);
    const other = [
      Object.assign(new Error('duplicate key value violates unique constraint'), { code: '23505' }),
      Object.assign(new Error('syntax error'), { code: '42601' }),
      new Error('Failed query: insert', { cause: Object.assign(new Error('deadlock detected'), { code: '40P01' }) }),
      new RangeError('fs=0 must be > 0'),
      null,
      'Connection terminated',
    ];
    for (const err of other) expect(isDatabaseUnavailable(err), String(err)).toBe(false);
  });

  it('answers 503 to an upload whose backend is terminated inside its transaction (57P01), stores nothing of it, and stores the retry with the same key once', async () => {
    const target = rig.entries.find((e) => e.excitationDof === 'B07:+Z')!;
    const key = 'outage-test-b07-0001';
    const wav = barHitsWav(rig, { excitationDof: 'B07:+Z', count: 2, seed: 707 });
    const direct = new pg.Client({ connectionString: directUrl });
    await direct.connect();
    const locker = new pg.Client({ connectionString: directUrl });
    await locker.connect();
    const stored = async () => (await direct.query<{ n: number }>('SELECT count(*)::int AS n FROM hit WHERE schedule_entry_id = $1', [target.id])).rows[0]!.n;
    const send = () => lead.agent.post(`/api/campaigns/${rig.campaignId}/schedule/${target.id}/hits`).set('idempotency-key', key).attach('file', wav, 'b07.wav');
    try {
      // The lock makes the app's INSERT wait inside its transaction, so the termination lands
      // between BEGIN and COMMIT (as in upload-crash.test.ts).
      await locker.query('BEGIN');
      await locker.query('LOCK TABLE hit IN SHARE ROW EXCLUSIVE MODE');
      const cut = send().then((res) => res);
      let waiting: number[] = [];
      for (let i = 0; i < 300 && waiting.length === 0; i++) {
        await new Promise((r) => setTimeout(r, 50));
        const q = await direct.query<{ pid: number }>(`SELECT pid FROM pg_stat_activity WHERE datname = current_database() AND wait_event_type = 'Lock' AND query ILIKE 'insert into "hit"%'`);
        waiting = q.rows.map((r) => r.pid);
      }
      expect(waiting).toHaveLength(1);
      // As `pg_ctl stop -m fast` does to every backend: SQLSTATE 57P01, admin_shutdown.
      await direct.query('SELECT pg_terminate_backend($1)', [waiting[0]]);
      expectUnavailable(await cut);
      await locker.query('ROLLBACK');
      expect(await stored()).toBe(0);

      const retry = await send();
      expect(retry.status).toBe(201);
      expect(retry.body.replayed).toBe(false);
      expect(retry.body.hits.map((h: { sequence: number }) => h.sequence)).toEqual([1, 2]);
      const again = await send();
      expect(again.status).toBe(200);
      expect(again.body.replayed).toBe(true);
      expect(await stored()).toBe(2);
      const keys = await app.handle.database.db.select({ key: hit.idempotencyKey }).from(hit).where(eq(hit.scheduleEntryId, target.id));
      expect(keys.map((k) => k.key).sort()).toEqual([`${key}#1`, `${key}#2`]);
    } finally {
      await locker.end();
      await direct.end();
    }
  });
});
