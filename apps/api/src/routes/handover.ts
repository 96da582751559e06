// Hand-over (design.md step 6, issue 8): the printable report (HTML and PDF), the CSV/JSON
// bundles, sharing by mail (an expiring signed report link, or a viewer invitation), and campaign
// backup and restore. Only leads and admins export and share; a shared link opens that one report.
import { createHash, randomBytes } from 'node:crypto';
import { eq, sql } from 'drizzle-orm';
import type { RequestHandler } from 'express';
import { z } from 'zod';
import { campaign, campaignInvitation, campaignMember, hit, user } from '@resonote/db/schema';
import type { Deps } from './deps.ts';
import { audit } from '../http/audit.ts';
import { singleFileUpload } from '../http/multipart.ts';
import { forbidden, HttpError, notFound } from '../errors.ts';
import { collectHandover } from '../handover/collect.ts';
import { renderReport } from '../handover/report-html.ts';
import { bundleJson } from '../handover/bundle.ts';
import { rawHits } from '../handover/bundle-raw.ts';
import { streamBundleZip } from '../handover/bundle-zip.ts';
import { signReportLink, verifyReportLink } from '../handover/share-token.ts';
import { mayRestore, restoreBackup } from '../handover/restore.ts';
import { startProductJob, type JobRow } from '../jobs/campaign-jobs.ts';
import { waitForJob } from '../jobs/queue.ts';

const hashToken = (token: string) => createHash('sha256').update(token).digest('hex');

const shareSchema = z.strictObject({
  recipients: z
    .array(z.email('not a valid e-mail address').trim().toLowerCase())
    .min(1, 'name at least one recipient')
    .max(20, 'at most 20 recipients at once'),
  mode: z.enum(['report-link', 'viewer-invitation']),
  expiresInDays: z.number().int().min(1).max(90).default(14),
  message: z.string().trim().max(2000).optional(),
});

const rawQuery = z.strictObject({ raw: z.enum(['0', '1', 'true', 'false']).optional() });
const wantsRaw = (q: { raw?: string }) => q.raw === '1' || q.raw === 'true';

const safeFileName = (name: string) => name.replace(/[^A-Za-z0-9._-]+/g, '-').replace(/^-+|-+$/g, '').slice(0, 60) || 'campaign';

/** How long a request waits for its report or backup job before answering 503 with the job's id. */
const JOB_WAIT_MS = 120_000;

/** Sends the product of a finished job, or the refusal it ended with. */
function sendJobFile(res: Parameters<RequestHandler>[1], row: JobRow | null, what: string) {
  if (!row) throw new HttpError(500, 'job-lost', `${what} job disappeared.`);
  if (row.status === 'failed') {
    const r = (row.result ?? {}) as { httpStatus?: number; code?: string };
    throw new HttpError(r.httpStatus ?? 503, r.code ?? 'job-failed', row.message);
  }
  if (row.status !== 'done' || !row.file) throw new HttpError(503, 'busy', `${what} is still being made (job ${row.id}); read it later from GET /api/campaigns/${row.campaignId}/jobs/${row.id}/file.`, { jobId: row.id });
  res
    .status(200)
    .type(row.fileType ?? 'application/octet-stream')
    .setHeader('content-disposition', `attachment; filename="${row.fileName}"`)
    .setHeader('cache-control', 'no-store');
  res.send(row.file);
  return undefined;
}

