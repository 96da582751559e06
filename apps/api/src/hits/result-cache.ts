// The in-memory side of the hit path, per database: the newest entry results and the samples of
// recent hits, and the delayed writes of results to frf_result. Memory is only a cache: every read
// of a result first checks its input hash against PostgreSQL (hits/entry-result.ts), so nothing
// stale is ever served, and a write lost here is recomputed on the next read.
import { eq, inArray } from 'drizzle-orm';
import { FrfAccumulator, fftPathName, type AverageFrfOptions, type AveragedFrf } from '@resonote/dsp';
import { hit } from '@resonote/db/schema';
import type { Db } from '@resonote/db/client';
import { isDatabaseUnavailable } from '../db-health.ts';
import { unpackSamples } from './samples-codec.ts';

/** A small least-recently-used map. */
export class Lru<K, V> {
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
  delete(key: K): void {
    this.map.delete(key);
  }
  set(key: K, value: V): void {
    this.map.delete(key);
    this.map.set(key, value);
    if (this.map.size > this.max) this.map.delete(this.map.keys().next().value as K);
  }
  get size(): number {
    return this.map.size;
  }
}

/**
 * The newest results and the samples of recent hits, so the hot path of a test day (hit in →
 * updated average out) needs neither re-reading raw samples nor re-decoding stored spectra.
 */
interface Caches {
  /** Entry results (hits/entry-result.ts) by entry id; this module holds them without knowing their shape. */
  results: Lru<string, unknown>;
  samples: Lru<string, Float32Array[]>;
  /** Each DOF's running sums of the hits averaged last (settings version, FFT, shape; hits id:version in order). */
  sums: Lru<string, { key: string; hits: string[]; acc: FrfAccumulator }>;
  /** Check results (linearity) by key, with the input hash they were computed under. */
  checks: Lru<string, { hash: string; value: unknown }>;
  pending: Set<Promise<unknown>>;
  /** Result writes waiting for their DOF to go quiet, by entry id. */
  scheduled: Map<string, { timer: ReturnType<typeof setTimeout>; run: () => Promise<void> }>;
}

/**
 * A burst of hits at one DOF writes only its last result, this long after the last hit: longer
 * than the second or so between two taps, so a DOF's five hits write about 1 MB of spectra once
 * rather than five times (docs/decisions/hit-cost.md).
 */
export const RESULT_WRITE_DELAY_MS = 2000;

const cachesByDb = new WeakMap<object, Caches>();
function caches(db: Db): Caches {
  let c = cachesByDb.get(db);
  if (!c) {
    // 256 hits × 4 channels × 16 384 samples × 4 bytes ≈ 64 MB at most.
    // Running sums: 10 arrays × 8193 lines × 8 bytes + buffers ≈ 0.9 MB per DOF (4 channels, 16 384 samples).
    c = { results: new Lru(64), samples: new Lru(256), sums: new Lru(48), checks: new Lru(512), pending: new Set(), scheduled: new Map() };
    cachesByDb.set(db, c);
  }
  return c;
}

export function rememberedResult<T>(db: Db, entryId: string): T | undefined {
  return caches(db).results.get(entryId) as T | undefined;
}

export function rememberResult<T>(db: Db, entryId: string, result: T): void {
  caches(db).results.set(entryId, result);
}

/** A check result remembered under `key` when it was computed under `hash`; undefined otherwise. */
export function rememberedCheck<T>(db: Db, key: string, hash: string): T | undefined {
  const c = caches(db).checks.get(key);
  return c && c.hash === hash ? (c.value as T) : undefined;
}

export function rememberCheck(db: Db, key: string, hash: string, value: unknown): void {
  caches(db).checks.set(key, { hash, value });
}

/** Remembers the samples of a hit just stored (storage order, engineering units). */
export function rememberSamples(db: Db, hitId: string, channels: Float32Array[]): void {
  caches(db).samples.set(hitId, channels);
}

/**
 * The samples of stored hits (storage order, engineering units), from memory where they are and
 * read from `hit.samples` once otherwise. Every path that averages stored hits reads them here.
 */
