// The product as a cluster runs it (issue 18): nginx on loopback in front of two API processes
// (JOBS_IN_PROCESS=false) and two worker processes, one PostgreSQL — started and stopped by
// `npm run start:cluster` (scripts/cluster.mjs). Exercises the Tap, Review, Modes and Hand-over
// paths through nginx: sign-in, hit uploads, the events stream held through nginx seeing hits
// posted to either upstream, a modal fit and a report PDF done by workers, a campaign reprocess, a
// worker killed (SIGKILL) in the middle of a fit leaving it to the other, and the client address
// nginx passes on (a forged X-Forwarded-For is replaced by the address nginx was connected from).
import nodeFs from 'node:fs';
import http from 'node:http';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { eq, sql } from 'drizzle-orm';
import { openDb, type DbHandle } from '@resonote/db/client';
import { backgroundJob, jobLease, modalFit, session, user } from '@resonote/db/schema';
import { encodeWav } from '@resonote/api/recording';
import { signedInClient } from '@resonote/api/demo-client';
import { createRng, hitSeries } from '@resonote/sim';
import { freshClusterDatabase, startCluster, type RunningCluster } from '../support/cluster.ts';
import { openEvents, type SseReader } from '../support/processes.ts';
import { requestFrom } from '../support/client-address.ts';
import { BENCH_LEAD, BENCH_REFS, benchCampaignAt } from '../bench/bench-campaign.ts';

const PORT = Number(process.env.RESONOTE_CLUSTER_TEST_PORT ?? 40180);
const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '../..');
let cluster: RunningCluster;
let database: DbHandle;
let built: Awaited<ReturnType<typeof benchCampaignAt>>['built'];
let bar: Awaited<ReturnType<typeof benchCampaignAt>>['bar'];
let client: Awaited<ReturnType<typeof signedInClient>>;
let stream: SseReader;
const fs = 12800;
const n = 16384;

function wavFor(excitationDof: string, seed: number, count = 1) {
  const hits = hitSeries(bar.model, { excitationDof, responseDofs: BENCH_REFS, fs, samples: n, preTriggerS: 0.0051, peakForceN: 40, pulseWidthS: 0.0004, forceNoiseN: 0.02, responseNoise: 0.02, forceRangeN: 2000, responseRangeMs2: 500 }, count, createRng(seed), { doubleHitProbability: 0, overloadProbability: 0 });
  const join = (pick: (h: (typeof hits)[number]) => Float64Array, scale: number) => {
    const out = new Float64Array(n * count);
    hits.forEach((h, i) => out.set(pick(h).map((v) => (v * scale) / 1000), i * n));
    return out;
  };
  return encodeWav([join((h) => h.force, 2.25), ...BENCH_REFS.map((_, r) => join((h) => h.responses[r]!, 10.2))], fs);
}

beforeAll(async () => {
  // The checkout's .run folder as the API leaves it when it made its secret there (owner only,
  // apps/api/src/config.ts); nginx keeps its buffers of large answers under it (scripts/cluster.mjs).
  nodeFs.mkdirSync(path.join(root, '.run'), { recursive: true });
  nodeFs.chmodSync(path.join(root, '.run'), 0o700);
  const databaseUrl = await freshClusterDatabase('resonote_cluster_check');
  // A lease of 4 s, so a killed worker's fit is taken over within seconds; a dead worker is started
  // again only after 10 minutes, so the one that takes it over is the other worker.
  cluster = await startCluster({ databaseUrl, port: PORT, env: { JOB_LEASE_S: '4', JOB_POLL_S: '0.5', RESONOTE_CLUSTER_RESTART_S: '600' } });
  database = openDb(databaseUrl, { max: 2 });
  ({ built, bar } = await benchCampaignAt(cluster.url, 'Cluster check'));
  client = await signedInClient(cluster.url, cluster.url, BENCH_LEAD.email, BENCH_LEAD.password);
  stream = await openEvents(`${cluster.url}/api/campaigns/${built.campaignId}/events`, { cookie: client.cookie });
});
afterAll(async () => {
  stream?.close();
  await database?.close();
  const code = await cluster?.stop();
  // Ctrl-C / SIGTERM stops every process and exits cleanly.
  expect(code).toBe(0);
});

