// Why a DOF is flagged (packages/contracts/src/flag-reasons.ts) in every answer that carries its
// status, and the redo of a DOF (routes/redo.ts): the old hits kept and set aside with who and why,
// a new set of hits averaged on its own, bad input refused with 4xx.
import { describe, expect, it } from 'vitest';
import { and, eq } from 'drizzle-orm';
import { createRng } from '@resonote/sim';
import { auditEvent, hit } from '@resonote/db/schema';
import type { TestApp } from '../support/app.ts';
import type { Person } from '../support/campaign.ts';
import { barHitsWav, simulateBarHits } from '../support/bar-hits.ts';
import { barCampaign, useBarRig, BAR_SETTINGS, type RigCampaign } from '../support/rig.ts';

let app: TestApp;
let lead: Person;
let engineer: Person;
let viewer: Person;
let rig: RigCampaign;

const fs = BAR_SETTINGS.sampleRateHz;
const n = BAR_SETTINGS.sampleRateHz * BAR_SETTINGS.recordLengthS;

const simulate = (excitationDof: string, count: number, seed: number) => simulateBarHits(excitationDof, count, seed);

/** Hits whose response is decaying noise unrelated to the force: they pass the hit checks, but γ² stays low. */
function unrelated(excitationDof: string, count: number, seed: number) {
  const hits = simulate(excitationDof, count, seed);
  const rng = createRng(seed + 1);
  for (const h of hits) for (let k = 0; k < n; k++) h.responses[0]![k] = 5 * rng.gaussian() * Math.exp(-k / fs / 0.2);
  return hits;
}

const toWav = (hits: ReturnType<typeof simulate>) => barHitsWav(rig, hits);

const entry = (excitation: string) => rig.entries.find((e) => e.excitationDof === excitation)!;
const base = () => `/api/campaigns/${rig.campaignId}`;
const upload = (who: Person, entryId: string, key: string, wav: Buffer) => who.agent.post(`${base()}/schedule/${entryId}/hits`).set('idempotency-key', key).attach('file', wav, `${key}.wav`);
const scheduleEntry = async (id: string) => ((await viewer.agent.get(`${base()}/schedule`)).body.entries as { id: string; status: string; version: number; acceptedHits: number; flagReasons: { code: string; message: string; value: number; threshold: number; advice: string }[] }[]).find((e) => e.id === id)!;

useBarRig((r) => ({ app, lead, engineer, viewer, rig } = r));

describe('flag reasons', () => {
  it('says why an entry with all its good hits is flagged: the mean coherence over the band, the threshold, and what to try', async () => {
    const target = entry('B05:+Z');
    const res = await upload(engineer, target.id, 'flag-b05-noise', toWav(unrelated('B05:+Z', 3, 31)));
    expect(res.status).toBe(201);
    expect(res.body.entry.status).toBe('flagged');
    const [reason] = res.body.entry.flagReasons;
    expect(reason.code).toBe('low-coherence');
    // The value is the plain mean of γ² over the band's lines, 0 Hz left out (arithmetic on the
    // coherence that GET …/frf serves for the band of the settings, 10–800 Hz).
    const frf = await viewer.agent.get(`${base()}/schedule/${target.id}/frf`);
    const lines = (frf.body.f as number[]).map((f, k) => [f, frf.body.channels[0].coherence[k] as number] as const).filter(([f]) => f > 0 && f >= 10 && f <= 800);
    const mean = lines.reduce((s, [, g]) => s + g, 0) / lines.length;
    expect(reason.value).toBeCloseTo(mean, 9);
    expect(reason.value).toBeLessThan(0.9);
    expect(reason.threshold).toBe(BAR_SETTINGS.coherenceThreshold);
    expect(reason.message).toMatch(new RegExp(`^coherence ${mean.toFixed(2).replace('.', '\\.')} mean over 10–800 Hz, below 0\\.90; γ² is under 0\\.90 on \\d+ % of the band, lowest 0\\.\\d\\d at [\\d.]+ Hz$`));
    expect(reason.advice).toMatch(/Re-hit nearer the point/);

    // The same reason in the schedule, in the next-entry answer's list and in the entry's hits.
    const listed = await scheduleEntry(target.id);
    expect(listed.status).toBe('flagged');
    expect(listed.flagReasons).toEqual(res.body.entry.flagReasons);
    const hits = await viewer.agent.get(`${base()}/schedule/${target.id}/hits`);
    expect(hits.body.entry.flagReasons).toEqual(res.body.entry.flagReasons);
  });

  it('gives no reason for an entry done with good coherence, nor for one still short of hits', async () => {
    const done = await upload(engineer, entry('B11:+Z').id, 'flag-b11-good', toWav(simulate('B11:+Z', 3, 11)));
    expect(done.body.entry.status).toBe('done');
    expect(done.body.entry.flagReasons).toEqual([]);
    const short = await upload(engineer, entry('B09:+Z').id, 'flag-b09-short', toWav(unrelated('B09:+Z', 1, 51)));
    expect(short.body.entry.status).toBe('in-progress');
    expect(short.body.entry.flagReasons).toEqual([]);
    expect((await scheduleEntry(entry('B09:+Z').id)).flagReasons).toEqual([]);
  });
});

