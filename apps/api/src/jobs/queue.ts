// Background jobs in PostgreSQL (pg-boss, its own `pgboss` schema): the API sends, worker
// processes (`npm run worker`, any number; or the API itself when JOBS_IN_PROCESS is on) claim a
// job and hold a lease on it (job_lease, renewed by a heartbeat every third of JOB_LEASE_S). A
// lease that runs out means its worker died: any other worker hands the job back to pg-boss
// (`fail`), which retries it. pg-boss's own expiration (JOB_MAX_RUNTIME_S) caps one attempt. What people see —
// status, progress, the product — is the background_job row (or modal_fit for fits), written by
// the worker as it goes. See docs/decisions/0007-job-queue-pg-boss.md.
import { hostname } from 'node:os';
import PgBoss from 'pg-boss';
import { eq, sql } from 'drizzle-orm';
import { backgroundJob, jobLease, modalFit } from '@resonote/db/schema';
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
  private reaper: ReturnType<typeof setInterval> | null = null;
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
    const { leaseS, pollS, retryLimit, maxRuntimeS } = this.config.jobs;
    const boss = new PgBoss({
      connectionString: this.config.databaseUrl,
      application_name: 'resonote-jobs',
      max: work ? 4 : 2,
      schedule: false,
      supervise: true,
      maintenanceIntervalSeconds: 60,
    });
    boss.on('error', (err: Error) => this.log(`[resonote] job queue: ${err.message}`));
    await boss.start();
    this.boss = boss;
    await boss.createQueue(GAVE_UP, { name: GAVE_UP, retryLimit: 0, expireInSeconds: 60 });
    for (const name of QUEUES) {
      const options = { name, retryLimit, retryDelay: 1, expireInSeconds: maxRuntimeS, deadLetter: GAVE_UP };
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
        const heartbeat = await this.holdLease(name, job.id, job.data.jobId);
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
        } finally {
          await heartbeat.release();
        }
      });
    }
    const every = Math.max(1, leaseS / 2) * 1000;
    this.reaper = setInterval(() => void this.reclaimExpired().catch((err: Error) => this.log(`[resonote] job leases: ${err.message}`)), every);
    this.reaper.unref();
    await boss.work<JobData>(GAVE_UP, { pollingIntervalSeconds: pollS, batchSize: 1, includeMetadata: true }, async ([job]) => {
      if (job) await this.markFailed(job.data.jobId, `gave up after ${retryLimit + 1} attempts (a worker failed or stopped each time); start it again`);
    });
  }

  /** Takes the lease on a claimed job and renews it until released. */
  private async holdLease(queue: string, queueJobId: string, jobId: string) {
    const { leaseS } = this.config.jobs;
    const until = sql`now() + make_interval(secs => ${leaseS})`;
    await this.db
      .insert(jobLease)
      .values({ queueJobId, queue, jobId, worker: this.worker, leaseUntil: until })
      .onConflictDoUpdate({ target: jobLease.queueJobId, set: { worker: this.worker, leaseUntil: until } });
    const timer = setInterval(() => {
      void this.db
        .update(jobLease)
        .set({ leaseUntil: until })
        .where(eq(jobLease.queueJobId, queueJobId))
        .catch((err: Error) => this.log(`[resonote] renewing the lease of job ${jobId}: ${err.message}`));
    }, Math.max(300, (leaseS * 1000) / 3));
    timer.unref();
    return {
      release: async () => {
        clearInterval(timer);
        await this.db.delete(jobLease).where(eq(jobLease.queueJobId, queueJobId)).catch(() => undefined);
      },
    };
  }

  /**
   * Hands the jobs of dead workers (leases not renewed in time) back to the queue. DELETE …
   * RETURNING makes each lease reclaimed by exactly one worker.
   */
  async reclaimExpired(): Promise<number> {
    const boss = this.boss;
    if (!boss) return 0;
    const expired = await this.db.delete(jobLease).where(sql`${jobLease.leaseUntil} < now()`).returning();
    for (const lease of expired) {
      this.log(`[resonote] job ${lease.queue} ${lease.jobId}: the lease of ${lease.worker} ran out; handing it to another worker`);
      await boss.fail(lease.queue, lease.queueJobId, { message: `the worker ${lease.worker} stopped renewing its lease` });
    }
    return expired.length;
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
    if (this.reaper) clearInterval(this.reaper);
    this.reaper = null;
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
