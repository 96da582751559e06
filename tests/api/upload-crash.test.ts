// Nothing lost, nothing half-written: the API process is killed (SIGKILL, as a power cut or an OOM
// kill would) while an upload of three hits is inside its database transaction. The hits must be
// all there or none, and the engineer's retry with the same Idempotency-Key after the restart must
// store them exactly once. The server runs as a real child process on the test's own database.
import { spawn, type ChildProcess } from 'node:child_process';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { and, eq } from 'drizzle-orm';
import pg from 'pg';
import { createRng, hitSeries, steelBar } from '@resonote/sim';
import { auditEvent, hit } from '@resonote/db/schema';
import { encodeWav } from '@resonote/api/recording';
import { freePort, startTestApp, type TestApp } from '../support/app.ts';
import { PASSWORD, signUp } from '../support/accounts.ts';
import { invite, type Person } from '../support/campaign.ts';
import { barCampaign, BAR_SETTINGS, type RigCampaign } from '../support/rig.ts';
import { API_TEMPLATE } from '../support/global-setup-api.ts';

const apiDir = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '../../apps/api');

let app: TestApp;
let lead: Person;
let rig: RigCampaign;

interface Server {
  child: ChildProcess;
  url: string;
  output: () => string;
}

/** Starts apps/api/src/server.ts as `npm start` does, on the test database; resolves when it serves. */
async function startServer(): Promise<Server> {
  const port = await freePort();
  let output = '';
  const child = spawn(process.execPath, ['--import', 'tsx', 'src/server.ts'], {
    cwd: apiDir,
    env: {
      ...process.env,
      NODE_ENV: 'test',
      PORT: String(port),
      // Same public origin as the in-process app, so one sign-in origin works for both.
      PUBLIC_URL: app.config.publicUrl,
      DATABASE_URL: app.config.databaseUrl,
      SMTP_CAPTURE_PORT: '0',
      LOG_REQUESTS: 'false',
      AUTH_RATE_LIMIT_MAX: '1000',
      AUTH_SECRET: app.config.authSecret,
    },
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  child.stdout!.on('data', (d) => (output += String(d)));
  child.stderr!.on('data', (d) => (output += String(d)));
  const url = `http://127.0.0.1:${port}`;
  for (let i = 0; i < 300; i++) {
    if (child.exitCode !== null) throw new Error(`the server exited with ${child.exitCode}:\n${output}`);
    if (/serving on/.test(output)) return { child, url, output: () => output };
    await new Promise((r) => setTimeout(r, 100));
  }
  child.kill('SIGKILL');
  throw new Error(`the server did not start in 30 s:\n${output}`);
}

async function exited(child: ChildProcess): Promise<{ code: number | null; signal: NodeJS.Signals | null }> {
  if (child.exitCode !== null || child.signalCode !== null) return { code: child.exitCode, signal: child.signalCode };
  return new Promise((resolve) => child.once('exit', (code, signal) => resolve({ code, signal })));
}

/** Signs the lead in against `url` and returns the session cookie. */
async function cookieFor(url: string, email: string): Promise<string> {
  const res = await fetch(`${url}/api/auth/sign-in/email`, {
    method: 'POST',
    headers: { 'content-type': 'application/json', origin: app.config.publicUrl },
    body: JSON.stringify({ email, password: PASSWORD }),
  });
  expect(res.status).toBe(200);
  return res.headers.getSetCookie().map((c) => c.split(';')[0]).join('; ');
}

/** Three clean hits at B05 of the simulated bar, as volts in a float WAV (2.25 mV/N, 10.2 mV/(m/s²)). */
function threeHitsWav(): Buffer {
  const fs = BAR_SETTINGS.sampleRateHz;
  const n = fs * BAR_SETTINGS.recordLengthS;
  const hits = hitSeries(steelBar().model, { excitationDof: 'B05:+Z', responseDofs: ['B21:+Z'], fs, samples: n, preTriggerS: 0.0105, peakForceN: 50, pulseWidthS: 0.001, forceNoiseN: 0.02, responseNoise: 0.02, forceRangeN: 2000, responseRangeMs2: 500 }, 3, createRng(505), {
    doubleHitProbability: 0,
    overloadProbability: 0,
  });
  const force = new Float64Array(3 * n);
  const accel = new Float64Array(3 * n);
  hits.forEach((h, i) => {
    for (let k = 0; k < n; k++) {
      force[i * n + k] = (h.force[k]! * rig.hammerSensitivity) / 1000;
      accel[i * n + k] = (h.responses[0]![k]! * rig.accelSensitivity) / 1000;
    }
  });
  return encodeWav([force, accel], fs, 'float32', 1);
}

function upload(server: Server, cookie: string, entryId: string, key: string, wav: Buffer): Promise<Response> {
  const form = new FormData();
  form.append('file', new Blob([new Uint8Array(wav)], { type: 'audio/wav' }), 'b05.wav');
  return fetch(`${server.url}/api/campaigns/${rig.campaignId}/schedule/${entryId}/hits`, {
    method: 'POST',
    headers: { cookie, origin: app.config.publicUrl, 'idempotency-key': key },
    body: form,
  });
}

beforeAll(async () => {
  app = await startTestApp(API_TEMPLATE);
  const admin = await signUp(app, 'Ada Admin', 'admin@lab.test');
  lead = await signUp(app, 'Lena Lead', 'lead@lab.test');
  const seedCampaign = (await admin.agent.post('/api/campaigns').send({ name: 'Seed' })).body.campaign.id;
  await invite(app, admin, seedCampaign, lead, 'lead');
  rig = await barCampaign(app, lead);
}, 120_000);
afterAll(async () => {
  await app?.close();
});

describe('an upload cut off by a killed server', () => {
  it('leaves no hit and no audit line when the process dies inside the transaction, and the retry with the same key stores the hits once', async () => {
    const target = rig.entries.find((e) => e.excitationDof === 'B05:+Z')!;
    const key = 'crash-test-b05-0001';
    const wav = threeHitsWav();
    const db = app.handle.database.db;
    const stored = () => db.select().from(hit).where(eq(hit.scheduleEntryId, target.id));
    const auditedHits = () => db.select().from(auditEvent).where(and(eq(auditEvent.campaignId, rig.campaignId), eq(auditEvent.entity, 'hit')));

    // A second session holds a lock on the hit table, so the server's INSERT waits inside its
    // transaction: the kill then lands, deterministically, between BEGIN and COMMIT.
    const locker = new pg.Client({ connectionString: app.config.databaseUrl });
    await locker.connect();
    // Another session watches: pg_stat_activity is a snapshot held for the rest of a transaction.
    const watcher = new pg.Client({ connectionString: app.config.databaseUrl });
    await watcher.connect();
    const first = await startServer();
    try {
      const cookie = await cookieFor(first.url, lead.email);
      await locker.query('BEGIN');
      await locker.query('LOCK TABLE hit IN SHARE ROW EXCLUSIVE MODE');
      const cut = upload(first, cookie, target.id, key, wav).then(
        (res) => ({ status: res.status }),
        (err: Error) => ({ error: err.message }),
      );
      let waiting: { pid: number }[] = [];
      for (let i = 0; i < 300 && waiting.length === 0; i++) {
        await new Promise((r) => setTimeout(r, 100));
        const q = await watcher.query<{ pid: number }>(`SELECT pid FROM pg_stat_activity WHERE datname = current_database() AND wait_event_type = 'Lock' AND query ILIKE 'insert into "hit"%'`);
        waiting = q.rows;
      }
      if (waiting.length !== 1) {
        const seen = await watcher.query(`SELECT state, wait_event_type, left(query, 80) AS query FROM pg_stat_activity WHERE datname = current_database()`);
        const answered = await Promise.race([cut, new Promise((r) => setTimeout(() => r('no answer yet'), 100))]);
        expect.fail(`the server did not reach its INSERT inside the transaction; upload: ${JSON.stringify(answered)}; sessions: ${JSON.stringify(seen.rows)}; server: ${first.output()}`);
      }
      first.child.kill('SIGKILL');
      expect((await exited(first.child)).signal).toBe('SIGKILL');
      // The engineer's request never got an answer.
      expect(await cut).toHaveProperty('error');
      await locker.query('ROLLBACK');
      // The orphaned backend finds its client gone and rolls the transaction back.
      for (let i = 0; i < 100; i++) {
        const left = await watcher.query(`SELECT 1 FROM pg_stat_activity WHERE pid = $1`, [waiting[0]!.pid]);
        if (left.rowCount === 0) break;
        await new Promise((r) => setTimeout(r, 100));
      }
      expect(await stored()).toHaveLength(0);
      expect(await auditedHits()).toHaveLength(0);
    } finally {
      await locker.end();
      await watcher.end();
      if (first.child.exitCode === null && first.child.signalCode === null) first.child.kill('SIGKILL');
    }

    // Restart; the engineer's app retries with the same key: stored once, then replayed.
    const second = await startServer();
    try {
      const cookie = await cookieFor(second.url, lead.email);
      const retry = await upload(second, cookie, target.id, key, wav);
      expect(retry.status).toBe(201);
      const body = (await retry.json()) as { replayed: boolean; hits: { id: string; sequence: number }[] };
      expect(body.replayed).toBe(false);
      expect(body.hits.map((h) => h.sequence)).toEqual([1, 2, 3]);
      const again = await upload(second, cookie, target.id, key, wav);
      expect(again.status).toBe(200);
      const replay = (await again.json()) as { replayed: boolean; hits: { id: string }[] };
      expect(replay.replayed).toBe(true);
      expect(replay.hits.map((h) => h.id)).toEqual(body.hits.map((h) => h.id));
      expect((await stored()).map((h) => h.sequence).sort()).toEqual([1, 2, 3]);
      expect(await auditedHits()).toHaveLength(3);

      // A polite stop (SIGTERM) finishes open requests and exits 0.
      second.child.kill('SIGTERM');
      expect(await exited(second.child)).toEqual({ code: 0, signal: null });
      expect(second.output()).toMatch(/\[resonote\] stopped/);
    } finally {
      if (second.child.exitCode === null && second.child.signalCode === null) second.child.kill('SIGKILL');
    }
  }, 120_000);
});
