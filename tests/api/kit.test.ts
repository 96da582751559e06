// Kit register, calibration records and the channel map, against the real Express app and a real
// PostgreSQL database (design.md "Kit"; docs/methods.md#units, #traceability).
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { startTestApp, type TestApp } from '../support/app.ts';
import { API_TEMPLATE } from '../support/global-setup-api.ts';
import { makeCrew, type CampaignCrew } from '../support/campaign.ts';

let app: TestApp;
let crew: CampaignCrew;
let kitPath: string;
let channelsPath: string;

beforeAll(async () => {
  app = await startTestApp(API_TEMPLATE);
  crew = await makeCrew(app, 'kit');
  kitPath = `/api/campaigns/${crew.campaignId}/kit`;
  channelsPath = `/api/campaigns/${crew.campaignId}/channels`;
});
afterAll(async () => {
  await app?.close();
});

/** A date `days` from today (UTC, as the server counts), YYYY-MM-DD. */
const dayFromToday = (days: number) => new Date(Date.now() + days * 86_400_000).toISOString().slice(0, 10);

let serialCounter = 1000;
const nextSerial = () => `SN-${serialCounter++}`;

async function addAccelerometer(overrides: Record<string, unknown> = {}) {
  const res = await crew.lead.agent
    .post(kitPath)
    .send({ kind: 'accelerometer', model: 'ACC-100', serial: nextSerial(), sensitivity: 100, sensitivityUnit: 'mV/g', axes: ['Z'], ...overrides });
  expect(res.status, JSON.stringify(res.body)).toBe(201);
  return res.body.item as { id: string; version: number; model: string; serial: string; sensitivityBase: number };
}

async function addHammer(overrides: Record<string, unknown> = {}) {
  const res = await crew.lead.agent
    .post(kitPath)
    .send({ kind: 'hammer', model: 'HMR-5', serial: nextSerial(), sensitivity: 2.25, sensitivityUnit: 'mV/N', tips: ['rubber', 'steel'], ...overrides });
  expect(res.status, JSON.stringify(res.body)).toBe(201);
  return res.body.item as { id: string; version: number; model: string; serial: string; sensitivityBase: number };
}

async function auditEvents(entity: string) {
  const res = await crew.lead.agent.get(`/api/campaigns/${crew.campaignId}/audit`).query({ entity, limit: 1000 });
  expect(res.status).toBe(200);
  return res.body.events as { entity: string; entityId: string; action: string; actorId: string; before: Record<string, unknown> | null; after: Record<string, unknown> | null }[];
}