describe('redo a DOF', () => {
  it('refuses bad input with 4xx in the one error shape and leaves the hits alone', async () => {
    const target = entry('B05:+Z');
    const { version } = await scheduleEntry(target.id);
    const url = `${base()}/schedule/${target.id}/redo`;
    const cases: [unknown, number, string][] = [
      [{ version }, 400, 'invalid-input'],
      [{ reason: 'x', version }, 400, 'invalid-input'],
      [{ reason: 'loose sensor', version: 'one' }, 400, 'invalid-input'],
      [{ reason: 'loose sensor', version, extra: true }, 400, 'invalid-input'],
      [{ reason: 'loose sensor', version: version + 7 }, 409, 'stale-version'],
    ];
    for (const [body, status, code] of cases) {
      const res = await engineer.agent.post(url).send(body as object);
      expect(res.status, JSON.stringify(body)).toBe(status);
      expect(res.body.error.code).toBe(code);
      expect(typeof res.body.error.message).toBe('string');
    }
    const unknown = await engineer.agent.post(`${base()}/schedule/00000000-0000-4000-8000-000000000000/redo`).send({ reason: 'loose sensor', version: 1 });
    expect(unknown.status).toBe(404);
    const notUuid = await engineer.agent.post(`${base()}/schedule/not-a-uuid/redo`).send({ reason: 'loose sensor', version: 1 });
    expect(notUuid.status).toBe(404);
    const byViewer = await viewer.agent.post(url).send({ reason: 'loose sensor', version });
    expect(byViewer.status).toBe(403);
    const fresh = entry('B13:+Z');
    const nothing = await engineer.agent.post(`${base()}/schedule/${fresh.id}/redo`).send({ reason: 'loose sensor', version: (await scheduleEntry(fresh.id)).version });
    expect(nothing.status).toBe(409);
    expect(nothing.body.error.code).toBe('nothing-to-redo');
    expect((await scheduleEntry(target.id)).status).toBe('flagged');
  });

  it('sets the old hits aside with who and why, keeps them stored, and averages the new set on its own', async () => {
    const target = entry('B05:+Z');
    const before = await scheduleEntry(target.id);
    const res = await engineer.agent.post(`${base()}/schedule/${target.id}/redo`).send({ reason: 'accelerometer wax had let go', version: before.version });
    expect(res.status).toBe(200);
    expect(res.body.setAside).toMatchObject({ hits: [1, 2, 3], by: 'Eric Engineer', reason: 'accelerometer wax had let go' });
    expect(res.body.entry).toMatchObject({ status: 'in-progress', acceptedHits: 0, flagReasons: [] });

    // Never deleted: the three hits are still stored, and listed as set aside.
    expect(await app.handle.database.db.select({ id: hit.id }).from(hit).where(eq(hit.scheduleEntryId, target.id))).toHaveLength(3);
    const listed = await viewer.agent.get(`${base()}/schedule/${target.id}/hits`);
    expect(listed.body.hits).toHaveLength(3);
    for (const h of listed.body.hits) expect(h.setAside).toMatchObject({ by: 'Eric Engineer', reason: 'accelerometer wax had let go' });
    const frf = await viewer.agent.get(`${base()}/schedule/${target.id}/frf`);
    expect(frf.body.status).toBe('no-accepted-hit');
    const [logged] = await app.handle.database.db.select().from(auditEvent).where(and(eq(auditEvent.entityId, target.id), eq(auditEvent.action, 'redo')));
    expect(logged).toBeDefined();
    expect((logged!.after as { reason: string; setAside: number }).setAside).toBe(3);

    // A second redo with the version read before the first is stale.
    const stale = await lead.agent.post(`${base()}/schedule/${target.id}/redo`).send({ reason: 'again', version: before.version });
    expect(stale.status).toBe(409);

    // The new set: sequences go on from 4, and only they make the average.
    const again = await upload(engineer, target.id, 'redo-b05-good', toWav(simulate('B05:+Z', 3, 61)));
    expect(again.status).toBe(201);
    expect(again.body.hits.map((h: { sequence: number }) => h.sequence)).toEqual([4, 5, 6]);
    expect(again.body.entry).toMatchObject({ status: 'done', acceptedHits: 3, flagReasons: [] });
    const averaged = await viewer.agent.get(`${base()}/schedule/${target.id}/frf`);
    expect(averaged.body.averages).toBe(3);
    expect([...averaged.body.hitIds].sort()).toEqual(again.body.hits.map((h: { id: string }) => h.id).sort());
  });

  it('carries the set-aside hits into a backup and restores them as set aside, with who and why', async () => {
    const res = await lead.agent
      .get(`${base()}/backup`)
      .buffer(true)
      .parse((r, done) => {
        const chunks: Buffer[] = [];
        r.on('data', (c: Buffer) => chunks.push(c));
        r.on('end', () => done(null, Buffer.concat(chunks)));
      });
    expect(res.status).toBe(200);
    const restored = await lead.agent.post('/api/campaigns/restore').attach('file', res.body as Buffer, 'bar.resonote-backup.zip');
    expect(restored.status).toBe(201);
    const id = restored.body.campaign.id as string;
    const entries = (await lead.agent.get(`/api/campaigns/${id}/schedule`)).body.entries as { id: string; excitationDof: string; status: string; acceptedHits: number }[];
    const b05 = entries.find((e) => e.excitationDof === 'B05:+Z')!;
    expect(b05).toMatchObject({ status: 'done', acceptedHits: 3 });
    const hits = (await lead.agent.get(`/api/campaigns/${id}/schedule/${b05.id}/hits`)).body.hits as { sequence: number; setAside: { by: string | null; reason: string } | null }[];
    expect(hits.filter((h) => h.setAside).map((h) => h.sequence)).toEqual([1, 2, 3]);
    expect(hits.find((h) => h.sequence === 1)!.setAside).toMatchObject({ by: 'Eric Engineer', reason: 'accelerometer wax had let go' });
    expect(hits.filter((h) => !h.setAside).map((h) => h.sequence)).toEqual([4, 5, 6]);
  });
});

