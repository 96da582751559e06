// Versioned acquisition settings: defaults before the first save, a new version per change with
// the fields it changed, optimistic concurrency, rule checks, roles and the audit trail
// (design.md "Kit"; docs/methods.md#traceability).
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { defaultAcquisitionSettings } from '@resonote/contracts';
import { startTestApp, type TestApp } from '../support/app.ts';
import { API_TEMPLATE } from '../support/global-setup-api.ts';
import { makeCrew, type CampaignCrew } from '../support/campaign.ts';

let app: TestApp;
let crew: CampaignCrew;
let path: string;

beforeAll(async () => {
  app = await startTestApp(API_TEMPLATE);
  crew = await makeCrew(app, 'set');
  path = `/api/campaigns/${crew.campaignId}/settings`;
});
afterAll(async () => {
  await app?.close();
});

const defaults = () => structuredClone(defaultAcquisitionSettings);

async function current() {
  const res = await crew.lead.agent.get(path);
  expect(res.status).toBe(200);
  return res.body.current as { version: number; settings: typeof defaultAcquisitionSettings };
}

async function settingsEvents() {
  const res = await crew.lead.agent.get(`/api/campaigns/${crew.campaignId}/audit`).query({ entity: 'settings' });
  expect(res.status).toBe(200);
  return res.body.events as { action: string; actorId: string; before: { version: number; settings: Record<string, unknown> }; after: { version: number; settings: Record<string, unknown>; reason: string } }[];
}

// The tests below run in order and build the version history of one campaign.
describe('acquisition settings versions', () => {
  it('offers the defaults as version 0 with an empty history before anything is saved', async () => {
    const res = await crew.viewer.agent.get(path);
    expect(res.status).toBe(200);
    expect(res.body.current).toMatchObject({ version: 0, settings: defaultAcquisitionSettings, reason: '', createdBy: null });
    expect(res.body.history).toEqual([]);
    expect(res.body.defaults).toEqual(defaultAcquisitionSettings);
  });

  it('saves a first version from the defaults and lists the fields it changed', async () => {
    const settings = { ...defaults(), hitsToAverage: 8, bandHz: { low: 5, high: 2000 } };
    const res = await crew.lead.agent.put(path).send({ baseVersion: 0, settings, reason: 'more averages for the light bracket' });
    expect(res.status).toBe(200);
    expect(res.body.unchanged).toBe(false);
    expect(res.body.current).toMatchObject({ version: 1, settings, reason: 'more averages for the light bracket', createdBy: 'Lena Lead set' });

    const got = await crew.viewer.agent.get(path);
    expect(got.body.current).toMatchObject({ version: 1, settings, createdBy: 'Lena Lead set' });
    expect(got.body.history).toHaveLength(1);
    expect(got.body.history[0]).toMatchObject({ version: 1, createdBy: 'Lena Lead set', reason: 'more averages for the light bracket' });
    expect(got.body.history[0].changes).toEqual([
      { field: 'hitsToAverage', before: 5, after: 8 },
      { field: 'bandHz.low', before: 0, after: 5 },
    ]);
  });

  it('makes version 2 on the next change and lists only the fields that differ from version 1, newest first', async () => {
    const base = await current();
    const settings = { ...base.settings, estimator: 'H2' as const, bandHz: { low: 5, high: 1500 }, exponentialWindow: { mode: 'tau' as const, tauS: 0.5 } };
    const res = await crew.lead.agent.put(path).send({ baseVersion: 1, settings, reason: 'noise on the force channel' });
    expect(res.status).toBe(200);
    expect(res.body.current.version).toBe(2);

    const got = await crew.lead.agent.get(path);
    expect(got.body.history.map((h: { version: number }) => h.version)).toEqual([2, 1]);
    const changes = got.body.history[0].changes as { field: string; before: unknown; after: unknown }[];
    expect(changes).toHaveLength(5);
    expect(changes).toEqual(
      expect.arrayContaining([
        { field: 'estimator', before: 'H1', after: 'H2' },
        { field: 'bandHz.high', before: 2000, after: 1500 },
        { field: 'exponentialWindow.mode', before: 'end-level', after: 'tau' },
        { field: 'exponentialWindow.endLevelPercent', before: 1, after: null },
        { field: 'exponentialWindow.tauS', before: null, after: 0.5 },
      ]),
    );
  });

  it('answers unchanged without a new version when the settings equal the current ones', async () => {
    const base = await current();
    // Same values, keys in another order: still the same settings.
    const reordered = Object.fromEntries(Object.entries(base.settings).reverse());
    const res = await crew.lead.agent.put(path).send({ baseVersion: base.version, settings: reordered, reason: 'no-op' });
    expect(res.status).toBe(200);
    expect(res.body.unchanged).toBe(true);
    expect(res.body.current.version).toBe(base.version);
    expect((await crew.lead.agent.get(path)).body.history).toHaveLength(base.version);
  });

  it('answers 409 with the current settings when the base version is stale, and saves nothing', async () => {
    const base = await current();
    const res = await crew.lead.agent.put(path).send({ baseVersion: base.version - 1, settings: { ...base.settings, hitsToAverage: 3 }, reason: 'old tab' });
    expect(res.status).toBe(409);
    expect(res.body.error.code).toBe('stale-version');
    expect(res.body.error.details.current).toMatchObject({ version: base.version, settings: base.settings });
    expect((await current()).version).toBe(base.version);
  });

  it('refuses a band above the Nyquist frequency with 400 naming bandHz.high', async () => {
    const base = await current();
    // 12.8 kHz sampling: Nyquist is 6400 Hz (half the sample rate).
    const res = await crew.lead.agent.put(path).send({ baseVersion: base.version, settings: { ...base.settings, sampleRateHz: 12_800, bandHz: { low: 0, high: 7000 } } });
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('invalid-input');
    expect(res.body.error.message).toMatch(/bandHz\.high: the band must end at or below half the sample rate \(6400 Hz\)/);
    expect(res.body.error.details).toEqual(expect.arrayContaining([expect.objectContaining({ path: 'settings.bandHz.high' })]));
    expect((await current()).version).toBe(base.version);
  });

  it('refuses a pre-trigger as long as the record with 400 naming preTriggerS', async () => {
    const base = await current();
    const res = await crew.lead.agent.put(path).send({ baseVersion: base.version, settings: { ...base.settings, recordLengthS: 0.5, preTriggerS: 0.5 } });
    expect(res.status).toBe(400);
    expect(res.body.error.message).toMatch(/preTriggerS: the pre-trigger must be shorter than the record/);
    expect((await current()).version).toBe(base.version);
  });

  it('refuses an unknown field in the settings with 400 naming it', async () => {
    const base = await current();
    const res = await crew.lead.agent.put(path).send({ baseVersion: base.version, settings: { ...base.settings, windowShape: 'flat-top' } });
    expect(res.status).toBe(400);
    expect(res.body.error.message).toMatch(/windowShape/);
  });

  it('records each saved version in the audit trail with the settings before and after, and nothing for refused or unchanged saves', async () => {
    const events = await settingsEvents();
    expect(events.map((e) => e.after.version)).toEqual([2, 1]);
    expect(events.every((e) => e.action === 'update' && e.actorId === crew.lead.id)).toBe(true);
    expect(events[0]!.before).toMatchObject({ version: 1, settings: { estimator: 'H1' } });
    expect(events[0]!.after).toMatchObject({ version: 2, settings: { estimator: 'H2' }, reason: 'noise on the force channel' });
    expect(events[1]!.before).toMatchObject({ version: 0, settings: { hitsToAverage: 5 } });
  });
});

