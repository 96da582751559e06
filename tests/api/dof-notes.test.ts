// Notes and photos per DOF: validation (type by the file's first bytes, size limit, empty notes),
// roles, storage byte for byte, the audit trail, and notes surviving a re-planned schedule.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createHash, randomUUID } from 'node:crypto';
import { PHOTO_MAX_BYTES } from '@resonote/contracts';
import { startTestApp, type TestApp } from '../support/app.ts';
import { API_TEMPLATE } from '../support/global-setup-api.ts';
import { barCrew, type RigCampaign } from '../support/rig.ts';
import type { Person } from '../support/campaign.ts';
import { jpegHead, platePng, webpHead } from '../support/photo.ts';

let app: TestApp;
let lead: Person;
let engineer: Person;
let viewer: Person;
let rig: RigCampaign;
let base: string;
let entryId: string;
/** A fresh Idempotency-Key for each note upload. */
const key = () => `note-${randomUUID()}`;

beforeAll(async () => {
  app = await startTestApp(API_TEMPLATE);
  ({ lead, engineer, viewer, rig } = await barCrew(app));
  base = `/api/campaigns/${rig.campaignId}`;
  entryId = rig.entries.find((e: { excitationDof: string }) => e.excitationDof === 'B04:+Z')!.id;
}, 120_000);
afterAll(async () => {
  await app?.close();
});

