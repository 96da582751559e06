// Geometry (points, lines, CSV import/export) and the schedule against the real API and database.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { eq } from 'drizzle-orm';
import { hit, point } from '@resonote/db/schema';
import { startTestApp, type TestApp } from '../support/app.ts';
import { staffedCampaign, type Person } from '../support/campaign.ts';
import { API_TEMPLATE } from '../support/global-setup-api.ts';

let app: TestApp;
let admin: Person;
let lead: Person;
let engineer: Person;
let viewer: Person;
let campaignId: string;

const base = () => `/api/campaigns/${campaignId}`;
const countPoints = async () => (await app.handle.database.db.select().from(point).where(eq(point.campaignId, campaignId))).length;

beforeAll(async () => {
  app = await startTestApp(API_TEMPLATE);
  ({ campaignId, admin, lead, engineer, viewer } = await staffedCampaign(app, { name: 'Calibration bar', structure: 'Free-free steel bar 1000 × 40 × 10 mm' }));
});
afterAll(async () => {
  await app?.close();
});

describe('geometry CSV import', () => {
  it('refuses a file without the label,x,y,z columns and writes nothing', async () => {
    const res = await lead.agent.post(`${base()}/geometry/import`).send({ csv: 'name,x,y\nB01,0,0\n' });
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('invalid-csv');
    expect(res.body.error.message).toMatch(/lacks the columns label, z/);
    expect(await countPoints()).toBe(0);
  });

  it('reports non-numeric values and duplicate labels with their line numbers, and writes nothing', async () => {
    const csv = ['label,x,y,z', 'B01,0,0,0', 'B02,50,0,zero', 'B03,100,0,0', 'B01,150,0,0'].join('\n');
    const res = await lead.agent.post(`${base()}/geometry/import`).send({ csv });
    expect(res.status).toBe(400);
    expect(res.body.error.details).toEqual([
      { line: 3, message: 'column 4 (z, mm): the value "zero" is not a decimal number' },
      { line: 5, message: 'label "B01" already appears on line 2' },
    ]);
    expect(await countPoints()).toBe(0);
  });

  it('accepts a byte-order mark, blank lines and a directions column', async () => {
    const csv = '\uFEFFlabel,x,y,z,directions\r\nB01,0,0,0,+Z\r\n\r\nB02,50,0,0,+Z -Y\r\n   \r\nB03,100,0,0,z\r\n';
    const res = await lead.agent.post(`${base()}/geometry/import`).send({ csv });
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ added: 3, updated: 0, total: 3 });
    const { points } = (await viewer.agent.get(`${base()}/points`)).body;
    expect(points.map((p: { label: string; directions: string[] }) => [p.label, p.directions])).toEqual([
      ['B01', ['+Z']],
      ['B02', ['+Z', '-Y']],
      ['B03', ['+Z']],
    ]);
  });

  it('takes the file as a multipart upload too, and merges by label', async () => {
    const csv = 'label,x,y,z\nB03,100,0,1.5\nB04,150,0,0\n';
    const res = await lead.agent.post(`${base()}/geometry/import`).field('mode', 'merge').field('directions', '+Z').attach('file', Buffer.from(csv), { filename: 'bar.csv', contentType: 'text/csv' });
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ added: 1, updated: 1 });
    const { points } = (await viewer.agent.get(`${base()}/points`)).body;
    expect(points.find((p: { label: string }) => p.label === 'B03')).toMatchObject({ z: 1.5, directions: ['+Z'] });
    expect(points.find((p: { label: string }) => p.label === 'B04').directions).toEqual(['+Z']);
  });

  it('refuses 100 000 rows with a message that gives the limit, and writes nothing', async () => {
    const rows = ['label,x,y,z'];
    for (let i = 0; i < 100_000; i++) rows.push(`Q${i},${i},0,0`);
    const res = await lead.agent.post(`${base()}/geometry/import`).send({ csv: rows.join('\n') });
    expect(res.status).toBe(400);
    expect(res.body.error.message).toMatch(/100,000 points; one import takes at most 20,000/);
    expect(await countPoints()).toBe(4);
  });

  it('refuses a 50 MB file with 413 and writes nothing', async () => {
    const big = Buffer.alloc(50 * 1024 * 1024, 'a');
    const res = await lead.agent.post(`${base()}/geometry/import`).attach('file', big, { filename: 'huge.csv', contentType: 'text/csv' });
    expect(res.status).toBe(413);
    expect(res.body.error.message).toMatch(/larger than 5 MB/);
    expect(await countPoints()).toBe(4);
  });

  it('exports CSV that imports back to the same points', async () => {
    const exported = await viewer.agent.get(`${base()}/geometry/export.csv`);
    expect(exported.headers['content-type']).toMatch(/text\/csv/);
    expect(exported.text.split('\n')[0]).toBe('label,x,y,z,directions');
    const before = (await viewer.agent.get(`${base()}/points`)).body.points.map((p: { label: string; x: number; y: number; z: number; directions: string[] }) => [p.label, p.x, p.y, p.z, p.directions]);
    const again = await lead.agent.post(`${base()}/geometry/import`).send({ csv: exported.text, mode: 'replace' });
    expect(again.body).toMatchObject({ added: 0, updated: 4, removed: 0 });
    const after = (await viewer.agent.get(`${base()}/points`)).body.points.map((p: { label: string; x: number; y: number; z: number; directions: string[] }) => [p.label, p.x, p.y, p.z, p.directions]);
    expect(after).toEqual(before);
  });

  it('imports 10 000 points in one go', async () => {
    const other = (await admin.agent.post('/api/campaigns').send({ name: 'Large grid' })).body.campaign.id;
    const rows = ['label,x,y,z'];
    for (let i = 0; i < 10_000; i++) rows.push(`G${i},${(i % 100) * 10},${Math.floor(i / 100) * 10},0`);
    const started = performance.now();
    const res = await admin.agent.post(`/api/campaigns/${other}/geometry/import`).send({ csv: rows.join('\n'), directions: ['+Z'] });
    const ms = performance.now() - started;
    expect(res.status).toBe(200);
    expect(res.body.added).toBe(10_000);
    console.log(`[figure] geometry import of 10 000 points: ${ms.toFixed(0)} ms`);
  });
});

