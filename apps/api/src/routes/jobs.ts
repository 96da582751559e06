// Background jobs of a campaign (issue 18): start a campaign reprocess, a report PDF or a backup;
// read a job's status and progress; download its product. Any API process answers; any worker
// process does the work (apps/api/src/jobs/).
import { and, eq } from 'drizzle-orm';
import { z } from 'zod';
import { uuidSchema } from '@resonote/contracts';
import { backgroundJob } from '@resonote/db/schema';
import type { Deps } from './deps.ts';
import { audit } from '../http/audit.ts';
import { assertNotArchived } from '../http/archived.ts';
import { HttpError, notFound } from '../errors.ts';
import { jobView, startProductJob, startReprocess } from '../jobs/campaign-jobs.ts';

export function registerJobRoutes({ routes, db, config, jobs }: Deps): void {
  async function loadJob(campaignId: string, jobId: string) {
    if (!uuidSchema.safeParse(jobId).success) throw notFound('That job');
    const [row] = await db.select().from(backgroundJob).where(and(eq(backgroundJob.id, jobId), eq(backgroundJob.campaignId, campaignId)));
    if (!row) throw notFound('That job');
    return row;
  }

  routes.add({
    method: 'post',
    path: '/campaigns/:campaignId/jobs',
    tag: 'Jobs',
    access: 'lead',
    summary:
      'Start a background job: "reprocess" recomputes the averaged FRF of every DOF with accepted hits under the current settings (split into parts that several workers share); "report-pdf" prints the hand-over report; "backup" builds the campaign backup zip',
    body: z.strictObject({ kind: z.enum(['reprocess', 'report-pdf', 'backup']) }),
    status: 202,
    // A report or a backup only reads; a reprocess writes results, so it checks the archive itself.
    whileArchived: 'allowed',
    returns: '{ job: { id, kind, status, progress, … } } — poll GET …/jobs/:jobId',
    handler: async ({ body, campaign: access, user: me }) => {
      if (body.kind === 'reprocess') await assertNotArchived(db, access.campaignId);
      if (body.kind === 'reprocess') return { job: jobView(await startReprocess({ db, jobs, config }, access.campaignId, me.id)) };
      if (body.kind === 'backup') await audit(db, { campaignId: access.campaignId, actorId: me.id, entity: 'campaign', entityId: access.campaignId, action: 'backup', after: { by: me.email } });
      return { job: jobView(await startProductJob({ db, jobs }, body.kind, access.campaignId, me.id)) };
    },
  });

  routes.add({
    method: 'get',
    path: '/campaigns/:campaignId/jobs/:jobId',
    tag: 'Jobs',
    access: 'lead',
    summary: 'A background job: status (queued, running, done, failed), progress 0–1, parts done, attempts, result',
    handler: async ({ params, campaign: access }) => ({ job: jobView(await loadJob(access.campaignId, params.jobId!)) }),
  });

  routes.add({
    method: 'get',
    path: '/campaigns/:campaignId/jobs/:jobId/file',
    tag: 'Jobs',
    access: 'lead',
    summary: 'The product of a finished report-pdf or backup job',
    produces: 'application/octet-stream',
    handler: async ({ params, res, campaign: access }) => {
      const row = await loadJob(access.campaignId, params.jobId!);
      if (row.status !== 'done') throw new HttpError(409, 'not-ready', `The job is ${row.status}${row.status === 'failed' ? `: ${row.message}` : '; try again when it is done'}.`);
      if (!row.file) throw new HttpError(404, 'not-found', 'This job has no file to download.');
      res
        .status(200)
        .type(row.fileType ?? 'application/octet-stream')
        .setHeader('content-disposition', `attachment; filename="${row.fileName ?? 'download'}"`)
        .setHeader('cache-control', 'no-store');
      res.send(row.file);
      return undefined;
    },
  });
}
