// The team around a campaign: a lead adds an existing account directly; invitations answered in the
// app; archive (read-only, everything kept) and un-archive; delete only without recordings; the
// campaign list's status filter; PATCH of the acquisition settings (design.md, "Who uses it", "Kit").
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { defaultAcquisitionSettings } from '@resonote/contracts';
import { steelBar } from '@resonote/sim';
import { startTestApp, type TestApp } from '../support/app.ts';
import { signUp } from '../support/accounts.ts';
import { makeCrew, waitForMail, type CampaignCrew, type Person } from '../support/campaign.ts';
import { BAR_SETTINGS } from '../support/rig.ts';
import { API_TEMPLATE } from '../support/global-setup-api.ts';

let app: TestApp;
let crew: CampaignCrew;
let newcomer: Person;
let nina: Person;

async function ok<T extends { status: number; body: unknown }>(req: PromiseLike<T>, what: string): Promise<T> {
  const res = await req;
  if (res.status >= 300) throw new Error(`${what}: ${res.status} ${JSON.stringify(res.body)}`);
  return res;
}
const campaignOf = async (p: Person, id: string) => (await ok(p.agent.get(`/api/campaigns/${id}`), 'campaign')).body.campaign as { version: number; archivedAt: string | null; name: string };

beforeAll(async () => {
  app = await startTestApp(API_TEMPLATE);
  crew = await makeCrew(app, 'team');
  newcomer = await signUp(app, 'Nico Newcomer', 'Nico.Newcomer@lab.test');
  nina = await signUp(app, 'Nina Analyst', 'nina@lab.test');
}, 60_000);
afterAll(async () => {
  await app?.close();
});

describe('adding an existing account', () => {
  const members = () => `/api/campaigns/${crew.campaignId}/members`;

  it('adds an account by its address (any case) with the role the lead chose, and records it', async () => {
    const res = await crew.lead.agent.post(members()).send({ email: 'NICO.newcomer@lab.test', role: 'engineer' });
    expect(res.status).toBe(201);
    expect(res.body.member).toMatchObject({ userId: newcomer.id, name: 'Nico Newcomer', role: 'engineer' });
    expect((await newcomer.agent.get(`/api/campaigns/${crew.campaignId}`)).body.myRole).toBe('engineer');
    const audit = (await crew.lead.agent.get(`/api/campaigns/${crew.campaignId}/audit`).query({ entity: 'member' })).body.events;
    expect(audit[0]).toMatchObject({ action: 'add', entityId: newcomer.id, after: { role: 'engineer', via: 'added-by-lead' } });
  });

  it('refuses a second add (409 already-member), an unknown address (404 no-account), a bad role or address (400)', async () => {
    expect((await crew.lead.agent.post(members()).send({ email: 'nico.newcomer@lab.test', role: 'viewer' })).body.error.code).toBe('already-member');
    const unknown = await crew.lead.agent.post(members()).send({ email: 'nobody@lab.test', role: 'viewer' });
    expect(unknown.status).toBe(404);
    expect(unknown.body.error.code).toBe('no-account');
    expect(unknown.body.error.message).toMatch(/invitation/);
    expect((await crew.lead.agent.post(members()).send({ email: 'nina@lab.test', role: 'owner' })).status).toBe(400);
    expect((await crew.lead.agent.post(members()).send({ email: 'not-an-address', role: 'viewer' })).status).toBe(400);
    expect((await crew.lead.agent.post(members()).send({ email: 'nina@lab.test', role: 'viewer', extra: 1 })).status).toBe(400);
  });

  it('lets only a lead add people: an engineer gets 403, an outsider 404', async () => {
    expect((await crew.engineer.agent.post(members()).send({ email: 'nina@lab.test', role: 'viewer' })).status).toBe(403);
    expect((await crew.outsider.agent.post(members()).send({ email: 'nina@lab.test', role: 'viewer' })).status).toBe(404);
  });
});

