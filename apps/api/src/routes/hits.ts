// The test day on the server (issue 5): hits come in for a schedule entry (upload or simulated
// rig), each gets a verdict with reasons, accepted hits are averaged into FRFs, the schedule
// advances, and everyone on the campaign hears about it.
import { randomUUID } from 'node:crypto';
import { and, asc, eq, inArray, sql } from 'drizzle-orm';
import { z } from 'zod';
import { averageFrf, forceWindow, removeOffsets, transientSpectrum, type HitCheck } from '@resonote/dsp';
import { createRng, hitSeries } from '@resonote/sim';
import { AXIS_CONVENTION, idempotencyKeySchema, uuidSchema } from '@resonote/contracts';
import { campaign, hit, point, scheduleEntry, uploadKey, user } from '@resonote/db/schema';
import type { Deps } from './deps.ts';
import { audit } from '../http/audit.ts';
import { staleWrite } from '../http/concurrency.ts';
import { badRequest, HttpError, notFound } from '../errors.ts';
import { channelMapFor, storageOrder, type ChannelSnapshot } from '../hits/channel-map.ts';
import { compareFrfs, entryLinearity, isReciprocal, onPositiveAxis } from '../hits/checks.ts';
import { CampaignEvents } from '../hits/events.ts';
import { frfJson, frfUnits, type FrfKind } from '../hits/frf-json.ts';
import { exponentialWindowOf, forceWindowOf } from '../hits/settings-to-dsp.ts';
import {
  currentSettings,
  entriesWithAcceptedHits,
  entryResult,
  judge,
  loadScheduleEntry,
  responsePoint,
  excitationPoint,
  mainChannel,
  packSamples,
  recordSamples,
  rememberSamples,
  splitByTrigger,
  statusFrom,
  unpackSamples,
  type CurrentSettings,
} from '../hits/processing.ts';
import { rigModel, rigNoise, rigTips } from '../hits/simulated-rig.ts';
import { readUploadForm, recordingUpload, uploadFields } from '../hits/upload.ts';
import { keepOriginal, resampledSource, uploadAtCampaignRate } from '../hits/resample-upload.ts';
import { earlierUse, isUniqueViolation, requestSha256 } from '../hits/upload-keys.ts';
import { notExcluded } from '../hits/exclusion.ts';
import { flagReasonsOf } from '../hits/entry-flags.ts';
import { hitExclusion } from '@resonote/db/schema';

const kindSchema = z.enum(['receptance', 'mobility', 'accelerance']).default('accelerance');

function metricsOf(check: HitCheck) {
  return {
    peakForceN: check.peakForceN,
    pulseWidthS: check.pulseWidthS,
    impulseNs: check.impulseNs,
    rollOff10dBHz: check.rollOff10dBHz,
    rollOff20dBHz: check.rollOff20dBHz,
    secondPeakRatio: check.secondPeakRatio,
    secondPeakDelayS: check.secondPeakDelayS,
    forceClippedSamples: check.forceClippedSamples,
    noiseRmsN: check.noiseRmsN,
    peakTimeS: check.peakTimeS,
    responsePeaks: check.responses.map((r) => r.peak),
    responseTailRatios: check.responses.map((r) => r.tailRatio),
  };
}