describe('registering kit items', () => {
  it('stores a hammer entered in mV/lbf as entered and converts it exactly to mV/N', async () => {
    const res = await crew.lead.agent.post(kitPath).send({ kind: 'hammer', model: 'HMR-10', serial: 'H-001', sensitivity: 10, sensitivityUnit: 'mV/lbf', tips: ['medium'] });
    expect(res.status).toBe(201);
    const item = res.body.item;
    expect(item).toMatchObject({ kind: 'hammer', model: 'HMR-10', serial: 'H-001', sensitivity: 10, sensitivityUnit: 'mV/lbf', sensitivityBaseUnit: 'mV/N', tips: ['medium'], axes: [], version: 1 });
    // docs/methods.md#units: 10 mV/lbf = 2.2481 mV/N (1 lbf = 4.4482216152605 N exactly).
    expect(item.sensitivityBase).toBeCloseTo(2.2481, 4);
    expect(item.sensitivityBase).toBe(10 / 4.4482216152605);
  });

  it('stores an accelerometer entered in mV/g as entered and converts it exactly to mV/(m/s²)', async () => {
    const res = await crew.lead.agent.post(kitPath).send({ kind: 'accelerometer', model: 'ACC-3056', serial: 'A-12345', sensitivity: 100, sensitivityUnit: 'mV/g', axes: ['X', 'Y', 'Z'] });
    expect(res.status).toBe(201);
    const item = res.body.item;
    expect(item).toMatchObject({ kind: 'accelerometer', sensitivity: 100, sensitivityUnit: 'mV/g', sensitivityBaseUnit: 'mV/(m/s²)', axes: ['X', 'Y', 'Z'], tips: [] });
    // docs/methods.md#units: 100 mV/g = 10.1972 mV/(m/s²), with g_n = 9.80665 m/s² exactly.
    expect(item.sensitivityBase).toBeCloseTo(10.1972, 4);
    expect(item.sensitivityBase).toBe(100 / 9.80665);
  });

  it('refuses a second item of the same kind, model and serial in the campaign with 409', async () => {
    await addAccelerometer({ model: 'ACC-DUP', serial: 'DUP-1' });
    const again = await crew.lead.agent.post(kitPath).send({ kind: 'accelerometer', model: 'ACC-DUP', serial: 'DUP-1', sensitivity: 50, sensitivityUnit: 'mV/(m/s²)' });
    expect(again.status).toBe(409);
    expect(again.body.error.code).toBe('conflict');
    expect(again.body.error.message).toMatch(/ACC-DUP \(SN DUP-1\) is already in this campaign/);
    const list = await crew.lead.agent.get(kitPath);
    expect(list.body.items.filter((i: { serial: string }) => i.serial === 'DUP-1')).toHaveLength(1);
  });

  it('refuses an unknown field in the body with 400 naming the field', async () => {
    const res = await crew.lead.agent.post(kitPath).send({ kind: 'hammer', model: 'HMR-X', serial: 'X-1', sensitivity: 2, sensitivityUnit: 'mV/N', colour: 'red' });
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('invalid-input');
    expect(res.body.error.message).toMatch(/colour/);
  });

  it('refuses an accelerometer unit on a hammer at creation with 400', async () => {
    const res = await crew.lead.agent.post(kitPath).send({ kind: 'hammer', model: 'HMR-X', serial: 'X-2', sensitivity: 2, sensitivityUnit: 'mV/g' });
    expect(res.status).toBe(400);
    expect(res.body.error.message).toMatch(/sensitivityUnit/);
  });
});

