// From raw samples to verdicts and averaged FRFs, with the campaign's current settings.
// Raw hits are never changed; everything here is recomputable from them and the settings.
import { createHash } from 'node:crypto';
import { aliasedTable, and, asc, desc, eq, inArray } from 'drizzle-orm';
import {
  FRF_ALGORITHM_VERSION,
  averageFrf,
  fftPathName,
  checkHit,
  defaultHitLimits,
  findTrigger,
  type AveragedFrf,
  type HitCheck,
  type HitLimits,
} from '@resonote/dsp';
import { acquisitionSettingsSchema, defaultAcquisitionSettings, uuidSchema, type AcquisitionSettings } from '@resonote/contracts';
import { acquisitionSettings, frfResult, hit, point, scheduleEntry } from '@resonote/db/schema';
import { notFound } from '../errors.ts';
import { dspExponentialWindowOf, frfWindowsOf } from './settings-to-dsp.ts';
import { isDatabaseUnavailable } from '../db-health.ts';
import type { Db } from '@resonote/db/client';
import type { ChannelSnapshot } from './channel-map.ts';
import { notExcluded } from './exclusion.ts';

/** A small least-recently-used map. */
class Lru<K, V> {
  private readonly map = new Map<K, V>();
  constructor(private readonly max: number) {}
  get(key: K): V | undefined {
    const v = this.map.get(key);
    if (v !== undefined) {
      this.map.delete(key);
      this.map.set(key, v);
    }
    return v;
  }
  set(key: K, value: V): void {
    this.map.delete(key);
    this.map.set(key, value);
    if (this.map.size > this.max) this.map.delete(this.map.keys().next().value as K);
  }
}

/**
 * Per database: the newest results and the samples of recent hits kept in memory, so the hot path
 * of a test day (hit in → updated average out, issue 5) needs neither re-reading raw samples nor
 * re-decoding stored spectra. Results are still written to frf_result (off the request path) and
 * every read checks the input hash, so nothing stale is ever served.
 */
interface Caches {
  results: Lru<string, EntryResult>;
  samples: Lru<string, Float32Array[]>;
  pending: Set<Promise<unknown>>;
  /** Result writes waiting for their DOF to go quiet, by entry id. */
  scheduled: Map<string, { timer: ReturnType<typeof setTimeout>; run: () => Promise<void> }>;
}

const RESULT_WRITE_DELAY_MS = 400;

function scheduleWrite(db: Db, cache: Caches, entryId: string, write: () => Promise<void>) {
  const earlier = cache.scheduled.get(entryId);
  if (earlier) clearTimeout(earlier.timer);
  const run = () => {
    cache.scheduled.delete(entryId);
    const p: Promise<unknown> = write()
      .catch((err: Error) =>
        // The result is recomputed from the hits on the next read, so a write lost to a database
        // outage costs nothing; the message never carries the query's parameters (raw spectra).
        isDatabaseUnavailable(err)
          ? console.log(`[resonote] the stored copy of entry ${entryId}'s result was not written (database unreachable); it is recomputed on the next read`)
          : console.error(`[resonote] storing the result of entry ${entryId} failed: ${((err as { cause?: Error }).cause ?? err).message}`),
      )
      .finally(() => cache.pending.delete(p));
    cache.pending.add(p);
    return p.then(() => undefined);
  };
  const timer = setTimeout(run, RESULT_WRITE_DELAY_MS);
  timer.unref?.();
  cache.scheduled.set(entryId, { timer, run });
  void db;
}
const cachesByDb = new WeakMap<object, Caches>();
function caches(db: Db): Caches {
  let c = cachesByDb.get(db);
  if (!c) {
    // 256 hits × 4 channels × 16 384 samples × 4 bytes ≈ 64 MB at most.
    c = { results: new Lru(64), samples: new Lru(256), pending: new Set(), scheduled: new Map() };
    cachesByDb.set(db, c);
  }
  return c;
}

/** Remembers the samples of a hit just stored (storage order, engineering units). */
export function rememberSamples(db: Db, hitId: string, channels: Float32Array[]): void {
  caches(db).samples.set(hitId, channels);
}