describe('notes and photos per DOF', () => {
  it('stores a note with a PNG photo byte for byte and serves it back as image/png', async () => {
    const png = platePng();
    const res = await engineer.agent.post(`${base}/schedule/${entryId}/notes`).set('Idempotency-Key', key()).field('topic', 'sensor-mounting').field('text', 'Wax mount; the surface was oily, cleaned with solvent.').attach('file', png, { filename: 'mount.jpg', contentType: 'image/jpeg' });
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    // The type comes from the PNG signature, not the .jpg name or the claimed content type.
    expect(res.body.note).toMatchObject({ topic: 'sensor-mounting', excitationDof: 'B04:+Z', responseDof: 'B21:+Z', authorName: 'Eric Engineer', photo: { mime: 'image/png', size: png.length } });
    const photo = await viewer.agent.get(`${base}/notes/${res.body.note.id}/photo`).buffer(true).parse((r, done) => {
      const parts: Buffer[] = [];
      r.on('data', (c: Buffer) => parts.push(c));
      r.on('end', () => done(null, Buffer.concat(parts)));
    });
    expect(photo.status).toBe(200);
    expect(photo.headers['content-type']).toBe('image/png');
    expect(photo.headers['x-content-type-options']).toBe('nosniff');
    expect(createHash('sha256').update(photo.body as Buffer).digest('hex')).toBe(createHash('sha256').update(png).digest('hex'));
    const list = await viewer.agent.get(`${base}/notes`).query({ entryId });
    expect(list.body.notes).toHaveLength(1);
    expect(list.body.notes[0]).toMatchObject({ text: 'Wax mount; the surface was oily, cleaned with solvent.', photo: { mime: 'image/png', size: png.length } });
  });

  it('takes a note without a photo, and JPEG and WebP photos by their signatures', async () => {
    const text = await engineer.agent.post(`${base}/schedule/${entryId}/notes`).set('Idempotency-Key', key()).field('topic', 'tip').field('text', 'Changed to the hard tip: the soft one rolled off at 400 Hz.');
    expect(text.status).toBe(201);
    expect(text.body.note.photo).toBeNull();
    const jpeg = await engineer.agent.post(`${base}/schedule/${entryId}/notes`).set('Idempotency-Key', key()).attach('file', jpegHead(), 'a.bin');
    expect(jpeg.status).toBe(201);
    expect(jpeg.body.note).toMatchObject({ topic: 'other', text: '', photo: { mime: 'image/jpeg' } });
    const webp = await engineer.agent.post(`${base}/schedule/${entryId}/notes`).set('Idempotency-Key', key()).attach('file', webpHead(), 'b.webp');
    expect(webp.body.note.photo.mime).toBe('image/webp');
  });

  it('refuses a file that is not a JPEG, PNG or WebP with 415, whatever its name says, and stores nothing', async () => {
    const before = (await viewer.agent.get(`${base}/notes`)).body.notes.length;
    const gif = await engineer.agent.post(`${base}/schedule/${entryId}/notes`).set('Idempotency-Key', key()).field('text', 'x').attach('file', Buffer.from('GIF89a\x01\x00\x01\x00', 'latin1'), { filename: 'photo.png', contentType: 'image/png' });
    expect(gif.status).toBe(415);
    expect(gif.body.error).toMatchObject({ code: 'unsupported-photo', details: { accepted: ['image/jpeg', 'image/png', 'image/webp'] } });
    expect(gif.body.error.message).toBe('The file "photo.png" is not a JPEG, PNG or WebP image (judged by its first bytes, not its name). Take or export the photo as JPEG, PNG or WebP. Nothing was stored.');
    const html = await engineer.agent.post(`${base}/schedule/${entryId}/notes`).set('Idempotency-Key', key()).attach('file', Buffer.from('<svg onload=alert(1)>'), 'x.webp');
    expect(html.status).toBe(415);
    expect((await viewer.agent.get(`${base}/notes`)).body.notes.length).toBe(before);
  });

  it(`refuses a photo over ${PHOTO_MAX_BYTES / 1024 / 1024} MB with 413, an empty note and an unknown topic with 400`, async () => {
    const big = Buffer.concat([platePng(8, 8), Buffer.alloc(PHOTO_MAX_BYTES)]);
    const tooBig = await engineer.agent.post(`${base}/schedule/${entryId}/notes`).set('Idempotency-Key', key()).attach('file', big, 'big.png');
    expect(tooBig.status).toBe(413);
    expect(tooBig.body.error.code).toBe('too-large');
    expect(tooBig.body.error.message).toMatch(/^The photo is larger than 8 MB/);
    const empty = await engineer.agent.post(`${base}/schedule/${entryId}/notes`).set('Idempotency-Key', key()).field('text', '   ');
    expect(empty.status).toBe(400);
    expect(empty.body.error.message).toBe('Write a note or attach a photo (or both); an empty note was not stored.');
    const topic = await engineer.agent.post(`${base}/schedule/${entryId}/notes`).set('Idempotency-Key', key()).field('topic', 'weather').field('text', 'x');
    expect(topic.status).toBe(400);
    expect(topic.body.error.details[0].path).toBe('topic');
    const json = await engineer.agent.post(`${base}/schedule/${entryId}/notes`).set('Idempotency-Key', key()).send({ text: 'x' });
    expect(json.status).toBe(415);
    const longText = await engineer.agent.post(`${base}/schedule/${entryId}/notes`).set('Idempotency-Key', key()).field('text', 'x'.repeat(2001));
    expect(longText.status).toBe(400);
  });

  it('lets viewers read but not write, answers 404 for another campaign’s entry or photo, and audits each note', async () => {
    const asViewer = await viewer.agent.post(`${base}/schedule/${entryId}/notes`).set('Idempotency-Key', key()).field('text', 'x');
    expect(asViewer.status).toBe(403);
    const unknownEntry = await engineer.agent.post(`${base}/schedule/00000000-0000-4000-8000-000000000000/notes`).set('Idempotency-Key', key()).field('text', 'x');
    expect(unknownEntry.status).toBe(404);
    const unknownPhoto = await viewer.agent.get(`${base}/notes/00000000-0000-4000-8000-000000000000/photo`);
    expect(unknownPhoto.status).toBe(404);
    expect(unknownPhoto.body.error.code).toBe('not-found');
    const events = await lead.agent.get(`${base}/audit`).query({ entity: 'dof-note', limit: 100 });
    const notes = (await viewer.agent.get(`${base}/notes`)).body.notes;
    expect(events.body.events.map((e: { entityId: string }) => e.entityId).sort()).toEqual(notes.map((n: { id: string }) => n.id).sort());
    const withPhoto = events.body.events.find((e: { after: { photo: unknown } }) => e.after.photo);
    expect(withPhoto.after.photo.sha256).toMatch(/^[0-9a-f]{64}$/);
  });

  it('puts every note, with its photo embedded as the stored bytes, into the hand-over report', async () => {
    const report = await viewer.agent.get(`${base}/report.html`);
    expect(report.status).toBe(200);
    expect(report.text).toContain('<h3>Notes at the structure</h3>');
    expect(report.text).toContain('Wax mount; the surface was oily, cleaned with solvent.');
    expect(report.text).toContain('Changed to the hard tip: the soft one rolled off at 400 Hz.');
    // The PNG of the first test, byte for byte, as a data URI.
    expect(report.text).toContain(`data:image/png;base64,${platePng().toString('base64')}`);
    const notes = (await viewer.agent.get(`${base}/notes`)).body.notes as unknown[];
    expect(report.text.match(/<tr><td class="n">B21:\+Z \/ B04:\+Z<\/td>/g)).toHaveLength(notes.length);
  });
});