describe('changing kit items', () => {
  it('recomputes the base sensitivity when the sensitivity and unit change, and bumps the version', async () => {
    const item = await addAccelerometer({ sensitivity: 10, sensitivityUnit: 'mV/(m/s²)' });
    // 10 → 5.0986 mV/(m/s²) is a 49 % step: beyond the 5 % tolerance, so it is confirmed
    // (tests/api/kit-calibration-policy.test.ts covers the refusal).
    const res = await crew.lead.agent.patch(`${kitPath}/${item.id}`).send({ version: item.version, sensitivity: 50, sensitivityUnit: 'mV/g', confirmLargeChange: true });
    expect(res.status).toBe(200);
    expect(res.body.item).toMatchObject({ sensitivity: 50, sensitivityUnit: 'mV/g', version: item.version + 1 });
    // docs/methods.md#units: g_n = 9.80665 m/s² exactly, so 50 mV/g = 5.0986 mV/(m/s²).
    expect(res.body.item.sensitivityBase).toBeCloseTo(5.0986, 4);
    expect(res.body.item.sensitivityBase).toBe(50 / 9.80665);
  });

  it('answers 409 with the current item when the version is stale, and keeps the other change', async () => {
    const item = await addAccelerometer();
    const first = await crew.lead.agent.patch(`${kitPath}/${item.id}`).send({ version: item.version, notes: 'stud mounted' });
    expect(first.status).toBe(200);
    const stale = await crew.lead.agent.patch(`${kitPath}/${item.id}`).send({ version: item.version, notes: 'wax mounted' });
    expect(stale.status).toBe(409);
    expect(stale.body.error.code).toBe('stale-version');
    expect(stale.body.error.details.current).toMatchObject({ id: item.id, version: item.version + 1, notes: 'stud mounted' });
  });

  it('refuses a unit that does not belong to the item’s kind with 400 naming the unit', async () => {
    const hammer = await addHammer();
    const res = await crew.lead.agent.patch(`${kitPath}/${hammer.id}`).send({ version: hammer.version, sensitivity: 100, sensitivityUnit: 'mV/g' });
    expect(res.status).toBe(400);
    expect(res.body.error.message).toMatch(/mV\/g is not a unit for a hammer/);
    const list = await crew.lead.agent.get(kitPath);
    expect(list.body.items.find((i: { id: string }) => i.id === hammer.id)).toMatchObject({ sensitivityUnit: 'mV/N', version: hammer.version });
  });

  it('refuses a new unit without the sensitivity in that unit, so a value is never reinterpreted', async () => {
    const hammer = await addHammer();
    const res = await crew.lead.agent.patch(`${kitPath}/${hammer.id}`).send({ version: hammer.version, sensitivityUnit: 'mV/lbf' });
    expect(res.status).toBe(400);
    expect(res.body.error.message).toMatch(/^sensitivity:/);
  });

  it('refuses axes on a hammer and tips on an accelerometer with 400', async () => {
    const hammer = await addHammer();
    const acc = await addAccelerometer();
    const axes = await crew.lead.agent.patch(`${kitPath}/${hammer.id}`).send({ version: hammer.version, axes: ['Z'] });
    expect(axes.status).toBe(400);
    expect(axes.body.error.message).toMatch(/^axes: a hammer has tips/);
    const tips = await crew.lead.agent.patch(`${kitPath}/${acc.id}`).send({ version: acc.version, tips: ['steel'] });
    expect(tips.status).toBe(400);
    expect(tips.body.error.message).toMatch(/^tips: an accelerometer has axes/);
  });
});

