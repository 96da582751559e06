// Intake of a recording for a schedule entry (upload or simulated rig): cut into records by the
// trigger, each record judged, all records stored as hits with their verdicts and the
// Idempotency-Key's binding in one transaction (hits/upload-keys.ts).
import { and, asc, eq, getTableColumns, inArray, sql } from 'drizzle-orm';
import { checkHit, splitRecords, type HitCheck } from '@resonote/dsp';
import type { AcquisitionSettings } from '@resonote/contracts';
import { hit, scheduleEntry, uploadKey } from '@resonote/db/schema';
import type { Db } from '@resonote/db/client';
import { audit } from '../http/audit.ts';
import { HttpError } from '../errors.ts';
import { storageOrder, type ChannelSnapshot } from './channel-map.ts';
import { preTriggerSamples, recordSamples, type CurrentSettings } from './current-settings.ts';
import { hitLimitsOf } from './settings-to-dsp.ts';
import { packSamples } from './samples-codec.ts';
import { rememberSamples } from './result-cache.ts';
import { earlierUse, isUniqueViolation } from './upload-keys.ts';
import type { ScheduleEntry } from './schedule-entry.ts';

/** A hit row without its samples: the hit path never reads back the 256 KB it has just written. */
export type HitRow = Omit<typeof hit.$inferSelect, 'samples'>;
const { samples: _samples, ...columns } = getTableColumns(hit);
/** Every column of `hit` but `samples`, for `select(hitColumns)` and `returning(hitColumns)`. */
export const hitColumns = columns;
export interface Skipped {
  timeS: number;
  reason: string;
}

/** Verdict of one record: channels in storage order (force first, N; then responses, m/s²). */
export function judge(channels: Float32Array[] | Float64Array[], fs: number, s: AcquisitionSettings): HitCheck {
  return checkHit(channels[0]!, channels.slice(1), fs, hitLimitsOf(s, fs));
}

/**
 * Cuts a continuous recording (storage order, engineering units) into triggered records of the
 * settings' length (dsp `splitRecords`, docs/methods.md#trigger); a hit that cannot be cut out
 * whole is reported in words, not stored.
 */
export function splitByTrigger(channels: Float64Array[], fs: number, s: AcquisitionSettings): { records: { startIndex: number; channels: Float32Array[] }[]; skipped: Skipped[] } {
  const split = splitRecords(channels, fs, { recordSamples: recordSamples(s), preTriggerSamples: preTriggerSamples(s, fs), level: s.triggerLevelN });
  return {
    records: split.records,
    skipped: split.skipped.map(({ timeS, kind }) => ({
      timeS,
      reason:
        kind === 'short-pre-trigger'
          ? `the hit at ${timeS.toFixed(3)} s starts before a full pre-trigger of ${(s.preTriggerS * 1000).toFixed(1)} ms could be recorded`
          : `the hit at ${timeS.toFixed(3)} s is cut short by the end of the file (a record needs ${s.recordLengthS.toFixed(3)} s)`,
    })),
  };
}

/** The figures of a check kept with the hit (`hit.metrics`). */
export function metricsOf(check: HitCheck) {
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

export interface IntakeRequest {
  campaignId: string;
  entry: ScheduleEntry;
  /** One stream per channel in channel-map (file) order, engineering units. */
  fileChannels: Float64Array[];
  fs: number;
  source: string;
  key: string;
  requestSha256: string;
  userId: string;
  map: ChannelSnapshot[];
  settings: CurrentSettings;
}

export interface Intake {
  replayed: boolean;
  stored: HitRow[];
  skipped: Skipped[];
}

/**
 * Stores the triggered records of one recording as hits with their verdicts and the key's binding,
 * all in one transaction; a retry of the same request with the same key returns the hits stored the
 * first time. 422 `no-hit` when no complete hit is in the recording (nothing is stored).
 */
export async function intake(db: Db, args: IntakeRequest): Promise<Intake> {
  const { campaignId, entry, settings, map } = args;
  const s = settings.settings;
  const binding = { campaignId, key: args.key, purpose: 'hits' as const, scheduleEntryId: entry.id, requestSha256: args.requestSha256 };
  const replay = async () => {
    const earlier = await earlierUse(db, binding);
    if (!earlier) return null;
    return earlier.hitIds.length ? await db.select(hitColumns).from(hit).where(and(eq(hit.campaignId, campaignId), inArray(hit.id, earlier.hitIds))).orderBy(asc(hit.sequence)) : [];
  };
  const earlier = await replay();
  if (earlier) return { replayed: true, stored: earlier, skipped: [] };

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
        .returning(hitColumns);
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
