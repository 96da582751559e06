// A campaign with a lead, an engineer, a viewer and an outsider (a member of another campaign),
// made through the real API: the instance admin creates both campaigns and invites everyone, so
// the lead is an ordinary account whose rights come from its campaign role only.
import { capturedMail } from '@resonote/db/schema';
import type { TestApp } from './app.ts';
import { signUp } from './accounts.ts';
import { until } from './poll.ts';

type Agent = ReturnType<TestApp['agent']>;

export interface Person {
  agent: Agent;
  id: string;
  email: string;
}

export interface CampaignCrew {
  campaignId: string;
  otherCampaignId: string;
  /** The instance admin (first account) who created both campaigns. */
  admin: Person;
  /** Lead of the campaign by invitation, not an admin. */
  lead: Person;
  engineer: Person;
  viewer: Person;
  /** Member (lead) of the other campaign only. */
  outsider: Person;
}

/** The first captured mail to `to` whose subject matches, polled for up to 5 s. */
export async function waitForMail(app: TestApp, to: string, subject: RegExp) {
  return until(
    `a mail to ${to} matching ${subject}`,
    async () => (await app.handle.database.db.select().from(capturedMail)).find((m) => m.toAddresses.includes(to) && subject.test(m.subject)),
    5_000,
  );
}

/** Invites `person` to the campaign with `role` and accepts through the mailed link. */
export async function invite(app: TestApp, lead: Person | { agent: Agent }, campaignId: string, person: Person, role: 'lead' | 'engineer' | 'viewer') {
  const sent = await lead.agent.post(`/api/campaigns/${campaignId}/invitations`).send({ email: person.email, role });
  if (sent.status !== 201) throw new Error(`invitation of ${person.email} failed: ${sent.status} ${JSON.stringify(sent.body)}`);
  const mail = await waitForMail(app, person.email, /invites you/);
  const token = mail.text.match(/\/invitations\/([A-Za-z0-9_-]+)/)?.[1];
  if (!token) throw new Error(`no invitation link in the mail to ${person.email}`);
  const accepted = await person.agent.post(`/api/invitations/${token}/accept`).send({});
  if (accepted.status !== 200) throw new Error(`accepting the invitation of ${person.email} failed: ${accepted.status} ${JSON.stringify(accepted.body)}`);
}

/**
 * Signs up five people on a fresh test database and builds the crew. Call it once per test file,
 * before any other sign-up: the first account becomes the instance admin.
 */
export async function makeCrew(app: TestApp, tag = 'c'): Promise<CampaignCrew> {
  const admin = await signUp(app, `Ada Admin ${tag}`, `admin-${tag}@lab.test`);
  const lead = await signUp(app, `Lena Lead ${tag}`, `lead-${tag}@lab.test`);
  const engineer = await signUp(app, `Eric Engineer ${tag}`, `engineer-${tag}@lab.test`);
  const viewer = await signUp(app, `Vera Viewer ${tag}`, `viewer-${tag}@lab.test`);
  const outsider = await signUp(app, `Otto Outsider ${tag}`, `outsider-${tag}@lab.test`);
  const made = await admin.agent.post('/api/campaigns').send({ name: `Bracket modal survey ${tag}`, structure: 'Steel bracket' });
  if (made.status !== 201) throw new Error(`campaign creation failed: ${made.status} ${JSON.stringify(made.body)} (is the first account the admin?)`);
  const other = await admin.agent.post('/api/campaigns').send({ name: `Other campaign ${tag}` });
  if (other.status !== 201) throw new Error(`second campaign creation failed: ${other.status} ${JSON.stringify(other.body)}`);
  const campaignId = made.body.campaign.id as string;
  const otherCampaignId = other.body.campaign.id as string;
  await invite(app, admin, campaignId, lead, 'lead');
  await invite(app, lead, campaignId, engineer, 'engineer');
  await invite(app, lead, campaignId, viewer, 'viewer');
  await invite(app, admin, otherCampaignId, outsider, 'lead');
  return { campaignId, otherCampaignId, admin, lead, engineer, viewer, outsider };
}

/**
 * On a fresh database: an admin (the first account), a lead, an engineer and a viewer signed up, and
 * one campaign the admin creates from `body` with the other three invited to their roles.
 */
export async function staffedCampaign(app: TestApp, body: Record<string, unknown>): Promise<{ campaignId: string; admin: Person; lead: Person; engineer: Person; viewer: Person }> {
  const admin = await signUp(app, 'Ada Admin', 'admin@lab.test');
  const lead = await signUp(app, 'Lena Lead', 'lead@lab.test');
  const engineer = await signUp(app, 'Eric Engineer', 'eng@lab.test');
  const viewer = await signUp(app, 'Vera Viewer', 'view@lab.test');
  const made = await admin.agent.post('/api/campaigns').send(body);
  if (made.status !== 201) throw new Error(`campaign creation failed: ${made.status} ${JSON.stringify(made.body)}`);
  const campaignId = made.body.campaign.id as string;
  await invite(app, admin, campaignId, lead, 'lead');
  await invite(app, admin, campaignId, engineer, 'engineer');
  await invite(app, admin, campaignId, viewer, 'viewer');
  return { campaignId, admin, lead, engineer, viewer };
}
