// The bar campaign of the live-input browser test and benchmark: the bar rig (support/rig.ts) at
// 48 kHz with the interface's full scales as the channels' ranges, resampling of uploads allowed,
// the input scaling entered per channel, and an engineer to sign in.
import { signUp } from './accounts.ts';
import { invite, type Person } from './campaign.ts';
import { barCampaign, type RigCampaign } from './rig.ts';
import type { TestApp } from './app.ts';
import { LIVE_FS, LIVE_KIT, LIVE_RANGES } from './live-wav.ts';

export async function liveCampaign(app: TestApp, settings: Record<string, unknown> = {}): Promise<{ engineer: Person; lead: Person; rig: RigCampaign }> {
  const admin = await signUp(app, 'Ada Admin', 'admin@lab.test');
  const lead = await signUp(app, 'Lena Lead', 'lead@lab.test');
  const engineer = await signUp(app, 'Eric Engineer', 'eng@lab.test');
  const seed = (await admin.agent.post('/api/campaigns').send({ name: 'Seed' })).body.campaign.id;
  await invite(app, admin, seed, lead, 'lead');
  const rig = await barCampaign(app, lead, { settings: { sampleRateHz: LIVE_FS, hitsToAverage: 4, ...LIVE_RANGES, resampleUploads: true, ...settings } });
  await invite(app, lead, rig.campaignId, engineer, 'engineer');
  const channels = (await lead.agent.get(`/api/campaigns/${rig.campaignId}/channels`)).body.channels as { id: string; channel: number }[];
  for (const c of channels) {
    const res = await lead.agent.put(`/api/campaigns/${rig.campaignId}/channels/${c.id}/input-scaling`).send({ fullScaleVolts: c.channel === 1 ? LIVE_KIT.forceFullScaleV : LIVE_KIT.accelFullScaleV, acLowCutHz: 3 });
    if (res.status !== 200) throw new Error(`input scaling: ${res.status} ${JSON.stringify(res.body)}`);
  }
  return { engineer, lead, rig };
}