describe('calibration records and warnings', () => {
  it('reports due-soon, overdue, ok and none from the latest record, with plain-words warnings', async () => {
    const soon = await addAccelerometer({ model: 'CAL-SOON' });
    const late = await addAccelerometer({ model: 'CAL-LATE' });
    const fine = await addAccelerometer({ model: 'CAL-FINE' });
    const never = await addAccelerometer({ model: 'CAL-NONE' });
    const calibrate = (id: string, dueIn: number) =>
      crew.lead.agent.post(`${kitPath}/${id}/calibrations`).send({ calibratedOn: dayFromToday(dueIn - 365), dueOn: dayFromToday(dueIn), certificateRef: `CERT-${id.slice(0, 6)}`, performedBy: 'Lab A' });
    // An older record of `late` that would be fine: the newest record decides.
    const older = await crew.lead.agent
      .post(`${kitPath}/${late.id}/calibrations`)
      .send({ calibratedOn: dayFromToday(-800), dueOn: dayFromToday(400), certificateRef: 'OLD-1', performedBy: 'Lab A' });
    expect(older.status).toBe(201);
    for (const [id, dueIn] of [[soon.id, 10], [late.id, -1], [fine.id, 60]] as const) expect((await calibrate(id, dueIn)).status).toBe(201);

    const res = await crew.viewer.agent.get(kitPath);
    expect(res.status).toBe(200);
    const byId = (id: string) => res.body.items.find((i: { id: string }) => i.id === id);
    // CALIBRATION_WARNING_DAYS = 30: due within 30 days is due-soon, past the due date is overdue.
    expect(byId(soon.id).calibration).toEqual({ state: 'due-soon', days: 10, dueOn: dayFromToday(10) });
    expect(byId(late.id).calibration).toEqual({ state: 'overdue', days: -1, dueOn: dayFromToday(-1) });
    expect(byId(fine.id).calibration).toEqual({ state: 'ok', days: 60, dueOn: dayFromToday(60) });
    expect(byId(never.id).calibration).toEqual({ state: 'none', days: null, dueOn: null });
    expect(byId(late.id).calibrations.map((c: { certificateRef: string }) => c.certificateRef)).toEqual([`CERT-${late.id.slice(0, 6)}`, 'OLD-1']);

    const warning = (id: string) => res.body.warnings.find((w: { kitItemId: string }) => w.kitItemId === id);
    expect(warning(soon.id)).toEqual({ kitItemId: soon.id, state: 'due-soon', message: `Accelerometer CAL-SOON (SN ${soon.serial}) calibration is due in 10 days (${dayFromToday(10)}).` });
    expect(warning(late.id)).toEqual({ kitItemId: late.id, state: 'overdue', message: `Accelerometer CAL-LATE (SN ${late.serial}) calibration is overdue by 1 day (due ${dayFromToday(-1)}).` });
    expect(warning(never.id)).toMatchObject({ state: 'none', message: expect.stringMatching(/CAL-NONE .* has no calibration record/) });
    expect(warning(fine.id)).toBeUndefined();
  });

  it('updates the item’s sensitivity from a certificate that states one, in the same change', async () => {
    const item = await addAccelerometer({ sensitivity: 100, sensitivityUnit: 'mV/g' });
    const res = await crew.lead.agent
      .post(`${kitPath}/${item.id}/calibrations`)
      .send({ calibratedOn: dayFromToday(-2), dueOn: dayFromToday(363), certificateRef: 'CERT-2026-17', performedBy: 'Accredited lab B', sensitivity: 98.1 });
    expect(res.status).toBe(201);
    expect(res.body.calibration).toMatchObject({ certificateRef: 'CERT-2026-17', sensitivity: 98.1, recordedBy: crew.lead.id });
    expect(res.body.item).toMatchObject({ sensitivity: 98.1, sensitivityUnit: 'mV/g', version: item.version + 1 });
    // docs/methods.md#units: mV/g ÷ 9.80665 (exact g_n) gives mV/(m/s²); 98.1 mV/g = 10.0034 mV/(m/s²).
    expect(res.body.item.sensitivityBase).toBeCloseTo(10.0034, 4);
    const list = await crew.lead.agent.get(kitPath);
    expect(list.body.items.find((i: { id: string }) => i.id === item.id)).toMatchObject({ sensitivity: 98.1, version: item.version + 1 });
  });

  it('keeps the item unchanged when a certificate states no sensitivity', async () => {
    const item = await addAccelerometer({ sensitivity: 100, sensitivityUnit: 'mV/g' });
    const res = await crew.lead.agent.post(`${kitPath}/${item.id}/calibrations`).send({ calibratedOn: dayFromToday(-2), dueOn: dayFromToday(363), certificateRef: 'CERT-NS', performedBy: 'Lab C' });
    expect(res.status).toBe(201);
    expect(res.body.item).toMatchObject({ sensitivity: 100, version: item.version });
  });

  it('refuses a due date before the calibration date with 400 naming dueOn, and stores no record', async () => {
    const item = await addAccelerometer();
    const res = await crew.lead.agent.post(`${kitPath}/${item.id}/calibrations`).send({ calibratedOn: dayFromToday(0), dueOn: dayFromToday(-1), certificateRef: 'C-BAD', performedBy: 'Lab' });
    expect(res.status).toBe(400);
    expect(res.body.error.message).toMatch(/^dueOn: the due date must be after the calibration date/);
    const list = await crew.lead.agent.get(kitPath);
    expect(list.body.items.find((i: { id: string }) => i.id === item.id).calibrations).toEqual([]);
  });
});

