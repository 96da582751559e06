// PostgreSQL restarted under a burst of uploads. The API runs as a real child process on a small
// PostgreSQL cluster of this test's own (initdb on a free port, removed afterwards), so stopping
// and starting that database cannot disturb the other test files on the shared test cluster.
// 200 uploads of one hit each go out at concurrency 8, each retried with its own Idempotency-Key
// until it is acknowledged (503 and refused connections are waited out with bounded backoff).
// While about a quarter is acknowledged, the postmaster is stopped (`pg_ctl stop -m fast`: every
// backend gets 57P01) and started 3 s later. The server must stay up, answer 503 with Retry-After
// meanwhile, recover alone, and the database must hold each acknowledged hit exactly once.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { randomBytes } from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';
import pg from 'pg';
import request from 'supertest';
import { createApp } from '@resonote/api/app';
import { loadConfig } from '@resonote/api/config';
import { migrateDatabase } from '@resonote/db/migrate';
import { ensureDatabase, postgresCluster, root, type PostgresCluster } from '../../scripts/bootstrap.mjs';
import { freePort, type TestApp } from '../support/app.ts';
import { PASSWORD, signUp } from '../support/accounts.ts';
import { invite } from '../support/campaign.ts';
import { barCampaign, type RigCampaign } from '../support/rig.ts';
import { barHitsWav } from '../support/bar-wav.ts';
import { startServerProcess, type ServerProcess } from '../support/server-process.ts';

const UPLOADS = 200;
const CONCURRENCY = 8;
// One-second records (4096 samples a channel) keep the burst short on a shared machine.
const RECORD_LENGTH_S = 1;

let cluster: PostgresCluster;
let databaseUrl: string;
let rig: RigCampaign;
let leadEmail: string;
const secret = randomBytes(32).toString('hex');
const publicUrl = 'http://127.0.0.1:3999';

beforeAll(async () => {
  const port = await freePort();
  cluster = postgresCluster({ name: `test-fault-${port}`, port });
  const started = cluster.start();
  if (!started.ok) throw new Error(`the test's own PostgreSQL did not start: ${started.message}`);
  ensureDatabase(port, 'resonote');
  databaseUrl = cluster.url('resonote');
  await migrateDatabase(databaseUrl);

  // The campaign is set up through the real app in process, which is closed before the burst.
  const config = loadConfig({ NODE_ENV: 'test', PORT: '3999', PUBLIC_URL: publicUrl, DATABASE_URL: databaseUrl, SMTP_CAPTURE_PORT: '0', LOG_REQUESTS: 'false', AUTH_RATE_LIMIT_MAX: '1000', AUTH_SECRET: secret });
  const handle = await createApp({ config, log: () => undefined });
  const app: TestApp = { handle, config, origin: publicUrl, agent: () => request.agent(handle.app).set('origin', publicUrl), close: () => handle.close() };
  try {
    const admin = await signUp(app, 'Ada Admin', 'admin@lab.test');
    const lead = await signUp(app, 'Lena Lead', 'lead@lab.test');
    leadEmail = lead.email;
    const seedCampaign = (await admin.agent.post('/api/campaigns').send({ name: 'Seed' })).body.campaign.id;
    await invite(app, admin, seedCampaign, lead, 'lead');
    rig = await barCampaign(app, lead, { settings: { recordLengthS: RECORD_LENGTH_S } });
  } finally {
    await app.close();
  }
}, 120_000);

afterAll(() => {
  cluster?.remove();
});

interface Tally {
  acknowledged: Map<string, string[]>;
  answered503: number;
  answered503WithoutRetryAfter: number;
  refusedConnections: number;
  /** Keys of requests that got no answer within 20 s. */
  unanswered: string[];
  otherAnswers: { status: number; body: string }[];
  healthDuringOutage: { status: number; body: { status?: string; database?: { status?: string; since?: string } } }[];
}

