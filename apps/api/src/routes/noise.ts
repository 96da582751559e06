// Background-noise checks (design: "PSD … background-noise check before testing"): a few seconds
// recorded with nobody touching the structure, uploaded or taken from the simulated rig, read per
// channel as a Welch PSD (packages/dsp backgroundNoise) and stored like a hit — raw samples,
// channel-map snapshot, who and when — so the noise floor of the day stays on record.
import { randomUUID } from 'node:crypto';
import { and, desc, eq, inArray, sql } from 'drizzle-orm';
import type { Response } from 'express';
import { z } from 'zod';
import { backgroundNoise } from '@resonote/dsp';
import { createRng } from '@resonote/sim';
import { idempotencyKeySchema, uuidSchema, type NoiseChannelReading } from '@resonote/contracts';
import { noiseCheck, scheduleEntry, uploadKey, user } from '@resonote/db/schema';
import type { Deps } from './deps.ts';
import { audit } from '../http/audit.ts';
import { badRequest, notFound } from '../errors.ts';
import { channelMapFor, storageOrder, uploadInEngineeringUnits, type ChannelSnapshot } from '../hits/channel-map.ts';
import { currentSettings, type CurrentSettings } from '../hits/current-settings.ts';
import { loadScheduleEntry } from '../hits/schedule-entry.ts';
import { packSamples, unpackSamples } from '../hits/samples-codec.ts';
import { rigNoise } from '../hits/simulated-rig.ts';
import { readUploadForm, recordingUpload, uploadFields } from '../hits/upload.ts';
import { earlierUse, isUniqueViolation, requestSha256 } from '../hits/upload-keys.ts';

/** Shortest and longest quiet recording taken, s: enough Welch segments for a steady floor; bounded storage. */
const MIN_S = 1;
const MAX_S = 60;
/** Force noise peaks above this fraction of the trigger level risk false triggers (Resonote's rule of thumb). */
const TRIGGER_MARGIN = 0.5;

type ChannelReading = NoiseChannelReading;

const fmt = (v: number) => (v === 0 ? '0' : Math.abs(v) >= 0.01 && Math.abs(v) < 1e4 ? v.toPrecision(3) : v.toExponential(2));

/** The reading of one channel in plain words, with the numbers behind it. */
function readChannel(c: ChannelSnapshot, x: ArrayLike<number>, fs: number, s: CurrentSettings['settings']): ChannelReading & { f: Float64Array; psd: Float64Array } {
  const band: [number, number] = [s.bandHz.low, s.bandHz.high];
  const r = backgroundNoise(x, fs, { bandHz: band });
  const cautions: string[] = [];
  let info: string;
  if (c.role === 'force') {
    const pct = (100 * r.peak) / s.triggerLevelN;
    info = `peak ${fmt(r.peak)} N, ${pct.toFixed(pct < 10 ? 1 : 0)} % of the ${s.triggerLevelN} N trigger level; ${fmt(r.rmsInBand)} N rms in ${band[0]}–${band[1]} Hz`;
    if (r.peak >= TRIGGER_MARGIN * s.triggerLevelN) cautions.push(`noise reaches ${pct.toFixed(0)} % of the trigger level and may start records by itself: raise the trigger level or check the hammer cable`);
  } else {
    const belowRange = 20 * Math.log10(s.responseRangeMs2 / Math.max(r.rmsInBand, 1e-300));
    info = `${fmt(r.rmsInBand)} m/s² rms in ${band[0]}–${band[1]} Hz (${belowRange.toFixed(0)} dB below the ${s.responseRangeMs2} m/s² range), peak ${fmt(r.peak)} m/s²`;
    if (r.peak >= s.responseRangeMs2) cautions.push(`the quiet recording already reaches the ${s.responseRangeMs2} m/s² range: check the sensor and its cable`);
  }
  for (const t of r.tones) cautions.push(`a tone at ${t.fHz.toFixed(1)} Hz stands ${t.aboveFloorDb.toFixed(0)} dB above the floor${t.testedHz % 50 === 0 || t.testedHz % 60 === 0 ? ' (mains hum?): check grounding and cable routing' : ''}; it will show in the FRFs near that frequency`);
  return {
    channel: c.channel,
    role: c.role,
    dof: c.dof,
    unit: c.unit,
    mean: r.mean,
    rms: r.rms,
    rmsInBand: r.rmsInBand,
    peak: r.peak,
    tones: r.tones,
    status: cautions.length ? 'caution' : 'ok',
    message: cautions.length ? `${info}. Caution: ${cautions.join('; ')}.` : `${info}. Quiet enough.`,
    f: r.f,
    psd: r.psd,
  };
}

