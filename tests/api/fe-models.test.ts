// FE model versions through the API (issue 19): upload with row-numbered problems, the point ↔ node
// map and its units check, the Effective Independence proposal on a simply supported beam with a
// known answer (Kammer 1991; numpy reference tests/reference/efi_reference.py → efi-beam.json), and
// accepting it into geometry and schedule.
import { readFileSync } from 'node:fs';
import { resolve } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { eq } from 'drizzle-orm';
import { feModelToCsv, feModelToJson, MAX_FE_CHARS, type FeModel } from '@resonote/contracts';
import { auditEvent } from '@resonote/db/schema';
import { startTestApp, type TestApp } from '../support/app.ts';
import { makeCrew, type CampaignCrew } from '../support/campaign.ts';
import { API_TEMPLATE } from '../support/global-setup-api.ts';

const beamFixture = JSON.parse(readFileSync(resolve(import.meta.dirname, '../fixtures/correlation/efi-beam.json'), 'utf8')) as {
  xOverL: number[];
  fiveSensors: { kept: number[] };
};

/** A uniform simply supported beam, L = 1000 mm, modes sin(nπx/L) in Z (Blevins 1979), f_n = 20·n² Hz (∝ n²). */
function beamModel(scaleMm = 1): FeModel {
  const nodes = beamFixture.xOverL.map((x, i) => ({ label: `N${String(i).padStart(2, '0')}`, x: x * 1000 * scaleMm, y: 0, z: 0 }));
  return {
    name: 'Simply supported beam',
    normalisation: 'none',
    fileUnits: { length: 'mm', frequency: 'Hz', mass: 'kg' },
    nodes,
    modes: [1, 2, 3].map((n) => ({ number: n, frequencyHz: 20 * n * n, modalMassKg: null, shape: beamFixture.xOverL.flatMap((x) => [0, 0, Math.sin(n * Math.PI * x)]) })),
  };
}

let app: TestApp;
let crew: CampaignCrew;
const base = () => `/api/campaigns/${crew.campaignId}`;

beforeAll(async () => {
  app = await startTestApp(API_TEMPLATE);
  crew = await makeCrew(app, 'fe');
});
afterAll(async () => {
  await app?.close();
});

