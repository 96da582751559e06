// Background modal fits: one worker thread at a time (the machine has 2 cores; the API keeps the
// other), a queue behind it, progress written to the modal_fit row.
import { Worker } from 'node:worker_threads';
import { eq, inArray } from 'drizzle-orm';
import { modalFit } from '@resonote/db/schema';
import type { Db } from '@resonote/db/client';
import type { FitJob, FitMessage } from './fit-types.ts';

export class FitQueue {
  private queue: { fitId: string; job: FitJob }[] = [];
  private running = false;
  private worker: Worker | null = null;
  private idleWaiters: (() => void)[] = [];

  constructor(private readonly db: Db) {}

  /** Marks fits left queued or running by a previous process as failed. */
  async recover(): Promise<void> {
    await this.db
      .update(modalFit)
      .set({ status: 'failed', message: 'interrupted by a server restart; run the fit again', finishedAt: new Date() })
      .where(inArray(modalFit.status, ['queued', 'running']));
  }

  enqueue(fitId: string, job: FitJob): void {
    this.queue.push({ fitId, job });
    void this.pump();
  }

  /** Resolves when no fit is queued or running (tests and shutdown). */
  idle(): Promise<void> {
    if (!this.running && this.queue.length === 0) return Promise.resolve();
    return new Promise((resolve) => this.idleWaiters.push(resolve));
  }

  async close(): Promise<void> {
    this.queue = [];
    await this.worker?.terminate();
    this.worker = null;
  }

  private getWorker(): Worker {
    if (!this.worker) {
      this.worker = new Worker(new URL('./worker-boot.mjs', import.meta.url), { workerData: { impl: new URL('./fit-worker.ts', import.meta.url).href } });
      this.worker.unref();
    }
    return this.worker;
  }

  private async pump(): Promise<void> {
    if (this.running) return;
    const next = this.queue.shift();
    if (!next) {
      this.idleWaiters.splice(0).forEach((r) => r());
      return;
    }
    this.running = true;
    const started = Date.now();
    try {
      await this.db.update(modalFit).set({ status: 'running', progress: 0.01, message: 'starting' }).where(eq(modalFit.id, next.fitId));
      const outcome = await new Promise<FitMessage>((resolve) => {
        const worker = this.getWorker();
        const onMessage = (m: FitMessage) => {
          if (m.type === 'progress') {
            // Progress is advisory: a write lost to a database outage is skipped, never thrown.
            this.db
              .update(modalFit)
              .set({ progress: m.progress, message: m.message })
              .where(eq(modalFit.id, next.fitId))
              .catch(() => undefined);
            return;
          }
          worker.off('message', onMessage);
          worker.off('error', onError);
          resolve(m);
        };
        const onError = (err: Error) => {
          worker.off('message', onMessage);
          this.worker = null;
          resolve({ type: 'failed', message: `the fit worker stopped: ${err.message}` });
        };
        worker.on('message', onMessage);
        worker.on('error', onError);
        worker.postMessage(next.job);
      });
      const elapsedMs = Date.now() - started;
      if (outcome.type === 'done') {
        await this.db.update(modalFit).set({ status: 'done', progress: 1, message: 'done', result: outcome.result, finishedAt: new Date(), elapsedMs }).where(eq(modalFit.id, next.fitId));
      } else if (outcome.type === 'failed') {
        await this.db.update(modalFit).set({ status: 'failed', message: outcome.message, finishedAt: new Date(), elapsedMs }).where(eq(modalFit.id, next.fitId));
      }
    } catch {
      // The database went away (shutdown): nothing more to record.
    } finally {
      this.running = false;
      void this.pump();
    }
  }
}
