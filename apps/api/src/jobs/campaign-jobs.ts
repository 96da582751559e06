// The campaign's background jobs besides modal fits (issue 18): a campaign reprocess (every DOF's
// averaged FRF under the current settings, split into parts so several workers share it), the
// report PDF and the campaign backup (products stored on the job row for the request or a later
// download). Each handler is safe to run again: a retried part that already finished is skipped,
// a recomputed FRF with an unchanged input hash is served from frf_result.
import { eq, sql } from 'drizzle-orm';
import { backgroundJob } from '@resonote/db/schema';
import type { Db } from '@resonote/db/client';
import type { Config } from '../config.ts';
import { HttpError } from '../errors.ts';
import { audit } from '../http/audit.ts';
import type { CampaignEvents } from '../hits/events.ts';
import { currentSettings } from '../hits/current-settings.ts';
import { entriesWithAcceptedHits } from '../hits/schedule-status.ts';
import { entryResult } from '../hits/entry-result.ts';
import { flushResultWrites } from '../hits/result-cache.ts';
import { collectHandover } from '../handover/collect.ts';
import { renderReport } from '../handover/report-html.ts';
import { htmlToPdf } from '../handover/pdf.ts';
import { buildBackup } from '../handover/backup.ts';
import type { JobContext, Jobs } from './queue.ts';

export type JobRow = typeof backgroundJob.$inferSelect;

interface ReprocessInput {
  entryIds: string[];
  chunk: number;
  settingsVersion: number;
}

/** What a client sees of a job. */
export function jobView(row: JobRow) {
  return {
    id: row.id,
    kind: row.kind,
    status: row.status,
    progress: row.progress,
    message: row.message,
    parts: row.parts,
    partsDone: row.doneParts.length,
    attempts: row.attempts,
    result: row.result,
    file: row.fileName ? { name: row.fileName, type: row.fileType } : null,
    createdAt: row.createdAt,
    startedAt: row.startedAt,
    finishedAt: row.finishedAt,
    elapsedMs: row.elapsedMs,
  };
}

/** Queues a reprocess of every DOF with accepted hits, in parts of `config.jobs.reprocessChunk` DOFs. */
export async function startReprocess(deps: { db: Db; jobs: Jobs; config: Config }, campaignId: string, userId: string | null): Promise<JobRow> {
  const { db, jobs, config } = deps;
  const entryIds = await entriesWithAcceptedHits(db, campaignId);
  const settings = await currentSettings(db, campaignId);
  const chunk = config.jobs.reprocessChunk;
  const parts = Math.ceil(entryIds.length / chunk);
  const input: ReprocessInput = { entryIds, chunk, settingsVersion: settings.version };
  const [row] = await db
    .insert(backgroundJob)
    .values({
      campaignId,
      kind: 'reprocess',
      input,
      parts: Math.max(parts, 1),
      createdBy: userId,
      ...(parts === 0 ? { status: 'done' as const, progress: 1, message: 'no DOF has accepted hits', result: { entries: 0 }, finishedAt: new Date(), elapsedMs: 0 } : { message: `${entryIds.length} DOFs in ${parts} parts` }),
    })
    .returning();
  await audit(db, { campaignId, actorId: userId, entity: 'campaign', entityId: campaignId, action: 'reprocess', after: { jobId: row!.id, entries: entryIds.length, settingsVersion: settings.version } });
  for (let part = 0; part < parts; part++) await jobs.send('reprocess', { jobId: row!.id, part });
  return row!;
}

/** Queues a report PDF or a backup; the product lands on the job row. */
export async function startProductJob(deps: { db: Db; jobs: Jobs }, kind: 'report-pdf' | 'backup', campaignId: string, userId: string | null): Promise<JobRow> {
  const [row] = await deps.db.insert(backgroundJob).values({ campaignId, kind, createdBy: userId }).returning();
  await deps.jobs.send(kind, { jobId: row!.id, part: 0 });
  return row!;
}

async function claim(db: Db, jobId: string): Promise<JobRow | null> {
  const [row] = await db
    .update(backgroundJob)
    .set({ status: 'running', attempts: sql`${backgroundJob.attempts} + 1`, startedAt: sql`coalesce(${backgroundJob.startedAt}, now())` })
    .where(sql`${backgroundJob.id} = ${jobId} AND ${backgroundJob.status} IN ('queued', 'running')`)
    .returning();
  return row ?? null;
}

const elapsed = sql`(extract(epoch from now() - ${backgroundJob.startedAt}) * 1000)::int`;