describe('uploading a model version', () => {
  it('stores a good CSV with its nodes and modes in mm and Hz, and keeps the file byte for byte', async () => {
    const csv = feModelToCsv(beamModel());
    const res = await crew.lead.agent.post(`${base()}/fe-models`).send({ text: csv, versionLabel: 'csv v1', fileName: 'beam.csv' });
    expect(res.status).toBe(201);
    expect(res.body.model).toMatchObject({ versionLabel: 'csv v1', nodeCount: 41, modeCount: 3, normalisation: 'none', sourceFormat: 'csv', name: 'Simply supported beam' });
    const got = await crew.viewer.agent.get(`${base()}/fe-models/${res.body.model.id}`);
    expect(got.status).toBe(200);
    expect(got.body.nodes[40]).toEqual({ label: 'N40', x: 1000, y: 0, z: 0 });
    expect(got.body.modes.map((m: { frequencyHz: number }) => m.frequencyHz)).toEqual([20, 80, 180]);
    const src = await crew.viewer.agent
      .get(`${base()}/fe-models/${res.body.model.id}/source`)
      .buffer(true)
      .parse((r, done) => {
        const chunks: Buffer[] = [];
        r.on('data', (c: Buffer) => chunks.push(c));
        r.on('end', () => done(null, Buffer.concat(chunks)));
      });
    expect((src.body as Buffer).toString('utf8')).toBe(csv);
  });

  it('stores a good JSON file sent as a multipart upload, in metres converted to mm', async () => {
    const m = beamModel();
    const doc = JSON.parse(feModelToJson(m));
    doc.units.length = 'm';
    doc.nodes = doc.nodes.map((n: { x: number }) => ({ ...n, x: n.x / 1000 }));
    const res = await crew.lead.agent.post(`${base()}/fe-models`).field('versionLabel', 'json v1').attach('file', Buffer.from(JSON.stringify(doc)), 'beam.json');
    expect(res.status).toBe(201);
    expect(res.body.model).toMatchObject({ sourceFormat: 'json', fileUnits: { length: 'm' } });
    const got = await crew.viewer.agent.get(`${base()}/fe-models/${res.body.model.id}`);
    // 1 m = 1000 mm
    expect(got.body.nodes[40].x).toBeCloseTo(1000, 9);
  });

  it('refuses a CSV with a bad number, naming its line and column, and stores nothing', async () => {
    const before = (await crew.viewer.agent.get(`${base()}/fe-models`)).body.models.length;
    const csv = ['format,resonote-fe-modes,1', 'units,mm,Hz,kg', 'normalisation,none', 'node,N1,0,0,0', 'node,N2,abc,0,0', 'mode,1,10,', 'shape,1,N1,0,0,1', 'shape,1,N2,0,0,1'].join('\n');
    const res = await crew.lead.agent.post(`${base()}/fe-models`).send({ text: csv, versionLabel: 'bad' });
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('invalid-model');
    expect(res.body.error.message).toMatch(/line 5, x/);
    expect(res.body.error.details.problems).toEqual([expect.objectContaining({ row: 5, column: 'x' })]);
    expect((await crew.viewer.agent.get(`${base()}/fe-models`)).body.models.length).toBe(before);
  });

  it('refuses a JSON document with a string coordinate, naming its path', async () => {
    const doc = JSON.parse(feModelToJson(beamModel()));
    doc.nodes[3].z = 'a';
    const res = await crew.lead.agent.post(`${base()}/fe-models`).send({ text: JSON.stringify(doc), format: 'json', versionLabel: 'bad json' });
    expect(res.status).toBe(400);
    expect(res.body.error.details.problems[0]).toMatchObject({ path: 'nodes[3].z', column: 'z' });
  });

  it('refuses a file over the size limit with 413, and a second version under a label already taken with 409', async () => {
    const big = Buffer.alloc(MAX_FE_CHARS + 1024, 'a');
    const res = await crew.lead.agent.post(`${base()}/fe-models`).field('versionLabel', 'huge').attach('file', big, 'huge.csv');
    expect(res.status).toBe(413);
    expect(res.body.error.code).toBe('too-large');
    const dup = await crew.lead.agent.post(`${base()}/fe-models`).send({ text: feModelToCsv(beamModel()), versionLabel: 'csv v1' });
    expect(dup.status).toBe(409);
  });

  it('lets a viewer read but not upload or delete, and deletes a version with an audit line', async () => {
    expect((await crew.viewer.agent.post(`${base()}/fe-models`).send({ text: feModelToCsv(beamModel()), versionLabel: 'v' })).status).toBe(403);
    const made = await crew.lead.agent.post(`${base()}/fe-models`).send({ text: feModelToCsv(beamModel()), versionLabel: 'to delete' });
    expect((await crew.viewer.agent.delete(`${base()}/fe-models/${made.body.model.id}`)).status).toBe(403);
    expect((await crew.lead.agent.delete(`${base()}/fe-models/${made.body.model.id}`)).status).toBe(204);
    expect((await crew.viewer.agent.get(`${base()}/fe-models/${made.body.model.id}`)).status).toBe(404);
    const events = await app.handle.database.db.select().from(auditEvent).where(eq(auditEvent.entityId, made.body.model.id));
    expect(events.map((e) => e.action).sort()).toEqual(['delete', 'upload']);
  });
});

