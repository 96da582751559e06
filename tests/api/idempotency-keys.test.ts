// Idempotency-Keys of recordings: a key is bound to its campaign, its schedule entry and the
// SHA-256 of its request, and matched exactly. A retry replays; any other reuse is refused by name.
import { describe, expect, it } from 'vitest';
import { eq } from 'drizzle-orm';
import { hit, noiseCheck, uploadKey } from '@resonote/db/schema';
import type { TestApp } from '../support/app.ts';
import type { Person } from '../support/campaign.ts';
import { useBarRig, type RigCampaign } from '../support/rig.ts';
import { barWav } from '../support/bar-recording.ts';

let app: TestApp;
let engineer: Person;
let rig: RigCampaign;

useBarRig((r) => ({ app, engineer, rig } = r));

const entry = (excitation: string) => rig.entries.find((e) => e.excitationDof === excitation)!;
const hitsAt = async (excitation: string) => app.handle.database.db.select({ id: hit.id, sequence: hit.sequence }).from(hit).where(eq(hit.scheduleEntryId, entry(excitation).id));
const upload = (excitation: string, key: string, wav: Buffer, fields: Record<string, string> = {}) => {
  let req = engineer.agent.post(`/api/campaigns/${rig.campaignId}/schedule/${entry(excitation).id}/hits`).set('idempotency-key', key);
  for (const [k, v] of Object.entries(fields)) req = req.field(k, v);
  return req.attach('file', wav, 'take.wav');
};

describe('a retry with the same key', () => {
  it('replays every hit of a recording of two hits, in order, and stores nothing more', async () => {
    const wav = barWav(rig, 'B03:+Z', 2, 301);
    const first = await upload('B03:+Z', 'take-b03-0001', wav);
    expect(first.status).toBe(201);
    expect(first.body.hits).toHaveLength(2);
    const again = await upload('B03:+Z', 'take-b03-0001', wav);
    expect(again.status).toBe(200);
    expect(again.body.replayed).toBe(true);
    expect(again.body.hits.map((h: { id: string }) => h.id)).toEqual(first.body.hits.map((h: { id: string }) => h.id));
    expect(await hitsAt('B03:+Z')).toHaveLength(2);
  });

  it('stores a recording once when the same request arrives twice at the same moment', async () => {
    const wav = barWav(rig, 'B06:+Z', 1, 306);
    const [a, b] = await Promise.all([upload('B06:+Z', 'take-b06-race', wav), upload('B06:+Z', 'take-b06-race', wav)]);
    expect([a.status, b.status].sort()).toEqual([200, 201]);
    expect(a.body.hits[0].id).toBe(b.body.hits[0].id);
    expect(await hitsAt('B06:+Z')).toHaveLength(1);
  });
});

describe('a key reused for something else', () => {
  it('refuses the same key with a different file at the same entry (422) instead of dropping the second recording', async () => {
    const first = await upload('B04:+Z', 'take-b04-0001', barWav(rig, 'B04:+Z', 1, 401));
    expect(first.status).toBe(201);
    const other = await upload('B04:+Z', 'take-b04-0001', barWav(rig, 'B04:+Z', 1, 402));
    expect(other.status).toBe(422);
    expect(other.body.error.code).toBe('idempotency-key-reused');
    expect(other.body.error.message).toMatch(/^This Idempotency-Key was already used for a different recording \(another file or other fields\) at this entry\. Nothing was stored/);
    expect(await hitsAt('B04:+Z')).toHaveLength(1);
  });

  it('refuses the same file with other reading fields under the same key (422)', async () => {
    const wav = barWav(rig, 'B08:+Z', 1, 801);
    expect((await upload('B08:+Z', 'take-b08-0001', wav)).status).toBe(201);
    const scaled = await upload('B08:+Z', 'take-b08-0001', wav, { fullScaleVolts: '2' });
    expect(scaled.status).toBe(422);
    expect(scaled.body.error.code).toBe('idempotency-key-reused');
    // Only the FRF kind of the answer differs: that is still a retry.
    const asMobility = await upload('B08:+Z', 'take-b08-0001', wav, { kind: 'mobility' });
    expect(asMobility.status).toBe(200);
    expect(asMobility.body.replayed).toBe(true);
  });

  it('refuses the same key at another schedule entry (409) and names the entry it was used at, instead of answering that entry’s hits', async () => {
    const wav = barWav(rig, 'B10:+Z', 1, 1001);
    const first = await upload('B10:+Z', 'take-b10-0001', wav);
    expect(first.status).toBe(201);
    const elsewhere = await upload('B12:+Z', 'take-b10-0001', wav);
    expect(elsewhere.status).toBe(409);
    expect(elsewhere.body.error.code).toBe('idempotency-key-other-entry');
    expect(elsewhere.body.error.message).toContain('already used for a recording at another schedule entry (response B21:+Z, excitation B10:+Z)');
    expect(await hitsAt('B12:+Z')).toHaveLength(0);
  });

  it('refuses a simulated take that reuses a key with other settings (422), and a key of hits reused for a noise check (409)', async () => {
    const url = `/api/campaigns/${rig.campaignId}/schedule/${entry('B14:+Z').id}/simulate`;
    const take = { count: 1, seed: 14, doubleHitProbability: 0, overloadProbability: 0, idempotencyKey: 'sim-b14-0001' };
    expect((await engineer.agent.post(url).send(take)).status).toBe(201);
    expect((await engineer.agent.post(url).send(take)).status).toBe(200);
    const more = await engineer.agent.post(url).send({ ...take, count: 2 });
    expect(more.status).toBe(422);
    expect(await hitsAt('B14:+Z')).toHaveLength(1);

    const noise = await engineer.agent.post(`/api/campaigns/${rig.campaignId}/noise-checks/simulate`).send({ durationS: 2, seed: 1, idempotencyKey: 'sim-b14-0001' });
    expect(noise.status).toBe(409);
    expect(noise.body.error.message).toMatch(/already used in this campaign for hits/);
    expect(await app.handle.database.db.select().from(noiseCheck).where(eq(noiseCheck.campaignId, rig.campaignId))).toHaveLength(0);
  });
});

