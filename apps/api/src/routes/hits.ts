// The test day on the server (issue 5): hits come in for a schedule entry (upload or simulated
// rig), each gets a verdict with reasons, accepted hits are averaged into FRFs, the schedule
// advances, and everyone on the campaign hears about it. The routes validate, call hits/ and answer.
import { randomUUID } from 'node:crypto';
import { asc, eq } from 'drizzle-orm';
import { z } from 'zod';
import { entryHitsAnswerSchema, frfKindSchema, hitDetailSchema, hitsAnswerSchema, idempotencyKeySchema, rigTipHardnesses } from '@resonote/contracts';
import { campaign, hit, hitExclusion, point, user } from '@resonote/db/schema';
import type { Deps } from './deps.ts';
import { channelMapFor } from '../hits/channel-map.ts';
import { refuseUncalibrated } from '../kit/policy.ts';
import { CampaignEvents } from '../hits/events.ts';
import { currentSettings } from '../hits/current-settings.ts';
import { loadScheduleEntry } from '../hits/schedule-entry.ts';
import { intake } from '../hits/intake.ts';
import { answerHitChange } from '../hits/hit-answer.ts';
import { hitDetail, hitSummary } from '../hits/hit-view.ts';
import { overrideVerdict } from '../hits/verdict.ts';
import { rigModel, rigRecording } from '../hits/simulated-rig.ts';
import { readUploadForm, recordingUpload, uploadFields } from '../hits/upload.ts';
import { keepOriginal, resampledSource, uploadAtCampaignRate } from '../hits/resample-upload.ts';
import { requestSha256 } from '../hits/upload-keys.ts';
import { tipChoice, tipSource } from './tip-choice.ts';
import { flagReasonsOf } from '../hits/entry-flags.ts';
import { entryResult } from '../hits/entry-result.ts';

export const kindSchema = frfKindSchema.default('accelerance');