describe('the plan proposal on a simply supported beam', () => {
  let modelId: string;
  beforeAll(async () => {
    modelId = (await crew.lead.agent.post(`${base()}/fe-models`).send({ text: feModelToCsv(beamModel()), versionLabel: 'beam' })).body.model.id;
  });

  it('keeps the same five DOFs as the numpy implementation of Effective Independence (Kammer 1991)', async () => {
    const res = await crew.viewer.agent.post(`${base()}/fe-models/${modelId}/proposal`).send({ sensors: 5, axes: ['Z'] });
    expect(res.status).toBe(200);
    const kept = res.body.kept.map((k: { dof: string }) => Number(k.dof.slice(1, 3))).sort((a: number, b: number) => a - b);
    // efi_reference.py (numpy), efi-beam.json fiveSensors.kept
    expect(kept).toEqual(beamFixture.fiveSensors.kept);
    // Σ E_D over the kept set = number of modes (Kammer 1991)
    expect(res.body.kept.reduce((s: number, k: { ed: number }) => s + k.ed, 0)).toBeCloseTo(3, 9);
  });

  it('proposes as reference the kept DOF with the largest product of relative amplitudes of the three modes (closed form sin(nπx/L))', async () => {
    const res = await crew.viewer.agent.post(`${base()}/fe-models/${modelId}/proposal`).send({ sensors: 5, axes: ['Z'] });
    const xs: number[] = res.body.kept.map((k: { x: number }) => k.x / 1000);
    const rel = (n: number) => xs.map((x) => Math.abs(Math.sin(n * Math.PI * x)) / Math.max(...xs.map((y) => Math.abs(Math.sin(n * Math.PI * y)))));
    const product = xs.map((_, i) => rel(1)[i]! * rel(2)[i]! * rel(3)[i]!);
    const top = Math.max(...product);
    // mirror DOFs tie (the beam is symmetric); the measure's documented rule takes the lower index
    const best = res.body.kept
      .map((k: { dof: string }, i: number) => ({ dof: k.dof, p: product[i]! }))
      .filter((k: { p: number }) => Math.abs(k.p - top) <= 1e-12 * top)
      .map((k: { dof: string }) => k.dof)
      .sort()[0];
    expect(res.body.reference.dof).toBe(best);
    expect(res.body.reference.product).toBeCloseTo(top, 12);
  });

  it('gives the auto-MAC of the kept set and says in words whether it stays below the threshold', async () => {
    const res = await crew.viewer.agent.post(`${base()}/fe-models/${modelId}/proposal`).send({ sensors: 5, axes: ['Z'], threshold: 0.2 });
    const am = res.body.autoMac;
    expect(am.matrix.length).toBe(3);
    // MAC of a shape with itself is 1 (Allemang & Brown 1982)
    am.matrix.forEach((row: number[], i: number) => expect(row[i]).toBeCloseTo(1, 12));
    // closed form: MAC(a, b) = (aᵀb)² / (aᵀa · bᵀb) over the kept x
    const xs: number[] = res.body.kept.map((k: { x: number }) => k.x / 1000);
    const s = (n: number) => xs.map((x) => Math.sin(n * Math.PI * x));
    const dot = (a: number[], b: number[]) => a.reduce((t, v, i) => t + v * b[i]!, 0);
    const mac12 = dot(s(1), s(2)) ** 2 / (dot(s(1), s(1)) * dot(s(2), s(2)));
    expect(am.matrix[0][1]).toBeCloseTo(mac12, 12);
    expect(am.words).toMatch(am.maxOffDiagonal.value >= 0.2 ? /at or above the threshold 0\.2/ : /below the threshold 0\.2/);
    // a threshold of 0 puts every pair at or above it
    const strict = await crew.viewer.agent.post(`${base()}/fe-models/${modelId}/proposal`).send({ sensors: 5, axes: ['Z'], threshold: 0 });
    expect(strict.body.autoMac.words).toMatch(/at or above the threshold 0/);
  });

  it('refuses fewer DOFs than modes, an empty band and both a band and a mode list, with 400', async () => {
    const few = await crew.viewer.agent.post(`${base()}/fe-models/${modelId}/proposal`).send({ sensors: 2 });
    expect(few.status).toBe(400);
    expect(few.body.error.message).toMatch(/at least as many DOFs as modes/);
    const band = await crew.viewer.agent.post(`${base()}/fe-models/${modelId}/proposal`).send({ sensors: 5, bandHz: [500, 600] });
    expect(band.status).toBe(400);
    expect(band.body.error.message).toMatch(/No mode of the model lies between 500 and 600 Hz/);
    const both = await crew.viewer.agent.post(`${base()}/fe-models/${modelId}/proposal`).send({ sensors: 5, bandHz: [0, 100], modes: [1] });
    expect(both.status).toBe(400);
    const two = await crew.viewer.agent.post(`${base()}/fe-models/${modelId}/proposal`).send({ sensors: 3, bandHz: [0, 100] });
    expect(two.status).toBe(200);
    expect(two.body.modes.map((m: { number: number }) => m.number)).toEqual([1, 2]);
  });

  it('accepts the proposal: points at the node coordinates, the reference DOF, the schedule, and audit lines', async () => {
    const proposal = (await crew.lead.agent.post(`${base()}/fe-models/${modelId}/proposal`).send({ sensors: 5, axes: ['Z'] })).body;
    const c = (await crew.lead.agent.get(base())).body.campaign;
    const dofs = proposal.kept.map((k: { dof: string }) => k.dof);
    expect((await crew.viewer.agent.post(`${base()}/fe-models/${modelId}/proposal/accept`).send({ dofs, reference: proposal.reference.dof, campaignVersion: c.version })).status).toBe(403);
    const res = await crew.lead.agent.post(`${base()}/fe-models/${modelId}/proposal/accept`).send({ dofs, reference: proposal.reference.dof, campaignVersion: c.version, requiredHits: 4 });
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ pointsAdded: 5, pointsUpdated: 0, referenceDofs: [proposal.reference.dof], schedule: { added: 5, removed: 0 } });
    const { points } = (await crew.viewer.agent.get(`${base()}/points`)).body;
    expect(proposal.kept).toHaveLength(5);
    for (const k of proposal.kept) {
      const p = points.find((q: { label: string }) => `${q.label}:+Z` === k.dof);
      expect(p).toMatchObject({ x: k.x, y: 0, z: 0, directions: ['+Z'] });
    }
    const entries = (await crew.viewer.agent.get(`${base()}/schedule`)).body.entries;
    expect(entries).toHaveLength(5);
    expect(entries.every((e: { requiredHits: number }) => e.requiredHits === 4)).toBe(true);
    expect(entries.filter((e: { drivingPoint: boolean }) => e.drivingPoint)).toHaveLength(1);
    const events = await app.handle.database.db.select().from(auditEvent).where(eq(auditEvent.campaignId, crew.campaignId));
    expect(events.some((e) => e.entity === 'fe-model' && e.action === 'accept-plan')).toBe(true);
    expect(events.filter((e) => e.entity === 'point' && e.action === 'create')).toHaveLength(5);
    // the stale campaign version is refused and changes nothing
    const stale = await crew.lead.agent.post(`${base()}/fe-models/${modelId}/proposal/accept`).send({ dofs, reference: proposal.reference.dof, campaignVersion: c.version });
    expect(stale.status).toBe(409);
    const unknown = await crew.lead.agent.post(`${base()}/fe-models/${modelId}/proposal/accept`).send({ dofs: ['Q99:+Z'], reference: 'Q99:+Z', campaignVersion: c.version + 1 });
    expect(unknown.status).toBe(400);
    expect(unknown.body.error.message).toMatch(/Q99 is neither a point of the campaign nor a node/);
  });
});

