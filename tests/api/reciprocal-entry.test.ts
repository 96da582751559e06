// Planning a reciprocity pair from Plan: the reciprocal of an entry (response and excitation swapped)
// joins the schedule at the end, once; generate keeps it; a driving point has no other reciprocal.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startTestApp, type TestApp } from '../support/app.ts';
import { makeCrew, type CampaignCrew } from '../support/campaign.ts';
import { API_TEMPLATE } from '../support/global-setup-api.ts';

let app: TestApp;
let crew: CampaignCrew;
let entries: { id: string; responseDof: string; excitationDof: string; drivingPoint: boolean; position: number }[];

beforeAll(async () => {
  app = await startTestApp(API_TEMPLATE);
  crew = await makeCrew(app, 'recip');
  const base = `/api/campaigns/${crew.campaignId}`;
  await crew.lead.agent.post(`${base}/geometry/import`).send({ csv: 'label,x,y,z,directions\nA1,0,0,0,+Z\nA2,100,0,0,+Z\nA3,200,0,0,+Z' }).expect(200);
  const c = (await crew.lead.agent.get(base)).body.campaign;
  await crew.lead.agent.patch(base).send({ version: c.version, testType: 'roving-hammer', referenceDofs: ['A1:+Z'] }).expect(200);
  entries = (await crew.lead.agent.post(`${base}/schedule/generate`).send({})).body.entries;
}, 60_000);
afterAll(async () => {
  await app?.close();
});

const path = (id: string) => `/api/campaigns/${crew.campaignId}/schedule/${id}/reciprocal`;

describe('the reciprocal of a schedule entry', () => {
  it('adds H(A2, A1) beside H(A1, A2) at the end of the schedule', async () => {
    const a = entries.find((e) => e.excitationDof === 'A2:+Z')!;
    expect(a.responseDof).toBe('A1:+Z');
    const res = await crew.lead.agent.post(path(a.id)).send({});
    expect(res.status).toBe(201);
    expect(res.body.entry).toMatchObject({ responseDof: 'A2:+Z', excitationDof: 'A1:+Z', drivingPoint: false, status: 'planned' });
    const after = (await crew.lead.agent.get(`/api/campaigns/${crew.campaignId}/schedule`)).body.entries as { id: string }[];
    expect(after).toHaveLength(entries.length + 1);
    expect(after.at(-1)!.id).toBe(res.body.entry.id);
  });

  it('refuses a second one (409 reciprocal-exists, naming it) and a driving point (400)', async () => {
    const a = entries.find((e) => e.excitationDof === 'A2:+Z')!;
    const again = await crew.lead.agent.post(path(a.id)).send({});
    expect(again.status).toBe(409);
    expect(again.body.error.code).toBe('reciprocal-exists');
    const drive = entries.find((e) => e.drivingPoint)!;
    const res = await crew.lead.agent.post(path(drive.id)).send({});
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('driving-point');
  });

  it('keeps the reciprocal entry when the schedule is generated again', async () => {
    const res = await crew.lead.agent.post(`/api/campaigns/${crew.campaignId}/schedule/generate`).send({});
    expect(res.status).toBe(200);
    expect(res.body.removed).toBe(0);
    expect(res.body.entries.some((e: { responseDof: string; excitationDof: string }) => e.responseDof === 'A2:+Z' && e.excitationDof === 'A1:+Z')).toBe(true);
  });

  it('is for leads only, and answers 404 for an entry that is not there', async () => {
    const a = entries.find((e) => e.excitationDof === 'A3:+Z')!;
    expect((await crew.engineer.agent.post(path(a.id)).send({})).status).toBe(403);
    expect((await crew.lead.agent.post(path('00000000-0000-4000-8000-000000000000')).send({})).status).toBe(404);
    expect((await crew.lead.agent.post(path('not-a-uuid')).send({})).status).toBe(404);
  });
});