describe('invitations answered in the app', () => {
  let invitationId: string;

  it('lists an open invitation to the signed-in address, with campaign, role and who invited', async () => {
    await ok(crew.lead.agent.post(`/api/campaigns/${crew.campaignId}/invitations`).send({ email: 'nina@lab.test', role: 'viewer' }), 'invite');
    await waitForMail(app, 'nina@lab.test', /invites you/);
    const res = await nina.agent.get('/api/account/invitations');
    expect(res.status).toBe(200);
    expect(res.body.invitations).toHaveLength(1);
    expect(res.body.invitations[0]).toMatchObject({ campaignId: crew.campaignId, role: 'viewer', invitedBy: 'Lena Lead team' });
    invitationId = res.body.invitations[0].id;
    // Nobody else sees it, and nobody else can answer it.
    expect((await crew.viewer.agent.get('/api/account/invitations')).body.invitations).toEqual([]);
    expect((await crew.viewer.agent.post(`/api/account/invitations/${invitationId}/accept`).send({})).status).toBe(404);
    expect((await crew.viewer.agent.post('/api/account/invitations/not-a-uuid/accept').send({})).status).toBe(404);
  });

  it('accepts it: the person joins with the invited role and the invitation is gone from both lists', async () => {
    const res = await nina.agent.post(`/api/account/invitations/${invitationId}/accept`).send({});
    expect(res.status).toBe(200);
    expect(res.body).toEqual({ campaignId: crew.campaignId, role: 'viewer' });
    expect((await nina.agent.get(`/api/campaigns/${crew.campaignId}`)).body.myRole).toBe('viewer');
    expect((await nina.agent.get('/api/account/invitations')).body.invitations).toEqual([]);
    expect((await crew.lead.agent.get(`/api/campaigns/${crew.campaignId}/invitations`)).body.invitations).toEqual([]);
    expect((await nina.agent.post(`/api/account/invitations/${invitationId}/accept`).send({})).status).toBe(404);
  });

  it('declines one: no membership, the lead sees the decline in the audit trail', async () => {
    await ok(crew.admin.agent.post(`/api/campaigns/${crew.otherCampaignId}/invitations`).send({ email: 'nina@lab.test', role: 'engineer' }), 'invite');
    const [inv] = (await nina.agent.get('/api/account/invitations')).body.invitations;
    expect((await nina.agent.post(`/api/account/invitations/${inv.id}/decline`).send({})).status).toBe(204);
    expect((await nina.agent.get(`/api/campaigns/${crew.otherCampaignId}`)).status).toBe(404);
    expect((await nina.agent.get('/api/account/invitations')).body.invitations).toEqual([]);
    const audit = (await crew.admin.agent.get(`/api/campaigns/${crew.otherCampaignId}/audit`).query({ entity: 'invitation' })).body.events;
    expect(audit[0]).toMatchObject({ action: 'decline', entityId: inv.id });
  });

  it('needs a signed-in person', async () => {
    expect((await app.agent().get('/api/account/invitations')).status).toBe(401);
  });
});

