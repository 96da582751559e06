// Campaign backup and restore (issue 8): a backup restores as a new campaign whose raw samples are
// byte-identical (SHA-256 per hit, computed here with node:crypto), whose FRFs equal the
// original's, whose audit trail is copied with a 'restore' event — and a tampered or foreign file
// is refused with nothing written.
import { createHash } from 'node:crypto';
import { createRequire } from 'node:module';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { asc, count, eq } from 'drizzle-orm';
import { auditEvent, campaign, campaignMember, channel, channelInput, dofNote, dofNoteKey, hit, noiseCheck, scheduleEntry, sensitivityCheck, user } from '@resonote/db/schema';
import { seedDemo, DEMO_PASSWORD, BAR_CAMPAIGN } from '@resonote/api/seed';
import { startTestApp, type TestApp } from '../support/app.ts';
import { signUp } from '../support/accounts.ts';
import { waitForMail } from '../support/campaign.ts';
import { platePng } from '../support/photo.ts';
import { API_TEMPLATE } from '../support/global-setup-api.ts';

const apiRequire = createRequire(new URL('../../apps/api/package.json', import.meta.url));
const { unzipSync, zipSync } = apiRequire('fflate') as { unzipSync: (d: Uint8Array) => Record<string, Uint8Array>; zipSync: (f: Record<string, Uint8Array>) => Uint8Array };

type Agent = ReturnType<TestApp['agent']>;
let app: TestApp;
let lead: Agent;
let admin: Agent;
let viewer: Agent;
let engineer: Agent;
let barId: string;
let backup: Buffer;
/** The Idempotency-Key of the note left at the first schedule entry before the backup. */
const NOTE_KEY = 'note-before-backup-1';
/** The schedule position of the entry that note was left at. */
let notePosition: number;
const notePhoto = platePng(40, 30);
/** The note upload a flaky connection would send again: same key, same fields, same photo. */
const postNote = (agent: Agent, campaignId: string, entryId: string) =>
  agent.post(`/api/campaigns/${campaignId}/schedule/${entryId}/notes`).set('Idempotency-Key', NOTE_KEY).field('topic', 'sensor-mounting').field('text', 'Wax mount, re-seated after hit 3.').attach('file', notePhoto, 'mount.png');

const sha = (b: Uint8Array) => createHash('sha256').update(b).digest('hex');
const binary = (req: import('supertest').Test) =>
  req.buffer(true).parse((res, done) => {
    const chunks: Buffer[] = [];
    res.on('data', (c: Buffer) => chunks.push(c));
    res.on('end', () => done(null, Buffer.concat(chunks)));
  });

async function signIn(email: string) {
  const agent = app.agent();
  await agent.post('/api/auth/sign-in/email').send({ email, password: DEMO_PASSWORD }).expect(200);
  return agent;
}

/** sha256 of every hit's samples, keyed by "entry position / hit sequence" (ids differ after a restore). */
async function sampleHashes(campaignId: string) {
  const db = app.handle.database.db;
  const rows = await db
    .select({ position: scheduleEntry.position, sequence: hit.sequence, samples: hit.samples })
    .from(hit)
    .innerJoin(scheduleEntry, eq(scheduleEntry.id, hit.scheduleEntryId))
    .where(eq(hit.campaignId, campaignId));
  return Object.fromEntries(rows.map((r) => [`${r.position}/${r.sequence}`, sha(r.samples)]));
}

async function campaignCount() {
  return (await app.handle.database.db.select({ n: count() }).from(campaign))[0]!.n;
}