/** Waits for results still being written (shutdown, tests). */
export async function flushResultWrites(db: Db): Promise<void> {
  const c = caches(db);
  for (const { timer, run } of [...c.scheduled.values()]) {
    clearTimeout(timer);
    void run();
  }
  await Promise.all([...c.pending]);
}

export interface CurrentSettings {
  version: number;
  settings: AcquisitionSettings;
}

export async function currentSettings(db: Db, campaignId: string): Promise<CurrentSettings> {
  const [row] = await db
    .select({ version: acquisitionSettings.version, settings: acquisitionSettings.settings })
    .from(acquisitionSettings)
    .where(eq(acquisitionSettings.campaignId, campaignId))
    .orderBy(desc(acquisitionSettings.version))
    .limit(1);
  if (!row) return { version: 0, settings: defaultAcquisitionSettings };
  // Parsing fills fields added to the schema after the version was saved with their defaults.
  return { version: row.version, settings: acquisitionSettingsSchema.parse(row.settings) };
}

export function recordSamples(s: AcquisitionSettings): number {
  return Math.round(s.recordLengthS * s.sampleRateHz);
}

export function hitLimitsOf(s: AcquisitionSettings): HitLimits {
  return {
    ...defaultHitLimits,
    forceRangeN: s.forceRangeN,
    responseRange: s.responseRangeMs2,
    overloadFraction: s.overloadPercent / 100,
    doubleHitRatio: s.doubleHitRatio,
    minPeakN: s.minPeakN,
    bandHz: [s.bandHz.low, s.bandHz.high],
    rollOffDb: s.rollOffDb,
    exponentialWindow: dspExponentialWindowOf(s),
  };
}

/** Verdict of one record: channels in storage order (force first, N; then responses, m/s²). */
export function judge(channels: Float32Array[] | Float64Array[], fs: number, s: AcquisitionSettings): HitCheck {
  return checkHit(channels[0]!, channels.slice(1), fs, hitLimitsOf(s));
}

export interface SplitRecords {
  records: { startIndex: number; channels: Float32Array[] }[];
  skipped: { timeS: number; reason: string }[];
}

/**
 * Cuts a continuous recording (force first, engineering units) into triggered records of the
 * settings' length: trigger on |force − offset| ≥ level, keep the pre-trigger before it
 * (docs/methods.md#trigger). A hit too close to the start or cut short by the end of the file is
 * reported as skipped, not stored.
 */
export function splitByTrigger(channels: Float64Array[], fs: number, s: AcquisitionSettings): SplitRecords {
  const force = channels[0]!;
  const n = recordSamples(s);
  const pre = Math.round(s.preTriggerS * fs);
  // The offset for triggering comes from the first samples (before any hit); common practice.
  const head = Math.max(1, Math.min(pre || 64, force.length));
  let offset = 0;
  for (let i = 0; i < head; i++) offset += force[i]!;
  offset /= head;
  const centred = new Float64Array(force.length);
  for (let i = 0; i < force.length; i++) centred[i] = force[i]! - offset;
  const records: SplitRecords['records'] = [];
  const skipped: SplitRecords['skipped'] = [];
  // Already-triggered records, back to back (what a front end exports): every block of the
  // record length holds a hit after its pre-trigger. Take the blocks as they are.
  if (force.length % n === 0) {
    const blocks = force.length / n;
    const triggers = Array.from({ length: blocks }, (_, b) => findTrigger(centred.subarray(b * n, (b + 1) * n), fs, { level: s.triggerLevelN, preTriggerS: 0 }));
    if (triggers.every((t) => t !== null && t.index >= Math.floor(pre / 2))) {
      for (let b = 0; b < blocks; b++) records.push({ startIndex: b * n, channels: channels.map((c) => Float32Array.from(c.subarray(b * n, (b + 1) * n))) });
      return { records, skipped };
    }
  }
  let p = 0;
  while (p < force.length) {
    const trig = findTrigger(centred.subarray(p), fs, { level: s.triggerLevelN, preTriggerS: s.preTriggerS });
    if (!trig) break;
    const triggerIndex = p + trig.index;
    const start = triggerIndex - pre;
    if (start < p) {
      skipped.push({ timeS: triggerIndex / fs, reason: `the hit at ${(triggerIndex / fs).toFixed(3)} s starts before a full pre-trigger of ${(s.preTriggerS * 1000).toFixed(1)} ms could be recorded` });
      p = triggerIndex + n;
      continue;
    }
    if (start + n > force.length) {
      skipped.push({ timeS: triggerIndex / fs, reason: `the hit at ${(triggerIndex / fs).toFixed(3)} s is cut short by the end of the file (a record needs ${(s.recordLengthS).toFixed(3)} s)` });
      break;
    }
    records.push({ startIndex: start, channels: channels.map((c) => Float32Array.from(c.subarray(start, start + n))) });
    p = start + n;
  }
  return { records, skipped };
}