describe('points and lines', () => {
  it('refuses a duplicate label and a stale edit', async () => {
    expect((await lead.agent.post(`${base()}/points`).send({ label: 'B01', x: 0, y: 0, z: 0 })).status).toBe(409);
    const p = (await viewer.agent.get(`${base()}/points`)).body.points[0];
    expect((await lead.agent.patch(`${base()}/points/${p.id}`).send({ version: p.version, x: 1 })).status).toBe(200);
    const stale = await lead.agent.patch(`${base()}/points/${p.id}`).send({ version: p.version, x: 2 });
    expect(stale.status).toBe(409);
    expect(stale.body.error.details.current.x).toBe(1);
  });

  it('joins two points with one line only', async () => {
    const [a, b] = (await viewer.agent.get(`${base()}/points`)).body.points;
    expect((await lead.agent.post(`${base()}/lines`).send({ pointA: a.id, pointB: b.id })).status).toBe(201);
    const twice = await lead.agent.post(`${base()}/lines`).send({ pointA: b.id, pointB: a.id });
    expect(twice.status).toBe(409);
    expect((await lead.agent.post(`${base()}/lines`).send({ pointA: a.id, pointB: a.id })).status).toBe(400);
  });

  it('never deletes a point with recorded hits; it can be retired', async () => {
    // Reference DOF B01:+Z and a schedule, then a hit on the B02 entry written straight into the table.
    const c = (await lead.agent.get(base())).body.campaign;
    await lead.agent.patch(base()).send({ version: c.version, referenceDofs: ['B01:+Z'] }).expect(200);
    const { entries } = (await lead.agent.post(`${base()}/schedule/generate`).send({})).body;
    const entry = entries.find((e: { excitationDof: string }) => e.excitationDof === 'B02:+Z');
    await app.handle.database.db.insert(hit).values({
      campaignId,
      scheduleEntryId: entry.id,
      sequence: 1,
      settingsVersion: 0,
      sampleRateHz: 1024,
      samplesPerChannel: 4,
      channels: [],
      samples: Buffer.alloc(32),
      source: 'test',
      idempotencyKey: 'geometry-test-1',
      autoVerdict: 'accept',
      verdict: 'accept',
      reasons: [],
      metrics: {},
    });
    const b02 = (await viewer.agent.get(`${base()}/points`)).body.points.find((p: { label: string }) => p.label === 'B02');
    expect(b02.hasHits).toBe(true);
    const del = await lead.agent.delete(`${base()}/points/${b02.id}`);
    expect(del.status).toBe(409);
    expect(del.body.error.message).toMatch(/retired but never deleted/);
    const retire = await lead.agent.patch(`${base()}/points/${b02.id}`).send({ version: b02.version, retired: true });
    expect(retire.status).toBe(200);
    expect(retire.body.point.retiredAt).not.toBeNull();
    const b04 = (await viewer.agent.get(`${base()}/points`)).body.points.find((p: { label: string }) => p.label === 'B04');
    expect((await lead.agent.delete(`${base()}/points/${b04.id}`)).status).toBe(204);
  });
});