async function signIn(server: ServerProcess): Promise<string> {
  const res = await fetch(`${server.url}/api/auth/sign-in/email`, {
    method: 'POST',
    headers: { 'content-type': 'application/json', origin: publicUrl },
    body: JSON.stringify({ email: leadEmail, password: PASSWORD }),
  });
  expect(res.status).toBe(200);
  return res.headers.getSetCookie().map((c) => c.split(';')[0]).join('; ');
}

/** One upload, retried with the same key until acknowledged (≤ 60 s, backoff 100 ms doubling to 2 s). */
async function uploadUntilAcknowledged(server: ServerProcess, cookie: string, entryId: string, key: string, wav: Buffer, tally: Tally): Promise<void> {
  const deadline = Date.now() + 60_000;
  let wait = 100;
  for (;;) {
    if (Date.now() > deadline) throw new Error(`upload ${key} was not acknowledged within 60 s`);
    try {
      const form = new FormData();
      form.append('file', new Blob([new Uint8Array(wav)], { type: 'audio/wav' }), `${key}.wav`);
      // A request left unanswered for 20 s counts as cut off and is retried (none should be).
      const res = await fetch(`${server.url}/api/campaigns/${rig.campaignId}/schedule/${entryId}/hits`, { method: 'POST', headers: { cookie, origin: publicUrl, 'idempotency-key': key }, body: form, signal: AbortSignal.timeout(20_000) });
      const text = await res.text();
      if (res.status === 201 || res.status === 200) {
        const body = JSON.parse(text) as { hits: { id: string }[] };
        tally.acknowledged.set(key, body.hits.map((h) => h.id));
        return;
      }
      if (res.status === 503) {
        tally.answered503 += 1;
        if (!res.headers.get('retry-after')) tally.answered503WithoutRetryAfter += 1;
        expect(JSON.parse(text)).toMatchObject({ error: { code: 'database-unavailable' } });
      } else {
        tally.otherAnswers.push({ status: res.status, body: text.slice(0, 300) });
        return;
      }
    } catch (err) {
      // The server is up, but a request can still be cut: count and retry as the Tap screen does.
      if ((err as Error).name === 'TimeoutError') tally.unanswered.push(key);
      else tally.refusedConnections += 1;
    }
    await new Promise((r) => setTimeout(r, wait));
    wait = Math.min(wait * 2, 2000);
  }
}