describe('channel map', () => {
  let hammer: Awaited<ReturnType<typeof addHammer>>;
  let triax: Awaited<ReturnType<typeof addAccelerometer>>;
  let uniax: Awaited<ReturnType<typeof addAccelerometer>>;

  beforeAll(async () => {
    hammer = await addHammer({ model: 'HMR-CH' });
    triax = await addAccelerometer({ model: 'TRI-CH', axes: ['X', 'Y', 'Z'] });
    uniax = await addAccelerometer({ model: 'UNI-CH', axes: ['Z'] });
  });

  it('assigns sensors to channels and lists them by channel number with the sensor’s model, serial and base sensitivity', async () => {
    const c3 = await crew.lead.agent.post(channelsPath).send({ channel: 3, kitItemId: triax.id, axis: 'Y', dof: 'B01:+Y', label: 'ref Y' });
    expect(c3.status).toBe(201);
    const c1 = await crew.lead.agent.post(channelsPath).send({ channel: 1, kitItemId: hammer.id });
    expect(c1.status).toBe(201);
    expect(c1.body.channel).toMatchObject({ channel: 1, axis: null, kind: 'hammer', sensitivityBaseUnit: 'mV/N' });
    const c2 = await crew.lead.agent.post(channelsPath).send({ channel: 2, kitItemId: uniax.id, dof: 'B01:+Z', sign: -1 });
    expect(c2.status).toBe(201);
    // A uniaxial sensor records its only axis when none is named.
    expect(c2.body.channel).toMatchObject({ axis: 'Z', sign: -1 });

    const list = await crew.viewer.agent.get(channelsPath);
    expect(list.status).toBe(200);
    expect(list.body.channels.map((c: { channel: number }) => c.channel)).toEqual([1, 2, 3]);
    expect(list.body.channels[2]).toMatchObject({ channel: 3, kitItemId: triax.id, axis: 'Y', dof: 'B01:+Y', label: 'ref Y', model: 'TRI-CH', serial: triax.serial, kind: 'accelerometer', sensitivityBase: triax.sensitivityBase });
  });

  it('refuses a channel number already in use with 409 naming the channel', async () => {
    const res = await crew.lead.agent.post(channelsPath).send({ channel: 1, kitItemId: uniax.id });
    expect(res.status).toBe(409);
    expect(res.body.error.message).toMatch(/^Channel 1 is already assigned/);
  });

  it('refuses an axis the sensor does not have with 400, and an axis on a hammer channel', async () => {
    const noAxis = await crew.lead.agent.post(channelsPath).send({ channel: 10, kitItemId: uniax.id, axis: 'X' });
    expect(noAxis.status).toBe(400);
    expect(noAxis.body.error.message).toMatch(/^axis: Accelerometer UNI-CH .* has no X axis/);
    const hammerAxis = await crew.lead.agent.post(channelsPath).send({ channel: 10, kitItemId: hammer.id, axis: 'Z' });
    expect(hammerAxis.status).toBe(400);
    expect(hammerAxis.body.error.message).toMatch(/^axis: a hammer channel has no axis/);
    const list = await crew.lead.agent.get(channelsPath);
    expect(list.body.channels.some((c: { channel: number }) => c.channel === 10)).toBe(false);
  });

  it('asks which axis of a triaxial sensor a channel records', async () => {
    const res = await crew.lead.agent.post(channelsPath).send({ channel: 11, kitItemId: triax.id });
    expect(res.status).toBe(400);
    expect(res.body.error.message).toMatch(/choose which one/);
  });

  it('answers 404 for a kit item of another campaign and 409 for a retired one', async () => {
    const foreign = await crew.outsider.agent
      .post(`/api/campaigns/${crew.otherCampaignId}/kit`)
      .send({ kind: 'hammer', model: 'FOREIGN', serial: 'F-1', sensitivity: 1, sensitivityUnit: 'mV/N' });
    expect(foreign.status).toBe(201);
    const res = await crew.lead.agent.post(channelsPath).send({ channel: 12, kitItemId: foreign.body.item.id });
    expect(res.status).toBe(404);
    expect(res.body.error.message).toBe('That kit item was not found.');

    const old = await addAccelerometer({ model: 'OLD-ACC' });
    const retired = await crew.lead.agent.patch(`${kitPath}/${old.id}`).send({ version: old.version, retired: true });
    expect(retired.status).toBe(200);
    const onRetired = await crew.lead.agent.post(channelsPath).send({ channel: 12, kitItemId: old.id });
    expect(onRetired.status).toBe(409);
    expect(onRetired.body.error.message).toMatch(/OLD-ACC .* is retired/);
  });

  it('lists retired items after the ones in use', async () => {
    const list = await crew.lead.agent.get(kitPath);
    const retired = list.body.items.map((i: { retired: boolean }) => i.retired);
    expect(retired).toContain(true);
    expect(retired.indexOf(true)).toBeGreaterThan(retired.lastIndexOf(false));
  });

  it('refuses to retire an item that is on a channel', async () => {
    const current = (await crew.lead.agent.get(kitPath)).body.items.find((i: { id: string }) => i.id === hammer.id);
    const res = await crew.lead.agent.patch(`${kitPath}/${hammer.id}`).send({ version: current.version, retired: true });
    expect(res.status).toBe(409);
    expect(res.body.error.message).toMatch(/is on channel 1/);
  });

  it('changes a channel with its version and answers 409 with the current channel when the version is stale', async () => {
    const made = await crew.lead.agent.post(channelsPath).send({ channel: 20, kitItemId: triax.id, axis: 'X' });
    expect(made.status).toBe(201);
    const id = made.body.channel.id;
    const moved = await crew.lead.agent.patch(`${channelsPath}/${id}`).send({ version: 1, axis: 'Z', dof: 'B07:-Z', sign: -1 });
    expect(moved.status).toBe(200);
    expect(moved.body.channel).toMatchObject({ axis: 'Z', dof: 'B07:-Z', sign: -1, version: 2 });
    const stale = await crew.lead.agent.patch(`${channelsPath}/${id}`).send({ version: 1, label: 'lost' });
    expect(stale.status).toBe(409);
    expect(stale.body.error.code).toBe('stale-version');
    expect(stale.body.error.details.current).toMatchObject({ id, channel: 20, axis: 'Z', version: 2, label: '' });
  });

  it('moves a channel to another sensor, dropping the axis for a hammer', async () => {
    const made = await crew.lead.agent.post(channelsPath).send({ channel: 21, kitItemId: triax.id, axis: 'X' });
    expect(made.status).toBe(201);
    const spare = await addHammer({ model: 'HMR-SPARE' });
    const res = await crew.lead.agent.patch(`${channelsPath}/${made.body.channel.id}`).send({ version: 1, kitItemId: spare.id });
    expect(res.status).toBe(200);
    expect(res.body.channel).toMatchObject({ kitItemId: spare.id, axis: null, kind: 'hammer', model: 'HMR-SPARE' });
  });

  it('removes a channel with 204', async () => {
    const made = await crew.lead.agent.post(channelsPath).send({ channel: 30, kitItemId: uniax.id });
    expect(made.status).toBe(201);
    const del = await crew.lead.agent.delete(`${channelsPath}/${made.body.channel.id}`);
    expect(del.status).toBe(204);
    const list = await crew.lead.agent.get(channelsPath);
    expect(list.body.channels.some((c: { id: string }) => c.id === made.body.channel.id)).toBe(false);
    expect((await crew.lead.agent.delete(`${channelsPath}/${made.body.channel.id}`)).status).toBe(404);
  });
});