export function packSamples(channels: Float32Array[]): Buffer {
  const n = channels[0]!.length;
  const out = Buffer.alloc(channels.length * n * 4);
  channels.forEach((ch, c) => {
    for (let i = 0; i < n; i++) out.writeFloatLE(ch[i]!, (c * n + i) * 4);
  });
  return out;
}

export function unpackSamples(buf: Buffer, channelCount: number, n: number): Float32Array[] {
  const copy = new Uint8Array(buf.length);
  copy.set(buf);
  const all = new Float32Array(copy.buffer);
  if (all.length !== channelCount * n) throw new Error(`stored samples hold ${all.length} values, expected ${channelCount} × ${n}`);
  return Array.from({ length: channelCount }, (_, c) => all.subarray(c * n, (c + 1) * n));
}

export interface ResultChannel {
  dof: string;
  unit: string;
  sign: 1 | -1;
  /** Mean ordinary coherence over the band of interest. */
  meanCoherence: number;
}

export interface EntryResult {
  inputHash: string;
  settingsVersion: number;
  hitIds: string[];
  averages: number;
  sampleRateHz: number;
  samples: number;
  channels: ResultChannel[];
  excitationDof: string;
  frf: AveragedFrf;
  excluded: { hitId: string; reason: string }[];
  computedAt: Date;
}

const ARRAYS_PER_CHANNEL = 6; // h1 re/im, h2 re/im, coherence, gxx

function encode(frf: AveragedFrf): Buffer {
  const lines = frf.f.length;
  const channels = frf.h1.length;
  const all = new Float64Array(lines * (1 + ARRAYS_PER_CHANNEL * channels));
  all.set(frf.gff, 0);
  for (let c = 0; c < channels; c++) {
    const base = lines * (1 + ARRAYS_PER_CHANNEL * c);
    all.set(frf.h1[c]!.re, base);
    all.set(frf.h1[c]!.im, base + lines);
    all.set(frf.h2[c]!.re, base + 2 * lines);
    all.set(frf.h2[c]!.im, base + 3 * lines);
    all.set(frf.coherence[c]!, base + 4 * lines);
    all.set(frf.gxx[c]!, base + 5 * lines);
  }
  return Buffer.from(all.buffer);
}

function decode(buf: Buffer, channels: number, fs: number, samples: number, averages: number): AveragedFrf {
  const lines = Math.floor(samples / 2) + 1;
  const copy = new Uint8Array(buf.length);
  copy.set(buf);
  const all = new Float64Array(copy.buffer);
  const f = new Float64Array(lines);
  for (let k = 0; k < lines; k++) f[k] = (k * fs) / samples;
  const part = (c: number, j: number) => all.slice(lines * (1 + ARRAYS_PER_CHANNEL * c) + j * lines, lines * (1 + ARRAYS_PER_CHANNEL * c) + (j + 1) * lines);
  const idx = Array.from({ length: channels }, (_, c) => c);
  return {
    f,
    gff: all.slice(0, lines),
    h1: idx.map((c) => ({ re: part(c, 0), im: part(c, 1) })),
    h2: idx.map((c) => ({ re: part(c, 2), im: part(c, 3) })),
    coherence: idx.map((c) => part(c, 4)),
    gxx: idx.map((c) => part(c, 5)),
    gfx: [],
    averages,
  };
}

function meanOverBand(values: Float64Array, f: Float64Array, lo: number, hi: number): number {
  let sum = 0;
  let count = 0;
  for (let k = 0; k < f.length; k++) {
    if (f[k]! >= lo && f[k]! <= hi && f[k]! > 0) {
      sum += values[k]!;
      count++;
    }
  }
  return count ? sum / count : 0;
}