beforeAll(async () => {
  app = await startTestApp(API_TEMPLATE);
  await seedDemo(app.handle, { log: () => undefined });
  lead = await signIn('lead@demo.resonote.local');
  admin = await signIn('admin@demo.resonote.local');
  viewer = await signIn('viewer@demo.resonote.local');
  engineer = await signIn('engineer@demo.resonote.local');
  barId = ((await lead.get('/api/campaigns')).body.campaigns as { id: string; name: string }[]).find((c) => c.name === BAR_CAMPAIGN)!.id;
  // A finished modal fit, so the backup carries a fit too.
  const started = await lead.post(`/api/campaigns/${barId}/modes/fits`).send({ bandHz: { low: 20, high: 600 }, maxOrder: 10 });
  for (let i = 0; i < 600; i++) {
    const fit = (await lead.get(`/api/campaigns/${barId}/modes/fits/${started.body.fit.id}`)).body.fit;
    if (fit.status === 'done' || fit.status === 'failed') break;
    await new Promise((r) => setTimeout(r, 100));
  }
  // One mode of it in the campaign's mode table, so the backup carries the table too.
  const top = (await lead.get(`/api/campaigns/${barId}/modes/fits/${started.body.fit.id}`)).body.fit.result.diagram.orders.at(-1);
  const near = top.poles.reduce((best: number, p: { fHz: number }, i: number) => (Math.abs(p.fHz - 53.17) < Math.abs(top.poles[best].fHz - 53.17) ? i : best), 0);
  expect((await lead.post(`/api/campaigns/${barId}/modes/fits/${started.body.fit.id}/modes`).send({ poles: [{ order: top.order, index: near }] })).status).toBe(200);
  expect((await lead.post(`/api/campaigns/${barId}/modes/table`).send({ fitId: started.body.fit.id, modes: [1], baseVersion: 0 })).status).toBe(201);
  // A second background-noise check besides the demo's own (raw samples in its row).
  expect((await engineer.post(`/api/campaigns/${barId}/noise-checks/simulate`).send({ durationS: 2, seed: 3, humHz: 50 })).status).toBe(201);
  // The live input's scaling of every channel and a calibrator check through it (routes/live-input.ts).
  const chans = (await lead.get(`/api/campaigns/${barId}/channels`)).body.channels as { id: string; channel: number; kind: string }[];
  for (const c of chans) expect((await lead.put(`/api/campaigns/${barId}/channels/${c.id}/input-scaling`).send({ fullScaleVolts: c.channel === 1 ? 0.5 : 5, acLowCutHz: 3 })).status).toBe(200);
  const accel = chans.find((c) => c.kind === 'accelerometer')!;
  // 0.1 V RMS at 10 m/s² RMS: 10 mV/(m/s²) measured (sensitivity = V_rms / level).
  expect((await engineer.post(`/api/campaigns/${barId}/sensitivity-checks`).send({ channelId: accel.id, referenceMs2Rms: 10, referenceHz: 159.2, measuredVoltsRms: 0.1, measuredHz: 159.3, sampleRateHz: 48_000, durationS: 2 })).status).toBe(201);
  // A note with a photo, stored under an Idempotency-Key (routes/dof-note-upload.ts).
  const first = ((await lead.get(`/api/campaigns/${barId}/schedule`)).body.entries as { id: string; position: number }[])[0]!;
  notePosition = first.position;
  expect((await postNote(engineer, barId, first.id)).status).toBe(201);
  const res = await binary(lead.get(`/api/campaigns/${barId}/backup`));
  expect(res.status).toBe(200);
  backup = res.body as Buffer;
}, 240_000);
afterAll(async () => {
  await app?.close();
});

describe('campaign backup', () => {
  it('is a zip with a manifest, every campaign table and each hit’s samples with their SHA-256', async () => {
    const files = unzipSync(new Uint8Array(backup));
    const manifest = JSON.parse(Buffer.from(files['manifest.json']!).toString('utf8'));
    expect(manifest.format).toBe('resonote-campaign-backup');
    expect(manifest.version).toBe(1);
    expect(manifest.sourceUrl).toBe(app.config.publicUrl);
    expect(Date.now() - Date.parse(manifest.exportedAt)).toBeLessThan(120_000);
    for (const t of ['campaign', 'point', 'line', 'schedule_entry', 'kit_item', 'calibration_record', 'channel', 'channel_input', 'sensitivity_check', 'acquisition_settings', 'audit_event', 'hit', 'noise_check', 'frf_result', 'modal_fit', 'mode_table', 'mode_table_row', 'dof_note', 'dof_note_key', 'campaign_member']) {
      expect(files[`tables/${t}.json`], t).toBeDefined();
      expect(JSON.parse(Buffer.from(files[`tables/${t}.json`]!).toString('utf8')), t).toHaveLength(manifest.counts[t]);
    }
    const db = app.handle.database.db;
    const stored = await db.select({ id: hit.id, samples: hit.samples }).from(hit).where(eq(hit.campaignId, barId));
    expect(stored.length).toBe(manifest.counts.hit);
    expect(manifest.counts.modal_fit).toBe(1);
    expect(manifest.counts.dof_note_key).toBe(1);
    expect(manifest.counts.noise_check).toBe(2); // the demo's check before the first hit, and the one above
    for (const h of stored) {
      expect(sha(files[`samples/${h.id}.f32`]!)).toBe(sha(h.samples));
      expect(manifest.samples[h.id].sha256).toBe(sha(h.samples));
    }
  });
});