describe('who may read and change the settings', () => {
  it('lets a viewer and an engineer read the settings but answers 403 when they save', async () => {
    const base = await current();
    for (const who of [crew.viewer, crew.engineer]) {
      expect((await who.agent.get(path)).status).toBe(200);
      const res = await who.agent.put(path).send({ baseVersion: base.version, settings: { ...base.settings, hitsToAverage: 2 } });
      expect(res.status).toBe(403);
      expect(res.body.error.code).toBe('forbidden');
    }
    expect((await current()).version).toBe(base.version);
  });

  it('answers 404 to a member of another campaign, for reading and saving', async () => {
    const read = await crew.outsider.agent.get(path);
    expect(read.status).toBe(404);
    const save = await crew.outsider.agent.put(path).send({ baseVersion: 0, settings: defaults() });
    expect(save.status).toBe(404);
    expect(save.body.error.message).toBe('That campaign was not found.');
  });

  it('answers 401 to a signed-out caller', async () => {
    expect((await request(app.handle.app).get(path)).status).toBe(401);
    expect((await request(app.handle.app).put(path).set('origin', app.origin).send({ baseVersion: 0, settings: defaults() })).status).toBe(401);
  });

  it('keeps the versions of each campaign apart', async () => {
    const other = `/api/campaigns/${crew.otherCampaignId}/settings`;
    const got = await crew.outsider.agent.get(other);
    expect(got.status).toBe(200);
    expect(got.body.current.version).toBe(0);
    const saved = await crew.outsider.agent.put(other).send({ baseVersion: 0, settings: { ...defaults(), hitsToAverage: 10 } });
    expect(saved.status).toBe(200);
    expect(saved.body.current.version).toBe(1);
    expect((await current()).settings.hitsToAverage).toBe(8);
  });
});