describe('who may read and change the kit', () => {
  let item: Awaited<ReturnType<typeof addAccelerometer>>;
  let channelId: string;

  beforeAll(async () => {
    item = await addAccelerometer({ model: 'ROLE-ACC' });
    const made = await crew.lead.agent.post(channelsPath).send({ channel: 40, kitItemId: item.id });
    channelId = made.body.channel.id;
  });

  const writes = () => [
    { method: 'post' as const, path: kitPath, body: { kind: 'hammer', model: 'R', serial: 'R-1', sensitivity: 1, sensitivityUnit: 'mV/N' } },
    { method: 'patch' as const, path: `${kitPath}/${item.id}`, body: { version: item.version, notes: 'x' } },
    { method: 'post' as const, path: `${kitPath}/${item.id}/calibrations`, body: { calibratedOn: dayFromToday(-1), dueOn: dayFromToday(300), certificateRef: 'R', performedBy: 'R' } },
    { method: 'post' as const, path: channelsPath, body: { channel: 41, kitItemId: item.id } },
    { method: 'patch' as const, path: `${channelsPath}/${channelId}`, body: { version: 1, label: 'x' } },
    { method: 'delete' as const, path: `${channelsPath}/${channelId}`, body: undefined },
  ];

  it('lets a viewer read the kit and the channel map', async () => {
    expect((await crew.viewer.agent.get(kitPath)).status).toBe(200);
    expect((await crew.viewer.agent.get(channelsPath)).status).toBe(200);
  });

  it('answers 403 to viewers and engineers on every change, and changes nothing', async () => {
    for (const who of [crew.viewer, crew.engineer]) {
      for (const w of writes()) {
        const res = await who.agent[w.method](w.path).send(w.body);
        expect(res.status, `${w.method} ${w.path}`).toBe(403);
        expect(res.body.error.code).toBe('forbidden');
      }
    }
    const list = await crew.lead.agent.get(kitPath);
    expect(list.body.items.find((i: { id: string }) => i.id === item.id)).toMatchObject({ version: item.version, notes: '', calibrations: [] });
    expect((await crew.lead.agent.get(channelsPath)).body.channels.find((c: { id: string }) => c.id === channelId)).toMatchObject({ version: 1, label: '' });
  });

  it('answers 404 to a member of another campaign on every route, reads included', async () => {
    for (const w of [...writes(), { method: 'get' as const, path: kitPath, body: undefined }, { method: 'get' as const, path: channelsPath, body: undefined }]) {
      const res = await crew.outsider.agent[w.method](w.path).send(w.body);
      expect(res.status, `${w.method} ${w.path}`).toBe(404);
      expect(res.body.error.message).toBe('That campaign was not found.');
    }
  });

  it('answers 401 to a signed-out caller', async () => {
    for (const w of [...writes(), { method: 'get' as const, path: kitPath, body: undefined }, { method: 'get' as const, path: channelsPath, body: undefined }]) {
      const res = await request(app.handle.app)[w.method](w.path).set('origin', app.origin).send(w.body);
      expect(res.status, `${w.method} ${w.path}`).toBe(401);
    }
  });

  it('answers 404 for ids that are not UUIDs or that belong to another campaign', async () => {
    const foreign = await crew.outsider.agent
      .post(`/api/campaigns/${crew.otherCampaignId}/kit`)
      .send({ kind: 'accelerometer', model: 'FOREIGN-ACC', serial: 'F-2', sensitivity: 1, sensitivityUnit: 'mV/(m/s²)' });
    expect(foreign.status).toBe(201);
    const foreignChannel = await crew.outsider.agent.post(`/api/campaigns/${crew.otherCampaignId}/channels`).send({ channel: 1, kitItemId: foreign.body.item.id });
    expect(foreignChannel.status).toBe(201);
    const cases = [
      crew.lead.agent.patch(`${kitPath}/not-a-uuid`).send({ version: 1, notes: 'x' }),
      crew.lead.agent.patch(`${kitPath}/${foreign.body.item.id}`).send({ version: 1, notes: 'x' }),
      crew.lead.agent.post(`${kitPath}/${foreign.body.item.id}/calibrations`).send({ calibratedOn: dayFromToday(-1), dueOn: dayFromToday(300), certificateRef: 'R', performedBy: 'R' }),
      crew.lead.agent.patch(`${channelsPath}/123`).send({ version: 1, label: 'x' }),
      crew.lead.agent.patch(`${channelsPath}/${foreignChannel.body.channel.id}`).send({ version: 1, label: 'x' }),
      crew.lead.agent.delete(`${channelsPath}/${foreignChannel.body.channel.id}`),
    ];
    for (const res of await Promise.all(cases)) {
      expect(res.status).toBe(404);
      expect(res.body.error.code).toBe('not-found');
      expect(JSON.stringify(res.body)).not.toMatch(/FOREIGN/);
    }
    const theirs = await crew.outsider.agent.get(`/api/campaigns/${crew.otherCampaignId}/kit`);
    expect(theirs.body.items[0]).toMatchObject({ notes: '', version: 1, calibrations: [] });
  });
});