export function registerHitRoutes({ routes, db, config }: Deps, events: CampaignEvents): void {
  const loadEntry = (campaignId: string, entryId: string) => loadScheduleEntry(db, campaignId, entryId);
  type Entry = Awaited<ReturnType<typeof loadEntry>>;

  /** Recomputes the entry's result and status after its hits changed; tells the campaign. */
  async function afterHitsChanged(campaignId: string, entry: Entry, settings: CurrentSettings, type: 'hit' | 'verdict') {
    const result = await entryResult(db, campaignId, entry.id, settings);
    const [counts] = await db
      .select({ total: sql<number>`count(*)::int`, accepted: sql<number>`count(*) FILTER (WHERE ${hit.verdict} = 'accept')::int` })
      .from(hit)
      .where(and(eq(hit.scheduleEntryId, entry.id), notExcluded));
    const main = result ? result.channels[mainChannel(result.channels, entry.responseDof)] : undefined;
    const [fresh] = await db.select().from(scheduleEntry).where(eq(scheduleEntry.id, entry.id));
    const status = statusFrom({
      hitCount: counts?.total ?? 0,
      accepted: result?.averages ?? 0,
      requiredHits: fresh!.requiredHits,
      meanCoherence: main?.meanCoherence ?? null,
      threshold: settings.settings.coherenceThreshold,
      current: fresh!.status,
    });
    if (status !== fresh!.status) {
      await db.update(scheduleEntry).set({ status: status as typeof fresh.status, version: fresh!.version + 1, updatedAt: new Date() }).where(eq(scheduleEntry.id, entry.id));
    }
    events.publish(campaignId, { type, entryId: entry.id });
    return { result, status, accepted: counts?.accepted ?? 0, total: counts?.total ?? 0 };
  }

  async function nextEntry(campaignId: string) {
    const [row] = await db
      .select({ id: scheduleEntry.id, status: scheduleEntry.status })
      .from(scheduleEntry)
      .where(and(eq(scheduleEntry.campaignId, campaignId), inArray(scheduleEntry.status, ['in-progress', 'planned'])))
      .orderBy(sql`CASE WHEN ${scheduleEntry.status} = 'in-progress' THEN 0 ELSE 1 END`, asc(scheduleEntry.position))
      .limit(1);
    return row?.id ?? null;
  }

  /**
   * Stores the triggered records of one recording (channels in channel-map order, engineering
   * units) as hits with their verdicts and the key's binding (hits/upload-keys.ts), all in one
   * transaction; a retry of the same request with the same key returns the hits stored the first time.
   */
  async function intake(args: { campaignId: string; entry: Entry; fileChannels: Float64Array[]; fs: number; source: string; key: string; requestSha256: string; userId: string; map: ChannelSnapshot[]; settings: CurrentSettings; kind: FrfKind }) {
    const { campaignId, entry, settings, map } = args;
    const s = settings.settings;
    const binding = { campaignId, key: args.key, purpose: 'hits' as const, scheduleEntryId: entry.id, requestSha256: args.requestSha256 };
    const replay = async () => {
      const earlier = await earlierUse(db, binding);
      if (!earlier) return null;
      const rows = earlier.hitIds.length ? await db.select().from(hit).where(and(eq(hit.campaignId, campaignId), inArray(hit.id, earlier.hitIds))).orderBy(asc(hit.sequence)) : [];
      return rows;
    };
    const earlier = await replay();
    if (earlier) return { replayed: true, stored: earlier, skipped: [] as { timeS: number; reason: string }[] };

    // File order is channel-number order; storage order is force first, then the responses.
    const order = storageOrder(map);
    const byChannel = new Map(map.map((c, i) => [c.channel, args.fileChannels[i]!]));
    const channels = order.map((c) => byChannel.get(c.channel)!);
    const split = splitByTrigger(channels, args.fs, s);
    if (split.records.length === 0) {
      const why = split.skipped.length ? split.skipped.map((x) => x.reason).join('; ') : `the force never reached the trigger level of ${s.triggerLevelN} N`;
      throw new HttpError(422, 'no-hit', `No complete hit in the recording: ${why}. Nothing was stored.`);
    }
    const n = recordSamples(s);
    const judged = split.records.map((r) => ({ record: r, check: judge(r.channels, args.fs, s) }));
    try {
      const stored = await db.transaction(async (tx) => {
        await tx.select({ id: scheduleEntry.id }).from(scheduleEntry).where(eq(scheduleEntry.id, entry.id)).for('update');
        const [last] = await tx.select({ seq: sql<number>`coalesce(max(${hit.sequence}), 0)::int` }).from(hit).where(eq(hit.scheduleEntryId, entry.id));
        let seq = last?.seq ?? 0;
        const rows = await tx
          .insert(hit)
          .values(
            judged.map((j, i) => ({
              campaignId,
              scheduleEntryId: entry.id,
              sequence: ++seq,
              settingsVersion: settings.version,
              sampleRateHz: args.fs,
              samplesPerChannel: n,
              channels: order,
              samples: packSamples(j.record.channels),
              source: args.source,
              idempotencyKey: judged.length === 1 ? args.key : `${args.key}#${i + 1}`,
              autoVerdict: j.check.verdict,
              verdict: j.check.verdict,
              reasons: j.check.reasons,
              metrics: metricsOf(j.check),
              recordedBy: args.userId,
            })),
          )
          .returning();
        await tx.insert(uploadKey).values({ ...binding, hitIds: rows.map((r) => r.id) });
        for (const r of rows) {
          await audit(tx, { campaignId, actorId: args.userId, entity: 'hit', entityId: r.id, action: 'record', after: { entry: `${entry.responseDof} / ${entry.excitationDof}`, sequence: r.sequence, verdict: r.verdict, reasons: r.reasons, source: r.source, settingsVersion: r.settingsVersion } });
        }
        return rows;
      });
      stored.forEach((row, i) => rememberSamples(db, row.id, judged[i]!.record.channels));
      return { replayed: false, stored, skipped: split.skipped };
    } catch (err) {
      // A simultaneous request with the same key won the race: answer as its retry (or refuse).
      if (isUniqueViolation(err)) {
        const again = await replay();
        if (again) return { replayed: true, stored: again, skipped: [] };
      }
      throw err;
    }
  }

  function hitSummary(h: typeof hit.$inferSelect, names?: Map<string, string>) {
    return {
      id: h.id,
      sequence: h.sequence,
      verdict: h.verdict,
      autoVerdict: h.autoVerdict,
      overridden: h.verdict !== h.autoVerdict,
      reasons: h.reasons,
      metrics: h.metrics,
      overrideNote: h.overrideNote,
      source: h.source,
      settingsVersion: h.settingsVersion,
      recordedBy: h.recordedBy ? (names?.get(h.recordedBy) ?? null) : null,
      recordedAt: h.recordedAt,
      version: h.version,
    };
  }

  async function answer(campaignId: string, entry: Entry, stored: (typeof hit.$inferSelect)[], replayed: boolean, skipped: { timeS: number; reason: string }[], settings: CurrentSettings, kind: FrfKind, type: 'hit' | 'verdict') {
    const after = await afterHitsChanged(campaignId, entry, settings, type);
    return {
      replayed,
      hits: stored.map((h) => hitSummary(h)),
      skipped,
      entry: { id: entry.id, status: after.status, acceptedHits: after.accepted, totalHits: after.total, flagReasons: flagReasonsOf({ ...entry, status: after.status }, after.accepted, after.result, settings) },
      // The channel that measures this entry's own DOF; GET …/frf has every channel.
      frf: after.result ? frfJson(after.result, kind, settings.settings.bandHz, mainChannel(after.result.channels, entry.responseDof)) : null,
      next: await nextEntry(campaignId),
    };
  }

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
    handler: async ({ req, res, params, campaign: access, user: me }) => {
      const entry = await loadEntry(access.campaignId, params.entryId!);
      const { fields, key, file } = readUploadForm(req, z.strictObject({ ...uploadFields, kind: kindSchema }));
      const settings = await currentSettings(db, access.campaignId);
      const s = settings.settings;
      const map = await channelMapFor(db, access.campaignId, entry);
      const { channels: eu, resampled } = uploadAtCampaignRate(file, map, fields, s);
      const { kind: _kind, idempotencyKey: _key, ...storing } = fields;
      const hash = requestSha256('hits:upload', storing, file.buffer);
      // The file as made is kept before its hits are stored, so no hit exists without it.
      const originalId = resampled ? await keepOriginal(db, { campaignId: access.campaignId, key, file, note: resampled, userId: me.id }) : null;
      const { replayed, stored, skipped } = await intake({ campaignId: access.campaignId, entry, fileChannels: eu, fs: s.sampleRateHz, source: resampledSource(file.originalname, resampled), key, requestSha256: hash, userId: me.id, map, settings, kind: fields.kind });
      if (replayed) res.locals.status = 200;
      const answered = await answer(access.campaignId, entry, stored, replayed, skipped, settings, fields.kind, 'hit');
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
      tip: z.enum(['soft', 'medium', 'hard']).default('medium'),
      peakForceN: z.number().positive().max(1e5).optional(),
      seed: z.number().int().min(0).max(2 ** 31).optional(),
      doubleHitProbability: z.number().min(0).max(1).default(0.1),
      overloadProbability: z.number().min(0).max(1).default(0.03),
      idempotencyKey: idempotencyKeySchema.optional(),
      kind: kindSchema,
    }),
    status: 201,
    handler: async ({ body, params, res, campaign: access, user: me }) => {
      const entry = await loadEntry(access.campaignId, params.entryId!);
      const [c] = await db.select({ simulator: campaign.simulator }).from(campaign).where(eq(campaign.id, access.campaignId));
      const points = await db.select({ label: point.label, x: point.x, y: point.y, z: point.z }).from(point).where(eq(point.campaignId, access.campaignId));
      const settings = await currentSettings(db, access.campaignId);
      const s = settings.settings;
      const map = await channelMapFor(db, access.campaignId, entry);
      const responses = map.filter((m) => m.role === 'response');
      const model = rigModel(c!.simulator, points);
      const n = recordSamples(s);
      const seed = body.seed ?? Math.floor(Math.random() * 2 ** 31);
      let hits;
      try {
        hits = hitSeries(
          model,
          {
            excitationDof: entry.excitationDof,
            responseDofs: responses.map((r) => r.dof),
            fs: s.sampleRateHz,
            samples: n,
            preTriggerS: s.preTriggerS + 0.5 / s.sampleRateHz,
            peakForceN: body.peakForceN ?? Math.min(0.02 * s.forceRangeN, 100),
            pulseWidthS: rigTips[body.tip],
            forceNoiseN: rigNoise.forceN,
            responseNoise: rigNoise.responseMs2,
            forceRangeN: s.forceRangeN,
            responseRangeMs2: s.responseRangeMs2,
            adcBits: 24,
          },
          body.count,
          createRng(seed),
          { doubleHitProbability: body.doubleHitProbability, overloadProbability: body.overloadProbability },
        );
      } catch (err) {
        if (err instanceof RangeError) throw badRequest(`The simulated rig cannot strike here: ${err.message}`);
        throw err;
      }
      // One continuous recording: records back to back, as a front end would stream them.
      const fileChannels = map.map((m) => {
        const out = new Float64Array(n * hits.length);
        hits.forEach((h, i) => {
          const src = m.role === 'force' ? h.force : h.responses[responses.findIndex((r) => r.channel === m.channel)]!;
          out.set(src, i * n);
        });
        return out;
      });
      const key = body.idempotencyKey ?? randomUUID();
      const { kind: _kind, idempotencyKey: _key, ...asked } = body;
      const hash = requestSha256('hits:simulate', asked);
      const { replayed, stored, skipped } = await intake({ campaignId: access.campaignId, entry, fileChannels, fs: s.sampleRateHz, source: `simulated-rig:${c!.simulator}:seed=${seed}:tip=${body.tip}`, key, requestSha256: hash, userId: me.id, map, settings, kind: body.kind });
      if (replayed) res.locals.status = 200;
      return answer(access.campaignId, entry, stored, replayed, skipped, settings, body.kind, 'hit');
    },
  });

  routes.add({
    method: 'get',
    path: '/campaigns/:campaignId/schedule/:entryId/hits',
    tag: 'Hits',
    access: 'viewer',
    summary: 'The hits of a schedule entry, accepted and rejected, with verdicts, reasons and metrics (no samples)',
    handler: async ({ params, campaign: access }) => {
      const entry = await loadEntry(access.campaignId, params.entryId!);
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
    handler: async ({ params, query, campaign: access }) => {
      if (!uuidSchema.safeParse(params.hitId).success) throw notFound('That hit');
      const [h] = await db.select().from(hit).where(and(eq(hit.id, params.hitId!), eq(hit.campaignId, access.campaignId)));
      if (!h) throw notFound('That hit');
      const settings = await currentSettings(db, access.campaignId);
      const s = settings.settings;
      const channels = h.channels as ChannelSnapshot[];
      const raw = unpackSamples(h.samples, channels.length, h.samplesPerChannel);
      const pre = Math.round(s.preTriggerS * h.sampleRateHz);
      const centred = removeOffsets(raw, pre);
      const step = Math.max(1, Math.ceil(h.samplesPerChannel / query.maxPoints));
      const t: number[] = [];
      for (let i = 0; i < h.samplesPerChannel; i += step) t.push(i / h.sampleRateHz);
      // The force as the FRF sees it: offset removed and the force window applied (docs/methods.md
      // #force-window), so noise over the rest of the record does not swamp |F(0)|.
      const fw = forceWindow(h.samplesPerChannel, h.sampleRateHz, forceWindowOf(s));
      const windowed = centred[0]!.map((v, i) => v * fw[i]!);
      const spectrum = transientSpectrum(windowed, h.sampleRateHz);
      const f: number[] = [];
      const esdDb: number[] = [];
      const dc = spectrum.re[0]! ** 2 + spectrum.im[0]! ** 2 || 1e-300;
      const fMax = Math.min(h.sampleRateHz / 2, s.bandHz.high * 2);
      for (let k = 0; k < spectrum.f.length && spectrum.f[k]! <= fMax; k++) {
        f.push(spectrum.f[k]!);
        esdDb.push(10 * Math.log10(Math.max((spectrum.re[k]! ** 2 + spectrum.im[k]! ** 2) / dc, 1e-30)));
      }
      const exp = exponentialWindowOf(s);
      return {
        hit: hitSummary(h),
        sampleRateHz: h.sampleRateHz,
        samples: h.samplesPerChannel,
        decimation: step,
        t,
        channels: channels.map((c, i) => ({ channel: c.channel, role: c.role, dof: c.dof, unit: c.unit, sign: c.sign, kitItem: `${c.model} SN ${c.serial}`, sensitivity: c.sensitivityBase, calibration: c.calibration, values: t.map((_, j) => raw[i]![j * step]!) })),
        triggerTimeS: s.preTriggerS,
        forceWindow: forceWindowOf(s),
        exponentialWindow: exp,
        forceSpectrum: { f, levelDb: esdDb, reference: '|F(f)|² relative to |F(0)|² (dB), force window applied', bandHz: s.bandHz, rollOffDb: s.rollOffDb },
      };
    },
  });

  routes.add({
    method: 'post',
    path: '/campaigns/:campaignId/hits/:hitId/verdict',
    tag: 'Hits',
    access: 'engineer',
    summary: 'Override a hit’s verdict either way, with a note (audited). Send the version you read; a concurrent override answers 409',
    body: z.strictObject({ verdict: z.enum(['accept', 'reject']), note: z.string().trim().min(3, 'say why in a few words').max(1000), version: z.number().int().positive(), kind: kindSchema }),
    handler: async ({ body, params, campaign: access, user: me }) => {
      if (!uuidSchema.safeParse(params.hitId).success) throw notFound('That hit');
      const updated = await db.transaction(async (tx) => {
        const [before] = await tx.select().from(hit).where(and(eq(hit.id, params.hitId!), eq(hit.campaignId, access.campaignId))).for('update');
        if (!before) throw notFound('That hit');
        const { samples: _s, ...beforeState } = before;
        if (before.version !== body.version) throw staleWrite('The hit', beforeState);
        const [after] = await tx
          .update(hit)
          .set({ verdict: body.verdict, overrideNote: body.note, overriddenBy: me.id, version: before.version + 1 })
          .where(eq(hit.id, before.id))
          .returning();
        await audit(tx, { campaignId: access.campaignId, actorId: me.id, entity: 'hit', entityId: before.id, action: 'override', before: { verdict: before.verdict, reasons: before.reasons }, after: { verdict: body.verdict, note: body.note } });
        return after!;
      });
      const entry = await loadEntry(access.campaignId, updated.scheduleEntryId);
      const settings = await currentSettings(db, access.campaignId);
      return answer(access.campaignId, entry, [updated], false, [], settings, body.kind, 'verdict');
    },
  });

  routes.add({
    method: 'get',
    path: '/campaigns/:campaignId/schedule/:entryId/frf',
    tag: 'Results',
    access: 'viewer',
    summary: 'Averaged FRFs of an entry (H1, H2 per response channel, coherence, force ESD) in the requested kind; only the band of interest unless band=all',
    query: z.strictObject({ kind: kindSchema, band: z.enum(['settings', 'all']).default('settings') }),
    returns: "{ status: 'ready', kind, unit, f, channels: [{ responseDof, h1: { re, im }, h2, coherence }], forceEsd, averages, inputHash }, or { status: 'no-accepted-hit', message } while the entry has no accepted hit (an ordinary state of the test day, not an error)",
    handler: async ({ params, query, campaign: access }) => {
      const entry = await loadEntry(access.campaignId, params.entryId!);
      const settings = await currentSettings(db, access.campaignId);
      const result = await entryResult(db, access.campaignId, entry.id, settings);
      const about = { id: entry.id, responseDof: entry.responseDof, excitationDof: entry.excitationDof, drivingPoint: entry.drivingPoint };
      if (!result) return { status: 'no-accepted-hit' as const, entry: about, message: `No accepted hit at ${entry.responseDof} / ${entry.excitationDof} yet.` };
      return { status: 'ready' as const, entry: about, ...frfJson(result, query.kind, query.band === 'all' ? null : settings.settings.bandHz) };
    },
  });

  routes.add({
    method: 'get',
    path: '/campaigns/:campaignId/progress',
    tag: 'Results',
    access: 'viewer',
    summary: 'Progress of the campaign: schedule counts by status, work by engineer, rejected hits by reason',
    handler: async ({ campaign: access }) => {
      const byStatus = await db.select({ status: scheduleEntry.status, n: sql<number>`count(*)::int` }).from(scheduleEntry).where(eq(scheduleEntry.campaignId, access.campaignId)).groupBy(scheduleEntry.status);
      const byEngineer = await db
        .select({
          userId: hit.recordedBy,
          name: user.name,
          hits: sql<number>`count(*)::int`,
          accepted: sql<number>`count(*) FILTER (WHERE ${hit.verdict} = 'accept')::int`,
          rejected: sql<number>`count(*) FILTER (WHERE ${hit.verdict} = 'reject')::int`,
          lastHitAt: sql<string>`max(${hit.recordedAt})`,
        })
        .from(hit)
        .leftJoin(user, eq(user.id, hit.recordedBy))
        .where(eq(hit.campaignId, access.campaignId))
        .groupBy(hit.recordedBy, user.name);
      const reasons = await db.execute<{ code: string; n: number }>(
        sql`SELECT r->>'code' AS code, count(*)::int AS n FROM ${hit}, jsonb_array_elements(${hit.reasons}) r WHERE ${hit.campaignId} = ${access.campaignId} AND ${hit.verdict} = 'reject' GROUP BY 1 ORDER BY 2 DESC`,
      );
      const counts: Record<string, number> = { planned: 0, 'in-progress': 0, done: 0, flagged: 0, skipped: 0 };
      for (const r of byStatus) counts[r.status] = r.n;
      return {
        byStatus: counts,
        total: Object.values(counts).reduce((a, b) => a + b, 0),
        byEngineer,
        rejectedByReason: Object.fromEntries(reasons.rows.map((r) => [r.code, Number(r.n)])),
        next: await nextEntry(access.campaignId),
      };
    },
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
    handler: async ({ campaign: access }) => {
      const settings = await currentSettings(db, access.campaignId);
      const s = settings.settings;
      const entries = await db
        .select({ id: scheduleEntry.id, r: responsePoint.label, rd: scheduleEntry.responseDirection, e: excitationPoint.label, ed: scheduleEntry.excitationDirection })
        .from(scheduleEntry)
        .innerJoin(responsePoint, eq(responsePoint.id, scheduleEntry.responsePointId))
        .innerJoin(excitationPoint, eq(excitationPoint.id, scheduleEntry.excitationPointId))
        .where(eq(scheduleEntry.campaignId, access.campaignId));
      const withResult = new Set(await entriesWithAcceptedHits(db, access.campaignId));
      const label = (e: (typeof entries)[number]) => ({ response: `${e.r}:${e.rd}`, excitation: `${e.e}:${e.ed}` });
      const reciprocity = [];
      for (const a of entries) {
        if (!withResult.has(a.id)) continue;
        // The reciprocal pair by physical axis, whatever the written signs (contracts/axis.ts).
        const b = entries.find((x) => isReciprocal({ responseDof: `${a.r}:${a.rd}`, excitationDof: `${a.e}:${a.ed}` }, { responseDof: `${x.r}:${x.rd}`, excitationDof: `${x.e}:${x.ed}` }) && x.id !== a.id);
        if (!b || !withResult.has(b.id) || a.id > b.id) continue;
        const ra = await entryResult(db, access.campaignId, a.id, settings);
        const rb = await entryResult(db, access.campaignId, b.id, settings);
        if (!ra || !rb || ra.samples !== rb.samples) continue;
        const ia = mainChannel(ra.channels, `${a.r}:${a.rd}`);
        const ib = mainChannel(rb.channels, `${b.r}:${b.rd}`);
        // Both FRFs on the positive axes before they are compared: H(i,−d) = −H(i,+d).
        reciprocity.push({ a: label(a), b: label(b), axisConvention: AXIS_CONVENTION, ...compareFrfs(onPositiveAxis(ra.frf.h1[ia]!, `${a.r}:${a.rd}`, `${a.e}:${a.ed}`), onPositiveAxis(rb.frf.h1[ib]!, `${b.r}:${b.rd}`, `${b.e}:${b.ed}`), ra.frf.f, s.bandHz) });
      }
      const linearity = [];
      for (const e of entries) {
        if (!withResult.has(e.id)) continue;
        const result = await entryLinearity(db, e.id, `${e.r}:${e.rd}`, s);
        if (result) linearity.push({ entry: label(e), ...result });
      }
      return {
        reciprocity,
        linearity,
        note: 'No normative pass/fail threshold exists for these checks (reciprocity and linearity checks as in Ewins 2000, Modal Testing, ch. 3); each lab sets its own. FRAC is blind to a constant factor, so read it together with the dB differences.',
      };
    },
  });

  routes.add({
    method: 'get',
    path: '/campaigns/:campaignId/frfs',
    tag: 'Results',
    access: 'viewer',
    summary: 'Averaged FRFs of several entries at once for overlays (up to 100), main channel only',
    query: z.strictObject({ entries: z.string().max(4000).optional(), kind: kindSchema, band: z.enum(['settings', 'all']).default('settings') }),
    handler: async ({ query, campaign: access }) => {
      const settings = await currentSettings(db, access.campaignId);
      const ids = query.entries
        ? query.entries.split(',').filter(Boolean)
        : await entriesWithAcceptedHits(db, access.campaignId);
      if (ids.length > 100) throw badRequest(`At most 100 FRFs at once; ${ids.length} were asked for.`);
      const out = [];
      for (const id of ids) {
        const entry = await loadEntry(access.campaignId, id);
        const result = await entryResult(db, access.campaignId, id, settings);
        if (!result) continue;
        const json = frfJson(result, query.kind, query.band === 'all' ? null : settings.settings.bandHz);
        const main = json.channels[mainChannel(result.channels, entry.responseDof)]!;
        out.push({ entryId: id, responseDof: entry.responseDof, excitationDof: entry.excitationDof, averages: json.averages, f: json.f, h1: main.h1, coherence: main.coherence, meanCoherence: main.meanCoherence });
      }
      return { kind: query.kind, unit: frfUnits[query.kind], frfs: out };
    },
  });
}