export async function hitSamples(db: Db, ids: readonly string[], channelCount: number, samplesPerChannel: number): Promise<Float32Array[][]> {
  const cache = caches(db).samples;
  const missing = ids.filter((id) => !cache.get(id));
  if (missing.length) {
    const rows = await db.select({ id: hit.id, samples: hit.samples }).from(hit).where(inArray(hit.id, missing));
    for (const r of rows) cache.set(r.id, unpackSamples(r.samples, channelCount, samplesPerChannel));
  }
  return ids.map((id) => {
    const chans = cache.get(id);
    if (!chans) throw new Error(`hit ${id} has no stored samples`);
    return chans;
  });
}

/**
 * averageFrf of an entry's hits, from the entry's running sums when they hold a prefix of these hits
 * (the usual case: a new hit appended), so only the new hits are transformed; from scratch otherwise
 * (a verdict changed, new settings). Bit-identical to averageFrf either way (FrfAccumulator,
 * docs/decisions/incremental-averaging.md). Samples not in memory (stored by another process, or
 * long ago) are read from the hit rows.
 */
export async function averageIncrementally(
  db: Db,
  entryId: string,
  layout: { settingsVersion: number; sampleRateHz: number; samplesPerChannel: number; channelCount: number },
  hits: readonly { id: string; version: number }[],
  options: () => AverageFrfOptions,
): Promise<AveragedFrf> {
  const cache = caches(db);
  const { settingsVersion, sampleRateHz, samplesPerChannel: n, channelCount } = layout;
  const key = JSON.stringify([settingsVersion, fftPathName(), sampleRateHz, n, channelCount]);
  const ids = hits.map((h) => `${h.id}:${h.version}`);
  const reusable = () => {
    const prior = cache.sums.get(entryId);
    return prior && prior.key === key && prior.hits.length <= ids.length && prior.hits.every((h, i) => h === ids[i]) ? prior : undefined;
  };
  // Read what is missing, then (with no await in between) take the sums and add the new hits.
  for (let round = 0; ; round++) {
    const from = reusable()?.hits.length ?? 0;
    const missing = hits.slice(from).filter((h) => !cache.samples.get(h.id)).map((h) => h.id);
    if (missing.length === 0 || round > 3) break;
    const rows = await db.select({ id: hit.id, samples: hit.samples }).from(hit).where(inArray(hit.id, missing));
    for (const r of rows) cache.samples.set(r.id, unpackSamples(r.samples, channelCount, n));
  }
  const prior = reusable();
  // Taken out while hits are added: a refused record leaves no half-updated sums behind.
  cache.sums.delete(entryId);
  const acc = prior?.acc ?? new FrfAccumulator(n, channelCount - 1, sampleRateHz, options());
  for (const h of hits.slice(prior?.hits.length ?? 0)) {
    let chans = cache.samples.get(h.id);
    if (!chans) {
      // Evicted by concurrent reads in the meantime (a very busy process): read it once more.
      const [row] = await db.select({ samples: hit.samples }).from(hit).where(eq(hit.id, h.id));
      if (!row) throw new Error(`hit ${h.id} has no stored samples`);
      chans = unpackSamples(row.samples, channelCount, n);
    }
    acc.add({ force: chans[0]!, responses: chans.slice(1) });
  }
  const frf = acc.result();
  cache.sums.set(entryId, { key, hits: ids, acc });
  return frf;
}

/** Stores a result off the request path, once its entry has been quiet for RESULT_WRITE_DELAY_MS. */
export function scheduleResultWrite(db: Db, entryId: string, write: () => Promise<void>): void {
  const cache = caches(db);
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
}

/** Writes the results still waiting and waits for every write under way (shutdown, tests). */
export async function flushResultWrites(db: Db): Promise<void> {
  const c = caches(db);
  for (const { timer, run } of [...c.scheduled.values()]) {
    clearTimeout(timer);
    void run();
  }
  await Promise.all([...c.pending]);
}