describe('campaign restore', () => {
  let restoredId: string;

  it('restores as a new campaign led by the restorer, raw samples byte-identical, counts equal', async () => {
    const res = await lead.post('/api/campaigns/restore').attach('file', backup, 'bar.resonote-backup.zip');
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    restoredId = res.body.campaign.id;
    expect(restoredId).not.toBe(barId);
    expect(res.body.campaign.name).toBe(`${BAR_CAMPAIGN} (restored)`);
    const manifest = JSON.parse(Buffer.from(unzipSync(new Uint8Array(backup))['manifest.json']!).toString('utf8'));
    for (const [table, n] of Object.entries(res.body.counts)) expect(n, table).toBe(manifest.counts[table]);
    const mine = (await lead.get(`/api/campaigns/${restoredId}`)).body;
    expect(mine.myRole).toBe('lead');
    // Members are not copied without ?members=1: the lead alone.
    expect((await lead.get(`/api/campaigns/${restoredId}/members`)).body.members).toHaveLength(1);
    expect(await sampleHashes(restoredId)).toEqual(await sampleHashes(barId));
    const [a, b] = await Promise.all([lead.get(`/api/campaigns/${barId}/schedule`), lead.get(`/api/campaigns/${restoredId}/schedule`)]);
    expect(b.body.entries.map((e: { responseDof: string; excitationDof: string; status: string; acceptedHits: number; rejectedHits: number }) => [e.responseDof, e.excitationDof, e.status, e.acceptedHits, e.rejectedHits])).toEqual(
      a.body.entries.map((e: { responseDof: string; excitationDof: string; status: string; acceptedHits: number; rejectedHits: number }) => [e.responseDof, e.excitationDof, e.status, e.acceptedHits, e.rejectedHits]),
    );
    // The noise check comes back with byte-identical samples and the same reading.
    const db = app.handle.database.db;
    const [noiseA, noiseB] = await Promise.all([barId, restoredId].map((id) => db.select().from(noiseCheck).where(eq(noiseCheck.campaignId, id)).orderBy(asc(noiseCheck.recordedAt))));
    expect(noiseB).toHaveLength(2);
    expect(noiseB!.map((n) => sha(n.samples))).toEqual(noiseA!.map((n) => sha(n.samples)));
    expect(noiseB!.map((n) => n.results)).toEqual(noiseA!.map((n) => n.results));
    // The mode table comes back, its row pointing at the restored fit.
    const [tableA, tableB] = [(await lead.get(`/api/campaigns/${barId}/modes`)).body, (await lead.get(`/api/campaigns/${restoredId}/modes`)).body];
    expect(tableB.modes.map((m: { fHz: number; zetaPercent: number }) => [m.fHz, m.zetaPercent])).toEqual(tableA.modes.map((m: { fHz: number; zetaPercent: number }) => [m.fHz, m.zetaPercent]));
    const restoredFits = (await lead.get(`/api/campaigns/${restoredId}/modes/fits`)).body.fits.map((f: { id: string }) => f.id);
    expect(restoredFits).toContain(tableB.modes[0].source.fitId);
    const settings = [(await lead.get(`/api/campaigns/${barId}/settings`)).body, (await lead.get(`/api/campaigns/${restoredId}/settings`)).body];
    expect(settings[1].current.settings).toEqual(settings[0].current.settings);
    expect(settings[1].history.length).toBe(settings[0].history.length);
  });

  it('brings back each channel’s input scaling and the calibrator checks, on the restored channels, with their checker', async () => {
    const db = app.handle.database.db;
    const scaling = async (id: string) =>
      (await db.select({ n: channel.channel, v: channelInput.fullScaleVolts, cut: channelInput.acLowCutHz, version: channelInput.version }).from(channelInput).innerJoin(channel, eq(channel.id, channelInput.channelId)).where(eq(channelInput.campaignId, id)).orderBy(asc(channel.channel)));
    const a = await scaling(barId);
    expect(a.length).toBeGreaterThan(1);
    expect(await scaling(restoredId)).toEqual(a);
    const checks = async (id: string) =>
      db.select({ n: channel.channel, chCampaign: channel.campaignId, check: sensitivityCheck }).from(sensitivityCheck).innerJoin(channel, eq(channel.id, sensitivityCheck.channelId)).where(eq(sensitivityCheck.campaignId, id));
    const [ca, cb] = [await checks(barId), await checks(restoredId)];
    expect(cb).toHaveLength(1);
    expect(cb[0]!.chCampaign).toBe(restoredId);
    expect(cb[0]!.n).toBe(ca[0]!.n);
    // The stored numbers unchanged: 0.1 V / 10 m/s² = 10 mV/(m/s²); the checker is an account the lead shares the campaign with.
    expect(cb[0]!.check.measuredSensitivity).toBeCloseTo(10, 12);
    for (const k of ['measuredVoltsRms', 'kitSensitivity', 'deviationPercent', 'deviationDb', 'checkedAt', 'checkedBy'] as const) expect(cb[0]!.check[k], k).toEqual(ca[0]!.check[k]);
  });

  it('keeps each note’s Idempotency-Key: the same note upload retried at the restored campaign replays the restored note and stores nothing twice', async () => {
    const db = app.handle.database.db;
    const notesOf = async (id: string) => db.select({ id: dofNote.id, entryId: dofNote.entryId, text: dofNote.text }).from(dofNote).where(eq(dofNote.campaignId, id));
    const keysOf = async (id: string) => db.select({ key: dofNoteKey.key, entryId: dofNoteKey.entryId, noteId: dofNoteKey.noteId }).from(dofNoteKey).where(eq(dofNoteKey.campaignId, id));
    const [restoredNotes, restoredKeys] = [await notesOf(restoredId), await keysOf(restoredId)];
    expect(restoredNotes).toHaveLength(1);
    // The key points at the restored note and entry, not at the original campaign's ids.
    expect(restoredKeys).toEqual([{ key: NOTE_KEY, entryId: restoredNotes[0]!.entryId, noteId: restoredNotes[0]!.id }]);
    const entry = ((await lead.get(`/api/campaigns/${restoredId}/schedule`)).body.entries as { id: string; position: number }[]).find((e) => e.position === notePosition)!;
    expect(entry.id).toBe(restoredNotes[0]!.entryId);
    const again = await postNote(lead, restoredId, entry.id);
    expect(again.status, JSON.stringify(again.body)).toBe(200);
    expect(again.body.replayed).toBe(true);
    expect(again.body.note).toMatchObject({ id: restoredNotes[0]!.id, text: 'Wax mount, re-seated after hit 3.', photo: { mime: 'image/png', size: notePhoto.length } });
    expect(await notesOf(restoredId)).toHaveLength(1);
    // The same key with another text is still refused there (422), as at the original campaign.
    const other = await lead.post(`/api/campaigns/${restoredId}/schedule/${entry.id}/notes`).set('Idempotency-Key', NOTE_KEY).field('topic', 'tip').field('text', 'Another note');
    expect(other.status).toBe(422);
    expect(other.body.error.code).toBe('idempotency-key-reused');
  });

  it('restores a backup written before the live input existed (no tables/channel_input.json, tables/sensitivity_check.json) with none', async () => {
    const files = unzipSync(new Uint8Array(backup));
    const manifest = JSON.parse(Buffer.from(files['manifest.json']!).toString('utf8'));
    delete manifest.counts.channel_input;
    delete manifest.counts.sensitivity_check;
    const { 'tables/channel_input.json': _a, 'tables/sensitivity_check.json': _b, ...older } = files;
    const res = await lead.post('/api/campaigns/restore').attach('file', Buffer.from(zipSync({ ...older, 'manifest.json': new TextEncoder().encode(JSON.stringify(manifest)) })), 'older-live.zip');
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    expect(res.body.counts.channel_input).toBe(0);
    expect(res.body.counts.sensitivity_check).toBe(0);
    expect((await lead.get(`/api/campaigns/${res.body.campaign.id}/input-scaling`)).body.scaling).toEqual([]);
  });

  it('gives the restored campaign the same FRF as the original, to full precision', async () => {
    const original = (await lead.get(`/api/campaigns/${barId}/schedule`)).body.entries as { id: string; position: number }[];
    const restored = (await lead.get(`/api/campaigns/${restoredId}/schedule`)).body.entries as { id: string; position: number }[];
    for (const pos of [0, 10, 20]) {
      const o = original.find((e) => e.position === original[pos]!.position)!;
      const r = restored.find((e) => e.position === o.position)!;
      const [fo, fr] = [(await lead.get(`/api/campaigns/${barId}/schedule/${o.id}/frf?band=all`)).body, (await lead.get(`/api/campaigns/${restoredId}/schedule/${r.id}/frf?band=all`)).body];
      expect(fr.f).toEqual(fo.f);
      expect(fr.channels[0].h1).toEqual(fo.channels[0].h1);
      expect(fr.channels[0].coherence).toEqual(fo.channels[0].coherence);
      expect(fr.averages).toBe(fo.averages);
    }
  });

  it('copies the audit trail and adds a restore event', async () => {
    const db = app.handle.database.db;
    const trail = async (id: string) => (await db.select({ entity: auditEvent.entity, action: auditEvent.action, at: auditEvent.at }).from(auditEvent).where(eq(auditEvent.campaignId, id)).orderBy(asc(auditEvent.id))).map((e) => `${e.entity}/${e.action}/${e.at.toISOString()}`);
    const original = await trail(barId);
    const restored = await trail(restoredId);
    expect(restored.slice(0, original.length)).toEqual(original);
    expect(restored).toHaveLength(original.length + 1);
    const events = (await lead.get(`/api/campaigns/${restoredId}/audit?limit=1`)).body.events;
    expect(events[0].action).toBe('restore');
    expect(events[0].after.from.campaignId).toBe(barId);
  });

  it('invites the backup’s other members with their backup roles when asked with ?members=1; nobody joins before accepting', async () => {
    const res = await admin.post('/api/campaigns/restore?members=1').attach('file', backup, 'bar.zip');
    expect(res.status).toBe(201);
    const id = res.body.campaign.id as string;
    // The demo campaign's members besides the restorer (the demo admin): lead, engineer, viewer.
    expect(res.body.invited).toEqual(
      expect.arrayContaining([
        { email: 'lead@demo.resonote.local', role: 'lead' },
        { email: 'engineer@demo.resonote.local', role: 'engineer' },
        { email: 'viewer@demo.resonote.local', role: 'viewer' },
      ]),
    );
    expect(res.body.notInvited).toEqual([]);
    const members = (await admin.get(`/api/campaigns/${id}/members`)).body.members as { email: string; role: string }[];
    expect(members.map((m) => [m.email, m.role])).toEqual([['admin@demo.resonote.local', 'lead']]);
    const open = (await admin.get(`/api/campaigns/${id}/invitations`)).body.invitations as { email: string; role: string }[];
    expect(open.map((i) => `${i.email}/${i.role}`).sort()).toEqual(res.body.invited.map((i: { email: string; role: string }) => `${i.email}/${i.role}`).sort());
    expect((await engineer.get(`/api/campaigns/${id}`)).status).toBe(404);

    // The engineer accepts through the mailed link and only then holds the role.
    const restoredName = `${BAR_CAMPAIGN} (restored)`.replace(/[.*+?^${}()|[\]\\]/g, '\\$&');
    const mail = await waitForMail(app, 'engineer@demo.resonote.local', new RegExp(`invites you to the Resonote campaign “${restoredName}”`));
    expect(mail.text).toMatch(/restored from a backup that lists you as a member; you join it only if you accept/);
    const token = mail.text.match(/\/invitations\/([A-Za-z0-9_-]+)/)![1]!;
    expect((await engineer.post(`/api/invitations/${token}/accept`).send({})).status).toBe(200);
    expect((await engineer.get(`/api/campaigns/${id}`)).body.myRole).toBe('engineer');
  });

  it('restores a backup written before noise checks existed (no tables/noise_check.json) with none', async () => {
    const files = unzipSync(new Uint8Array(backup));
    const manifest = JSON.parse(Buffer.from(files['manifest.json']!).toString('utf8'));
    delete manifest.counts.noise_check;
    const { 'tables/noise_check.json': _dropped, ...older } = files;
    const res = await lead.post('/api/campaigns/restore').attach('file', Buffer.from(zipSync({ ...older, 'manifest.json': new TextEncoder().encode(JSON.stringify(manifest)) })), 'older.zip');
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    expect(res.body.counts.noise_check).toBe(0);
    expect(res.body.counts.hit).toBe(manifest.counts.hit);
  });

  it('restores a backup written before the mode table existed (no tables/mode_table*.json) with an empty table', async () => {
    const files = unzipSync(new Uint8Array(backup));
    const manifest = JSON.parse(Buffer.from(files['manifest.json']!).toString('utf8'));
    delete manifest.counts.mode_table;
    delete manifest.counts.mode_table_row;
    const { 'tables/mode_table.json': _a, 'tables/mode_table_row.json': _b, ...older } = files;
    const res = await lead.post('/api/campaigns/restore').attach('file', Buffer.from(zipSync({ ...older, 'manifest.json': new TextEncoder().encode(JSON.stringify(manifest)) })), 'older-modes.zip');
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    expect(res.body.counts.mode_table_row).toBe(0);
    const table = (await lead.get(`/api/campaigns/${res.body.campaign.id}/modes`)).body;
    expect(table.modes).toEqual([]);
    expect(table.version).toBe(0);
  });

  it('refuses a backup whose samples do not match the manifest, and writes nothing', async () => {
    const files = unzipSync(new Uint8Array(backup));
    const name = Object.keys(files).find((f) => f.startsWith('samples/'))!;
    const altered = new Uint8Array(files[name]!);
    altered[100] = altered[100]! ^ 0x01;
    const before = await campaignCount();
    const hitsBefore = (await app.handle.database.db.select({ n: count() }).from(hit))[0]!.n;
    const res = await lead.post('/api/campaigns/restore').attach('file', Buffer.from(zipSync({ ...files, [name]: altered })), 'tampered.zip');
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('backup-corrupt');
    expect(res.body.error.message).toMatch(/SHA-256/);
    expect(await campaignCount()).toBe(before);
    expect((await app.handle.database.db.select({ n: count() }).from(hit))[0]!.n).toBe(hitsBefore);
  });

  it('refuses files that are not backups with a clear 400', async () => {
    const cases: [Buffer, RegExp][] = [
      [Buffer.from('label,x,y,z\nB01,0,0,0\n'), /not a zip/],
      [Buffer.from(zipSync({ 'readme.txt': new TextEncoder().encode('hello') })), /manifest\.json is missing/],
      [Buffer.from(zipSync({ 'manifest.json': new TextEncoder().encode(JSON.stringify({ format: 'something-else', version: 1 })) })), /manifest\.json does not describe/],
    ];
    for (const [file, message] of cases) {
      const res = await lead.post('/api/campaigns/restore').attach('file', file, 'x.zip');
      expect(res.status).toBe(400);
      expect(res.body.error.code).toBe('not-a-backup');
      expect(res.body.error.message).toMatch(message);
    }
    const noFile = await lead.post('/api/campaigns/restore').field('members', '1');
    expect(noFile.status).toBe(400);
    expect((await lead.post('/api/campaigns/restore').send({})).status).toBe(415);
  });

  it('lets only admins and campaign leads restore, and only leads and admins back up', async () => {
    // The demo engineer leads no campaign.
    const res = await engineer.post('/api/campaigns/restore').attach('file', backup, 'bar.zip');
    expect(res.status).toBe(403);
    expect((await viewer.get(`/api/campaigns/${barId}/backup`)).status).toBe(403);
    const db = app.handle.database.db;
    const [eng] = await db.select({ id: user.id }).from(user).where(eq(user.email, 'engineer@demo.resonote.local'));
    const led = await db.select().from(campaignMember).where(eq(campaignMember.userId, eng!.id));
    expect(led.every((m) => m.role !== 'lead')).toBe(true);
  });
});