describe('the hand-over after a redo', () => {
  it('counts only the hits that are not set aside in the report totals, and says how many were set aside', async () => {
    // A campaign of its own, so the counts below are only this test's uploads: 3 hits, a redo, then 2.
    const own = await barCampaign(app, lead, { name: 'Report after a redo' });
    for (const [email, role] of [['eng@lab.test', 'engineer'], ['view@lab.test', 'viewer']]) expect((await lead.agent.post(`/api/campaigns/${own.campaignId}/members`).send({ email, role })).status).toBe(201);
    const saved = rig;
    rig = own;
    try {
      const target = own.entries.find((e) => e.excitationDof === 'B07:+Z')!;
      expect((await upload(engineer, target.id, 'report-b07-first', toWav(simulate('B07:+Z', 3, 71)))).status).toBe(201);
      const before = await scheduleEntry(target.id);
      expect((await engineer.agent.post(`${base()}/schedule/${target.id}/redo`).send({ reason: 'hammer tip was loose', version: before.version })).status).toBe(200);
      expect((await upload(engineer, target.id, 'report-b07-again', toWav(simulate('B07:+Z', 2, 72)))).status).toBe(201);
      // All five are still stored (raw hits are never deleted).
      expect(await app.handle.database.db.select({ id: hit.id }).from(hit).where(eq(hit.campaignId, own.campaignId))).toHaveLength(5);

      const report = await lead.agent.get(`${base()}/report.html`);
      expect(report.status).toBe(200);
      const text = report.text.replace(/<[^>]+>/g, '');
      // 5 uploaded − 3 set aside = 2 counted, both accepted; the 3 are named as set aside.
      expect(text).toContain('2 hits recorded: 2 accepted (✓), 0 rejected (✗)');
      expect(text).toContain('3 more hits were set aside by a redo of their DOF and are not counted here.');
      // The per-engineer table counts the same 2 hits (name, hits, accepted, rejected).
      expect(report.text).toMatch(/<td>Eric Engineer<\/td><td class="n r">2<\/td><td class="n r">2<\/td><td class="n r">0<\/td>/);
    } finally {
      rig = saved;
    }
  });
});