describe('the point ↔ node map', () => {
  let modelId: string;
  let metreModelId: string;
  beforeAll(async () => {
    modelId = (await crew.lead.agent.post(`${base()}/fe-models`).send({ text: feModelToCsv(beamModel()), versionLabel: 'map' })).body.model.id;
    // The same beam with its coordinates 1000× too small: lengths in m in a file that says mm.
    metreModelId = (await crew.lead.agent.post(`${base()}/fe-models`).send({ text: feModelToCsv(beamModel(0.001)), versionLabel: 'wrong unit' })).body.model.id;
  });

  it('links points by label, with the distance to the node', async () => {
    const res = await crew.lead.agent.post(`${base()}/fe-models/${modelId}/map/auto`).send({ by: 'label' });
    expect(res.status).toBe(200);
    expect(res.body.linked).toBe(5);
    expect(res.body.map.links.every((l: { node: string; point: string; distanceMm: number }) => l.node === l.point && l.distanceMm === 0)).toBe(true);
  });

  it('links points to the nearest node within the tolerance, and leaves the others unlinked', async () => {
    const pts = (await crew.viewer.agent.get(`${base()}/points`)).body.points as { id: string; label: string; x: number; version: number }[];
    // move one point 12 mm along the beam: 12 mm from its node, 13 mm from the next (nodes every 25 mm)
    const moved = pts[0]!;
    await crew.lead.agent.patch(`${base()}/points/${moved.id}`).send({ x: moved.x + 12, version: moved.version }).expect(200);
    const tight = await crew.lead.agent.post(`${base()}/fe-models/${modelId}/map/auto`).send({ by: 'nearest', toleranceMm: 5 });
    expect(tight.body.linked).toBe(4);
    const link = tight.body.map.links.find((l: { point: string }) => l.point === moved.label);
    expect(link).toMatchObject({ node: null, distanceMm: null, source: 'nearest' });
    const loose = await crew.lead.agent.post(`${base()}/fe-models/${modelId}/map/auto`).send({ by: 'nearest', toleranceMm: 20 });
    expect(loose.body.linked).toBe(5);
    expect(loose.body.map.links.find((l: { point: string }) => l.point === moved.label)).toMatchObject({ node: moved.label, distanceMm: 12 });
    const noTol = await crew.lead.agent.post(`${base()}/fe-models/${modelId}/map/auto`).send({ by: 'nearest' });
    expect(noTol.status).toBe(400);
  });

  it('takes manual edits with the map version, refusing a stale version and an unknown node', async () => {
    const got = (await crew.viewer.agent.get(`${base()}/fe-models/${modelId}`)).body.map;
    const point = got.links[0].point;
    const res = await crew.lead.agent.patch(`${base()}/fe-models/${modelId}/map`).send({ version: got.version, links: [{ point, node: 'N20' }] });
    expect(res.status).toBe(200);
    const l = res.body.map.links.find((x: { point: string }) => x.point === point);
    expect(l.node).toBe('N20');
    expect(l.source).toBe('manual');
    const stale = await crew.lead.agent.patch(`${base()}/fe-models/${modelId}/map`).send({ version: got.version, links: [{ point, node: 'N21' }] });
    expect(stale.status).toBe(409);
    const unknown = await crew.lead.agent.patch(`${base()}/fe-models/${modelId}/map`).send({ version: res.body.map.version, links: [{ point, node: 'Z99' }] });
    expect(unknown.status).toBe(400);
    expect(unknown.body.error.message).toMatch(/node Z99 is not in model version map/);
    expect((await crew.viewer.agent.patch(`${base()}/fe-models/${modelId}/map`).send({ version: res.body.map.version, links: [{ point, node: 'N21' }] })).status).toBe(403);
  });

  it('refuses to map a model 1000 times smaller than the geometry, and says the units differ', async () => {
    const res = await crew.lead.agent.post(`${base()}/fe-models/${metreModelId}/map/auto`).send({ by: 'label' });
    expect(res.status).toBe(422);
    expect(res.body.error.code).toBe('units-mismatch');
    // the geometry spans part of a 1 m beam, the model 1 mm: more than 10× apart (MAX_EXTENT_RATIO)
    expect(res.body.error.message).toMatch(/times smaller, so the two are not in the same length unit/);
    expect(res.body.error.details.ratio).toBeLessThan(0.1);
    // nothing was mapped
    expect((await crew.viewer.agent.get(`${base()}/fe-models/${metreModelId}`)).body.map.links).toEqual([]);
  });
});
