// Campaigns, members and invitations against the real API and database.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startTestApp, type TestApp } from '../support/app.ts';
import { signUp } from '../support/accounts.ts';
import { staffedCampaign, waitForMail, type Person } from '../support/campaign.ts';
import { API_TEMPLATE } from '../support/global-setup-api.ts';

let app: TestApp;
let admin: Person;
let lead: Person;
let engineer: Person;
let viewer: Person;
let stranger: Person;
let campaignId: string;

beforeAll(async () => {
  app = await startTestApp(API_TEMPLATE);
  ({ campaignId, admin, lead, engineer, viewer } = await staffedCampaign(app, { name: 'Pump skid baseplate', structure: 'Baseplate, skid 3', client: 'Northwind Pumps (fictional)', testType: 'roving-hammer' }));
  stranger = await signUp(app, 'Sam Stranger', 'sam@lab.test');
});
afterAll(async () => {
  await app?.close();
});

describe('campaigns', () => {
  it('lists a campaign for its members with their role, and not for others', async () => {
    const forViewer = await viewer.agent.get('/api/campaigns');
    expect(forViewer.body.campaigns.map((c: { name: string; myRole: string }) => [c.name, c.myRole])).toEqual([['Pump skid baseplate', 'viewer']]);
    expect(forViewer.body.campaigns[0].leads).toContain('Lena Lead');
    expect((await stranger.agent.get('/api/campaigns')).body.campaigns).toEqual([]);
    const search = await admin.agent.get('/api/campaigns?q=northwind');
    expect(search.body.campaigns).toHaveLength(1);
    expect((await admin.agent.get('/api/campaigns?q=nothing-like-this')).body.campaigns).toHaveLength(0);
  });

  it('answers 404, not 403, to someone outside the campaign', async () => {
    const res = await stranger.agent.get(`/api/campaigns/${campaignId}`);
    expect(res.status).toBe(404);
    expect(res.body.error.message).toBe('That campaign was not found.');
  });

  it('lets only admins and leads create campaigns', async () => {
    const refused = await stranger.agent.post('/api/campaigns').send({ name: 'My own' });
    expect(refused.status).toBe(403);
    const byLead = await lead.agent.post('/api/campaigns').send({ name: 'Lead-made campaign' });
    expect(byLead.status).toBe(201);
    expect(byLead.body.myRole).toBe('lead');
  });

  it('refuses unknown fields and says which', async () => {
    const res = await admin.agent.post('/api/campaigns').send({ name: 'X', colour: 'red' });
    expect(res.status).toBe(400);
    expect(res.body.error.message).toMatch(/colour/);
  });

  it('keeps a concurrent edit from overwriting another: the stale one gets 409 with the current state', async () => {
    const current = (await lead.agent.get(`/api/campaigns/${campaignId}`)).body.campaign;
    const first = await lead.agent.patch(`/api/campaigns/${campaignId}`).send({ version: current.version, status: 'testing', referenceDofs: ['P01:+Z'] });
    expect(first.status).toBe(200);
    expect(first.body.campaign.version).toBe(current.version + 1);
    const second = await admin.agent.patch(`/api/campaigns/${campaignId}`).send({ version: current.version, client: 'Someone else' });
    expect(second.status).toBe(409);
    expect(second.body.error.code).toBe('stale-version');
    expect(second.body.error.details.current.status).toBe('testing');
    expect((await lead.agent.get(`/api/campaigns/${campaignId}`)).body.campaign.client).toBe('Northwind Pumps (fictional)');
  });

  it('refuses a badly written reference DOF', async () => {
    const current = (await lead.agent.get(`/api/campaigns/${campaignId}`)).body.campaign;
    const res = await lead.agent.patch(`/api/campaigns/${campaignId}`).send({ version: current.version, referenceDofs: ['P01+Z'] });
    expect(res.status).toBe(400);
    expect(res.body.error.message).toMatch(/point:±axis/);
  });

  it('lets an engineer and a viewer read but not change the campaign', async () => {
    const current = (await viewer.agent.get(`/api/campaigns/${campaignId}`)).body;
    expect(current.myRole).toBe('viewer');
    const res = await engineer.agent.patch(`/api/campaigns/${campaignId}`).send({ version: current.campaign.version, name: 'Hijacked' });
    expect(res.status).toBe(403);
  });
});

