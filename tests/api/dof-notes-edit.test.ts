// Notes per DOF after they are left: edit and delete by the author or a lead (403 for another
// engineer, 404 elsewhere, 409 on a stale version), audited; the Idempotency-Key of note uploads
// (the same key twice stores once and answers the same); photo thumbnails; and the tip a simulated
// strike records, chosen from the hammer's registered tips.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { randomUUID } from 'node:crypto';
import { DOF_THUMB_MAX_BYTES } from '@resonote/contracts';
import { startTestApp, type TestApp } from '../support/app.ts';
import { API_TEMPLATE } from '../support/global-setup-api.ts';
import { barCrew, type RigCampaign } from '../support/rig.ts';
import { invite, type Person } from '../support/campaign.ts';
import { signUp } from '../support/accounts.ts';
import { platePng } from '../support/photo.ts';

let app: TestApp;
let lead: Person;
let engineer: Person;
let other: Person;
let viewer: Person;
let rig: RigCampaign;
let base: string;
let entryId: string;
let otherEntryId: string;
const key = () => `note-${randomUUID()}`;

beforeAll(async () => {
  app = await startTestApp(API_TEMPLATE);
  ({ lead, engineer, viewer, rig } = await barCrew(app));
  other = await signUp(app, 'Olga Other', 'other@lab.test');
  await invite(app, lead, rig.campaignId, other, 'engineer');
  base = `/api/campaigns/${rig.campaignId}`;
  entryId = rig.entries[0]!.id;
  otherEntryId = rig.entries[1]!.id;
}, 120_000);
afterAll(async () => {
  await app?.close();
});

async function leaveNote(by: Person, text: string) {
  const res = await by.agent.post(`${base}/schedule/${entryId}/notes`).set('Idempotency-Key', key()).field('topic', 'other').field('text', text);
  expect(res.status, JSON.stringify(res.body)).toBe(201);
  return res.body.note as { id: string; version: number; text: string };
}

describe('editing and deleting a note', () => {
  it('lets the author change the text and topic, raising the version and recording both versions in the audit trail', async () => {
    const note = await leaveNote(engineer, 'Wax mount.');
    expect(note.version).toBe(1);
    const res = await engineer.agent.patch(`${base}/notes/${note.id}`).send({ text: 'Wax mount, re-seated after hit 3.', topic: 'sensor-mounting', version: 1 });
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    expect(res.body.note).toMatchObject({ id: note.id, text: 'Wax mount, re-seated after hit 3.', topic: 'sensor-mounting', version: 2 });
    expect(res.body.note.editedAt).not.toBeNull();
    const events = (await lead.agent.get(`${base}/audit`).query({ entity: 'dof-note', limit: 100 })).body.events as { entityId: string; action: string; before: { text: string }; after: { text: string; version: number } }[];
    const update = events.find((e) => e.entityId === note.id && e.action === 'update')!;
    expect(update.before.text).toBe('Wax mount.');
    expect(update.after).toMatchObject({ text: 'Wax mount, re-seated after hit 3.', version: 2 });
  });

  it('refuses an edit made from a stale version with 409 and the current note, and changes nothing', async () => {
    const note = await leaveNote(engineer, 'First words.');
    expect((await engineer.agent.patch(`${base}/notes/${note.id}`).send({ text: 'Second words.', version: 1 })).status).toBe(200);
    const stale = await lead.agent.patch(`${base}/notes/${note.id}`).send({ text: 'Lead’s words from an old screen.', version: 1 });
    expect(stale.status).toBe(409);
    expect(stale.body.error.code).toBe('stale-version');
    expect(stale.body.error.details.current).toMatchObject({ id: note.id, text: 'Second words.', version: 2 });
    const staleDelete = await engineer.agent.delete(`${base}/notes/${note.id}`).query({ version: 1 });
    expect(staleDelete.status).toBe(409);
    const list = (await viewer.agent.get(`${base}/notes`)).body.notes as { id: string; text: string }[];
    expect(list.find((n) => n.id === note.id)!.text).toBe('Second words.');
  });

  it('lets a lead edit and delete anyone’s note, and refuses another engineer with 403 and a viewer with 403', async () => {
    const note = await leaveNote(engineer, 'Cable taped to the bar.');
    const byOther = await other.agent.patch(`${base}/notes/${note.id}`).send({ text: 'mine now', version: 1 });
    expect(byOther.status).toBe(403);
    expect(byOther.body.error.code).toBe('not-note-author');
    expect((await other.agent.delete(`${base}/notes/${note.id}`).query({ version: 1 })).status).toBe(403);
    expect((await viewer.agent.patch(`${base}/notes/${note.id}`).send({ text: 'x', version: 1 })).status).toBe(403);
    const edited = await lead.agent.patch(`${base}/notes/${note.id}`).send({ text: 'Cable taped to the bar at 100 mm.', version: 1 });
    expect(edited.status).toBe(200);
    const removed = await lead.agent.delete(`${base}/notes/${note.id}`).query({ version: 2 });
    expect(removed.status).toBe(204);
    const list = (await viewer.agent.get(`${base}/notes`)).body.notes as { id: string }[];
    expect(list.some((n) => n.id === note.id)).toBe(false);
    const events = (await lead.agent.get(`${base}/audit`).query({ entity: 'dof-note', limit: 100 })).body.events as { entityId: string; action: string; before: { text: string } }[];
    expect(events.find((e) => e.entityId === note.id && e.action === 'delete')!.before.text).toBe('Cable taped to the bar at 100 mm.');
  });

  it('answers 404 for an unknown or malformed note id and 400 for an edit without a change, a version or with unknown fields', async () => {
    const note = await leaveNote(engineer, 'Something odd at 300 Hz.');
    expect((await engineer.agent.patch(`${base}/notes/00000000-0000-4000-8000-000000000000`).send({ text: 'x', version: 1 })).status).toBe(404);
    expect((await engineer.agent.patch(`${base}/notes/not-a-uuid`).send({ text: 'x', version: 1 })).status).toBe(404);
    expect((await engineer.agent.delete(`${base}/notes/00000000-0000-4000-8000-000000000000`).query({ version: 1 })).status).toBe(404);
    const nothing = await engineer.agent.patch(`${base}/notes/${note.id}`).send({ version: 1 });
    expect(nothing.status).toBe(400);
    expect(nothing.body.error.code).toBe('invalid-input');
    expect((await engineer.agent.patch(`${base}/notes/${note.id}`).send({ text: 'x' })).status).toBe(400);
    expect((await engineer.agent.patch(`${base}/notes/${note.id}`).send({ text: 'x', version: 1, authorId: 'someone' })).status).toBe(400);
    expect((await engineer.agent.patch(`${base}/notes/${note.id}`).send({ text: 'x'.repeat(2001), version: 1 })).status).toBe(400);
    expect((await engineer.agent.delete(`${base}/notes/${note.id}`)).status).toBe(400);
    const emptied = await engineer.agent.patch(`${base}/notes/${note.id}`).send({ text: '  ', version: 1 });
    expect(emptied.status).toBe(400);
    expect(emptied.body.error.message).toMatch(/delete the note instead/);
  });
});