export function reprocessHandler(db: Db, events: CampaignEvents) {
  return async ({ data }: JobContext): Promise<void> => {
    const [before] = await db.select({ doneParts: backgroundJob.doneParts, status: backgroundJob.status }).from(backgroundJob).where(eq(backgroundJob.id, data.jobId));
    if (!before || before.doneParts.includes(data.part)) return;
    const row = await claim(db, data.jobId);
    if (!row) return;
    const input = row.input as ReprocessInput;
    const ids = input.entryIds.slice(data.part * input.chunk, (data.part + 1) * input.chunk);
    // The settings as they are now: a change made while the reprocess runs is what counts.
    const settings = await currentSettings(db, row.campaignId);
    let averaged = 0;
    for (const id of ids) if (await entryResult(db, row.campaignId, id, settings)) averaged++;
    await flushResultWrites(db);
    const [after] = await db
      .update(backgroundJob)
      .set({
        doneParts: sql`array_append(${backgroundJob.doneParts}, ${data.part}::int)`,
        progress: sql`(cardinality(${backgroundJob.doneParts}) + 1)::real / ${backgroundJob.parts}`,
        status: sql`CASE WHEN cardinality(${backgroundJob.doneParts}) + 1 >= ${backgroundJob.parts} THEN 'done' ELSE 'running' END`,
        message: sql`(cardinality(${backgroundJob.doneParts}) + 1) || ' of ' || ${backgroundJob.parts} || ' parts done'`,
        result: sql`jsonb_build_object('entries', ${input.entryIds.length}::int, 'settingsVersion', ${settings.version}::int, 'averaged', coalesce((${backgroundJob.result}->>'averaged')::int, 0) + ${averaged}::int)`,
        finishedAt: sql`CASE WHEN cardinality(${backgroundJob.doneParts}) + 1 >= ${backgroundJob.parts} THEN now() END`,
        elapsedMs: sql`CASE WHEN cardinality(${backgroundJob.doneParts}) + 1 >= ${backgroundJob.parts} THEN ${elapsed} END`,
      })
      .where(sql`${backgroundJob.id} = ${data.jobId} AND NOT (${data.part}::int = ANY(${backgroundJob.doneParts}))`)
      .returning({ status: backgroundJob.status });
    void events.publish(row.campaignId, { type: 'job', jobId: row.id });
    if (after?.status === 'done') void events.publish(row.campaignId, { type: 'schedule' });
  };
}

/** A refusal the request that waits for the job passes on (status and code of an HttpError). */
async function failWith(db: Db, jobId: string, err: HttpError) {
  await db.update(backgroundJob).set({ status: 'failed', message: err.message, result: { httpStatus: err.status, code: err.code }, finishedAt: new Date(), elapsedMs: elapsed }).where(eq(backgroundJob.id, jobId));
}

const safeFileName = (name: string) => name.replace(/[^A-Za-z0-9._-]+/g, '-').replace(/^-+|-+$/g, '').slice(0, 60) || 'campaign';

export function reportPdfHandler(db: Db, config: Config, events: CampaignEvents) {
  return async ({ data }: JobContext): Promise<void> => {
    const row = await claim(db, data.jobId);
    if (!row) return;
    try {
      const handover = await collectHandover(db, row.campaignId);
      const pdf = await htmlToPdf(renderReport(handover, { publicUrl: config.publicUrl }), handover.campaign.name);
      await db.transaction(async (tx) => {
        await tx
          .update(backgroundJob)
          .set({ status: 'done', progress: 1, message: 'done', file: pdf, fileName: `${safeFileName(handover.campaign.name)}-report.pdf`, fileType: 'application/pdf', result: { bytes: pdf.length }, finishedAt: new Date(), elapsedMs: elapsed })
          .where(eq(backgroundJob.id, row.id));
        await audit(tx, { campaignId: row.campaignId, actorId: row.createdBy, entity: 'handover', entityId: row.campaignId, action: 'export-report-pdf', after: { bytes: pdf.length, settingsVersion: handover.settings.version, fitIds: handover.modes?.fits.map((f) => f.fitId) ?? [], jobId: row.id } });
      });
      void events.publish(row.campaignId, { type: 'job', jobId: row.id });
    } catch (err) {
      if (err instanceof HttpError) return failWith(db, row.id, err);
      throw err;
    }
  };
}

export function backupHandler(db: Db, config: Config, events: CampaignEvents) {
  return async ({ data }: JobContext): Promise<void> => {
    const row = await claim(db, data.jobId);
    if (!row) return;
    try {
      const backup = await buildBackup(db, row.campaignId, config.publicUrl);
      const zip = Buffer.from(backup.zip.buffer, backup.zip.byteOffset, backup.zip.byteLength);
      await db
        .update(backgroundJob)
        .set({ status: 'done', progress: 1, message: 'done', file: zip, fileName: backup.fileName, fileType: 'application/zip', result: { bytes: zip.length, counts: backup.counts }, finishedAt: new Date(), elapsedMs: elapsed })
        .where(eq(backgroundJob.id, row.id));
      void events.publish(row.campaignId, { type: 'job', jobId: row.id });
    } catch (err) {
      if (err instanceof HttpError) return failWith(db, row.id, err);
      throw err;
    }
  };
}