describe('PostgreSQL restarted under a burst of uploads', () => {
  it('keeps the API up, answers 503 with Retry-After during the outage, recovers alone, and stores every acknowledged hit exactly once', async () => {
    const server = await startServerProcess({ DATABASE_URL: databaseUrl, PUBLIC_URL: publicUrl, AUTH_SECRET: secret, LOG_REQUESTS: 'true' });
    try {
      const cookie = await signIn(server);
      // One recording per entry, reused under different keys: 21 entries of the bar, one hit each.
      const wavs = new Map(rig.entries.map((e, i) => [e.id, barHitsWav(rig, { excitationDof: e.excitationDof, count: 1, seed: 9000 + i, recordLengthS: RECORD_LENGTH_S })]));
      const jobs = Array.from({ length: UPLOADS }, (_, i) => ({ key: `fault-burst-${String(i).padStart(4, '0')}`, entryId: rig.entries[i % rig.entries.length]!.id }));
      const tally: Tally = { acknowledged: new Map(), answered503: 0, answered503WithoutRetryAfter: 0, refusedConnections: 0, unanswered: [], otherAnswers: [], healthDuringOutage: [] };

      let next = 0;
      const workers = Array.from({ length: CONCURRENCY }, async () => {
        while (next < jobs.length) {
          const job = jobs[next++]!;
          await uploadUntilAcknowledged(server, cookie, job.entryId, job.key, wavs.get(job.entryId)!, tally);
        }
      });

      // The restart, once about a quarter of the uploads is acknowledged.
      const restart = (async () => {
        while (tally.acknowledged.size < UPLOADS / 4) await new Promise((r) => setTimeout(r, 20));
        const stopped = cluster.stop('fast');
        expect(stopped.ok).toBe(true);
        const outageStarted = Date.now();
        while (Date.now() - outageStarted < 3000) {
          const res = await fetch(`${server.url}/api/health`).catch((err: Error) => err);
          if (res instanceof Error) tally.healthDuringOutage.push({ status: 0, body: { status: res.message } });
          else tally.healthDuringOutage.push({ status: res.status, body: (await res.json()) as Tally['healthDuringOutage'][number]['body'] });
          await new Promise((r) => setTimeout(r, 500));
        }
        const started = cluster.start();
        expect(started.ok).toBe(true);
        return tally.acknowledged.size;
      })();

      await Promise.all(workers);
      const acknowledgedAtStop = await restart;

      // The API stayed up and is healthy again without anyone touching it.
      expect(server.child.exitCode).toBeNull();
      expect(server.child.signalCode).toBeNull();
      const health = await fetch(`${server.url}/api/health`);
      expect(health.status).toBe(200);
      expect(tally.healthDuringOutage.length).toBeGreaterThan(0);
      for (const h of tally.healthDuringOutage) expect(h).toMatchObject({ status: 503, body: { status: 'degraded', database: { status: 'unreachable' } } });

      // What the database holds: one row per acknowledged upload, none twice.
      const direct = new pg.Client({ connectionString: databaseUrl });
      await direct.connect();
      try {
        const rows = (await direct.query<{ id: string; key: string }>(`SELECT id, idempotency_key AS key FROM hit WHERE idempotency_key LIKE 'fault-burst-%'`)).rows;
        const storedByKey = new Map<string, string[]>();
        for (const r of rows) storedByKey.set(r.key, [...(storedByKey.get(r.key) ?? []), r.id]);
        const lost = [...tally.acknowledged].filter(([key, ids]) => ids.some((id) => !(storedByKey.get(key) ?? []).includes(id)));
        const duplicates = [...storedByKey.values()].filter((ids) => ids.length > 1).length;
        const audited = (await direct.query<{ n: number }>(`SELECT count(*)::int AS n FROM audit_event WHERE entity = 'hit' AND action = 'record'`)).rows[0]!.n;
        const figures = { uploads: UPLOADS, acknowledgedAtStop, acknowledged: tally.acknowledged.size, answered503: tally.answered503, refusedConnections: tally.refusedConnections, unanswered: tally.unanswered.length, healthChecksDuringOutage: tally.healthDuringOutage.length, hitsInDatabase: rows.length, lost: lost.length, duplicates, auditLines: audited };
        console.log(`[fault test] ${JSON.stringify(figures)}`);

        expect(tally.otherAnswers).toEqual([]);
        expect(tally.unanswered).toEqual([]);
        expect(tally.acknowledged.size).toBe(UPLOADS);
        // The restart really fell inside the burst, and the server said so with 503 + Retry-After.
        expect(acknowledgedAtStop).toBeLessThan(UPLOADS);
        expect(tally.answered503).toBeGreaterThan(0);
        expect(tally.answered503WithoutRetryAfter).toBe(0);
        expect(lost).toEqual([]);
        expect(duplicates).toBe(0);
        expect(rows.length).toBe(UPLOADS);
        // Every stored hit has its one audit line (recorded in the same transaction).
        expect(audited).toBe(UPLOADS);
      } finally {
        await direct.end();
      }
      expect(server.output()).toMatch(/database unreachable/);
      expect(server.output()).toMatch(/database reachable again/);

      server.child.kill('SIGTERM');
      expect(await server.exited()).toEqual({ code: 0, signal: null });
    } finally {
      // The server's log, for reading after a failure.
      fs.mkdirSync(path.join(root, 'test-output'), { recursive: true });
      fs.writeFileSync(path.join(root, 'test-output', 'postgres-restart-server.log'), server.output());
      if (server.child.exitCode === null && server.child.signalCode === null) server.child.kill('SIGKILL');
    }
  }, 120_000);
});
