// The averaged FRF of one schedule entry from its accepted hits under the current settings, with
// its input hash; served from memory or frf_result when the hash matches, else computed (and
// stored off the request path, hits/result-cache.ts). Raw hits are never changed: everything here
// is recomputable from them and the settings.
import { createHash } from 'node:crypto';
import { and, asc, eq, sql } from 'drizzle-orm';
import { FRF_ALGORITHM_VERSION, averageFrf, fftPathName, type AverageFrfOptions, type AveragedFrf } from '@resonote/dsp';
import type { AcquisitionSettings } from '@resonote/contracts';
import { frfResult, hit } from '@resonote/db/schema';
import type { Db } from '@resonote/db/client';
import type { ChannelSnapshot } from './channel-map.ts';
import { currentSettings, preTriggerSamples, recordSamples, type CurrentSettings } from './current-settings.ts';
import { frfWindowsOf } from './settings-to-dsp.ts';
import { decodeFrf, encodeFrf } from './samples-codec.ts';
import { averageIncrementally, rememberResult, rememberedResult, scheduleResultWrite } from './result-cache.ts';
import { notExcluded } from './exclusion.ts';

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

/**
 * The averaged FRF of stored hits (channels in storage order: force first) under the settings:
 * each channel's pre-trigger offset removed, then the force and exponential windows
 * (docs/methods.md#frf-averaging, #force-window, #exp-window). The entry result and the linearity
 * check both average through here.
 */
export function averageHits(hits: readonly Float32Array[][], s: AcquisitionSettings): AveragedFrf {
  return averageFrf(
    hits.map((chans) => ({ force: chans[0]!, responses: chans.slice(1) })),
    s.sampleRateHz,
    frfOptionsOf(s),
  );
}

/** The averaging options of the settings: windows and pre-trigger offset removal. */
function frfOptionsOf(s: AcquisitionSettings): AverageFrfOptions {
  return { ...frfWindowsOf(s), offsets: { preTriggerSamples: preTriggerSamples(s) } };
}

/** Mean of `values` over the lines of f inside [lo, hi], leaving out 0 Hz; 0 when no line is inside. */
export function meanOverBand(values: ArrayLike<number>, f: ArrayLike<number>, lo: number, hi: number): number {
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

/** The columns an frf_result upsert replaces, each from the row it tried to insert (`excluded.*`). */
const upsertFromExcluded = Object.fromEntries(
  (['inputHash', 'settingsVersion', 'hitIds', 'averages', 'sampleRateHz', 'samples', 'channels', 'data', 'computedAt', 'campaignId'] as const).map((k) => [k, sql.raw(`excluded."${frfResult[k].name}"`)]),
);

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

  const remembered = rememberedResult<EntryResult>(db, entryId);
  if (remembered && remembered.inputHash === hash) return { ...remembered, excluded };

  // The stored spectra (≈ 1 MB) are read only when their hash matches; after a new hit it does not.
  const [storedHash] = await db.select({ inputHash: frfResult.inputHash }).from(frfResult).where(eq(frfResult.scheduleEntryId, entryId));
  const [stored] = storedHash?.inputHash === hash ? await db.select().from(frfResult).where(and(eq(frfResult.scheduleEntryId, entryId), eq(frfResult.inputHash, hash))) : [];
  if (stored) {
    const fromDb: EntryResult = {
      inputHash: hash,
      settingsVersion: stored.settingsVersion,
      hitIds: stored.hitIds,
      averages: stored.averages,
      sampleRateHz: stored.sampleRateHz,
      samples: stored.samples,
      channels: stored.channels as ResultChannel[],
      excitationDof,
      frf: decodeFrf(stored.data, responseChannels.length, stored.sampleRateHz, stored.samples, stored.averages),
      excluded,
      computedAt: stored.computedAt,
    };
    rememberResult(db, entryId, fromDb);
    return fromDb;
  }

  const frf = await averageIncrementally(
    db,
    entryId,
    { settingsVersion: settings.version, sampleRateHz: s.sampleRateHz, samplesPerChannel: n, channelCount: layout.length },
    sameLayout,
    () => frfOptionsOf(s),
  );
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
    computedAt,
  };
  const result: EntryResult = { inputHash: hash, settingsVersion: settings.version, hitIds: values.hitIds, averages: frf.averages, sampleRateHz: s.sampleRateHz, samples: n, channels, excitationDof, frf, excluded, computedAt };
  rememberResult(db, entryId, result);
  // The stored copy serves other processes and restarts; writing it is not on the request path,
  // and a burst of hits at one DOF writes only its last result.
  // The spectra are encoded only when written (once per quiet DOF, not once per hit), and the
  // upsert takes the new row's values as `excluded.*`, so its ≈ 1.6 MB go over the wire once.
  scheduleResultWrite(db, entryId, () =>
    db
      .insert(frfResult)
      .values({ ...values, data: encodeFrf(frf) })
      .onConflictDoUpdate({ target: frfResult.scheduleEntryId, set: upsertFromExcluded })
      .then(() => undefined),
  );
  return result;
}