describe('two API processes and two workers behind nginx', () => {
  it('serves sign-in and the web app through nginx, and passes the events stream unbuffered', async () => {
    const me = await client.request('GET', '/api/me');
    expect(me.status).toBe(200);
    expect(me.body.user.email).toBe(BENCH_LEAD.email);
    const page = await fetch(`${cluster.url}/`);
    expect(page.status).toBe(200);
    const res = await fetch(`${cluster.url}/api/campaigns/${built.campaignId}/events`, { headers: { cookie: client.cookie } });
    expect(res.headers.get('content-type')).toBe('text/event-stream');
    await res.body?.cancel();
  });

  it('passes a large answer through nginx whole to a client slower than the upstream: the biggest script of the web app, byte for byte as built', async () => {
    // A client that reads nothing until nginx has had to hold the answer in a temporary file (nginx
    // logs that it did, or that it could not): issue 18's ERR_CONTENT_LENGTH_MISMATCH was such an
    // answer cut short because nginx's workers could not write their temporary files.
    const assets = path.join(root, 'apps/web/dist/assets');
    const largest = nodeFs.readdirSync(assets).filter((f) => f.endsWith('.js')).sort((a, b) => nodeFs.statSync(path.join(assets, b)).size - nodeFs.statSync(path.join(assets, a)).size)[0]!;
    const onDisk = nodeFs.readFileSync(path.join(assets, largest));
    expect(onDisk.length).toBeGreaterThan(1_000_000);
    const errorLog = path.join(root, '.run', `cluster-${PORT}`, 'error.log');
    const logged = () => (nodeFs.existsSync(errorLog) ? nodeFs.readFileSync(errorLog, 'utf8') : '').split('\n').filter((l) => l.includes(`/assets/${largest}`));
    const before = logged().length;
    const res = await new Promise<http.IncomingMessage>((resolve, reject) => http.get(`${cluster.url}/assets/${largest}`, resolve).once('error', reject));
    res.pause();
    while (logged().length === before) await new Promise((r) => setTimeout(r, 100));
    expect(logged().at(-1)).toContain('an upstream response is buffered to a temporary file');
    expect(res.statusCode).toBe(200);
    expect(Number(res.headers['content-length'])).toBe(onDisk.length);
    const chunks: Buffer[] = [];
    await new Promise<void>((resolve, reject) => {
      res.on('data', (c: Buffer) => chunks.push(c));
      res.once('end', resolve);
      res.once('aborted', () => reject(new Error(`the answer was cut after ${Buffer.concat(chunks).length} of ${onDisk.length} bytes`)));
      res.once('error', reject);
      res.resume();
    });
    const body = Buffer.concat(chunks);
    expect(body.length).toBe(onDisk.length);
    expect(body.equals(onDisk)).toBe(true);
  });

  it('stores uploads through nginx and answers each with the updated averaged FRF', async () => {
    const entry = built.entries.find((e) => e.responseDof === 'B21:+Z')!;
    for (let i = 0; i < 3; i++) {
      const res = await client.upload(`/api/campaigns/${built.campaignId}/schedule/${entry.id}/hits`, wavFor(entry.excitationDof, 10 + i), `h${i}.wav`, { units: 'volts' }, `cluster-check-${i}-xxxxxxxx`);
      expect(res.status).toBe(201);
      expect(res.body.frf.averages).toBe(i + 1);
    }
  });

  it('shows on the stream held through nginx the hits posted straight to each upstream, within a second', async () => {
    const entries = built.entries.filter((e) => e.responseDof === 'B11:+Z').slice(0, cluster.apiUrls.length);
    for (const [i, apiUrl] of cluster.apiUrls.entries()) {
      const direct = await signedInClient(apiUrl, cluster.url, BENCH_LEAD.email, BENCH_LEAD.password);
      const res = await direct.upload(`/api/campaigns/${built.campaignId}/schedule/${entries[i]!.id}/hits`, wavFor(entries[i]!.excitationDof, 50 + i), 'h.wav', { units: 'volts' }, `cluster-direct-${i}-xxxxxxxx`);
      expect(res.status).toBe(201);
      const got = await stream.waitFor((e) => e.type === 'hit' && e.entryId === entries[i]!.id, 5000);
      // issue 18: "within a second", from the notice's time stamp to its arrival through nginx.
      expect(got.wallMs - Date.parse(String(got.data.at))).toBeLessThan(1000);
    }
  });

  it('has a worker process run a modal fit started through nginx', async () => {
    // Five hits at eight more DOFs in one recording each, so the fit has FRFs to work on.
    for (const [i, e] of built.entries.filter((x) => x.responseDof === 'B01:+Z').slice(0, 8).entries()) {
      const res = await client.upload(`/api/campaigns/${built.campaignId}/schedule/${e.id}/hits`, wavFor(e.excitationDof, 200 + i, 5), 'five.wav', { units: 'volts' }, `cluster-five-${i}-xxxxxxxx`);
      expect(res.status).toBe(201);
    }
    const started = await client.request('POST', `/api/campaigns/${built.campaignId}/modes/fits`, { bandHz: { low: 20, high: 1500 }, maxOrder: 20 });
    expect(started.status).toBe(202);
    let fit;
    for (let i = 0; i < 600; i++) {
      fit = (await client.request('GET', `/api/campaigns/${built.campaignId}/modes/fits/${started.body.fit.id}`)).body.fit;
      if (fit.status === 'done' || fit.status === 'failed') break;
      await new Promise((r) => setTimeout(r, 200));
    }
    expect(fit.status).toBe('done');
    const [row] = await database.db.select().from(modalFit).where(eq(modalFit.id, started.body.fit.id));
    expect(row!.status).toBe('done');
    const [job] = await database.db.select().from(backgroundJob).where(eq(backgroundJob.kind, 'modal-fit'));
    expect(job!.status).toBe('done');
  }, 180_000);

  it('finishes a modal fit on the other worker when the one running it is killed (SIGKILL) in the middle', async () => {
    const workerPids = [...cluster.output().matchAll(/worker-\d started \(pid (\d+)\)/g)].map((m) => Number(m[1]));
    expect(workerPids).toHaveLength(2);
    const started = await client.request('POST', `/api/campaigns/${built.campaignId}/modes/fits`, { bandHz: { low: 20, high: 1500 }, maxOrder: 80, orderStep: 1 });
    expect(started.status).toBe(202);
    const fitId = started.body.fit.id as string;
    // Killed once it is inside the stabilization diagram (progress 0.15 → 1 in one step).
    let holder: number | undefined;
    let jobId = '';
    for (let i = 0; i < 3000 && holder === undefined; i++) {
      const [f] = await database.db.select().from(modalFit).where(eq(modalFit.id, fitId));
      jobId ||= (await database.db.select({ id: backgroundJob.id }).from(backgroundJob).where(sql`${backgroundJob.input}->>'fitId' = ${fitId}`))[0]?.id ?? '';
      const [lease] = jobId ? await database.db.select().from(jobLease).where(eq(jobLease.jobId, jobId)) : [];
      if (f?.status === 'running' && f.progress >= 0.15 && lease) holder = Number(lease.worker.split(':').at(-1));
      else await new Promise((r) => setTimeout(r, 20));
    }
    expect(workerPids).toContain(holder);
    process.kill(holder!, 'SIGKILL');
    const other = workerPids.find((p) => p !== holder)!;
    const takers = new Set<number>();
    let fit;
    for (let i = 0; i < 1200; i++) {
      const [lease] = await database.db.select().from(jobLease).where(eq(jobLease.jobId, jobId));
      if (lease) takers.add(Number(lease.worker.split(':').at(-1)));
      fit = (await client.request('GET', `/api/campaigns/${built.campaignId}/modes/fits/${fitId}`)).body.fit;
      if (fit.status === 'done' || fit.status === 'failed') break;
      await new Promise((r) => setTimeout(r, 100));
    }
    expect(fit.status).toBe('done');
    // orders 2, 3, …, 80 (orderStep 1 from max(2, step)), as in tests/api/jobs.test.ts.
    const [row] = await database.db.select().from(modalFit).where(eq(modalFit.id, fitId));
    expect((row!.result as { diagram: { orders: unknown[] } }).diagram.orders.length).toBe(79);
    takers.delete(holder!);
    expect([...takers]).toEqual([other]);
    const [job] = await database.db.select().from(backgroundJob).where(eq(backgroundJob.id, jobId));
    // Two starts: the killed one and the one that finished.
    expect(job!.attempts).toBe(2);
    expect(cluster.output()).toMatch(new RegExp(`worker-\\d \\(pid ${holder}\\) exited \\(SIGKILL\\)`));
  }, 240_000);

  it('keeps on a session the address nginx was connected from, not the X-Forwarded-For the client sent', async () => {
    const email = 'forwarded@lab.test';
    const res = await requestFrom('127.0.0.23', `${cluster.url}/api/auth/sign-up/email`, { headers: { origin: cluster.url, 'x-forwarded-for': '203.0.113.9', 'x-real-ip': '203.0.113.9' }, body: { name: 'Forwarded', email, password: 'correct-horse-battery' } });
    expect(res.status).toBe(200);
    const [row] = await database.db.select({ ip: session.ipAddress }).from(session).innerJoin(user, eq(user.id, session.userId)).where(eq(user.email, email));
    expect(row!.ip).toBe('127.0.0.23');
  });

  it('has a worker print the report PDF asked for through nginx, and reprocess the campaign', async () => {
    const pdf = await fetch(`${cluster.url}/api/campaigns/${built.campaignId}/report.pdf`, { headers: { cookie: client.cookie } });
    expect(pdf.status).toBe(200);
    expect(Buffer.from(await pdf.arrayBuffer()).subarray(0, 5).toString()).toBe('%PDF-');
    const started = await client.request('POST', `/api/campaigns/${built.campaignId}/jobs`, { kind: 'reprocess' });
    expect(started.status).toBe(202);
    let job;
    for (let i = 0; i < 600; i++) {
      job = (await client.request('GET', `/api/campaigns/${built.campaignId}/jobs/${started.body.job.id}`)).body.job;
      if (job.status === 'done' || job.status === 'failed') break;
      await new Promise((r) => setTimeout(r, 200));
    }
    expect(job.status).toBe('done');
    // 1 + 2 + 8 DOFs got hits above.
    expect(job.result.entries).toBe(11);
  }, 180_000);
});
