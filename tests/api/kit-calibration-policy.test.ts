// The campaign's calibration policy (warn or block on an overdue or missing calibration, enforced
// at hit intake) and the confirmation a large sensitivity change needs, against the real app and
// PostgreSQL (design.md "Kit"; docs/methods.md#units).
import { beforeAll, describe, expect, it } from 'vitest';
import type { TestApp } from '../support/app.ts';
import { useBarRig, type RigCampaign } from '../support/rig.ts';
import type { Person } from '../support/campaign.ts';

let app: TestApp;
let lead: Person;
let engineer: Person;
let viewer: Person;
let rig: RigCampaign;
let base: string;

const dayFromToday = (days: number) => new Date(Date.now() + days * 86_400_000).toISOString().slice(0, 10);

useBarRig(async (r) => {
  ({ app, lead, engineer, viewer, rig } = r);
  base = `/api/campaigns/${rig.campaignId}`;
});

const entry = (dof: string) => rig.entries.find((e: { excitationDof: string }) => e.excitationDof === dof)!;
async function kitItems() {
  const res = await lead.agent.get(`${base}/kit`);
  return res.body.items as { id: string; kind: string; version: number; sensitivity: number; sensitivityUnit: string; sensitivityBase: number }[];
}

describe('calibration policy', () => {
  it('starts at warn with the 5 % tolerance (common practice) and lets hits through with missing calibrations', async () => {
    const policy = await viewer.agent.get(`${base}/kit-policy`);
    expect(policy.status).toBe(200);
    expect(policy.body.policy).toEqual({ calibration: 'warn', changeTolerancePct: 5, version: 0 });
    const ready = await engineer.agent.get(`${base}/kit-readiness`);
    expect(ready.status).toBe(200);
    // The bar rig registers a hammer (channel 1) and one accelerometer (channel 2), neither calibrated.
    expect(ready.body.channels.map((c: { channel: number; state: string }) => [c.channel, c.state])).toEqual([
      [1, 'none'],
      [2, 'none'],
    ]);
    expect(ready.body.problems[0]).toBe('Channel 1 (hammer IH-02, SN H1001) has no calibration record.');
    expect(ready.body.blocking).toBe(false);
    const hit = await engineer.agent.post(`${base}/schedule/${entry('B03:+Z').id}/simulate`).send({ count: 1, seed: 3, doubleHitProbability: 0, overloadProbability: 0 });
    expect(hit.status).toBe(201);
  });

  it('lets only a lead change the policy, validates it, and refuses a stale base version with 409', async () => {
    const asEngineer = await engineer.agent.put(`${base}/kit-policy`).send({ baseVersion: 0, calibration: 'block', changeTolerancePct: 5 });
    expect(asEngineer.status).toBe(403);
    const bad = await lead.agent.put(`${base}/kit-policy`).send({ baseVersion: 0, calibration: 'stop', changeTolerancePct: 0 });
    expect(bad.status).toBe(400);
    expect(bad.body.error.code).toBe('invalid-input');
    expect(bad.body.error.details.map((d: { path: string }) => d.path).sort()).toEqual(['calibration', 'changeTolerancePct']);
    const ok = await lead.agent.put(`${base}/kit-policy`).send({ baseVersion: 0, calibration: 'block', changeTolerancePct: 5 });
    expect(ok.status).toBe(200);
    expect(ok.body.policy).toEqual({ calibration: 'block', changeTolerancePct: 5, version: 1 });
    const stale = await lead.agent.put(`${base}/kit-policy`).send({ baseVersion: 0, calibration: 'warn', changeTolerancePct: 5 });
    expect(stale.status).toBe(409);
    expect(stale.body.error.code).toBe('stale-version');
    const events = await lead.agent.get(`${base}/audit`).query({ entity: 'kit-policy' });
    expect(events.body.events.map((e: { action: string; after: { calibration: string } }) => [e.action, e.after.calibration])).toEqual([['update', 'block']]);
  });

  it('with block, refuses simulated and uploaded hits with 409 calibration-blocked naming each channel, and stores nothing', async () => {
    const at = entry('B05:+Z');
    const sim = await engineer.agent.post(`${base}/schedule/${at.id}/simulate`).send({ count: 1, seed: 5 });
    expect(sim.status).toBe(409);
    expect(sim.body.error.code).toBe('calibration-blocked');
    expect(sim.body.error.message).toMatch(/Channel 1 \(hammer IH-02, SN H1001\) has no calibration record\. Channel 2 \(accelerometer AC-10, SN A200\) has no calibration record\./);
    expect(sim.body.error.details.channels.map((c: { channel: number; state: string }) => [c.channel, c.state])).toEqual([
      [1, 'none'],
      [2, 'none'],
    ]);
    const csv = Buffer.from('0.0,0.0\n0.1,0.01\n0.0,0.0\n');
    const up = await engineer.agent.post(`${base}/schedule/${at.id}/hits`).set('idempotency-key', 'blocked-upload-1').field('units', 'engineering').attach('file', csv, 'hit.csv');
    expect(up.status).toBe(409);
    expect(up.body.error.code).toBe('calibration-blocked');
    const hits = await engineer.agent.get(`${base}/schedule/${at.id}/hits`);
    expect(hits.body.hits).toHaveLength(0);
    expect((await engineer.agent.get(`${base}/kit-readiness`)).body.blocking).toBe(true);
  });

  it('with block, refuses an overdue calibration too and takes hits once every channel is in date', async () => {
    const [hammer, accel] = await kitItems();
    // Overdue since yesterday on the hammer; in date on the accelerometer.
    await lead.agent.post(`${base}/kit/${hammer!.id}/calibrations`).send({ calibratedOn: dayFromToday(-366), dueOn: dayFromToday(-1), certificateRef: 'C-H-1', performedBy: 'Cal lab' }).expect(201);
    await lead.agent.post(`${base}/kit/${accel!.id}/calibrations`).send({ calibratedOn: dayFromToday(-10), dueOn: dayFromToday(355), certificateRef: 'C-A-1', performedBy: 'Cal lab' }).expect(201);
    const at = entry('B07:+Z');
    const sim = await engineer.agent.post(`${base}/schedule/${at.id}/simulate`).send({ count: 1, seed: 7 });
    expect(sim.status).toBe(409);
    expect(sim.body.error.details.channels).toEqual([{ channel: 1, kitItemId: hammer!.id, state: 'overdue', dueOn: dayFromToday(-1), message: `Channel 1 (hammer IH-02, SN H1001): calibration overdue by 1 day (due ${dayFromToday(-1)}).` }]);
    await lead.agent.post(`${base}/kit/${hammer!.id}/calibrations`).send({ calibratedOn: dayFromToday(0), dueOn: dayFromToday(365), certificateRef: 'C-H-2', performedBy: 'Cal lab' }).expect(201);
    const ok = await engineer.agent.post(`${base}/schedule/${at.id}/simulate`).send({ count: 1, seed: 7, doubleHitProbability: 0, overloadProbability: 0 });
    expect(ok.status).toBe(201);
    expect((await engineer.agent.get(`${base}/kit-readiness`)).body).toMatchObject({ problems: [], blocking: false });
  });
});