export function registerHitRoutes({ routes, db, config }: Deps, events: CampaignEvents): void {
  const upload = recordingUpload(config.uploadLimitBytes);

  routes.add({
    method: 'post',
    path: '/campaigns/:campaignId/schedule/:entryId/hits',
    tag: 'Hits',
    access: 'engineer',
    summary:
      'Upload a recording (multipart field "file": CSV with optional time column, WAV 16/24/32-bit PCM or 32/64-bit float, also extensible, or JSON { sampleRateHz, channels }) for a schedule entry. Columns/channels in channel-number order. Fields: units = volts | engineering (default volts), sampleRateHz (when the file has none), fullScaleVolts (PCM WAV), kind. Header Idempotency-Key required. Several hits in one file are split by the trigger',
    tokenAccess: true,
    before: [upload],
    status: 201,
    returns: '{ replayed, hits: [{ id, sequence, verdict, reasons, metrics }], skipped, entry: { status, acceptedHits }, frf, next }',
    response: hitsAnswerSchema,
    handler: async ({ req, res, params, campaign: access, user: me }) => {
      const campaignId = access.campaignId;
      const entry = await loadScheduleEntry(db, campaignId, params.entryId!);
      const { fields, key, file } = readUploadForm(req, z.strictObject({ ...uploadFields, kind: kindSchema }));
      const settings = await currentSettings(db, campaignId);
      const map = await channelMapFor(db, campaignId, entry);
      await refuseUncalibrated(db, campaignId, map);
      const { channels, resampled } = uploadAtCampaignRate(file, map, fields, settings.settings);
      const { kind, idempotencyKey: _key, ...storing } = fields;
      // The file as made is kept before its hits are stored, so no hit exists without it.
      const originalId = resampled ? await keepOriginal(db, { campaignId, key, file, note: resampled, userId: me.id }) : null;
      const taken = await intake(db, { campaignId, entry, fileChannels: channels, fs: settings.settings.sampleRateHz, source: resampledSource(file.originalname, resampled), key, requestSha256: requestSha256('hits:upload', storing, file.buffer), userId: me.id, map, settings });
      if (taken.replayed) res.locals.status = 200;
      const answered = await answerHitChange(db, events, { campaignId, entry, ...taken, settings, kind, type: 'hit' });
      return resampled ? { ...answered, resampled: { ...resampled, originalRecordingId: originalId }, frf: answered.frf && { ...answered.frf, resampledFromHz: resampled.fromHz } } : answered;
    },
  });

  routes.add({
    method: 'post',
    path: '/campaigns/:campaignId/schedule/:entryId/simulate',
    tag: 'Hits',
    access: 'engineer',
    summary: 'Take hits from the simulated rig (a structure model of the campaign) at this entry; they go through the same checks as real hits',
    body: z.strictObject({
      count: z.number().int().min(1).max(20).default(1),
      tip: z.enum(rigTipHardnesses).optional(),
      /** A tip registered for the hammer (Kit): recorded with the hits; the rig plays it as rigHardnessOf(name) unless tip says otherwise. */
      tipName: z.string().trim().min(1).max(60).optional(),
      peakForceN: z.number().positive().max(1e5).optional(),
      seed: z.number().int().min(0).max(2 ** 31).optional(),
      doubleHitProbability: z.number().min(0).max(1).default(0.1),
      overloadProbability: z.number().min(0).max(1).default(0.03),
      idempotencyKey: idempotencyKeySchema.optional(),
      kind: kindSchema,
    }),
    status: 201,
    response: hitsAnswerSchema,
    handler: async ({ body, params, res, campaign: access, user: me }) => {
      const campaignId = access.campaignId;
      const entry = await loadScheduleEntry(db, campaignId, params.entryId!);
      const [c] = await db.select({ simulator: campaign.simulator }).from(campaign).where(eq(campaign.id, campaignId));
      const points = await db.select({ label: point.label, x: point.x, y: point.y, z: point.z }).from(point).where(eq(point.campaignId, campaignId));
      const settings = await currentSettings(db, campaignId);
      const map = await channelMapFor(db, campaignId, entry);
      await refuseUncalibrated(db, campaignId, map);
      const tip = await tipChoice(db, map.find((m) => m.role === 'force')!.kitItemId, body);
      const seed = body.seed ?? Math.floor(Math.random() * 2 ** 31);
      const fileChannels = rigRecording(rigModel(c!.simulator, points), entry, map, settings.settings, { ...body, tip: tip.hardness, seed });
      const { kind, idempotencyKey: _key, ...asked } = body;
      const key = body.idempotencyKey ?? randomUUID();
      const taken = await intake(db, { campaignId, entry, fileChannels, fs: settings.settings.sampleRateHz, source: `simulated-rig:${c!.simulator}:seed=${seed}:${tipSource(tip)}`, key, requestSha256: requestSha256('hits:simulate', asked), userId: me.id, map, settings });
      if (taken.replayed) res.locals.status = 200;
      return answerHitChange(db, events, { campaignId, entry, ...taken, settings, kind, type: 'hit' });
    },
  });

  routes.add({
    method: 'get',
    path: '/campaigns/:campaignId/schedule/:entryId/hits',
    tag: 'Hits',
    access: 'viewer',
    summary: 'The hits of a schedule entry, accepted and rejected, with verdicts, reasons and metrics (no samples)',
    response: entryHitsAnswerSchema,
    handler: async ({ params, campaign: access }) => {
      const entry = await loadScheduleEntry(db, access.campaignId, params.entryId!);
      const rows = await db.select().from(hit).where(eq(hit.scheduleEntryId, entry.id)).orderBy(asc(hit.sequence));
      const names = new Map((await db.select({ id: user.id, name: user.name }).from(user)).map((u) => [u.id, u.name]));
      // Hits set aside by a redo stay in the list with who, when and why (routes/redo.ts).
      const aside = new Map((await db.select().from(hitExclusion).where(eq(hitExclusion.scheduleEntryId, entry.id))).map((x) => [x.hitId, x]));
      const active = rows.filter((h) => !aside.has(h.id));
      const settings = await currentSettings(db, access.campaignId);
      const accepted = active.filter((h) => h.verdict === 'accept').length;
      const flagReasons = accepted >= entry.requiredHits ? flagReasonsOf(entry, accepted, await entryResult(db, access.campaignId, entry.id, settings), settings) : [];
      return {
        entry: { id: entry.id, responseDof: entry.responseDof, excitationDof: entry.excitationDof, status: entry.status, requiredHits: entry.requiredHits, version: entry.version, flagReasons },
        hits: rows.map((h) => {
          const x = aside.get(h.id);
          return { ...hitSummary(h, names), setAside: x ? { redoId: x.redoId, by: x.excludedBy ? (names.get(x.excludedBy) ?? null) : null, reason: x.reason, at: x.excludedAt } : null };
        }),
      };
    },
  });

  routes.add({
    method: 'get',
    path: '/campaigns/:campaignId/hits/:hitId',
    tag: 'Hits',
    access: 'viewer',
    summary: 'One hit: its verdict, the time traces (N, m/s²) with trigger and windows, and its force spectrum',
    query: z.strictObject({ maxPoints: z.coerce.number().int().min(100).max(100_000).default(4000) }),
    response: hitDetailSchema,
    handler: ({ params, query, campaign: access }) => hitDetail(db, access.campaignId, params.hitId!, query.maxPoints),
  });

  routes.add({
    method: 'post',
    path: '/campaigns/:campaignId/hits/:hitId/verdict',
    tag: 'Hits',
    access: 'engineer',
    summary: 'Override a hit’s verdict either way, with a note (audited). Send the version you read; a concurrent override answers 409',
    response: hitsAnswerSchema,
    body: z.strictObject({ verdict: z.enum(['accept', 'reject']), note: z.string().trim().min(3, 'say why in a few words').max(1000), version: z.number().int().positive(), kind: kindSchema }),
    handler: async ({ body, params, campaign: access, user: me }) => {
      const campaignId = access.campaignId;
      const updated = await overrideVerdict(db, { campaignId, hitId: params.hitId!, userId: me.id, verdict: body.verdict, note: body.note, version: body.version });
      const entry = await loadScheduleEntry(db, campaignId, updated.scheduleEntryId);
      const settings = await currentSettings(db, campaignId);
      return answerHitChange(db, events, { campaignId, entry, stored: [updated], replayed: false, skipped: [], settings, kind: body.kind, type: 'verdict' });
    },
  });
}
