// What the campaign's hits add up to: averaged FRFs (one entry, or several for overlays), the
// validity checks, the progress, and the stream of change notices. The routes validate, call hits/ and answer.
import { and, eq } from 'drizzle-orm';
import { z } from 'zod';
import { hit } from '@resonote/db/schema';
import { checksAnswerSchema, entryFrfAnswerSchema, overlayAnswerSchema } from '@resonote/contracts';
import type { Deps } from './deps.ts';
import { CampaignEvents } from '../hits/events.ts';
import { currentSettings } from '../hits/current-settings.ts';
import { entryResult } from '../hits/entry-result.ts';
import { frfJson } from '../hits/frf-json.ts';
import { frfOverlays } from '../hits/frf-overlays.ts';
import { campaignChecks } from '../hits/campaign-checks.ts';
import { campaignProgress } from '../hits/campaign-progress.ts';
import { loadScheduleEntry } from '../hits/schedule-entry.ts';
import { resampledFromOf } from '../hits/resample-upload.ts';
import { kindSchema } from './hits.ts';
import { notExcluded } from '../hits/exclusion.ts';

export function registerResultRoutes({ routes, db }: Deps, events: CampaignEvents): void {
  routes.add({
    method: 'get',
    path: '/campaigns/:campaignId/schedule/:entryId/frf',
    tag: 'Results',
    access: 'viewer',
    summary: 'Averaged FRFs of an entry (H1, H2 per response channel, coherence, force ESD) in the requested kind; only the band of interest unless band=all',
    query: z.strictObject({ kind: kindSchema, band: z.enum(['settings', 'all']).default('settings') }),
    response: entryFrfAnswerSchema,
    returns: "{ status: 'ready', kind, unit, f, channels: [{ responseDof, h1: { re, im }, h2, coherence }], forceEsd, averages, inputHash, resampled, resampledFromHz, resampledHits }, or { status: 'no-accepted-hit', message } while the entry has no accepted hit (an ordinary state of the test day, not an error)",
    handler: async ({ params, query, campaign: access }) => {
      const entry = await loadScheduleEntry(db, access.campaignId, params.entryId!);
      const settings = await currentSettings(db, access.campaignId);
      const result = await entryResult(db, access.campaignId, entry.id, settings);
      const about = { id: entry.id, responseDof: entry.responseDof, excitationDof: entry.excitationDof, drivingPoint: entry.drivingPoint };
      if (!result) return { status: 'no-accepted-hit' as const, entry: about, message: `No accepted hit at ${entry.responseDof} / ${entry.excitationDof} yet.` };
      const sources = await db.select({ source: hit.source }).from(hit).where(and(eq(hit.scheduleEntryId, entry.id), eq(hit.verdict, 'accept'), notExcluded));
      return { status: 'ready' as const, entry: about, ...frfJson(result, query.kind, query.band === 'all' ? null : settings.settings.bandHz), ...resampledFromOf(sources.map((r) => r.source)) };
    },
  });

  routes.add({
    method: 'get',
    path: '/campaigns/:campaignId/progress',
    tag: 'Results',
    access: 'viewer',
    summary: 'Progress of the campaign: schedule counts by status, work by engineer, rejected hits by reason',
    handler: ({ campaign: access }) => campaignProgress(db, access.campaignId),
  });

  routes.add({
    method: 'get',
    path: '/campaigns/:campaignId/events',
    tag: 'Results',
    access: 'viewer',
    summary: 'Server-Sent Events: a message each time a hit, a verdict or the schedule of the campaign changes',
    produces: 'text/event-stream',
    handler: ({ req, res, campaign: access }) => {
      res.writeHead(200, { 'content-type': 'text/event-stream', 'cache-control': 'no-cache', connection: 'keep-alive', 'x-accel-buffering': 'no' });
      res.write(': connected\n\n');
      const off = events.subscribe(access.campaignId, (e) => res.write(`event: change\ndata: ${JSON.stringify(e)}\n\n`));
      const ping = setInterval(() => res.write(': ping\n\n'), 15_000);
      req.on('close', () => {
        clearInterval(ping);
        off();
      });
    },
  });

  routes.add({
    method: 'get',
    path: '/campaigns/:campaignId/checks',
    tag: 'Results',
    access: 'viewer',
    summary: 'Reciprocity (H_ij against H_ji) and linearity (the same DOF pair at two force levels) checks, with FRAC and dB/phase differences at the peaks (FRAC: Heylen & Lammens 1996; the checks: Ewins 2000)',
    response: checksAnswerSchema,
    handler: ({ campaign: access }) => campaignChecks(db, access.campaignId),
  });

  routes.add({
    method: 'get',
    path: '/campaigns/:campaignId/frfs',
    tag: 'Results',
    access: 'viewer',
    summary: 'Averaged FRFs of several entries at once for overlays (up to 100), main channel only',
    query: z.strictObject({ entries: z.string().max(4000).optional(), kind: kindSchema, band: z.enum(['settings', 'all']).default('settings') }),
    response: overlayAnswerSchema,
    handler: ({ query, campaign: access }) => frfOverlays(db, access.campaignId, query.entries ? query.entries.split(',').filter(Boolean) : null, query.kind, query.band === 'all'),
  });
}