describe('the Idempotency-Key of a note upload', () => {
  it('stores a note once when the same upload comes twice with one key, and answers the second with the same note', async () => {
    const k = key();
    const png = platePng();
    const send = () => engineer.agent.post(`${base}/schedule/${entryId}/notes`).set('Idempotency-Key', k).field('topic', 'sensor-mounting').field('text', 'Stud mount, 2 N·m.').attach('file', png, 'mount.png');
    const first = await send();
    expect(first.status, JSON.stringify(first.body)).toBe(201);
    expect(first.body.replayed).toBe(false);
    const again = await send();
    expect(again.status).toBe(200);
    expect(again.body.replayed).toBe(true);
    expect(again.body.note).toEqual(first.body.note);
    const list = (await viewer.agent.get(`${base}/notes`)).body.notes as { text: string }[];
    expect(list.filter((n) => n.text === 'Stud mount, 2 N·m.')).toHaveLength(1);
  });

  it('takes the key as a form field too, and refuses a missing, malformed or disagreeing key with 400', async () => {
    const viaField = await engineer.agent.post(`${base}/schedule/${entryId}/notes`).field('idempotencyKey', key()).field('text', 'Key as a field.');
    expect(viaField.status).toBe(201);
    const missing = await engineer.agent.post(`${base}/schedule/${entryId}/notes`).field('text', 'No key.');
    expect(missing.status).toBe(400);
    expect(missing.body.error.message).toMatch(/Idempotency-Key/);
    expect((await engineer.agent.post(`${base}/schedule/${entryId}/notes`).set('Idempotency-Key', 'short').field('text', 'x')).status).toBe(400);
    expect((await engineer.agent.post(`${base}/schedule/${entryId}/notes`).set('Idempotency-Key', key()).field('idempotencyKey', key()).field('text', 'x')).status).toBe(400);
    const list = (await viewer.agent.get(`${base}/notes`)).body.notes as { text: string }[];
    expect(list.some((n) => n.text === 'No key.')).toBe(false);
  });

  it('refuses the same key with another note (422) or at another entry (409), storing nothing', async () => {
    const k = key();
    expect((await engineer.agent.post(`${base}/schedule/${entryId}/notes`).set('Idempotency-Key', k).field('text', 'Original.')).status).toBe(201);
    const changed = await engineer.agent.post(`${base}/schedule/${entryId}/notes`).set('Idempotency-Key', k).field('text', 'Different text.');
    expect(changed.status).toBe(422);
    expect(changed.body.error.code).toBe('idempotency-key-reused');
    const elsewhere = await engineer.agent.post(`${base}/schedule/${otherEntryId}/notes`).set('Idempotency-Key', k).field('text', 'Original.');
    expect(elsewhere.status).toBe(409);
    expect(elsewhere.body.error.code).toBe('idempotency-key-other-entry');
    const list = (await viewer.agent.get(`${base}/notes`)).body.notes as { text: string }[];
    expect(list.filter((n) => n.text === 'Original.')).toHaveLength(1);
    expect(list.some((n) => n.text === 'Different text.')).toBe(false);
  });

  it('answers a retry of a note deleted since with 409, storing nothing again', async () => {
    const k = key();
    const first = await engineer.agent.post(`${base}/schedule/${entryId}/notes`).set('Idempotency-Key', k).field('text', 'Soon gone.');
    expect((await engineer.agent.delete(`${base}/notes/${first.body.note.id}`).query({ version: 1 })).status).toBe(204);
    const retry = await engineer.agent.post(`${base}/schedule/${entryId}/notes`).set('Idempotency-Key', k).field('text', 'Soon gone.');
    expect(retry.status).toBe(409);
    expect(retry.body.error.code).toBe('idempotency-key-note-deleted');
  });
});