describe('key format and exact matching', () => {
  it('refuses a key with a pattern character such as "%" (it once replayed unrelated uploads) and stores nothing', async () => {
    const two = await upload('B16:+Z', 'victim-0001', barWav(rig, 'B16:+Z', 2, 1601));
    expect(two.status).toBe(201);
    const wildcard = await upload('B18:+Z', 'vic%', barWav(rig, 'B18:+Z', 1, 1801));
    expect(wildcard.status).toBe(400);
    expect(wildcard.body.error.message).toBe('The Idempotency-Key "vic%" (4 characters) is not usable: a key is 8–200 characters of letters, digits and . _ : ~ - (a UUID fits). Nothing was stored.');
    expect((await upload('B18:+Z', 'victim-%%', barWav(rig, 'B18:+Z', 1, 1801))).status).toBe(400);
    expect(await hitsAt('B18:+Z')).toHaveLength(0);
  });

  it('refuses keys that are too short, too long, or hold spaces or other characters, from the header, the form field and a JSON body', async () => {
    const wav = barWav(rig, 'B18:+Z', 1, 1802);
    for (const key of ['short', 'x'.repeat(201), 'has space-0001', 'umlaut-ä-0001', 'hash#0000001']) {
      const res = await upload('B18:+Z', key, wav);
      expect(res.status, key).toBe(400);
      expect(res.body.error.message, key).toMatch(/is not usable: a key is 8–200 characters/);
    }
    const field = await engineer.agent.post(`/api/campaigns/${rig.campaignId}/schedule/${entry('B18:+Z').id}/hits`).field('idempotencyKey', 'semi;colon;key').attach('file', wav, 'x.wav');
    expect(field.status).toBe(400);
    const both = await engineer.agent.post(`/api/campaigns/${rig.campaignId}/schedule/${entry('B18:+Z').id}/hits`).set('idempotency-key', 'header-key-0001').field('idempotencyKey', 'field-key-0001').attach('file', wav, 'x.wav');
    expect(both.status).toBe(400);
    expect(both.body.error.message).toMatch(/header and the idempotencyKey field differ/);
    const sim = await engineer.agent.post(`/api/campaigns/${rig.campaignId}/schedule/${entry('B18:+Z').id}/simulate`).send({ count: 1, idempotencyKey: 'bad key with spaces' });
    expect(sim.status).toBe(400);
    expect(sim.body.error.message).toMatch(/idempotencyKey: an Idempotency-Key is 8–200 characters/);
    expect(await hitsAt('B18:+Z')).toHaveLength(0);
  });

  it('keeps one binding row per key, with the request hash and the hits it stored', async () => {
    const rows = await app.handle.database.db.select().from(uploadKey).where(eq(uploadKey.campaignId, rig.campaignId));
    const b03 = rows.find((r) => r.key === 'take-b03-0001')!;
    expect(b03.purpose).toBe('hits');
    expect(b03.scheduleEntryId).toBe(entry('B03:+Z').id);
    expect(b03.requestSha256).toMatch(/^[0-9a-f]{64}$/);
    expect(b03.hitIds).toHaveLength(2);
    expect(new Set(rows.map((r) => r.key)).size).toBe(rows.length);
  });
});
