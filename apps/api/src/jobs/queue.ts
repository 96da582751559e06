// Background jobs in PostgreSQL (pg-boss, its own `pgboss` schema): the API sends, worker
// processes (`npm run worker`, any number; or the API itself when JOBS_IN_PROCESS is on) claim a
// job with a lease (pg-boss `expireInSeconds`), and a job whose worker died is failed by the
// queue's maintenance once its lease runs out and retried by another worker. What people see —
// status, progress, the product — is the background_job row (or modal_fit for fits), written by
// the worker as it goes. See docs/decisions/0007-job-queue-pg-boss.md.
import { hostname } from 'node:os';
import PgBoss from 'pg-boss';
import { eq, sql } from 'drizzle-orm';
import { backgroundJob, modalFit } from '@resonote/db/schema';
import type { Db } from '@resonote/db/client';
import type { Config } from '../config.ts';

export const QUEUES = ['modal-fit', 'reprocess', 'report-pdf', 'backup'] as const;
export type QueueName = (typeof QUEUES)[number];
/** Where pg-boss puts a job that failed on every attempt; its handler records the failure. */
const GAVE_UP = 'job-gave-up';

export interface JobData {
  /** background_job.id */
  jobId: string;
  /** The part of a job split over workers (campaign reprocess); 0 otherwise. */
  part: number;
}

export interface JobContext {
  data: JobData;
  /** 0 on the first attempt. */
  retryCount: number;
  retryLimit: number;
  /** This worker's name (host:pid), for logs. */
  worker: string;
}

export type JobHandler = (ctx: JobContext) => Promise<void>;

/** A failure that another attempt cannot mend (bad input, data that does not fit): not retried. */
export class PermanentJobError extends Error {}

export class Jobs {
  private boss: PgBoss | null = null;
  private readonly handlers = new Map<QueueName, JobHandler>();
  private working = false;
  readonly worker = `${hostname()}:${process.pid}`;

  constructor(
    private readonly db: Db,
    private readonly config: Config,
    private readonly log: (message: string) => void = (m) => console.warn(m),
  ) {}

  /** Registers what a worker does for one queue (before start). */
  handle(queue: QueueName, handler: JobHandler): void {
    this.handlers.set(queue, handler);
  }

  /**
   * Connects, creates the queues (idempotent; every process may do it), and — with `work` — starts
   * claiming jobs. No job is marked failed here: a job left running by a dead process is taken
   * over when its lease expires.
   */
  async start({ work }: { work: boolean }): Promise<void> {
    const { leaseS, pollS, retryLimit } = this.config.jobs;
    const boss = new PgBoss({
      connectionString: this.config.databaseUrl,
      application_name: 'resonote-jobs',
      max: work ? 4 : 2,
      schedule: false,
      supervise: true,
      // Expired leases are found by maintenance: run it often enough that a dead worker's job
      // waits little more than its lease.
      maintenanceIntervalSeconds: Math.max(1, Math.min(30, Math.floor(leaseS / 2))),
    });
    boss.on('error', (err: Error) => this.log(`[resonote] job queue: ${err.message}`));
    await boss.start();
    this.boss = boss;
    await boss.createQueue(GAVE_UP, { name: GAVE_UP, retryLimit: 0, expireInSeconds: 60 });
    for (const name of QUEUES) {
      const options = { name, retryLimit, retryDelay: 1, expireInSeconds: leaseS, deadLetter: GAVE_UP };
      await boss.createQueue(name, options);
      await boss.updateQueue(name, options);
    }
    if (!work) return;
    this.working = true;
    for (const name of QUEUES) {
      const handler = this.handlers.get(name);
      if (!handler) continue;
      await boss.work<JobData>(name, { pollingIntervalSeconds: pollS, batchSize: 1, includeMetadata: true }, async ([job]) => {
        if (!job) return;
        try {
          await handler({ data: job.data, retryCount: job.retryCount, retryLimit: job.retryLimit, worker: this.worker });
        } catch (err) {
          if (err instanceof PermanentJobError) {
            await this.markFailed(job.data.jobId, err.message);
            return;
          }
          const last = job.retryCount >= job.retryLimit;
          this.log(`[resonote] job ${name} ${job.data.jobId} part ${job.data.part} failed on attempt ${job.retryCount + 1}${last ? ' (the last)' : '; it will be retried'}: ${(err as Error).message}`);
          throw err;
        }
      });
    }
    await boss.work<JobData>(GAVE_UP, { pollingIntervalSeconds: pollS, batchSize: 1, includeMetadata: true }, async ([job]) => {
      if (job) await this.markFailed(job.data.jobId, `gave up after ${retryLimit + 1} attempts (a worker failed or stopped each time); start it again`);
    });
  }

  get isWorking(): boolean {
    return this.working;
  }

  /** Queues one job (or one part of one); returns the queue's id of it. */
  async send(queue: QueueName, data: JobData): Promise<string> {
    if (!this.boss) throw new Error('the job queue is not started');
    const id = await this.boss.send(queue, data as unknown as object);
    if (!id) throw new Error(`the job queue refused a ${queue} job`);
    return id;
  }

  /** Records a failure that no attempt will mend on the job's row (and its modal fit, if any). */
  async markFailed(jobId: string, message: string): Promise<void> {
    const [row] = await this.db
      .update(backgroundJob)
      .set({ status: 'failed', message, finishedAt: new Date(), elapsedMs: sql`(extract(epoch from now() - coalesce(${backgroundJob.startedAt}, ${backgroundJob.createdAt})) * 1000)::int` })
      .where(sql`${backgroundJob.id} = ${jobId} AND ${backgroundJob.status} <> 'done'`)
      .returning({ kind: backgroundJob.kind, input: backgroundJob.input });
    if (row?.kind === 'modal-fit') {
      const fitId = (row.input as { fitId: string }).fitId;
      await this.db.update(modalFit).set({ status: 'failed', message, finishedAt: new Date() }).where(sql`${modalFit.id} = ${fitId} AND ${modalFit.status} <> 'done'`);
    }
  }

  /** Stops claiming; waits (up to `timeoutMs`) for the jobs in hand to finish. */
  async stop(timeoutMs = 10_000): Promise<void> {
    const boss = this.boss;
    this.boss = null;
    this.working = false;
    if (!boss) return;
    await boss.stop({ graceful: true, wait: true, timeout: timeoutMs });
  }
}

/** Waits until a background_job row is done or failed (polling the database, so any worker may run it). */
export async function waitForJob(db: Db, jobId: string, timeoutMs: number): Promise<typeof backgroundJob.$inferSelect | null> {
  const until = Date.now() + timeoutMs;
  let delay = 100;
  for (;;) {
    const [row] = await db.select().from(backgroundJob).where(eq(backgroundJob.id, jobId));
    if (!row || row.status === 'done' || row.status === 'failed') return row ?? null;
    if (Date.now() > until) return row;
    await new Promise((r) => setTimeout(r, delay));
    delay = Math.min(delay * 1.5, 500);
  }
}