describe('restore from an edited backup', () => {
  /** The backup with its JSON tables changed by `edit` (as anyone holding the file can). */
  function edited(edit: (tables: { members: { userId: string; role: string; email: string; name: string }[]; users: { id: string; name: string; email: string }[] }) => void): Buffer {
    const files = unzipSync(new Uint8Array(backup));
    const read = (name: string) => JSON.parse(Buffer.from(files[name]!).toString('utf8'));
    const tables = { members: read('tables/campaign_member.json'), users: read('tables/users.json') };
    edit(tables);
    const enc = (v: unknown) => new TextEncoder().encode(JSON.stringify(v));
    return Buffer.from(zipSync({ ...files, 'tables/campaign_member.json': enc(tables.members), 'tables/users.json': enc(tables.users) }));
  }

  it('grants no role to an existing account that the backup lists as lead: it gets an invitation it may accept or not', async () => {
    const target = await signUp(app, 'Tara Target', 'tara@lab.test');
    const file = edited(({ members }) => members.push({ userId: 'not-a-local-id', role: 'lead', email: 'tara@lab.test', name: 'Tara Target' }));
    const res = await lead.post('/api/campaigns/restore?members=1').attach('file', file, 'edited.zip');
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    const id = res.body.campaign.id as string;
    expect((await target.agent.get(`/api/campaigns/${id}`)).status).toBe(404);
    const db = app.handle.database.db;
    const rows = await db.select({ userId: campaignMember.userId, role: campaignMember.role }).from(campaignMember).where(eq(campaignMember.campaignId, id));
    expect(rows).toHaveLength(1);
    expect(res.body.invited).toContainEqual({ email: 'tara@lab.test', role: 'lead' });
  });

  it('answers the same whether or not an address has an account here', async () => {
    await signUp(app, 'Hana Here', 'hana@lab.test');
    const withAddress = (email: string) => edited(({ members }) => members.push({ userId: 'x', role: 'viewer', email, name: 'Someone' }));
    const answers = [];
    for (const email of ['hana@lab.test', 'nobody-here@lab.test']) {
      const res = await lead.post('/api/campaigns/restore?members=1').attach('file', withAddress(email), 'edited.zip');
      expect(res.status).toBe(201);
      const { campaign: _c, ...rest } = res.body;
      answers.push(JSON.stringify(rest).replaceAll(email, '<address>'));
    }
    expect(answers[1]).toBe(answers[0]);
    expect(answers[0]).toContain('{"email":"<address>","role":"viewer"}');
  }, 150_000); // two full restores: about 30 s each on a loaded 2-core machine

  it('records as nobody the hits a backup attributes to an address the restorer shares no campaign with', async () => {
    const stranger = await signUp(app, 'Sam Stranger', 'stranger@lab.test');
    // The backup's engineer (who recorded the hits) renamed to the stranger's address.
    const file = edited(({ users }) => {
      for (const u of users) if (u.email === 'engineer@demo.resonote.local') u.email = 'stranger@lab.test';
    });
    const res = await lead.post('/api/campaigns/restore').attach('file', file, 'edited.zip');
    expect(res.status).toBe(201);
    const db = app.handle.database.db;
    const recorders = new Set((await db.select({ by: hit.recordedBy }).from(hit).where(eq(hit.campaignId, res.body.campaign.id))).map((h) => h.by));
    expect(recorders.has(stranger.id)).toBe(false);
    expect(recorders.has(null)).toBe(true);

    // Unedited, the same lead's restore keeps the engineer (a colleague in the demo campaign) as recorder.
    const plain = await lead.post('/api/campaigns/restore').attach('file', backup, 'bar.zip');
    const [eng] = await db.select({ id: user.id }).from(user).where(eq(user.email, 'engineer@demo.resonote.local'));
    const plainRecorders = new Set((await db.select({ by: hit.recordedBy }).from(hit).where(eq(hit.campaignId, plain.body.campaign.id))).map((h) => h.by));
    expect(plainRecorders.has(eng!.id)).toBe(true);
  });

  it('refuses a backup that lists more members than one restore invites, and writes nothing', async () => {
    const file = edited(({ members }) => {
      for (let i = 0; i < 101; i++) members.push({ userId: `u${i}`, role: 'viewer', email: `many-${i}@lab.test`, name: `M ${i}` });
    });
    const before = await campaignCount();
    const res = await lead.post('/api/campaigns/restore?members=1').attach('file', file, 'many.zip');
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('too-many-members');
    expect(await campaignCount()).toBe(before);
  });
});
