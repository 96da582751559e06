// Background work that outlives a request: one row per job (campaign reprocess, report PDF,
// backup, modal fit), its progress and its product, shared by every API and worker process.
// The queue itself (claiming, leases, retries) lives in pg-boss's own schema; this table is what
// people see. See docs/decisions/0007-job-queue-pg-boss.md.
import { index, integer, jsonb, pgTable, real, text, timestamp, uuid } from 'drizzle-orm/pg-core';
import { user } from './auth.ts';
import { campaign } from './campaign.ts';

import { bytea } from './hits.ts';

export const jobKinds = ['reprocess', 'report-pdf', 'backup', 'modal-fit'] as const;
export const jobStatuses = ['queued', 'running', 'done', 'failed'] as const;

export const backgroundJob = pgTable(
  'background_job',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    campaignId: uuid('campaign_id')
      .notNull()
      .references(() => campaign.id, { onDelete: 'cascade' }),
    kind: text('kind', { enum: jobKinds }).notNull(),
    status: text('status', { enum: jobStatuses }).notNull().default('queued'),
    progress: real('progress').notNull().default(0),
    message: text('message').notNull().default(''),
    /** What the job works on (kind-specific JSON, small). */
    input: jsonb('input').notNull().default({}),
    /** Large binary input (a modal fit's FRFs as float64), kept out of the queue's own rows. */
    inputData: bytea('input_data'),
    /** Parts of the job (reprocess chunks) and which of them are finished: progress survives a crash. */
    parts: integer('parts').notNull().default(1),
    doneParts: integer('done_parts').array().notNull().default([]),
    /** Kind-specific summary once done. */
    result: jsonb('result'),
    /** The product (PDF, zip) once done. */
    file: bytea('file'),
    fileName: text('file_name'),
    fileType: text('file_type'),
    /** How many times a worker has started (a part of) it; more than parts means retries. */
    attempts: integer('attempts').notNull().default(0),
    createdBy: text('created_by').references(() => user.id, { onDelete: 'set null' }),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
    startedAt: timestamp('started_at', { withTimezone: true }),
    finishedAt: timestamp('finished_at', { withTimezone: true }),
    elapsedMs: integer('elapsed_ms'),
  },
  (t) => [index('background_job_campaign_idx').on(t.campaignId, t.createdAt)],
);

/**
 * Fixed-window request counters for rate limits, shared by every API process (better-auth's
 * `consume`: check and increment in one statement).
 */
export const rateLimitWindow = pgTable('rate_limit_window', {
  key: text('key').primaryKey(),
  windowStart: timestamp('window_start', { withTimezone: true }).notNull(),
  count: integer('count').notNull(),
});

/**
 * The lease a worker holds on a queue job while it works it, renewed by a heartbeat. A lease that
 * runs out means the worker died: any other worker removes the row and hands the job back to the
 * queue for a retry (apps/api/src/jobs/queue.ts).
 */
export const jobLease = pgTable('job_lease', {
  /** pg-boss's id of the job. */
  queueJobId: uuid('queue_job_id').primaryKey(),
  queue: text('queue').notNull(),
  jobId: uuid('job_id').notNull(),
  worker: text('worker').notNull(),
  leaseUntil: timestamp('lease_until', { withTimezone: true }).notNull(),
});
