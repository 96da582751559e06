// From a model-based plan to a fit on the seeded baseplate (docs/methods.md#fit-selection): a default
// fit leaves out the flagged FRF (the seeded loose-cable DOF, P13, whose response is noise unrelated to
// the force), and accepting a plan with another reference moves the accelerometer channel there, so
// the new entries' hits are recorded at the new reference and a default fit takes only those.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { SKID_CAMPAIGN } from '@resonote/api/seed';
import type { TestApp } from '../support/app.ts';
import { campaignIdByName, signInDemo, startSeededApp } from '../support/demo-api.ts';

let app: TestApp;
let lead: ReturnType<TestApp['agent']>;
let skidId: string;
let modelId: string;

interface Entry {
  id: string;
  responseDof: string;
  excitationDof: string;
  status: string;
  acceptedHits: number;
}

beforeAll(async () => {
  app = await startSeededApp();
  lead = await signInDemo(app, 'lead@demo.resonote.local');
  skidId = await campaignIdByName(lead, SKID_CAMPAIGN);
  modelId = (await lead.get(`/api/campaigns/${skidId}/fe-models`)).body.models[0].id;
}, 120_000);
afterAll(async () => {
  await app?.close();
});

const schedule = async () => (await lead.get(`/api/campaigns/${skidId}/schedule`)).body.entries as Entry[];

describe('the FRFs a fit takes by default', () => {
  it('leaves out the flagged loose-cable FRF of the seeded baseplate and says so', async () => {
    const entries = await schedule();
    const flagged = entries.filter((e) => e.status === 'flagged');
    // the seed measures 12 entries and records P13 with a loose cable (apps/api/src/seed.ts)
    expect(flagged.map((e) => e.excitationDof)).toEqual(['P13:+Z']);
    const res = await lead.post(`/api/campaigns/${skidId}/modes/fits`).send({ bandHz: { low: 5, high: 120 }, maxOrder: 4 });
    expect(res.status).toBe(202);
    // The seed's reciprocal entry (hammer at the reference P07, the sensor at a roving point) is no
    // column of the reference's FRF matrix, so it is left out too (packages/contracts/src/fit-selection.ts).
    const reciprocal = entries.find((e) => e.excitationDof === 'P07:+Z' && e.responseDof !== 'P07:+Z')!;
    expect(res.body.leftOut).toEqual([
      { id: flagged[0]!.id, responseDof: 'P07:+Z', excitationDof: 'P13:+Z', reason: 'flagged' },
      { id: reciprocal.id, responseDof: reciprocal.responseDof, excitationDof: 'P07:+Z', reason: 'other-reference' },
    ]);
    const fit = (await lead.get(`/api/campaigns/${skidId}/modes/fits`)).body.fits[0];
    expect(fit.frfCount).toBe(12);
    // picked by name, the flagged FRF goes in
    const picked = await lead.post(`/api/campaigns/${skidId}/modes/fits`).send({ entryIds: entries.filter((e) => e.acceptedHits > 0).map((e) => e.id), bandHz: { low: 5, high: 120 }, maxOrder: 4 });
    expect(picked.status).toBe(202);
    expect(picked.body.leftOut).toEqual([]);
  });

  it('moves the accelerometer channel with the reference of an accepted plan, so new hits are recorded there', async () => {
    const c = (await lead.get(`/api/campaigns/${skidId}`)).body.campaign;
    const accepted = await lead.post(`/api/campaigns/${skidId}/fe-models/${modelId}/proposal/accept`).send({ dofs: ['P01:+Z', 'P05:+Z', 'P16:+Z', 'P20:+Z'], reference: 'P01:+Z', campaignVersion: c.version });
    expect(accepted.status, JSON.stringify(accepted.body)).toBe(200);
    expect(accepted.body.channelsMoved).toEqual([{ channel: 2, from: 'P07:+Z', to: 'P01:+Z' }]);
    expect(accepted.body.channelNote).toMatch(/move the sensor from P07:\+Z/);
    const channels = (await lead.get(`/api/campaigns/${skidId}/channels`)).body.channels as { channel: number; dof: string | null; label: string }[];
    expect(channels.find((x) => x.channel === 2)).toMatchObject({ dof: 'P01:+Z', label: 'accel P01:+Z' });
    const lines = (await lead.get(`/api/campaigns/${skidId}/audit?entity=channel`)).body.events as { action: string; before: { dof: string }; after: { dof: string } }[];
    // The seed moved the sensor to the reciprocal entry's point and back before (apps/api/src/seed.ts); the accept adds one move.
    const moves = lines.filter((e) => e.action === 'update').map((e) => [e.before.dof, e.after.dof]);
    expect(moves.filter(([, to]) => to === 'P01:+Z')).toEqual([['P07:+Z', 'P01:+Z']]);

    // The rig at two of the new entries: the response is measured, and labelled, at P01:+Z.
    const fresh = (await schedule()).filter((e) => e.responseDof === 'P01:+Z' && ['P01:+Z', 'P02:+Z'].includes(e.excitationDof));
    expect(fresh).toHaveLength(2);
    for (const [i, e] of fresh.entries()) {
      const r = await lead.post(`/api/campaigns/${skidId}/schedule/${e.id}/simulate`).send({ count: 5, seed: 7000 + i, tip: 'soft', peakForceN: 60, doubleHitProbability: 0, overloadProbability: 0 });
      expect(r.status).toBe(201);
      expect(r.body.frf.channels.map((x: { responseDof: string }) => x.responseDof)).toEqual(['P01:+Z']);
    }
    // A default fit takes the two FRFs at the new reference; the 14 at P07:+Z (13 roving entries and
    // the seed's reciprocal entry) are listed as left out.
    const res = await lead.post(`/api/campaigns/${skidId}/modes/fits`).send({ bandHz: { low: 5, high: 120 }, maxOrder: 4 });
    expect(res.status).toBe(202);
    expect(res.body.leftOut).toHaveLength(14);
    expect(new Set(res.body.leftOut.map((e: { reason: string }) => e.reason))).toEqual(new Set(['other-reference']));
    const fit = (await lead.get(`/api/campaigns/${skidId}/modes/fits`)).body.fits[0];
    expect(fit.frfCount).toBe(2);
  });

  it('leaves the channel map alone when the accepted plan keeps the reference', async () => {
    const c = (await lead.get(`/api/campaigns/${skidId}`)).body.campaign;
    const accepted = await lead.post(`/api/campaigns/${skidId}/fe-models/${modelId}/proposal/accept`).send({ dofs: ['P01:+Z', 'P05:+Z'], reference: 'P01:+Z', campaignVersion: c.version });
    expect(accepted.status).toBe(200);
    expect(accepted.body.channelsMoved).toEqual([]);
    expect(accepted.body.channelNote).toBeNull();
  });
});