/**
 * The key of a stored result: the settings version, the accepted hits (id and version, in order)
 * the version of the averaging code and the FFT in use (float64 fft.js or the float32 WebAssembly
 * build, docs/decisions/fast-fft.md), so a result computed by other code is never served.
 */
export function entryInputHash(settingsVersion: number, hits: readonly { id: string; version: number }[]): string {
  return createHash('sha256')
    .update(JSON.stringify({ algorithm: FRF_ALGORITHM_VERSION, fft: fftPathName(), v: settingsVersion, hits: hits.map((h) => `${h.id}:${h.version}`) }))
    .digest('hex');
}

/**
 * The averaged spectra of a schedule entry from its accepted hits under the current settings.
 * Served from the stored result when its input hash matches; otherwise computed and stored.
 * Hits recorded at another sample rate or record length than the current settings are left out,
 * with the reason.
 */
export async function entryResult(db: Db, campaignId: string, entryId: string, current?: CurrentSettings): Promise<EntryResult | null> {
  const settings = current ?? (await currentSettings(db, campaignId));
  const s = settings.settings;
  const n = recordSamples(s);
  const accepted = await db
    .select({ id: hit.id, version: hit.version, sampleRateHz: hit.sampleRateHz, samplesPerChannel: hit.samplesPerChannel, channels: hit.channels })
    .from(hit)
    .where(and(eq(hit.scheduleEntryId, entryId), eq(hit.campaignId, campaignId), eq(hit.verdict, 'accept'), notExcluded))
    .orderBy(asc(hit.sequence));
  const excluded: EntryResult['excluded'] = [];
  const usable = accepted.filter((h) => {
    if (h.sampleRateHz !== s.sampleRateHz || h.samplesPerChannel !== n) {
      excluded.push({ hitId: h.id, reason: `recorded at ${h.sampleRateHz} Hz × ${h.samplesPerChannel} samples; the settings now ask for ${s.sampleRateHz} Hz × ${n}` });
      return false;
    }
    return true;
  });
  const first = usable[0]?.channels as ChannelSnapshot[] | undefined;
  const sameLayout = usable.filter((h) => {
    const ch = h.channels as ChannelSnapshot[];
    const ok = ch.length === first!.length && ch.every((c, i) => c.dof === first![i]!.dof);
    if (!ok) excluded.push({ hitId: h.id, reason: 'recorded with a different channel map than the first accepted hit' });
    return ok;
  });
  if (sameLayout.length === 0) return null;
  const hash = entryInputHash(settings.version, sameLayout);
  const layout = first!;
  const responseChannels = layout.filter((c) => c.role === 'response');
  const excitationDof = layout[0]!.dof;

  const cache = caches(db);
  const remembered = cache.results.get(entryId);
  if (remembered && remembered.inputHash === hash) return { ...remembered, excluded };

  const [stored] = await db.select().from(frfResult).where(eq(frfResult.scheduleEntryId, entryId));
  if (stored && stored.inputHash === hash) {
    const fromDb: EntryResult = {
      inputHash: hash,
      settingsVersion: stored.settingsVersion,
      hitIds: stored.hitIds,
      averages: stored.averages,
      sampleRateHz: stored.sampleRateHz,
      samples: stored.samples,
      channels: stored.channels as ResultChannel[],
      excitationDof,
      frf: decode(stored.data, responseChannels.length, stored.sampleRateHz, stored.samples, stored.averages),
      excluded,
      computedAt: stored.computedAt,
    };
    cache.results.set(entryId, fromDb);
    return fromDb;
  }

  const missing = sameLayout.filter((h) => !cache.samples.get(h.id)).map((h) => h.id);
  if (missing.length) {
    const rows = await db.select({ id: hit.id, samples: hit.samples }).from(hit).where(inArray(hit.id, missing));
    for (const r of rows) cache.samples.set(r.id, unpackSamples(r.samples, layout.length, n));
  }
  const pre = Math.round(s.preTriggerS * s.sampleRateHz);
  const records = sameLayout.map((h) => {
    const chans = cache.samples.get(h.id)!;
    return { force: chans[0]!, responses: chans.slice(1) };
  });
  const frf = averageFrf(records, s.sampleRateHz, {
    ...frfWindowsOf(s),
    offsets: { preTriggerSamples: pre },
  });
  const channels: ResultChannel[] = responseChannels.map((c, i) => ({ dof: c.dof, unit: c.unit, sign: c.sign, meanCoherence: meanOverBand(frf.coherence[i]!, frf.f, s.bandHz.low, s.bandHz.high) }));
  const computedAt = new Date();
  const values = {
    campaignId,
    scheduleEntryId: entryId,
    inputHash: hash,
    settingsVersion: settings.version,
    hitIds: sameLayout.map((h) => h.id),
    averages: frf.averages,
    sampleRateHz: s.sampleRateHz,
    samples: n,
    channels,
    data: encode(frf),
    computedAt,
  };
  const result: EntryResult = { inputHash: hash, settingsVersion: settings.version, hitIds: values.hitIds, averages: frf.averages, sampleRateHz: s.sampleRateHz, samples: n, channels, excitationDof, frf, excluded, computedAt };
  cache.results.set(entryId, result);
  // The stored copy serves other processes and restarts; writing it is not on the request path,
  // and a burst of hits at one DOF writes only its last result (after RESULT_WRITE_DELAY_MS).
  scheduleWrite(db, cache, entryId, () =>
    db
      .insert(frfResult)
      .values(values)
      .onConflictDoUpdate({ target: frfResult.scheduleEntryId, set: values })
      .then(() => undefined),
  );
  return result;
}

