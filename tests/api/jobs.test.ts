// Background jobs in worker processes (issue 18): the API only queues (JOBS_IN_PROCESS=false);
// `npm run worker` child processes claim jobs with a short lease. A worker killed during a modal
// fit leaves it to the other, and a campaign reprocess is shared out in parts.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { eq } from 'drizzle-orm';
import { backgroundJob, frfResult, modalFit } from '@resonote/db/schema';
import { startTestApp, type TestApp } from '../support/app.ts';
import type { Person } from '../support/campaign.ts';
import { barCrew, BAR_SETTINGS, type RigCampaign } from '../support/rig.ts';
import { startWorker, type WorkerProcess } from '../support/processes.ts';
import { API_TEMPLATE } from '../support/global-setup-api.ts';

// A lease of 4 s: a dead worker's job is free again about 4–6 s after it was claimed.
const JOB_ENV = { JOB_LEASE_S: '4', JOB_POLL_S: '0.5', REPROCESS_CHUNK: '2' };

let app: TestApp;
let lead: Person;
let engineer: Person;
let rig: RigCampaign;
const workers: WorkerProcess[] = [];
const db = () => app.handle.database.db;

async function until<T>(what: string, read: () => Promise<T | undefined | null | false>, timeoutMs: number, everyMs = 50): Promise<T> {
  const end = Date.now() + timeoutMs;
  while (Date.now() < end) {
    const v = await read();
    if (v) return v;
    await new Promise((r) => setTimeout(r, everyMs));
  }
  throw new Error(`${what}: not within ${timeoutMs} ms`);
}

beforeAll(async () => {
  app = await startTestApp(API_TEMPLATE, { ...JOB_ENV, JOBS_IN_PROCESS: 'false' });
  ({ lead, engineer, rig } = await barCrew(app));
  // Three accepted hits at each of eight DOFs (the simulator without double hits or overloads).
  for (const [i, e] of rig.entries.slice(0, 8).entries()) {
    const res = await engineer.agent.post(`/api/campaigns/${rig.campaignId}/schedule/${e.id}/simulate`).send({ count: 3, seed: 100 + i, doubleHitProbability: 0, overloadProbability: 0 });
    if (res.status !== 201) throw new Error(`simulate: ${res.status} ${JSON.stringify(res.body)}`);
  }
}, 180_000);
afterAll(async () => {
  await Promise.all(workers.map((w) => w.stop()));
  await app?.close();
});

describe('jobs in worker processes', () => {
  it('finishes a modal fit on a second worker after the first was killed (SIGKILL) in the middle of it', async () => {
    const first = await startWorker(app.config.databaseUrl, JOB_ENV);
    workers.push(first);
    const started = await lead.agent.post(`/api/campaigns/${rig.campaignId}/modes/fits`).send({ bandHz: { low: 20, high: 800 }, maxOrder: 80, orderStep: 1 });
    expect(started.status).toBe(202);
    const fitId = started.body.fit.id as string;
    // Killed once it is inside the stabilization diagram (progress 0.15 → 1 in one step).
    await until('the first worker runs the fit', async () => {
      const [f] = await db().select().from(modalFit).where(eq(modalFit.id, fitId));
      return f?.status === 'running' && f.progress >= 0.15;
    }, 60_000, 20);
    await first.kill();
    const [atKill] = await db().select().from(modalFit).where(eq(modalFit.id, fitId));
    expect(atKill!.status).toBe('running');

    const second = await startWorker(app.config.databaseUrl, JOB_ENV);
    workers.push(second);
    const fit = await until('the fit is done', async () => {
      const [f] = await db().select().from(modalFit).where(eq(modalFit.id, fitId));
      return f && (f.status === 'done' || f.status === 'failed') ? f : null;
    }, 120_000, 200);
    expect({ status: fit.status, message: fit.message }).toEqual({ status: 'done', message: 'done' });
    expect((fit.result as { diagram: { orders: unknown[] } }).diagram.orders.length).toBe(79); // orders 2, 3, …, 80 (orderStep 1 from max(2, step))
    const [job] = await db().select().from(backgroundJob).where(eq(backgroundJob.kind, 'modal-fit'));
    // Two starts: the killed one and the one that finished.
    expect(job!.attempts).toBe(2);
    expect(job!.status).toBe('done');
    const api = await lead.agent.get(`/api/campaigns/${rig.campaignId}/modes/fits/${fitId}`);
    expect(api.body.fit.status).toBe('done');
  }, 240_000);

  it('reprocesses every DOF with accepted hits under new settings, in parts shared by two workers', async () => {
    if (workers.filter((w) => w.child.exitCode === null).length < 2) workers.push(await startWorker(app.config.databaseUrl, JOB_ENV));
    const current = await lead.agent.get(`/api/campaigns/${rig.campaignId}/settings`);
    const changed = await lead.agent.put(`/api/campaigns/${rig.campaignId}/settings`).send({ baseVersion: current.body.current.version, settings: { ...current.body.current.settings, bandHz: { low: 10, high: 600 } }, reason: 'narrower band for the fit' });
    expect(changed.status).toBe(200);
    const newVersion = changed.body.current.version as number;
    const started = await lead.agent.post(`/api/campaigns/${rig.campaignId}/jobs`).send({ kind: 'reprocess' });
    expect(started.status).toBe(202);
    // 8 DOFs with hits in parts of REPROCESS_CHUNK = 2.
    expect(started.body.job.parts).toBe(4);
    const job = await until('the reprocess is done', async () => {
      const res = await lead.agent.get(`/api/campaigns/${rig.campaignId}/jobs/${started.body.job.id}`);
      return res.body.job.status === 'done' || res.body.job.status === 'failed' ? res.body.job : null;
    }, 120_000, 200);
    expect(job.status).toBe('done');
    expect(job.partsDone).toBe(4);
    expect(job.result).toEqual({ entries: 8, averaged: 8, settingsVersion: newVersion });
    const stored = await db().select().from(frfResult).where(eq(frfResult.campaignId, rig.campaignId));
    expect(stored).toHaveLength(8);
    // Every stored FRF is keyed by the new settings version and averages the three hits.
    for (const r of stored) {
      expect(r.settingsVersion).toBe(newVersion);
      expect(r.averages).toBe(3);
      expect(r.sampleRateHz).toBe(BAR_SETTINGS.sampleRateHz);
    }
  }, 240_000);

  it('answers a report PDF through a worker, and refuses an unknown job kind and an unknown job', async () => {
    const pdf = await lead.agent.get(`/api/campaigns/${rig.campaignId}/report.pdf`).buffer(true).parse((res, cb) => {
      const chunks: Buffer[] = [];
      res.on('data', (c: Buffer) => chunks.push(c));
      res.on('end', () => cb(null, Buffer.concat(chunks)));
    });
    expect(pdf.status).toBe(200);
    expect((pdf.body as Buffer).subarray(0, 5).toString()).toBe('%PDF-');
    const bad = await lead.agent.post(`/api/campaigns/${rig.campaignId}/jobs`).send({ kind: 'everything' });
    expect(bad.status).toBe(400);
    expect(bad.body.error.code).toBeTruthy();
    const missing = await lead.agent.get(`/api/campaigns/${rig.campaignId}/jobs/00000000-0000-4000-8000-000000000000`);
    expect(missing.status).toBe(404);
  }, 120_000);
});