describe('photo thumbnails', () => {
  it('serves the thumbnail sent beside a photo byte for byte, and marks the note as having one', async () => {
    const photo = platePng(640, 480);
    const thumb = platePng(64, 48);
    const res = await engineer.agent.post(`${base}/schedule/${entryId}/notes`).set('Idempotency-Key', key()).field('text', 'With a thumbnail.').attach('file', photo, 'big.png').attach('thumbnail', thumb, 'thumb.png');
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    expect(res.body.note.photo).toEqual({ mime: 'image/png', size: photo.length, thumbnail: true });
    const got = await viewer.agent.get(`${base}/notes/${res.body.note.id}/thumbnail`).buffer(true).parse((r, done) => {
      const parts: Buffer[] = [];
      r.on('data', (c: Buffer) => parts.push(c));
      r.on('end', () => done(null, Buffer.concat(parts)));
    });
    expect(got.status).toBe(200);
    expect(got.headers['content-type']).toBe('image/png');
    expect(Buffer.compare(got.body as Buffer, thumb)).toBe(0);
    // The report embeds the thumbnail, not the full photo.
    const report = await viewer.agent.get(`${base}/report.html`);
    expect(report.text).toContain(`data:image/png;base64,${thumb.toString('base64')}`);
    expect(report.text).not.toContain(photo.toString('base64'));
  });

  it('answers 404 no-thumbnail for a photo sent without one, and refuses a thumbnail that is too large (413), not an image (415) or without a photo (400)', async () => {
    const plain = await engineer.agent.post(`${base}/schedule/${entryId}/notes`).set('Idempotency-Key', key()).attach('file', platePng(), 'p.png');
    expect(plain.body.note.photo.thumbnail).toBe(false);
    const none = await viewer.agent.get(`${base}/notes/${plain.body.note.id}/thumbnail`);
    expect(none.status).toBe(404);
    expect(none.body.error.code).toBe('no-thumbnail');
    const big = Buffer.concat([platePng(8, 8), Buffer.alloc(DOF_THUMB_MAX_BYTES)]);
    const tooBig = await engineer.agent.post(`${base}/schedule/${entryId}/notes`).set('Idempotency-Key', key()).attach('file', platePng(), 'p.png').attach('thumbnail', big, 't.png');
    expect(tooBig.status).toBe(413);
    expect(tooBig.body.error.code).toBe('thumbnail-too-large');
    const notImage = await engineer.agent.post(`${base}/schedule/${entryId}/notes`).set('Idempotency-Key', key()).attach('file', platePng(), 'p.png').attach('thumbnail', Buffer.from('<svg/>'), 't.png');
    expect(notImage.status).toBe(415);
    const alone = await engineer.agent.post(`${base}/schedule/${entryId}/notes`).set('Idempotency-Key', key()).field('text', 'x').attach('thumbnail', platePng(8, 8), 't.png');
    expect(alone.status).toBe(400);
    expect((await viewer.agent.get(`${base}/notes/not-a-uuid/thumbnail`)).status).toBe(404);
  });
});

describe('the tip of a simulated strike', () => {
  it('records a tip registered for the hammer with the hit, and refuses a tip the hammer does not have with 422', async () => {
    // tests/support/rig.ts registers the hammer with the tip "medium".
    const ok = await engineer.agent.post(`${base}/schedule/${entryId}/simulate`).send({ tipName: 'medium', seed: 11, doubleHitProbability: 0, overloadProbability: 0 });
    expect(ok.status, JSON.stringify(ok.body)).toBe(201);
    const detail = await viewer.agent.get(`${base}/hits/${ok.body.hits[0].id}`);
    expect(detail.body.hit?.source ?? detail.body.source).toMatch(/:tip=medium:tip-name=medium$/);
    const unknown = await engineer.agent.post(`${base}/schedule/${entryId}/simulate`).send({ tipName: 'steel' });
    expect(unknown.status).toBe(422);
    expect(unknown.body.error).toMatchObject({ code: 'tip-not-registered', details: { tips: ['medium'] } });
    expect((await engineer.agent.post(`${base}/schedule/${entryId}/simulate`).send({ tip: 'granite' })).status).toBe(400);
    expect((await engineer.agent.post(`${base}/schedule/${entryId}/simulate`).send({ tipName: '' })).status).toBe(400);
  });
});