describe('a large sensitivity change needs confirming', () => {
  let hammerId: string;
  beforeAll(async () => {
    const made = await lead.agent.post(`${base}/kit`).send({ kind: 'hammer', model: 'IH-10', serial: 'LBF-1', sensitivity: 10, sensitivityUnit: 'mV/lbf', tips: ['hard'] });
    expect(made.status).toBe(201);
    hammerId = made.body.item.id;
  });

  it('refuses 2.30 read as mV/lbf on a 10 mV/lbf hammer with 409, both values in mV/N and mV/lbf', async () => {
    const res = await lead.agent.post(`${base}/kit/${hammerId}/calibrations`).send({ calibratedOn: dayFromToday(0), dueOn: dayFromToday(365), certificateRef: 'C-10', performedBy: 'Cal lab', sensitivity: 2.3 });
    expect(res.status).toBe(409);
    expect(res.body.error.code).toBe('large-sensitivity-change');
    const d = res.body.error.details;
    // |2.30 − 10| / 10 = 77 %; 1 lbf = 4.4482216152605 N exactly (NIST SP 811, 2008, B.8), so
    // 10 mV/lbf = 2.248089430997105 mV/N and 2.30 mV/lbf = 0.5170605691293341 mV/N (python3: 10/4.4482216152605).
    expect(d.changePct).toBeCloseTo(77, 10);
    expect(d.tolerancePct).toBe(5);
    expect(d.previous).toEqual([
      { value: 10 / 4.4482216152605, unit: 'mV/N' },
      { value: expect.closeTo(10, 12), unit: 'mV/lbf' },
    ]);
    expect(d.next[0]).toEqual({ value: 2.3 / 4.4482216152605, unit: 'mV/N' });
    expect(d.next[0].value).toBeCloseTo(0.51706, 5);
    expect(d.next[1].value).toBeCloseTo(2.3, 12);
    expect(res.body.error.message).toBe(
      'Hammer IH-10 (SN LBF-1): the new sensitivity 0.5171 mV/N = 2.3 mV/lbf differs from the previous 2.248 mV/N = 10 mV/lbf by 77.0 %, more than the 5 % tolerance. Check the value and its unit; to store it anyway, send it again with confirmLargeChange: true. Nothing was changed.',
    );
    // Nothing stored: no calibration record, the item unchanged.
    const item = (await kitItems()).find((i) => i.id === hammerId)!;
    expect(item).toMatchObject({ sensitivity: 10, sensitivityUnit: 'mV/lbf', version: 1 });
    const kit = await lead.agent.get(`${base}/kit`);
    expect(kit.body.items.find((i: { id: string }) => i.id === hammerId).calibrations).toHaveLength(0);
  });

  it('stores the same value in mV/N without asking (2.30 against 2.2481 mV/N is 2.3 %), exact in both units', async () => {
    const before = (await kitItems()).find((i) => i.id === hammerId)!;
    const res = await lead.agent.patch(`${base}/kit/${hammerId}`).send({ version: before.version, sensitivity: 2.3, sensitivityUnit: 'mV/N' });
    expect(res.status).toBe(200);
    expect(res.body.item).toMatchObject({ sensitivity: 2.3, sensitivityUnit: 'mV/N', sensitivityBase: 2.3 });
  });

  it('asks at 5.1 % and not at 4.9 % (the 5 % default tolerance), and stores a confirmed change with its numbers audited', async () => {
    let item = (await kitItems()).find((i) => i.id === hammerId)!; // 2.3 mV/N
    const within = await lead.agent.patch(`${base}/kit/${hammerId}`).send({ version: item.version, sensitivity: 2.3 * 1.049 });
    expect(within.status).toBe(200);
    item = within.body.item;
    const beyond = await lead.agent.patch(`${base}/kit/${hammerId}`).send({ version: item.version, sensitivity: item.sensitivity * 1.051 });
    expect(beyond.status).toBe(409);
    expect(beyond.body.error.details.changePct).toBeCloseTo(5.1, 9);
    const unconfirmed = await lead.agent.post(`${base}/kit/${hammerId}/calibrations`).send({ calibratedOn: dayFromToday(0), dueOn: dayFromToday(365), certificateRef: 'C-11', performedBy: 'Cal lab', sensitivity: 10, confirmLargeChange: false });
    expect(unconfirmed.status, 'confirmLargeChange: false is no confirmation').toBe(409);
    const big = await lead.agent.post(`${base}/kit/${hammerId}/calibrations`).send({ calibratedOn: dayFromToday(0), dueOn: dayFromToday(365), certificateRef: 'C-12', performedBy: 'Cal lab', sensitivity: 10, confirmLargeChange: true });
    expect(big.status).toBe(201);
    expect(big.body.item).toMatchObject({ sensitivity: 10, sensitivityUnit: 'mV/N', sensitivityBase: 10 });
    const events = await lead.agent.get(`${base}/audit`).query({ entity: 'kit-item', limit: 1000 });
    const calibrate = events.body.events.find((e: { entityId: string; action: string; after: { certificateRef?: string; confirmedLargeChange?: unknown } }) => e.entityId === hammerId && e.action === 'calibrate' && e.after.confirmedLargeChange);
    // 10 against 2.3 × 1.049 = 2.4127 mV/N: (10 − 2.4127) / 2.4127 = 314.47 %.
    expect(calibrate.after.confirmedLargeChange.changePct).toBeCloseTo((10 / (2.3 * 1.049) - 1) * 100, 9);
  });

  it('uses the campaign’s own tolerance when the lead sets one', async () => {
    const policy = (await lead.agent.get(`${base}/kit-policy`)).body.policy;
    await lead.agent.put(`${base}/kit-policy`).send({ baseVersion: policy.version, calibration: 'warn', changeTolerancePct: 1 }).expect(200);
    const item = (await kitItems()).find((i) => i.id === hammerId)!; // 10 mV/N
    const res = await lead.agent.patch(`${base}/kit/${hammerId}`).send({ version: item.version, sensitivity: 10.2 });
    expect(res.status).toBe(409);
    expect(res.body.error.details).toMatchObject({ tolerancePct: 1 });
    expect(res.body.error.details.changePct).toBeCloseTo(2, 9);
  });
});