describe('members and invitations', () => {
  it('mails an invitation whose link tells who invites to what, and joins the invited person', async () => {
    const newcomer = await signUp(app, 'Nina New', 'nina@lab.test');
    const sent = await lead.agent.post(`/api/campaigns/${campaignId}/invitations`).send({ email: 'Nina@Lab.test', role: 'engineer' });
    expect(sent.status).toBe(201);
    const mail = await waitForMail(app, 'nina@lab.test', /invites you to the Resonote campaign “Pump skid baseplate”/);
    const token = mail.text.match(/\/invitations\/([A-Za-z0-9_-]+)/)![1]!;
    const peek = await app.agent().get(`/api/invitations/${token}`);
    expect(peek.body).toMatchObject({ campaignName: 'Pump skid baseplate', role: 'engineer', email: 'nina@lab.test' });
    const wrongPerson = await stranger.agent.post(`/api/invitations/${token}/accept`).send({});
    expect(wrongPerson.status).toBe(403);
    expect((await newcomer.agent.post(`/api/invitations/${token}/accept`).send({})).status).toBe(200);
    const again = await newcomer.agent.post(`/api/invitations/${token}/accept`).send({});
    expect(again.status).toBe(410);
    const members = (await viewer.agent.get(`/api/campaigns/${campaignId}/members`)).body.members;
    expect(members.find((m: { email: string }) => m.email === 'nina@lab.test').role).toBe('engineer');
  });

  it('refuses to invite someone who is already a member', async () => {
    const res = await lead.agent.post(`/api/campaigns/${campaignId}/invitations`).send({ email: 'view@lab.test', role: 'viewer' });
    expect(res.status).toBe(409);
  });

  it('withdraws an invitation so its link stops working', async () => {
    await lead.agent.post(`/api/campaigns/${campaignId}/invitations`).send({ email: 'later@lab.test', role: 'viewer' }).expect(201);
    const mail = await waitForMail(app, 'later@lab.test', /invites you/);
    const token = mail.text.match(/\/invitations\/([A-Za-z0-9_-]+)/)![1]!;
    const open = (await lead.agent.get(`/api/campaigns/${campaignId}/invitations`)).body.invitations;
    const id = open.find((i: { email: string }) => i.email === 'later@lab.test').id;
    expect((await lead.agent.delete(`/api/campaigns/${campaignId}/invitations/${id}`)).status).toBe(204);
    expect((await app.agent().get(`/api/invitations/${token}`)).status).toBe(404);
  });

  it('changes a role and always keeps a lead', async () => {
    const members = (await lead.agent.get(`/api/campaigns/${campaignId}/members`)).body.members as { userId: string; role: string; version: number; email: string }[];
    const leadRow = members.find((m) => m.email === 'lead@lab.test')!;
    const adminRow = members.find((m) => m.email === 'admin@lab.test')!;
    // Two leads (the admin who created it, and Lena): demoting one is fine, the last one is not.
    expect((await lead.agent.patch(`/api/campaigns/${campaignId}/members/${adminRow.userId}`).send({ version: adminRow.version, role: 'viewer' })).status).toBe(200);
    const last = await lead.agent.patch(`/api/campaigns/${campaignId}/members/${leadRow.userId}`).send({ version: leadRow.version, role: 'engineer' });
    expect(last.status).toBe(409);
    expect(last.body.error.message).toMatch(/always keeps a lead/);
    const remove = await lead.agent.delete(`/api/campaigns/${campaignId}/members/${leadRow.userId}`);
    expect(remove.status).toBe(409);
  });

  it('records every change in the audit trail, readable by leads but not by viewers', async () => {
    const trail = await lead.agent.get(`/api/campaigns/${campaignId}/audit`);
    expect(trail.status).toBe(200);
    const actions = trail.body.events.map((e: { entity: string; action: string }) => `${e.entity}:${e.action}`);
    expect(actions).toEqual(expect.arrayContaining(['campaign:create', 'campaign:update', 'invitation:create', 'member:join', 'member:change-role', 'invitation:revoke']));
    const update = trail.body.events.find((e: { entity: string; action: string }) => e.entity === 'campaign' && e.action === 'update');
    expect(update.before.status).toBe('planning');
    expect(update.after.status).toBe('testing');
    expect(update.actor).toBe('Lena Lead');
    expect((await viewer.agent.get(`/api/campaigns/${campaignId}/audit`)).status).toBe(403);
  });
});
