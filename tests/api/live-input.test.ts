// Live input through an audio-class interface: the lead's input scaling per channel (volts at
// digital full scale, AC-coupling low cut-off) and the calibrator check of a sensor's sensitivity,
// stored and audited (docs/methods.md#input-scaling).
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { and, eq } from 'drizzle-orm';
import { auditEvent } from '@resonote/db/schema';
import { startTestApp, type TestApp } from '../support/app.ts';
import type { Person } from '../support/campaign.ts';
import { barCrew, type RigCampaign } from '../support/rig.ts';
import { API_TEMPLATE } from '../support/global-setup-api.ts';

let app: TestApp;
let lead: Person;
let engineer: Person;
let viewer: Person;
let rig: RigCampaign;
let channels: { id: string; channel: number }[];

beforeAll(async () => {
  app = await startTestApp(API_TEMPLATE);
  ({ lead, engineer, viewer, rig } = await barCrew(app));
  channels = (await lead.agent.get(`/api/campaigns/${rig.campaignId}/channels`)).body.channels;
});
afterAll(async () => {
  await app?.close();
});

const scalingUrl = (channelId: string) => `/api/campaigns/${rig.campaignId}/channels/${channelId}/input-scaling`;

describe('input scaling of the live input', () => {
  it('stores volts at full scale and the low cut-off per channel, versioned and audited, and lists them for every member', async () => {
    const [hammer, accel] = channels;
    const made = await lead.agent.put(scalingUrl(hammer!.id)).send({ fullScaleVolts: 0.5, acLowCutHz: 2.5 });
    expect(made.status).toBe(200);
    expect(made.body.scaling).toMatchObject({ channel: 1, fullScaleVolts: 0.5, acLowCutHz: 2.5, version: 1 });
    expect((await lead.agent.put(scalingUrl(accel!.id)).send({ fullScaleVolts: 5 })).body.scaling).toMatchObject({ channel: 2, acLowCutHz: null, version: 1 });
    const changed = await lead.agent.put(scalingUrl(hammer!.id)).send({ fullScaleVolts: 1, acLowCutHz: 2.5, version: 1 });
    expect(changed.body.scaling).toMatchObject({ fullScaleVolts: 1, version: 2 });
    const list = await viewer.agent.get(`/api/campaigns/${rig.campaignId}/input-scaling`);
    expect(list.body.scaling.map((s: { channel: number; fullScaleVolts: number }) => [s.channel, s.fullScaleVolts])).toEqual([[1, 1], [2, 5]]);
    const trail = await app.handle.database.db.select().from(auditEvent).where(and(eq(auditEvent.campaignId, rig.campaignId), eq(auditEvent.entity, 'channel-input')));
    expect(trail.map((a) => a.action).sort()).toEqual(['create', 'create', 'update']);
  });

  it('refuses a stale version, a missing version on a change, bad numbers and unknown fields with 4xx in the one error shape', async () => {
    const hammer = channels[0]!;
    const stale = await lead.agent.put(scalingUrl(hammer.id)).send({ fullScaleVolts: 2, version: 1 });
    expect(stale.status).toBe(409);
    expect((await lead.agent.put(scalingUrl(hammer.id)).send({ fullScaleVolts: 2 })).status).toBe(409);
    for (const body of [{ fullScaleVolts: 0 }, { fullScaleVolts: -1 }, { fullScaleVolts: 'one' }, { fullScaleVolts: 1, acLowCutHz: -3 }, { fullScaleVolts: 1, gain: 2 }, {}]) {
      const res = await lead.agent.put(scalingUrl(hammer.id)).send(body);
      expect(res.status, JSON.stringify(body)).toBe(400);
      expect(res.body.error.code).toBeTypeOf('string');
      expect(res.body.error.message).toBeTypeOf('string');
    }
    expect((await engineer.agent.put(scalingUrl(hammer.id)).send({ fullScaleVolts: 2, version: 2 })).status).toBe(403);
    expect((await lead.agent.put(scalingUrl('00000000-0000-4000-8000-000000000000')).send({ fullScaleVolts: 2 })).status).toBe(404);
  });
});