/** Index of the response channel that measures the entry's own response DOF (same point and axis), else 0. */
export function mainChannel(channels: { dof: string }[], responseDof: string): number {
  const [point, dir] = responseDof.split(':');
  const i = channels.findIndex((c) => {
    const [p, d] = c.dof.split(':');
    return p === point && d!.slice(1) === dir!.slice(1);
  });
  return Math.max(0, i);
}

/**
 * Schedule status from the hits (design.md, "Tap"): done when the required accepted hits are in
 * and the mean coherence over the band (on the channel that measures the entry's own response
 * DOF) reaches the campaign's threshold; flagged when the hits are in but the coherence is low;
 * in progress while hits are missing. An entry without any hit keeps its status.
 */
export function statusFrom(input: { hitCount: number; accepted: number; requiredHits: number; meanCoherence: number | null; threshold: number; current: string }): string {
  if (input.hitCount === 0) return input.current;
  if (input.accepted < input.requiredHits) return 'in-progress';
  return (input.meanCoherence ?? 0) >= input.threshold ? 'done' : 'flagged';
}

/** Schedule entries of a campaign that have at least one accepted hit, in schedule order. */
export async function entriesWithAcceptedHits(db: Db, campaignId: string): Promise<string[]> {
  const rows = await db
    .selectDistinct({ id: scheduleEntry.id, position: scheduleEntry.position })
    .from(scheduleEntry)
    .innerJoin(hit, and(eq(hit.scheduleEntryId, scheduleEntry.id), eq(hit.verdict, 'accept'), notExcluded))
    .where(eq(scheduleEntry.campaignId, campaignId))
    .orderBy(asc(scheduleEntry.position));
  return rows.map((r) => r.id);
}

export const responsePoint = aliasedTable(point, 'response_point');
export const excitationPoint = aliasedTable(point, 'excitation_point');

/** A schedule entry of the campaign with its DOF labels ("P07:+Z"); 404 for an unknown id or another campaign's. */
export async function loadScheduleEntry(db: Db, campaignId: string, entryId: string) {
  if (!uuidSchema.safeParse(entryId).success) throw notFound('That schedule entry');
  const [row] = await db
    .select({
      entry: scheduleEntry,
      responseLabel: responsePoint.label,
      excitationLabel: excitationPoint.label,
    })
    .from(scheduleEntry)
    .innerJoin(responsePoint, eq(responsePoint.id, scheduleEntry.responsePointId))
    .innerJoin(excitationPoint, eq(excitationPoint.id, scheduleEntry.excitationPointId))
    .where(and(eq(scheduleEntry.id, entryId), eq(scheduleEntry.campaignId, campaignId)));
  if (!row) throw notFound('That schedule entry');
  return { ...row.entry, responseDof: `${row.responseLabel}:${row.entry.responseDirection}`, excitationDof: `${row.excitationLabel}:${row.entry.excitationDirection}` };
}
