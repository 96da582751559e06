// A geometry CSV with bad rows: the check before import lists them by line; the import refuses the
// whole file unless the lead asks for the good rows only (badRows: 'skip'), and then says what it skipped.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startTestApp, type TestApp } from '../support/app.ts';
import { makeCrew, type CampaignCrew } from '../support/campaign.ts';
import { API_TEMPLATE } from '../support/global-setup-api.ts';

let app: TestApp;
let crew: CampaignCrew;
const csv = ['label,x,y,z', 'P1,0,0,0', 'P2,100,0,0', 'P3,abc,0,0', 'P2,5,5,5', ',1,1,1', 'P4,300,0,0'].join('\n');

beforeAll(async () => {
  app = await startTestApp(API_TEMPLATE);
  crew = await makeCrew(app, 'rows');
}, 60_000);
afterAll(async () => {
  await app?.close();
});

const path = (end: string) => `/api/campaigns/${crew.campaignId}/geometry/${end}`;
const labels = async () => (await crew.lead.agent.get(`/api/campaigns/${crew.campaignId}/points`)).body.points.map((p: { label: string }) => p.label);

describe('bad rows of a geometry CSV', () => {
  it('lists each bad row by its line before anything is imported, and stores nothing', async () => {
    const res = await crew.lead.agent.post(path('import/check')).send({ csv });
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ ok: false, rows: 6, goodRows: 3, badRows: 3 });
    expect(res.body.problems.map((p: { line: number }) => p.line)).toEqual([4, 5, 6]);
    expect(res.body.problems[0].message).toMatch(/column 2 \(x, mm\)/);
    expect(res.body.problems[1].message).toMatch(/already appears on line 3/);
    expect(res.body.problems[2].message).toBe('the label is empty');
    expect(await labels()).toEqual([]);
    const clean = await crew.lead.agent.post(path('import/check')).send({ csv: 'label,x,y,z\nA,0,0,0' });
    expect(clean.body).toEqual({ ok: true, rows: 1, goodRows: 1, badRows: 0, message: null, problems: [] });
  });

  it('refuses the whole file by default (400 invalid-csv, nothing written)', async () => {
    const res = await crew.lead.agent.post(path('import')).send({ csv });
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('invalid-csv');
    expect(res.body.error.message).toMatch(/^Nothing was imported: 3 lines have a problem/);
    expect(await labels()).toEqual([]);
  });

  it('imports the good rows only when asked, and answers with the rows it skipped', async () => {
    const res = await crew.lead.agent.post(path('import')).send({ csv, badRows: 'skip' });
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ added: 3, total: 3, skippedRows: 3 });
    expect(res.body.skipped.map((p: { line: number }) => p.line)).toEqual([4, 5, 6]);
    expect(await labels()).toEqual(['P1', 'P2', 'P4']);
    const audit = (await crew.lead.agent.get(`/api/campaigns/${crew.campaignId}/audit`).query({ entity: 'geometry' })).body.events;
    expect(audit[0].after).toMatchObject({ added: 3, skippedRows: 3 });
  });

  it('still refuses with skip: a replace (it would delete the skipped rows’ points), a file with no good row, an unknown option', async () => {
    expect((await crew.lead.agent.post(path('import')).send({ csv, badRows: 'skip', mode: 'replace' })).status).toBe(400);
    expect((await crew.lead.agent.post(path('import')).send({ csv: 'label,x,y,z\nQ,a,b,c', badRows: 'skip' })).status).toBe(400);
    expect((await crew.lead.agent.post(path('import')).send({ csv, badRows: 'some' })).status).toBe(400);
    expect((await crew.lead.agent.post(path('import/check')).send({ csv, extra: 1 })).status).toBe(400);
    expect(await labels()).toEqual(['P1', 'P2', 'P4']);
  });

  it('lets only a lead check a file', async () => {
    expect((await crew.engineer.agent.post(path('import/check')).send({ csv })).status).toBe(403);
    expect((await crew.outsider.agent.post(path('import/check')).send({ csv })).status).toBe(404);
  });
});
