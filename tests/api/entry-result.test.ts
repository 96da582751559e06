// A stored averaged result is keyed by the settings, the accepted hits and the version of the
// averaging code (packages/dsp FRF_ALGORITHM_VERSION): a row written by older code is recomputed,
// never served.
import { createHash } from 'node:crypto';
import { describe, expect, it } from 'vitest';
import { eq } from 'drizzle-orm';
import { FRF_ALGORITHM_VERSION } from '@resonote/dsp';
import { createRng, hitSeries, steelBar } from '@resonote/sim';
import { frfResult, hit } from '@resonote/db/schema';
import { openDb } from '@resonote/db/client';
import { encodeWav } from '@resonote/api/recording';
import { entryInputHash, entryResult } from '../../apps/api/src/hits/entry-result.ts';
import { flushResultWrites } from '../../apps/api/src/hits/result-cache.ts';
import type { TestApp } from '../support/app.ts';
import type { Person } from '../support/campaign.ts';
import { useBarRig, BAR_SETTINGS, type RigCampaign } from '../support/rig.ts';

let app: TestApp;
let engineer: Person;
let rig: RigCampaign;

useBarRig((r) => ({ app, engineer, rig } = r));

describe('an entry without accepted hits', () => {
  it('answers its FRF request with the state in words, not an error', async () => {
    const entry = rig.entries.at(-1)!;
    const res = await engineer.agent.get(`/api/campaigns/${rig.campaignId}/schedule/${entry.id}/frf`);
    expect(res.status).toBe(200);
    expect(res.body.status).toBe('no-accepted-hit');
    expect(res.body.entry.id).toBe(entry.id);
    expect(res.body.message).toBe(`No accepted hit at ${entry.responseDof} / ${entry.excitationDof} yet.`);
    expect(res.body.channels).toBeUndefined();
  });
});

describe('stored results carry the version of the averaging code', () => {
  it('changes the input hash when only the algorithm version differs', () => {
    const hits = [{ id: 'a', version: 1 }, { id: 'b', version: 2 }];
    const withoutVersion = createHash('sha256').update(JSON.stringify({ v: 3, hits: ['a:1', 'b:2'] })).digest('hex');
    expect(entryInputHash(3, hits)).not.toBe(withoutVersion);
    expect(entryInputHash(3, hits)).toBe(entryInputHash(3, hits.map((h) => ({ ...h }))));
    expect(FRF_ALGORITHM_VERSION).toBeGreaterThanOrEqual(1);
  });

  it('recomputes an entry whose stored row was keyed by older code instead of serving it', async () => {
    const fs = BAR_SETTINGS.sampleRateHz;
    const n = fs * BAR_SETTINGS.recordLengthS;
    const entry = rig.entries[0]!;
    const hits = hitSeries(
      steelBar().model,
      { excitationDof: entry.excitationDof, responseDofs: ['B21:+Z'], fs, samples: n, preTriggerS: 0.0105, peakForceN: 50, pulseWidthS: 0.001, forceNoiseN: 0.02, responseNoise: 0.02, forceRangeN: 2000, responseRangeMs2: 500 },
      2,
      createRng(31),
      { doubleHitProbability: 0, overloadProbability: 0 },
    );
    const force = new Float64Array(n * 2);
    const accel = new Float64Array(n * 2);
    hits.forEach((h, i) => {
      for (let k = 0; k < n; k++) {
        force[i * n + k] = (h.force[k]! * rig.hammerSensitivity) / 1000;
        accel[i * n + k] = (h.responses[0]![k]! * rig.accelSensitivity) / 1000;
      }
    });
    const res = await engineer.agent
      .post(`/api/campaigns/${rig.campaignId}/schedule/${entry.id}/hits`)
      .set('idempotency-key', 'result-version-0001')
      .attach('file', encodeWav([force, accel], fs, 'float32', 1), 'two.wav');
    expect(res.status).toBe(201);
    const db = app.handle.database.db;
    await flushResultWrites(db);
    const [stored] = await db.select().from(frfResult).where(eq(frfResult.scheduleEntryId, entry.id));
    expect(stored!.averages).toBe(2);
    const ready = await engineer.agent.get(`/api/campaigns/${rig.campaignId}/schedule/${entry.id}/frf`);
    expect(ready.body.status).toBe('ready');
    expect(ready.body.averages).toBe(2);

    // Make the row look as if older code had written it: the hash without the algorithm version
    // (the key as it was before the version was added) and a tell-tale average count.
    const accepted = await db.select({ id: hit.id, version: hit.version }).from(hit).where(eq(hit.scheduleEntryId, entry.id));
    const oldHash = createHash('sha256')
      .update(JSON.stringify({ v: stored!.settingsVersion, hits: accepted.map((h) => `${h.id}:${h.version}`) }))
      .digest('hex');
    await db.update(frfResult).set({ inputHash: oldHash, averages: 99 }).where(eq(frfResult.scheduleEntryId, entry.id));

    // A second process (its own pool, so its own memory cache) must not serve that row.
    const other = openDb(app.config.databaseUrl, { max: 2 });
    try {
      const result = await entryResult(other.db, rig.campaignId, entry.id);
      expect(result!.averages).toBe(2);
      expect(result!.inputHash).not.toBe(oldHash);
      await flushResultWrites(other.db);
      const [rewritten] = await db.select().from(frfResult).where(eq(frfResult.scheduleEntryId, entry.id));
      expect(rewritten!.inputHash).toBe(result!.inputHash);
      expect(rewritten!.averages).toBe(2);
    } finally {
      await other.close();
    }
  });
});