describe('calibrator check of a sensitivity', () => {
  // The bar rig's accelerometer is 10.2 mV/(m/s²) (tests/support/rig.ts). A calibrator at 10 m/s² RMS
  // that reads 0.1 V RMS gives 10.0 mV/(m/s²): (10.0 − 10.2)/10.2 = −1.961 %, 20·log10(10/10.2) = −0.172 dB.
  it('stores the measured sensitivity with its deviation from the kit in % and dB, audited', async () => {
    const accel = channels[1]!;
    const res = await engineer.agent.post(`/api/campaigns/${rig.campaignId}/sensitivity-checks`).send({ channelId: accel.id, referenceMs2Rms: 10, referenceHz: 159.2, measuredVoltsRms: 0.1, measuredHz: 159.1, sampleRateHz: 48_000, durationS: 2 });
    expect(res.status).toBe(201);
    expect(res.body.check.measuredSensitivity).toBeCloseTo(10, 10);
    expect(res.body.check.kitSensitivity).toBe(10.2);
    expect(res.body.check.deviationPercent).toBeCloseTo(-1.96078, 4);
    expect(res.body.check.deviationDb).toBeCloseTo(-0.172003, 5);
    expect(res.body.check.fullScaleVolts).toBe(5);
    const list = await viewer.agent.get(`/api/campaigns/${rig.campaignId}/sensitivity-checks`);
    expect(list.body.checks).toHaveLength(1);
    expect(list.body.checks[0].checkedByName).toBe('Eric Engineer');
    const trail = await app.handle.database.db.select().from(auditEvent).where(and(eq(auditEvent.campaignId, rig.campaignId), eq(auditEvent.entity, 'sensitivity-check')));
    expect(trail).toHaveLength(1);
  });

  it('refuses the hammer channel, a tone away from the calibrator, no signal, and a channel without scaling', async () => {
    const [hammer, accel] = channels;
    const ok = { channelId: accel!.id, referenceMs2Rms: 10, referenceHz: 159.2, measuredVoltsRms: 0.1, measuredHz: 159.2, sampleRateHz: 48_000, durationS: 2 };
    const url = `/api/campaigns/${rig.campaignId}/sensitivity-checks`;
    const onHammer = await engineer.agent.post(url).send({ ...ok, channelId: hammer!.id });
    expect(onHammer.status).toBe(400);
    expect(onHammer.body.error.message).toMatch(/carries the hammer/);
    const offTone = await engineer.agent.post(url).send({ ...ok, measuredHz: 50 });
    expect(offTone.status).toBe(400);
    expect(offTone.body.error.message).toMatch(/strongest tone was at 50\.0 Hz/);
    expect((await engineer.agent.post(url).send({ ...ok, measuredVoltsRms: 0 })).status).toBe(400);
    expect((await engineer.agent.post(url).send({ ...ok, channelId: 'nope' })).status).toBe(400);
    expect((await viewer.agent.post(url).send(ok)).status).toBe(403);
    // A second accelerometer channel without scaling: 409 with what to do.
    const item = await lead.agent.post(`/api/campaigns/${rig.campaignId}/kit`).send({ kind: 'accelerometer', model: 'AC-10', serial: 'A999', sensitivity: 10, sensitivityUnit: 'mV/(m/s²)', axes: ['Z'] });
    const ch = await lead.agent.post(`/api/campaigns/${rig.campaignId}/channels`).send({ channel: 9, kitItemId: item.body.item.id, axis: 'Z', dof: 'B01:+Z', sign: 1 });
    const unscaled = await engineer.agent.post(url).send({ ...ok, channelId: ch.body.channel.id });
    expect(unscaled.status).toBe(409);
    expect(unscaled.body.error.message).toMatch(/no input scaling/);
  });
});