export function registerHandoverRoutes({ routes, db, config, mailer, jobs }: Deps): void {
  async function reportHtml(campaignId: string, sharedUntil?: Date) {
    const data = await collectHandover(db, campaignId);
    return { html: renderReport(data, { publicUrl: config.publicUrl, sharedUntil }), data };
  }

  const sendHtml = (res: Parameters<RequestHandler>[1], html: string) => {
    res.status(200).type('text/html; charset=utf-8').setHeader('cache-control', 'no-store');
    res.send(html);
    return undefined;
  };

  routes.add({
    method: 'get',
    path: '/campaigns/:campaignId/report.html',
    tag: 'Hand-over',
    access: 'viewer',
    summary: 'The hand-over report as one self-contained printable HTML page (A4): summary, geometry, kit and calibration, settings, hits, FRFs, checks, modes, cautions and a traceability appendix',
    produces: 'text/html',
    handler: async ({ res, campaign: access }) => sendHtml(res, (await reportHtml(access.campaignId)).html),
  });

  routes.add({
    method: 'get',
    path: '/campaigns/:campaignId/report.pdf',
    tag: 'Hand-over',
    access: 'lead',
    summary: 'The hand-over report printed to an A4 PDF',
    produces: 'application/pdf',
    handler: async ({ res, campaign: access, user: me }) => {
      // Printed by a worker process (Chromium off the API's machine share); this request waits.
      const job = await startProductJob({ db, jobs }, 'report-pdf', access.campaignId, me.id);
      return sendJobFile(res, await waitForJob(db, job.id, JOB_WAIT_MS), 'The report');
    },
  });

  routes.add({
    method: 'get',
    path: '/campaigns/:campaignId/export/bundle.zip',
    tag: 'Hand-over',
    access: 'lead',
    summary: 'The hand-over bundle as a zip: README.txt, geometry.csv, schedule.csv, frf/*.csv (H1, H2, coherence, every line), modes, settings.json, kit.json; raw time data with ?raw=1',
    query: rawQuery,
    produces: 'application/zip',
    handler: async ({ res, query, campaign: access, user: me }) => {
      const data = await collectHandover(db, access.campaignId, { checks: false });
      const raw = wantsRaw(query);
      await audit(db, { campaignId: access.campaignId, actorId: me.id, entity: 'handover', entityId: access.campaignId, action: 'export-bundle', after: { format: 'zip', raw, frfs: data.frfs.length, settingsVersion: data.settings.version } });
      res
        .status(200)
        .type('application/zip')
        .setHeader('content-disposition', `attachment; filename="${safeFileName(data.campaign.name)}-handover.zip"`)
        .setHeader('cache-control', 'no-store');
      // Streamed as it is built (raw hits one at a time), so a large campaign never sits in memory whole.
      try {
        await streamBundleZip(db, data, raw, res);
      } catch (err) {
        // The headers are out: all that is left is to cut the download, which the client sees as incomplete.
        res.destroy(err as Error);
      }
      return undefined;
    },
  });

  routes.add({
    method: 'get',
    path: '/campaigns/:campaignId/export/bundle.json',
    tag: 'Hand-over',
    access: 'lead',
    summary: 'The hand-over bundle as one JSON document (the same content as bundle.zip); raw time data with ?raw=1',
    query: rawQuery,
    returns: '{ format: "resonote-handover-bundle", version, readme, campaign, geometry, schedule, frfs: [{ file, responseDof, excitationDof, f, h1, h2, coherence, hitIds, inputHash, … }], modes, settings, kit, hits }',
    handler: async ({ query, campaign: access, user: me }) => {
      const data = await collectHandover(db, access.campaignId, { checks: false });
      if (wantsRaw(query)) {
        // One JSON document is built in memory (EXPORT_JSON_RAW_MAX_VALUES, default 8 million ≈ 100 MB of text); the zip streams any size.
        const values = (await db.select({ n: sql<number>`coalesce(sum(${hit.samplesPerChannel} * jsonb_array_length(${hit.channels})), 0)::float8` }).from(hit).where(eq(hit.campaignId, access.campaignId)))[0]?.n ?? 0;
        if (values > config.exportJsonRawMaxValues) throw new HttpError(413, 'too-large', `The raw time data holds ${(values / 1e6).toFixed(1)} million values, more than one JSON document carries (${config.exportJsonRawMaxValues / 1e6} million). Download bundle.zip?raw=1 instead: it streams any size.`);
      }
      const raw = wantsRaw(query) ? await rawHits(db, data) : null;
      await audit(db, { campaignId: access.campaignId, actorId: me.id, entity: 'handover', entityId: access.campaignId, action: 'export-bundle', after: { format: 'json', raw: raw !== null, frfs: data.frfs.length, settingsVersion: data.settings.version } });
      return bundleJson(data, raw);
    },
  });

  routes.add({
    method: 'post',
    path: '/campaigns/:campaignId/share',
    tag: 'Hand-over',
    access: 'lead',
    summary: 'Share the hand-over by e-mail: an expiring signed link to the report (report-link) or an invitation to join as viewer (viewer-invitation)',
    body: shareSchema,
    // Sharing reads the campaign (a report link, or a viewer's seat): allowed on an archived one.
    whileArchived: 'allowed',
    returns: '{ mode, expiresAt, sent: [email], skipped: [{ email, reason }], link? }',
    handler: async ({ body, campaign: access, user: me }) => {
      const [target] = await db.select().from(campaign).where(eq(campaign.id, access.campaignId));
      if (!target) throw notFound('That campaign');
      const recipients = [...new Set(body.recipients)];
      const expiresAt = new Date(Date.now() + body.expiresInDays * 86_400_000);
      const note = body.message ? `\n\nMessage from ${me.name}:\n${body.message}\n` : '';
      const what = `“${target.name}”${target.structure ? ` (${target.structure})` : ''}`;

      if (body.mode === 'report-link') {
        const { token, payload } = signReportLink(config.authSecret, access.campaignId, expiresAt);
        const link = `${config.publicUrl}/api/shared/reports/${token}`;
        await audit(db, { campaignId: access.campaignId, actorId: me.id, entity: 'share', entityId: payload.nonce, action: 'share-report-link', after: { recipients, expiresAt, nonce: payload.nonce } });
        const sent: string[] = [];
        for (const to of recipients) {
          try {
            await mailer.send({
              to,
              subject: `${me.name} shares the Resonote hand-over report of ${target.name}`,
              text: `Hello,\n\n${me.name} shares the hand-over report of the test campaign ${what} with you.${note}\n\nOpen the report (read-only, valid until ${expiresAt.toISOString().slice(0, 16).replace('T', ' ')} UTC):\n\n${link}\n\nThe link opens this report only. Anyone holding it can read the report until it expires, so do not forward it beyond the people who need it.\n`,
            });
            sent.push(to);
          } catch (err) {
            throw new HttpError(502, 'mail-failed', `The mail to ${to} could not be sent (${(err as Error).message}); ${sent.length ? `already sent to ${sent.join(', ')}` : 'nothing was sent'}.`, { sent });
          }
        }
        return { mode: body.mode, expiresAt, sent, skipped: [], link };
      }

      // viewer-invitation: the same invitation as POST …/invitations (hashed token, mailed link).
      const already = await db
        .select({ email: sql<string>`lower(${user.email})` })
        .from(campaignMember)
        .innerJoin(user, eq(user.id, campaignMember.userId))
        .where(eq(campaignMember.campaignId, access.campaignId));
      const members = new Set(already.map((r) => r.email));
      const skipped = recipients.filter((r) => members.has(r)).map((email) => ({ email, reason: 'already a member of this campaign' }));
      const invitees = recipients.filter((r) => !members.has(r));
      const tokens = new Map(invitees.map((email) => [email, randomBytes(24).toString('base64url')]));
      const rows = invitees.length
        ? await db.transaction(async (tx) => {
            const inserted = await tx
              .insert(campaignInvitation)
              .values(invitees.map((email) => ({ campaignId: access.campaignId, email, role: 'viewer' as const, tokenHash: hashToken(tokens.get(email)!), invitedBy: me.id, expiresAt })))
              .returning();
            for (const row of inserted) await audit(tx, { campaignId: access.campaignId, actorId: me.id, entity: 'invitation', entityId: row.id, action: 'create', after: { email: row.email, role: 'viewer', expiresAt, via: 'share' } });
            await audit(tx, { campaignId: access.campaignId, actorId: me.id, entity: 'share', entityId: access.campaignId, action: 'share-viewer-invitation', after: { recipients: invitees, skipped, expiresAt } });
            return inserted;
          })
        : [];
      const sent: string[] = [];
      for (const row of rows) {
        const link = `${config.publicUrl}/invitations/${tokens.get(row.email)}`;
        try {
          await mailer.send({
            to: row.email,
            subject: `${me.name} invites you to the Resonote campaign “${target.name}”`,
            text: `Hello,\n\n${me.name} invites you to the test campaign ${what} as viewer, to read its hand-over: progress, FRFs, modes and the report.${note}\n\nOpen this link to sign up or sign in and join. It is valid for ${body.expiresInDays} day${body.expiresInDays === 1 ? '' : 's'}:\n\n${link}\n`,
          });
          sent.push(row.email);
        } catch (err) {
          // Withdraw the invitations whose mail did not go out, so no dead invitation stays open.
          const unsent = rows.filter((r) => !sent.includes(r.email)).map((r) => r.id);
          for (const id of unsent) await db.update(campaignInvitation).set({ revokedAt: new Date() }).where(eq(campaignInvitation.id, id));
          throw new HttpError(502, 'mail-failed', `The invitation mail to ${row.email} could not be sent (${(err as Error).message}); the unsent invitations were withdrawn${sent.length ? `; already sent to ${sent.join(', ')}` : ''}.`, { sent });
        }
      }
      return { mode: body.mode, expiresAt, sent, skipped };
    },
  });

  routes.add({
    method: 'get',
    path: '/shared/reports/:token',
    tag: 'Hand-over',
    access: 'public',
    summary: 'A shared hand-over report (read-only HTML) through the signed, expiring link mailed by a lead',
    produces: 'text/html',
    handler: async ({ res, params }) => {
      const verified = verifyReportLink(config.authSecret, String(params.token ?? ''));
      if (!verified.ok && verified.reason === 'invalid') throw new HttpError(404, 'not-found', 'This report link is not valid. Check that the whole link was copied, or ask the lead for a new one.');
      if (!verified.ok) throw new HttpError(410, 'link-expired', `This report link expired on ${new Date(verified.payload.exp * 1000).toISOString().slice(0, 16).replace('T', ' ')} UTC. Ask the lead for a new one.`);
      const [exists] = await db.select({ id: campaign.id }).from(campaign).where(eq(campaign.id, verified.payload.campaignId));
      if (!exists) throw new HttpError(404, 'not-found', 'The campaign of this report link no longer exists.');
      const { html } = await reportHtml(verified.payload.campaignId, new Date(verified.payload.exp * 1000));
      res.setHeader('referrer-policy', 'no-referrer');
      res.setHeader('x-robots-tag', 'noindex, nofollow');
      return sendHtml(res, html);
    },
  });

  routes.add({
    method: 'get',
    path: '/campaigns/:campaignId/backup',
    tag: 'Hand-over',
    access: 'lead',
    summary: 'A complete backup of the campaign as one zip (manifest with SHA-256 per hit sample blob, every campaign table, raw samples byte for byte)',
    produces: 'application/zip',
    handler: async ({ res, campaign: access, user: me }) => {
      // Audited first, so the backup's own audit trail records it.
      await audit(db, { campaignId: access.campaignId, actorId: me.id, entity: 'campaign', entityId: access.campaignId, action: 'backup', after: { by: me.email } });
      // Built by a worker process; this request waits (POST …/jobs {kind:"backup"} does not).
      const job = await startProductJob({ db, jobs }, 'backup', access.campaignId, me.id);
      return sendJobFile(res, await waitForJob(db, job.id, JOB_WAIT_MS), 'The backup');
    },
  });

  const limit = config.uploadLimitBytes * 4;
  const parseBackupForm = singleFileUpload({ fileSize: limit, fields: 5, tooLarge: `The backup is larger than ${Math.round(limit / 1024 / 1024)} MB; nothing was restored.`, nothingDone: 'nothing was restored' });
  const upload: RequestHandler = (req, res, next) => {
    if (!req.is('multipart/form-data')) return next();
    parseBackupForm(req, res, next);
  };

  routes.add({
    method: 'post',
    path: '/campaigns/restore',
    tag: 'Hand-over',
    access: 'user',
    summary: 'Restore a campaign backup (multipart field "file") as a new campaign with new ids; the restorer becomes lead; ?members=1 also sends each of the backup’s other members an invitation with their role in the backup (they join only by accepting it)',
    query: z.strictObject({ members: z.enum(['0', '1']).optional() }),
    before: [upload],
    status: 201,
    returns: '{ campaign: { id, name }, counts, invited: [{ email, role }], notInvited: [{ email, reason }], sourceCampaignId }',
    handler: async ({ req, query, user: me }) => {
      if (!req.is('multipart/form-data')) throw new HttpError(415, 'unsupported-media-type', 'Send the backup as multipart/form-data with the file in the field "file".');
      const file = req.file;
      if (!file) throw new HttpError(400, 'invalid-input', 'Attach the backup file as the form field "file".');
      if (!(await mayRestore(db, me))) throw forbidden('Only admins and campaign leads can restore campaigns.');
      const result = await restoreBackup(db, file.buffer, me, { members: query.members === '1', mailer, publicUrl: config.publicUrl });
      return { campaign: { id: result.campaignId, name: result.name }, counts: result.counts, invited: result.invited, notInvited: result.notInvited, sourceCampaignId: result.sourceCampaignId };
    },
  });
}