describe('schedule', () => {
  it('plans one entry per excitation DOF against the fixed accelerometer for a roving hammer, and marks the driving point', async () => {
    const { entries } = (await viewer.agent.get(`${base()}/schedule`)).body;
    // Points B01 (+Z), B02 (+Z, −Y), B03 (+Z) and B04 (+Z, deleted since) with reference B01:+Z;
    // directions in the order ±X, ±Y, ±Z.
    expect(entries.map((e: { responseDof: string; excitationDof: string }) => `${e.responseDof}/${e.excitationDof}`)).toEqual(['B01:+Z/B01:+Z', 'B01:+Z/B02:-Y', 'B01:+Z/B02:+Z', 'B01:+Z/B03:+Z']);
    expect(entries.map((e: { drivingPoint: boolean }) => e.drivingPoint)).toEqual([true, false, false, false]);
    expect(entries.find((e: { excitationDof: string }) => e.excitationDof === 'B02:+Z').acceptedHits).toBe(1);
  });

  it('plans one entry per response DOF against the fixed hammer for a roving response test', async () => {
    const other = (await admin.agent.post('/api/campaigns').send({ name: 'Roving response', testType: 'roving-response', referenceDofs: ['R2:-Z'] })).body.campaign.id;
    await admin.agent.post(`/api/campaigns/${other}/geometry/import`).send({ csv: 'label,x,y,z,directions\nR1,0,0,0,+Z\nR2,10,0,0,-Z\nR10,20,0,0,+Z +X\n' }).expect(200);
    const res = await admin.agent.post(`/api/campaigns/${other}/schedule/generate`).send({ requiredHits: 3 });
    expect(res.status).toBe(200);
    expect(res.body.entries.map((e: { responseDof: string; excitationDof: string; drivingPoint: boolean; requiredHits: number }) => [e.responseDof, e.excitationDof, e.drivingPoint, e.requiredHits])).toEqual([
      ['R1:+Z', 'R2:-Z', false, 3],
      ['R2:-Z', 'R2:-Z', true, 3],
      ['R10:+X', 'R2:-Z', false, 3],
      ['R10:+Z', 'R2:-Z', false, 3],
    ]);
  });

  it('explains why it cannot plan without reference DOFs', async () => {
    const other = (await admin.agent.post('/api/campaigns').send({ name: 'No reference' })).body.campaign.id;
    const res = await admin.agent.post(`/api/campaigns/${other}/schedule/generate`).send({});
    expect(res.status).toBe(400);
    expect(res.body.error.message).toMatch(/Set the reference DOF/);
  });

  it('reorders the schedule and refuses an order that misses entries', async () => {
    const { entries } = (await viewer.agent.get(`${base()}/schedule`)).body;
    const reversed = entries.map((e: { id: string }) => e.id).reverse();
    const res = await lead.agent.post(`${base()}/schedule/reorder`).send({ order: reversed });
    expect(res.status).toBe(200);
    expect(res.body.entries.map((e: { id: string }) => e.id)).toEqual(reversed);
    const partial = await lead.agent.post(`${base()}/schedule/reorder`).send({ order: reversed.slice(1) });
    expect(partial.status).toBe(409);
    expect((await engineer.agent.post(`${base()}/schedule/reorder`).send({ order: reversed })).status).toBe(403);
  });

  it('lets an engineer skip an entry with a note but not reassign it; a lead assigns a member', async () => {
    const entry = (await viewer.agent.get(`${base()}/schedule`)).body.entries[0];
    const skip = await engineer.agent.patch(`${base()}/schedule/${entry.id}`).send({ version: entry.version, status: 'skipped', note: 'point under the lifting lug, not reachable' });
    expect(skip.status).toBe(200);
    expect(skip.body.entry.status).toBe('skipped');
    const reassign = await engineer.agent.patch(`${base()}/schedule/${entry.id}`).send({ version: skip.body.entry.version, assigneeId: engineer.id });
    expect(reassign.status).toBe(403);
    const assign = await lead.agent.patch(`${base()}/schedule/${entry.id}`).send({ version: skip.body.entry.version, assigneeId: engineer.id });
    expect(assign.status).toBe(200);
    expect(assign.body.entry.assigneeName).toBe('Eric Engineer');
    const outsider = await lead.agent.patch(`${base()}/schedule/${entry.id}`).send({ version: assign.body.entry.version, assigneeId: 'no-such-user' });
    expect(outsider.status).toBe(400);
  });

  it('offers the next entry to work on', async () => {
    const res = await engineer.agent.get(`${base()}/schedule/next`);
    expect(res.status).toBe(200);
    expect(res.body.next.status).toBe('planned');
    expect(res.body.remaining).toBe(3);
  });
});