describe('archive, un-archive and delete', () => {
  let archivedId: string;

  beforeAll(async () => {
    archivedId = (await ok(crew.lead.agent.post('/api/campaigns').send({ name: 'Archived skid', structure: 'Skid 2' }), 'campaign')).body.campaign.id;
    await ok(crew.lead.agent.post(`/api/campaigns/${archivedId}/points`).send({ label: 'P1', x: 0, y: 0, z: 0 }), 'point');
    await ok(crew.lead.agent.post(`/api/campaigns/${archivedId}/members`).send({ email: crew.engineer.email, role: 'engineer' }), 'member');
  });

  it('archives with the version read; a stale version is 409 stale-version and a missing one 400', async () => {
    const before = await campaignOf(crew.lead, archivedId);
    expect((await crew.lead.agent.post(`/api/campaigns/${archivedId}/archive`).send({})).status).toBe(400);
    expect((await crew.lead.agent.post(`/api/campaigns/${archivedId}/archive`).send({ version: before.version + 5 })).body.error.code).toBe('stale-version');
    expect((await crew.engineer.agent.post(`/api/campaigns/${archivedId}/archive`).send({ version: before.version })).status).toBe(403);
    const res = await crew.lead.agent.post(`/api/campaigns/${archivedId}/archive`).send({ version: before.version, reason: 'Handed over in May' });
    expect(res.status).toBe(200);
    expect(res.body.campaign.archivedAt).toBeTruthy();
    expect(res.body.campaign.version).toBe(before.version + 1);
    expect((await campaignOf(crew.engineer, archivedId)).archivedAt).toBeTruthy();
  });

  it('refuses every kind of change to an archived campaign with 409 campaign-archived, and keeps everything readable', async () => {
    const version = (await campaignOf(crew.lead, archivedId)).version;
    const attempts = [
      crew.lead.agent.patch(`/api/campaigns/${archivedId}`).send({ version, name: 'Renamed' }),
      crew.lead.agent.post(`/api/campaigns/${archivedId}/points`).send({ label: 'P2', x: 1, y: 0, z: 0 }),
      crew.lead.agent.put(`/api/campaigns/${archivedId}/settings`).send({ baseVersion: 0, settings: defaultAcquisitionSettings }),
      crew.lead.agent.patch(`/api/campaigns/${archivedId}/settings`).send({ baseVersion: 0, settings: { hitsToAverage: 3 } }),
      crew.lead.agent.post(`/api/campaigns/${archivedId}/kit`).send({ kind: 'hammer', model: 'IH-02', serial: 'H9', sensitivity: 2.25, sensitivityUnit: 'mV/N' }),
      crew.lead.agent.post(`/api/campaigns/${archivedId}/schedule/generate`).send({}),
      crew.lead.agent.post(`/api/campaigns/${archivedId}/members`).send({ email: crew.viewer.email, role: 'viewer' }),
      crew.lead.agent.post(`/api/campaigns/${archivedId}/invitations`).send({ email: 'x@lab.test', role: 'viewer' }),
      crew.lead.agent.post(`/api/campaigns/${archivedId}/jobs`).send({ kind: 'reprocess' }),
      crew.engineer.agent.put(`/api/campaigns/${archivedId}/arming`).send({}),
      crew.lead.agent.post(`/api/campaigns/${archivedId}/archive`).send({ version }),
    ];
    for (const [i, res] of (await Promise.all(attempts)).entries()) {
      expect(res.status, `attempt ${i}: ${JSON.stringify(res.body)}`).toBe(409);
      expect(res.body.error.code, `attempt ${i}`).toBe('campaign-archived');
      expect(res.body.error.message).toMatch(/archived on \d{4}-\d{2}-\d{2} and is read-only/);
    }
    // The role check still comes first: an engineer is told about the role, not the archive.
    const byEngineer = await crew.engineer.agent.post(`/api/campaigns/${archivedId}/points`).send({});
    expect(byEngineer.status).toBe(403);
    expect(byEngineer.body.error.code).toBe('forbidden');
    const points = await crew.engineer.agent.get(`/api/campaigns/${archivedId}/points`);
    expect(points.status).toBe(200);
    expect(points.body.points.map((p: { label: string }) => p.label)).toEqual(['P1']);
    expect((await campaignOf(crew.lead, archivedId)).name).toBe('Archived skid');
  });

  it('filters the list: active by default, archived, all, or one workflow status', async () => {
    const names = async (status?: string) => (await crew.lead.agent.get('/api/campaigns').query(status ? { status } : {})).body.campaigns.map((c: { name: string }) => c.name);
    expect(await names()).not.toContain('Archived skid');
    expect(await names('archived')).toEqual(['Archived skid']);
    expect(await names('all')).toContain('Archived skid');
    expect(await names('planning')).not.toContain('Archived skid');
    expect(await names('planning')).toContain('Bracket modal survey team');
    const bad = await crew.lead.agent.get('/api/campaigns').query({ status: 'deleted' });
    expect(bad.status).toBe(400);
    expect(bad.body.error.code).toBe('invalid-query');
  });

  it('un-archives by a lead only; then changes are allowed again', async () => {
    const version = (await campaignOf(crew.lead, archivedId)).version;
    expect((await crew.engineer.agent.post(`/api/campaigns/${archivedId}/unarchive`).send({ version })).status).toBe(403);
    const res = await crew.lead.agent.post(`/api/campaigns/${archivedId}/unarchive`).send({ version });
    expect(res.status).toBe(200);
    expect(res.body.campaign.archivedAt).toBeNull();
    expect((await crew.lead.agent.post(`/api/campaigns/${archivedId}/unarchive`).send({ version: version + 1 })).body.error.code).toBe('not-archived');
    expect((await crew.lead.agent.post(`/api/campaigns/${archivedId}/points`).send({ label: 'P2', x: 1, y: 0, z: 0 })).status).toBe(201);
    const audit = (await crew.lead.agent.get(`/api/campaigns/${archivedId}/audit`).query({ entity: 'campaign' })).body.events.map((e: { action: string }) => e.action);
    expect(audit.slice(0, 2)).toEqual(['unarchive', 'archive']);
  });

  it('deletes a campaign without recordings (with the version read; lead only), plan and members with it', async () => {
    const version = (await campaignOf(crew.lead, archivedId)).version;
    expect((await crew.lead.agent.delete(`/api/campaigns/${archivedId}`)).status).toBe(400);
    expect((await crew.lead.agent.delete(`/api/campaigns/${archivedId}`).query({ version: version + 1 })).body.error.code).toBe('stale-version');
    expect((await crew.engineer.agent.delete(`/api/campaigns/${archivedId}`).query({ version })).status).toBe(403);
    expect((await crew.lead.agent.delete(`/api/campaigns/${archivedId}`).query({ version })).status).toBe(204);
    expect((await crew.lead.agent.get(`/api/campaigns/${archivedId}`)).status).toBe(404);
    expect((await crew.engineer.agent.get('/api/campaigns').query({ status: 'all' })).body.campaigns.map((c: { name: string }) => c.name)).not.toContain('Archived skid');
  });

  it('refuses to delete a campaign that holds hits (409 campaign-has-hits) and keeps it whole', async () => {
    const bar = steelBar();
    const id = (await ok(crew.lead.agent.post('/api/campaigns').send({ name: 'Bar with hits', testType: 'roving-hammer', referenceDofs: ['B21:+Z'], simulator: 'steel-bar' }), 'campaign')).body.campaign.id;
    const csv = ['label,x,y,z,directions', ...bar.points.map((p) => `${p.label},${p.xMm},${p.yMm},${p.zMm},+Z`)].join('\n');
    await ok(crew.lead.agent.post(`/api/campaigns/${id}/geometry/import`).send({ csv }), 'geometry');
    const hammer = await ok(crew.lead.agent.post(`/api/campaigns/${id}/kit`).send({ kind: 'hammer', model: 'IH-02', serial: 'H1001', sensitivity: 2.25, sensitivityUnit: 'mV/N', tips: ['medium'] }), 'hammer');
    await ok(crew.lead.agent.post(`/api/campaigns/${id}/channels`).send({ channel: 1, kitItemId: hammer.body.item.id }), 'hammer channel');
    const accel = await ok(crew.lead.agent.post(`/api/campaigns/${id}/kit`).send({ kind: 'accelerometer', model: 'AC-10', serial: 'A200', sensitivity: 10.2, sensitivityUnit: 'mV/(m/s²)', axes: ['Z'] }), 'accelerometer');
    await ok(crew.lead.agent.post(`/api/campaigns/${id}/channels`).send({ channel: 2, kitItemId: accel.body.item.id, axis: 'Z', dof: 'B21:+Z', sign: 1 }), 'accelerometer channel');
    await ok(crew.lead.agent.put(`/api/campaigns/${id}/settings`).send({ baseVersion: 0, settings: BAR_SETTINGS }), 'settings');
    const entries = (await ok(crew.lead.agent.post(`/api/campaigns/${id}/schedule/generate`).send({}), 'schedule')).body.entries;
    await ok(crew.lead.agent.post(`/api/campaigns/${id}/schedule/${entries[0].id}/simulate`).send({ count: 2, seed: 3, doubleHitProbability: 0, overloadProbability: 0 }), 'hits');
    const version = (await campaignOf(crew.lead, id)).version;
    const res = await crew.lead.agent.delete(`/api/campaigns/${id}`).query({ version });
    expect(res.status).toBe(409);
    expect(res.body.error.code).toBe('campaign-has-hits');
    expect(res.body.error.details.hits).toBe(2);
    expect(res.body.error.message).toMatch(/Archive the campaign instead/);
    expect((await crew.lead.agent.get(`/api/campaigns/${id}/schedule/${entries[0].id}/hits`)).body.hits).toHaveLength(2);
  }, 60_000);
});