describe('audit trail of the kit', () => {
  it('records every kit, calibration and channel change with who made it and the state before and after', async () => {
    const item = await addAccelerometer({ model: 'AUDIT-ACC', axes: ['X', 'Z'] });
    const patched = await crew.lead.agent.patch(`${kitPath}/${item.id}`).send({ version: item.version, notes: 'on the flange' });
    expect(patched.status).toBe(200);
    const cal = await crew.lead.agent.post(`${kitPath}/${item.id}/calibrations`).send({ calibratedOn: dayFromToday(-1), dueOn: dayFromToday(364), certificateRef: 'AUD-1', performedBy: 'Lab', sensitivity: 101 });
    expect(cal.status).toBe(201);
    const ch = await crew.lead.agent.post(channelsPath).send({ channel: 50, kitItemId: item.id, axis: 'X' });
    expect(ch.status).toBe(201);
    const chId = ch.body.channel.id;
    expect((await crew.lead.agent.patch(`${channelsPath}/${chId}`).send({ version: 1, axis: 'Z' })).status).toBe(200);
    expect((await crew.lead.agent.delete(`${channelsPath}/${chId}`)).status).toBe(204);

    const kitEvents = (await auditEvents('kit-item')).filter((e) => e.entityId === item.id);
    expect(kitEvents.map((e) => e.action)).toEqual(['calibrate', 'update', 'create']);
    expect(kitEvents.every((e) => e.actorId === crew.lead.id)).toBe(true);
    expect(kitEvents[0]!.before).toMatchObject({ sensitivity: 100 });
    expect(kitEvents[0]!.after).toMatchObject({ sensitivity: 101 });
    expect(kitEvents[1]!.before).toMatchObject({ notes: '' });
    expect(kitEvents[1]!.after).toMatchObject({ notes: 'on the flange' });
    expect(kitEvents[2]!.after).toMatchObject({ model: 'AUDIT-ACC' });

    const calEvents = (await auditEvents('calibration')).filter((e) => e.entityId === cal.body.calibration.id);
    expect(calEvents).toHaveLength(1);
    expect(calEvents[0]!.after).toMatchObject({ certificateRef: 'AUD-1', kitItemId: item.id });

    const chEvents = (await auditEvents('channel')).filter((e) => e.entityId === chId);
    expect(chEvents.map((e) => e.action)).toEqual(['delete', 'update', 'create']);
    expect(chEvents[1]!.before).toMatchObject({ axis: 'X' });
    expect(chEvents[1]!.after).toMatchObject({ axis: 'Z' });
    expect(chEvents[0]!.before).toMatchObject({ channel: 50 });
  });

  it('writes no audit event for a refused change', async () => {
    const before = (await auditEvents('channel')).length;
    const res = await crew.lead.agent.post(channelsPath).send({ channel: 1, kitItemId: (await addHammer()).id });
    expect(res.status).toBe(409);
    expect((await auditEvents('channel')).length).toBe(before);
  });
});
