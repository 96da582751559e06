// Background modal fits as jobs in PostgreSQL (issue 18): the route stores the fit's input and
// queues it; a worker process (or the API itself with JOBS_IN_PROCESS) claims it, runs the fit in
// a worker thread off its event loop, and writes progress and the result to the modal_fit row.
// A worker that dies mid-fit leaves the job to another once its lease expires.
import { Worker } from 'node:worker_threads';
import { and, eq, inArray, sql } from 'drizzle-orm';
import { backgroundJob, modalFit } from '@resonote/db/schema';
import type { Db } from '@resonote/db/client';
import type { FitJob, FitMessage } from './fit-types.ts';
import { PermanentJobError, type JobContext, type Jobs } from '../jobs/queue.ts';

interface FitInputMeta {
  fitId: string;
  kind: FitJob['kind'];
  lines: number;
  frfs: { response: string; reference: string }[];
  bandHz: [number, number];
  orders: number[];
  tolerances: FitJob['tolerances'];
}

/** The FRFs as float64: f, then re and im of each FRF (kept out of the queue's own rows). */
function encodeFitJob(job: FitJob): Buffer {
  const lines = job.f.length;
  const all = new Float64Array(lines * (1 + 2 * job.frfs.length));
  all.set(job.f, 0);
  job.frfs.forEach((x, i) => {
    all.set(x.re, lines * (1 + 2 * i));
    all.set(x.im, lines * (2 + 2 * i));
  });
  return Buffer.from(all.buffer, all.byteOffset, all.byteLength);
}

function decodeFitJob(meta: FitInputMeta, data: Buffer): FitJob {
  const copy = new Uint8Array(data.length);
  copy.set(data);
  const all = new Float64Array(copy.buffer);
  const n = meta.lines;
  if (all.length !== n * (1 + 2 * meta.frfs.length)) throw new PermanentJobError(`the stored fit input holds ${all.length} values; ${n * (1 + 2 * meta.frfs.length)} expected`);
  return {
    f: all.slice(0, n),
    kind: meta.kind,
    frfs: meta.frfs.map((x, i) => ({ ...x, re: all.slice(n * (1 + 2 * i), n * (2 + 2 * i)), im: all.slice(n * (2 + 2 * i), n * (3 + 2 * i)) })),
    bandHz: meta.bandHz,
    orders: meta.orders,
    tolerances: meta.tolerances,
  };
}

/** What the modes routes use: queue a fit, wait for the queue to drain. */
export class FitQueue {
  constructor(
    private readonly db: Db,
    private readonly jobs: Jobs,
  ) {}

  /** Stores the fit's input and queues it; a failure to queue marks the fit failed. */
  enqueue(fitId: string, job: FitJob): void {
    void (async () => {
      const [campaign] = await this.db.select({ campaignId: modalFit.campaignId, createdBy: modalFit.createdBy }).from(modalFit).where(eq(modalFit.id, fitId));
      if (!campaign) return;
      const meta: FitInputMeta = { fitId, kind: job.kind, lines: job.f.length, frfs: job.frfs.map((x) => ({ response: x.response, reference: x.reference })), bandHz: job.bandHz, orders: job.orders, tolerances: job.tolerances };
      const [row] = await this.db
        .insert(backgroundJob)
        .values({ campaignId: campaign.campaignId, kind: 'modal-fit', input: meta, inputData: encodeFitJob(job), createdBy: campaign.createdBy })
        .returning({ id: backgroundJob.id });
      await this.jobs.send('modal-fit', { jobId: row!.id, part: 0 });
    })().catch(async (err: Error) => {
      await this.db
        .update(modalFit)
        .set({ status: 'failed', message: `the fit could not be queued: ${err.message}`, finishedAt: new Date() })
        .where(eq(modalFit.id, fitId))
        .catch(() => undefined);
    });
  }

  /** Resolves when no fit of this database is queued or running (tests and shutdown). */
  async idle(timeoutMs = 120_000): Promise<void> {
    const until = Date.now() + timeoutMs;
    while (Date.now() < until) {
      const [row] = await this.db.select({ n: sql<number>`count(*)::int` }).from(modalFit).where(inArray(modalFit.status, ['queued', 'running']));
      if (!row?.n) return;
      await new Promise((r) => setTimeout(r, 200));
    }
  }

  /** The queue belongs to the app (Jobs); nothing of its own to close. */
  async close(): Promise<void> {}
}

/** One worker thread per process, reused from fit to fit. */
let thread: Worker | null = null;
function fitThread(): Worker {
  if (!thread) {
    thread = new Worker(new URL('./worker-boot.mjs', import.meta.url), { workerData: { impl: new URL('./fit-worker.ts', import.meta.url).href } });
    thread.unref();
  }
  return thread;
}

/** Stops the fit thread (process shutdown). */
export async function stopFitThread(): Promise<void> {
  const t = thread;
  thread = null;
  await t?.terminate();
}

/** The worker side of a modal-fit job. */
export function fitJobHandler(db: Db): (ctx: JobContext) => Promise<void> {
  return async ({ data, retryCount }) => {
    const [row] = await db.select().from(backgroundJob).where(eq(backgroundJob.id, data.jobId));
    if (!row || row.status === 'done' || row.status === 'failed') return;
    const meta = row.input as FitInputMeta;
    const [fit] = await db.select({ status: modalFit.status }).from(modalFit).where(eq(modalFit.id, meta.fitId));
    if (!fit || fit.status === 'done' || fit.status === 'failed') return;
    const job = decodeFitJob(meta, row.inputData ?? Buffer.alloc(0));
    const started = Date.now();
    const again = retryCount > 0 ? ` (attempt ${retryCount + 1})` : '';
    await db.update(backgroundJob).set({ status: 'running', attempts: sql`${backgroundJob.attempts} + 1`, startedAt: row.startedAt ?? new Date() }).where(eq(backgroundJob.id, row.id));
    await db.update(modalFit).set({ status: 'running', progress: 0.01, message: `starting${again}` }).where(eq(modalFit.id, meta.fitId));
    const outcome = await new Promise<FitMessage>((resolve) => {
      const worker = fitThread();
      const onMessage = (m: FitMessage) => {
        if (m.type === 'progress') {
          void db.update(modalFit).set({ progress: m.progress, message: m.message + again }).where(and(eq(modalFit.id, meta.fitId), eq(modalFit.status, 'running'))).catch(() => undefined);
          return;
        }
        worker.off('message', onMessage);
        worker.off('error', onError);
        resolve(m);
      };
      const onError = (err: Error) => {
        worker.off('message', onMessage);
        thread = null;
        resolve({ type: 'failed', message: `the fit worker stopped: ${err.message}` });
      };
      worker.on('message', onMessage);
      worker.on('error', onError);
      worker.postMessage(job);
    });
    const elapsedMs = Date.now() - started;
    if (outcome.type === 'done') {
      await db.update(modalFit).set({ status: 'done', progress: 1, message: 'done', result: outcome.result, finishedAt: new Date(), elapsedMs }).where(eq(modalFit.id, meta.fitId));
      await db.update(backgroundJob).set({ status: 'done', progress: 1, message: 'done', inputData: null, finishedAt: new Date(), elapsedMs }).where(eq(backgroundJob.id, row.id));
    } else if (outcome.type === 'failed') {
      // The fit code refused the data (or its thread died): another attempt would do the same.
      throw new PermanentJobError(outcome.message);
    }
  };
}