describe('PATCH of the acquisition settings', () => {
  const path = () => `/api/campaigns/${crew.campaignId}/settings`;

  it('changes the one field sent and keeps the rest, as a new version with the change in the history', async () => {
    const res = await crew.lead.agent.patch(path()).send({ baseVersion: 0, settings: { forceWindow: { lengthS: 0.04 } }, reason: 'longer pulse' });
    expect(res.status).toBe(200);
    expect(res.body.unchanged).toBe(false);
    expect(res.body.current.version).toBe(1);
    // Everything but the force window length is the defaults the campaign started from.
    expect(res.body.current.settings).toEqual({ ...defaultAcquisitionSettings, forceWindow: { lengthS: 0.04, taperS: defaultAcquisitionSettings.forceWindow.taperS } });
    const history = (await crew.lead.agent.get(path())).body.history;
    expect(history[0].changes).toEqual([{ field: 'forceWindow.lengthS', before: 0.02, after: 0.04 }]);
  });

  it('increases the version again on the next patch, and answers unchanged for a patch that changes nothing', async () => {
    const res = await crew.lead.agent.patch(path()).send({ baseVersion: 1, settings: { hitsToAverage: 3 } });
    expect(res.body.current.version).toBe(2);
    expect(res.body.current.settings.forceWindow.lengthS).toBe(0.04);
    expect(res.body.current.settings.hitsToAverage).toBe(3);
    const same = await crew.lead.agent.patch(path()).send({ baseVersion: 2, settings: { hitsToAverage: 3 } });
    expect(same.body).toMatchObject({ unchanged: true, current: { version: 2 } });
  });

  it('refuses unknown fields, an empty patch, a bad value, and a merge that breaks a rule across fields (400)', async () => {
    const unknown = await crew.lead.agent.patch(path()).send({ baseVersion: 2, settings: { hitsToAverge: 4 } });
    expect(unknown.status).toBe(400);
    expect(unknown.body.error.message).toMatch(/hitsToAverge/);
    expect((await crew.lead.agent.patch(path()).send({ baseVersion: 2, settings: { forceWindow: { lenghtS: 1 } } })).status).toBe(400);
    expect((await crew.lead.agent.patch(path()).send({ baseVersion: 2, settings: {} })).status).toBe(400);
    expect((await crew.lead.agent.patch(path()).send({ baseVersion: 2, settings: { hitsToAverage: 0 } })).status).toBe(400);
    // 12 800 Hz sampling: the band cannot end above 6 400 Hz (Nyquist), a rule across two fields.
    const rule = await crew.lead.agent.patch(path()).send({ baseVersion: 2, settings: { bandHz: { high: 7000 } } });
    expect(rule.status).toBe(400);
    expect(rule.body.error.message).toMatch(/6400 Hz/);
    expect((await crew.lead.agent.get(path())).body.current.version).toBe(2);
  });

  it('answers a stale base version with 409 and the current settings, and only a lead may patch', async () => {
    const stale = await crew.lead.agent.patch(path()).send({ baseVersion: 1, settings: { hitsToAverage: 4 } });
    expect(stale.status).toBe(409);
    expect(stale.body.error.details.current.version).toBe(2);
    expect((await crew.engineer.agent.patch(path()).send({ baseVersion: 2, settings: { hitsToAverage: 4 } })).status).toBe(403);
    expect((await crew.outsider.agent.patch(path()).send({ baseVersion: 2, settings: { hitsToAverage: 4 } })).status).toBe(404);
  });
});
