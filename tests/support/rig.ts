// A campaign ready for hits: the demo steel bar's geometry, a hammer and one or two
// accelerometers on the channel map, acquisition settings, and the schedule.
import { afterAll, beforeAll } from 'vitest';
import { steelBar } from '@resonote/sim';
import { startTestApp, type TestApp } from './app.ts';
import { API_TEMPLATE } from './global-setup-api.ts';
import { signUp } from './accounts.ts';
import { invite, type Person } from './campaign.ts';

export interface RigCampaign {
  campaignId: string;
  entries: { id: string; responseDof: string; excitationDof: string; drivingPoint: boolean; version: number }[];
  hammerSensitivity: number;
  accelSensitivity: number;
}

export const BAR_SETTINGS = {
  sampleRateHz: 4096,
  recordLengthS: 4,
  preTriggerS: 0.01,
  triggerLevelN: 5,
  forceWindow: { lengthS: 0.02, taperS: 0.002 },
  exponentialWindow: { mode: 'none' },
  hitsToAverage: 3,
  bandHz: { low: 10, high: 800 },
  estimator: 'H1',
  doubleHitRatio: 0.04,
  overloadPercent: 99,
  rollOffDb: 20,
  coherenceThreshold: 0.9,
  minPeakN: 20,
  forceRangeN: 2000,
  responseRangeMs2: 500,
} as const;

export async function barCampaign(app: TestApp, lead: Person, options: { references?: string[]; settings?: Record<string, unknown>; name?: string } = {}): Promise<RigCampaign> {
  const references = options.references ?? ['B21:+Z'];
  const made = await lead.agent.post('/api/campaigns').send({ name: options.name ?? 'Calibration bar', structure: 'Free-free steel bar', testType: 'roving-hammer', referenceDofs: references, simulator: 'steel-bar' });
  if (made.status !== 201) throw new Error(`campaign: ${made.status} ${JSON.stringify(made.body)}`);
  const campaignId = made.body.campaign.id as string;
  const bar = steelBar();
  const csv = ['label,x,y,z,directions', ...bar.points.map((p) => `${p.label},${p.xMm},${p.yMm},${p.zMm},+Z`)].join('\n');
  await expectOk(lead.agent.post(`/api/campaigns/${campaignId}/geometry/import`).send({ csv }), 'geometry');
  const hammer = await expectOk(lead.agent.post(`/api/campaigns/${campaignId}/kit`).send({ kind: 'hammer', model: 'IH-02', serial: 'H1001', sensitivity: 2.25, sensitivityUnit: 'mV/N', tips: ['medium'] }), 'hammer');
  await expectOk(lead.agent.post(`/api/campaigns/${campaignId}/channels`).send({ channel: 1, kitItemId: hammer.body.item.id }), 'hammer channel');
  for (const [i, ref] of references.entries()) {
    const accel = await expectOk(lead.agent.post(`/api/campaigns/${campaignId}/kit`).send({ kind: 'accelerometer', model: 'AC-10', serial: `A20${i}`, sensitivity: 10.2, sensitivityUnit: 'mV/(m/s²)', axes: ['Z'] }), 'accelerometer');
    await expectOk(lead.agent.post(`/api/campaigns/${campaignId}/channels`).send({ channel: 2 + i, kitItemId: accel.body.item.id, axis: 'Z', dof: ref, sign: 1 }), 'accelerometer channel');
  }
  await expectOk(lead.agent.put(`/api/campaigns/${campaignId}/settings`).send({ baseVersion: 0, settings: { ...BAR_SETTINGS, ...(options.settings ?? {}) }, reason: 'test rig' }), 'settings');
  const schedule = await expectOk(lead.agent.post(`/api/campaigns/${campaignId}/schedule/generate`).send({}), 'schedule');
  return { campaignId, entries: schedule.body.entries, hammerSensitivity: 2.25, accelSensitivity: 10.2 };
}

async function expectOk<T extends { status: number; body: unknown }>(req: PromiseLike<T>, what: string): Promise<T> {
  const res = await req;
  if (res.status >= 300) throw new Error(`${what}: ${res.status} ${JSON.stringify(res.body)}`);
  return res;
}

/**
 * The usual cast of a hits test on a fresh database: an admin (first account), a lead of an
 * ordinary campaign role, an engineer and a viewer invited to the bar campaign the lead set up.
 */
export async function barCrew(app: TestApp): Promise<{ lead: Person; engineer: Person; viewer: Person; rig: RigCampaign }> {
  const admin = await signUp(app, 'Ada Admin', 'admin@lab.test');
  const lead = await signUp(app, 'Lena Lead', 'lead@lab.test');
  const engineer = await signUp(app, 'Eric Engineer', 'eng@lab.test');
  const viewer = await signUp(app, 'Vera Viewer', 'view@lab.test');
  const seedCampaign = (await admin.agent.post('/api/campaigns').send({ name: 'Seed' })).body.campaign.id;
  await invite(app, admin, seedCampaign, lead, 'lead');
  const rig = await barCampaign(app, lead);
  await invite(app, lead, rig.campaignId, engineer, 'engineer');
  await invite(app, lead, rig.campaignId, viewer, 'viewer');
  return { lead, engineer, viewer, rig };
}

export type BarRig = { app: Awaited<ReturnType<typeof startTestApp>> } & Awaited<ReturnType<typeof barCrew>>;

/**
 * The file's app on a fresh database with `barCrew` on it: started in a beforeAll (120 s) that hands
 * it to `use` (which assigns the file's variables and may add its own set-up), closed in an afterAll.
 * `env` and `options` go to startTestApp.
 */
export function useBarRig(use: (rig: BarRig) => unknown, env: Record<string, string> = {}, options: Parameters<typeof startTestApp>[2] = {}): void {
  let app: BarRig['app'] | undefined;
  beforeAll(async () => {
    app = await startTestApp(API_TEMPLATE, env, options);
    await use({ app, ...(await barCrew(app)) });
  }, 120_000);
  afterAll(async () => {
    await app?.close();
  });
}