/** A quiet recording to store: channels in channel-map order, engineering units. */
type QuietRecording = { campaignId: string; userId: string; key: string; requestSha256: string; source: string; map: ChannelSnapshot[]; settings: CurrentSettings; fileChannels: Float64Array[] };

export function registerNoiseRoutes({ routes, db, config }: Deps): void {
  /** The entry whose DOFs label the channels: the one asked for, else the next on the schedule, else none. */
  async function entryFor(campaignId: string, entryId: string | undefined) {
    if (entryId) return loadScheduleEntry(db, campaignId, entryId);
    const [next] = await db
      .select({ id: scheduleEntry.id })
      .from(scheduleEntry)
      .where(and(eq(scheduleEntry.campaignId, campaignId), inArray(scheduleEntry.status, ['in-progress', 'planned', 'flagged', 'done'])))
      .orderBy(sql`CASE ${scheduleEntry.status} WHEN 'in-progress' THEN 0 WHEN 'planned' THEN 1 ELSE 2 END`, scheduleEntry.position)
      .limit(1);
    if (next) return loadScheduleEntry(db, campaignId, next.id);
    return { responseDof: 'not on the schedule', excitationDof: 'not on the schedule' };
  }

  /**
   * Reads, stores (with its audit line, in one transaction) and answers a quiet recording: 201 with
   * the check and its spectra; a retry of the same request with the same key answers the stored
   * check with 200 (hits/upload-keys.ts).
   */
  async function record(res: Response, args: QuietRecording) {
    const stored = await store(args);
    if (stored.replayed) res.locals.status = 200;
    return { replayed: stored.replayed, check: await present(stored.row, stored.psd ?? true) };
  }

  async function store(args: QuietRecording): Promise<{ replayed: boolean; row: typeof noiseCheck.$inferSelect; psd?: { f: Float64Array; psd: Float64Array }[] }> {
    const { campaignId, settings, map } = args;
    const s = settings.settings;
    const binding = { campaignId, key: args.key, purpose: 'noise-check' as const, scheduleEntryId: null, requestSha256: args.requestSha256 };
    const replay = async () => {
      const earlier = await earlierUse(db, binding);
      if (!earlier?.noiseCheckId) return null;
      const [row] = await db.select().from(noiseCheck).where(and(eq(noiseCheck.campaignId, campaignId), eq(noiseCheck.id, earlier.noiseCheckId)));
      return row ?? null;
    };
    const earlier = await replay();
    if (earlier) return { replayed: true, row: earlier };
    const n = args.fileChannels[0]!.length;
    const seconds = n / s.sampleRateHz;
    if (seconds < MIN_S) throw badRequest(`The recording lasts ${seconds.toFixed(2)} s; record at least ${MIN_S} s of quiet. Nothing was stored.`);
    if (seconds > MAX_S) throw badRequest(`The recording lasts ${seconds.toFixed(1)} s; a background-noise check takes at most ${MAX_S} s. Nothing was stored.`);
    const order = storageOrder(map);
    const byChannel = new Map(map.map((c, i) => [c.channel, args.fileChannels[i]!]));
    // Read from the float32 values that are stored, so a later GET shows the same numbers.
    const channels = order.map((c) => Float32Array.from(byChannel.get(c.channel)!));
    const readings = order.map((c, i) => readChannel(c, channels[i]!, s.sampleRateHz, s));
    const results = { bandHz: s.bandHz, durationS: seconds, channels: readings.map(({ f: _f, psd: _p, ...rest }) => rest) };
    try {
      const row = await db.transaction(async (tx) => {
        const [stored] = await tx
          .insert(noiseCheck)
          .values({
            campaignId,
            settingsVersion: settings.version,
            sampleRateHz: s.sampleRateHz,
            samplesPerChannel: n,
            channels: order,
            samples: packSamples(channels),
            source: args.source,
            idempotencyKey: args.key,
            results,
            recordedBy: args.userId,
          })
          .returning();
        await tx.insert(uploadKey).values({ ...binding, noiseCheckId: stored!.id });
        await audit(tx, { campaignId, actorId: args.userId, entity: 'noise-check', entityId: stored!.id, action: 'record', after: { source: args.source, durationS: seconds, channels: results.channels.map((c) => ({ channel: c.channel, dof: c.dof, rmsInBand: c.rmsInBand, status: c.status })) } });
        return stored!;
      });
      return { replayed: false, row, psd: readings.map(({ f, psd }) => ({ f, psd })) };
    } catch (err) {
      if (isUniqueViolation(err)) {
        const again = await replay();
        if (again) return { replayed: true, row: again };
      }
      throw err;
    }
  }

  /**
   * A stored check as the API shows it; with `spectra`, each channel's PSD in dB re 1 unit²/Hz up to
   * 1.25 × the band's upper edge — the ones just computed when given, else recomputed from the stored samples.
   */
  async function present(row: typeof noiseCheck.$inferSelect, spectra: boolean | { f: Float64Array; psd: Float64Array }[]) {
    const [who] = row.recordedBy ? await db.select({ name: user.name }).from(user).where(eq(user.id, row.recordedBy)) : [];
    const results = row.results as { bandHz: { low: number; high: number }; durationS: number; channels: ChannelReading[] };
    const base = {
      id: row.id,
      recordedAt: row.recordedAt,
      recordedBy: who?.name ?? null,
      source: row.source,
      sampleRateHz: row.sampleRateHz,
      durationS: results.durationS,
      settingsVersion: row.settingsVersion,
      bandHz: results.bandHz,
      status: results.channels.some((c) => c.status === 'caution') ? ('caution' as const) : ('ok' as const),
      channels: results.channels,
    };
    if (!spectra) return base;
    const snap = row.channels as ChannelSnapshot[];
    const computed =
      spectra === true
        ? unpackSamples(row.samples, snap.length, row.samplesPerChannel).map((x) => backgroundNoise(x, row.sampleRateHz, { bandHz: [results.bandHz.low, results.bandHz.high] }))
        : spectra;
    const fMax = Math.min(row.sampleRateHz / 2, 1.25 * results.bandHz.high);
    const psd = snap.map((c, i) => {
      const r = computed[i]!;
      const f: number[] = [];
      const levelDb: number[] = [];
      for (let k = 0; k < r.f.length && r.f[k]! <= fMax; k++) {
        f.push(r.f[k]!);
        levelDb.push(10 * Math.log10(Math.max(r.psd[k]!, 1e-30)));
      }
      return { channel: c.channel, unit: `dB re 1 ${c.unit === 'N' ? 'N²' : '(m/s²)²'}/Hz`, f, levelDb };
    });
    return { ...base, spectra: psd };
  }

  const upload = recordingUpload(config.uploadLimitBytes);
  const returns = '{ replayed, check: { id, recordedAt, recordedBy, source, durationS, bandHz, status, channels: [{ channel, role, dof, unit, rmsInBand, peak, tones, status, message }], spectra } }';

  routes.add({
    method: 'post',
    path: '/campaigns/:campaignId/noise-checks',
    tag: 'Noise checks',
    access: 'engineer',
    summary:
      'Upload a background-noise recording (nobody touching the structure; 1–60 s; multipart field "file" as for hits: CSV, WAV or JSON, one column per channel of the map). Fields: units, sampleRateHz, fullScaleVolts, entryId (whose DOFs label the channels; default the next entry). Header Idempotency-Key required',
    before: [upload],
    status: 201,
    returns,
    handler: async ({ req, res, campaign: access, user: me }) => {
      const { fields, key, file } = readUploadForm(req, z.strictObject({ ...uploadFields, entryId: uuidSchema.optional() }));
      const settings = await currentSettings(db, access.campaignId);
      const map = await channelMapFor(db, access.campaignId, await entryFor(access.campaignId, fields.entryId));
      const fileChannels = uploadInEngineeringUnits(file, map, fields, settings.settings.sampleRateHz, settings.settings);
      const { idempotencyKey: _key, ...storing } = fields;
      const hash = requestSha256('noise-check:upload', storing, file.buffer);
      return record(res, { campaignId: access.campaignId, userId: me.id, key, requestSha256: hash, source: `upload:${file.originalname.slice(0, 100)}`, map, settings, fileChannels });
    },
  });

  routes.add({
    method: 'post',
    path: '/campaigns/:campaignId/noise-checks/simulate',
    tag: 'Noise checks',
    access: 'engineer',
    summary: "Take a background-noise recording from the simulated rig: the rig's sensor noise on every channel, optionally with mains hum on the accelerometers",
    body: z.strictObject({
      durationS: z.number().min(MIN_S).max(MAX_S).default(10),
      humHz: z.union([z.literal(0), z.literal(50), z.literal(60)]).default(0),
      humMs2: z.number().min(0).max(10).default(0.01),
      seed: z.number().int().min(0).max(2 ** 31).optional(),
      entryId: uuidSchema.optional(),
      idempotencyKey: idempotencyKeySchema.optional(),
    }),
    status: 201,
    returns,
    handler: async ({ body, res, campaign: access, user: me }) => {
      const settings = await currentSettings(db, access.campaignId);
      const fs = settings.settings.sampleRateHz;
      const map = await channelMapFor(db, access.campaignId, await entryFor(access.campaignId, body.entryId));
      const seed = body.seed ?? Math.floor(Math.random() * 2 ** 31);
      const rng = createRng(seed);
      const n = Math.round(body.durationS * fs);
      const fileChannels = map.map((c) => {
        const x = new Float64Array(n);
        const sigma = c.role === 'force' ? rigNoise.forceN : rigNoise.responseMs2;
        const phase = 2 * Math.PI * rng.uniform();
        for (let i = 0; i < n; i++) {
          x[i] = sigma * rng.gaussian();
          if (body.humHz && c.role === 'response') x[i]! += body.humMs2 * Math.sin((2 * Math.PI * body.humHz * i) / fs + phase);
        }
        return x;
      });
      const key = body.idempotencyKey ?? randomUUID();
      const source = `simulated-rig:seed=${seed}${body.humHz ? `:hum=${body.humHz}Hz` : ''}`;
      const { idempotencyKey: _key, ...asked } = body;
      return record(res, { campaignId: access.campaignId, userId: me.id, key, requestSha256: requestSha256('noise-check:simulate', asked), source, map, settings, fileChannels });
    },
  });

  routes.add({
    method: 'get',
    path: '/campaigns/:campaignId/noise-checks',
    tag: 'Noise checks',
    access: 'viewer',
    summary: 'The background-noise checks of the campaign, newest first (readings, no spectra)',
    query: z.strictObject({ limit: z.coerce.number().int().min(1).max(200).default(20) }),
    handler: async ({ query, campaign: access }) => {
      const rows = await db.select().from(noiseCheck).where(eq(noiseCheck.campaignId, access.campaignId)).orderBy(desc(noiseCheck.recordedAt)).limit(query.limit);
      return { checks: await Promise.all(rows.map((r) => present(r, false))) };
    },
  });

  routes.add({
    method: 'get',
    path: '/campaigns/:campaignId/noise-checks/:checkId',
    tag: 'Noise checks',
    access: 'viewer',
    summary: "One background-noise check with each channel's PSD (dB re 1 unit²/Hz, Welch, Hann, 50 % overlap)",
    handler: async ({ params, campaign: access }) => {
      if (!uuidSchema.safeParse(params.checkId).success) throw notFound('That noise check');
      const [row] = await db.select().from(noiseCheck).where(and(eq(noiseCheck.id, params.checkId!), eq(noiseCheck.campaignId, access.campaignId)));
      if (!row) throw notFound('That noise check');
      return { check: await present(row, true) };
    },
  });
}
