// Directions with sign: a DOF stays as written (B05:-Z), but point + axis identify the physical axis.
// An FRF is response over force along the stated directions, so reversing one end reverses the FRF:
// H(i,−d) = −H(i,+d) (Ewins, Modal Testing: Theory, Practice and Application, 2000, §4.2). The
// simulated bar (packages/sim, signed DOFs flip the shape value) is measured both ways.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { steelBar } from '@resonote/sim';
import { startTestApp, type TestApp } from '../support/app.ts';
import { signUp } from '../support/accounts.ts';
import type { Person } from '../support/campaign.ts';
import { BAR_SETTINGS } from '../support/rig.ts';
import { API_TEMPLATE } from '../support/global-setup-api.ts';

let app: TestApp;
let lead: Person;
let campaignId: string;
let entries: { id: string; responseDof: string; excitationDof: string; drivingPoint: boolean }[];
const bar = steelBar();

async function ok<T extends { status: number; body: unknown }>(req: PromiseLike<T>, what: string): Promise<T> {
  const res = await req;
  if (res.status >= 300) throw new Error(`${what}: ${res.status} ${JSON.stringify(res.body)}`);
  return res;
}
const entry = (excitation: string) => entries.find((e) => e.excitationDof === excitation)!;

beforeAll(async () => {
  app = await startTestApp(API_TEMPLATE);
  lead = await signUp(app, 'Lena Lead', 'lead@lab.test');
  campaignId = (await ok(lead.agent.post('/api/campaigns').send({ name: 'Signs', structure: 'Free-free steel bar', testType: 'roving-hammer', referenceDofs: ['B21:+Z'], simulator: 'steel-bar' }), 'campaign')).body.campaign.id;
  // B05 and B21 are struck from both sides; the accelerometer stays at B21:+Z.
  const both = new Set(['B05', 'B21']);
  const csv = ['label,x,y,z,directions', ...bar.points.map((p) => `${p.label},${p.xMm},${p.yMm},${p.zMm},${both.has(p.label) ? '+Z -Z' : '+Z'}`)].join('\n');
  await ok(lead.agent.post(`/api/campaigns/${campaignId}/geometry/import`).send({ csv }), 'geometry');
  const hammer = await ok(lead.agent.post(`/api/campaigns/${campaignId}/kit`).send({ kind: 'hammer', model: 'IH-02', serial: 'H1001', sensitivity: 2.25, sensitivityUnit: 'mV/N', tips: ['medium'] }), 'hammer');
  await ok(lead.agent.post(`/api/campaigns/${campaignId}/channels`).send({ channel: 1, kitItemId: hammer.body.item.id }), 'hammer channel');
  const accel = await ok(lead.agent.post(`/api/campaigns/${campaignId}/kit`).send({ kind: 'accelerometer', model: 'AC-10', serial: 'A200', sensitivity: 10.2, sensitivityUnit: 'mV/(m/s²)', axes: ['Z'] }), 'accelerometer');
  await ok(lead.agent.post(`/api/campaigns/${campaignId}/channels`).send({ channel: 2, kitItemId: accel.body.item.id, axis: 'Z', dof: 'B21:+Z', sign: 1 }), 'accelerometer channel');
  await ok(lead.agent.put(`/api/campaigns/${campaignId}/settings`).send({ baseVersion: 0, settings: BAR_SETTINGS, reason: 'test rig' }), 'settings');
  entries = (await ok(lead.agent.post(`/api/campaigns/${campaignId}/schedule/generate`).send({}), 'schedule')).body.entries;
  // The same seed at B05:+Z and B05:−Z: the same force pulses and the same chain noise.
  for (const [dof, seed] of [['B05:+Z', 5], ['B05:-Z', 5], ['B21:-Z', 6], ['B11:+Z', 7], ['B15:+Z', 8]] as const) {
    await ok(lead.agent.post(`/api/campaigns/${campaignId}/schedule/${entry(dof).id}/simulate`).send({ count: 3, seed, doubleHitProbability: 0, overloadProbability: 0 }), `hits at ${dof}`);
  }
}, 120_000);
afterAll(async () => {
  await app?.close();
});

describe('directions with sign', () => {
  it('recognises the driving point whatever the signs: B21 struck at −Z next to the accelerometer at B21:+Z', () => {
    expect(entry('B21:-Z').drivingPoint).toBe(true);
    expect(entry('B21:+Z').drivingPoint).toBe(true);
    expect(entry('B05:-Z').drivingPoint).toBe(false);
  });

  it('measures H(i,−d) = −H(i,+d) on a simulated pair, to within the chain noise (Ewins 2000, §4.2)', async () => {
    const plus = (await ok(lead.agent.get(`/api/campaigns/${campaignId}/schedule/${entry('B05:+Z').id}/frf`), 'frf +Z')).body.channels[0].h1 as { re: number[]; im: number[] };
    const minus = (await ok(lead.agent.get(`/api/campaigns/${campaignId}/schedule/${entry('B05:-Z').id}/frf`), 'frf −Z')).body.channels[0].h1 as { re: number[]; im: number[] };
    let sum = 0;
    let ref = 0;
    for (let k = 0; k < plus.re.length; k++) {
      sum += (plus.re[k]! + minus.re[k]!) ** 2 + (plus.im[k]! + minus.im[k]!) ** 2;
      ref += plus.re[k]! ** 2 + plus.im[k]! ** 2;
    }
    // Same pulses and noise draws: H+ + H− = 2·(noise cross-spectrum)/(force autospectrum), far below |H|.
    expect(Math.sqrt(sum / ref)).toBeLessThan(0.02);
  });

  it('puts FRFs and shapes on the positive axis in a fit: the driving point is named B21:+Z and B05 keeps the analytic sign', async () => {
    const ids = ['B05:-Z', 'B21:-Z', 'B11:+Z', 'B15:+Z'].map((d) => entry(d).id);
    const started = await ok(lead.agent.post(`/api/campaigns/${campaignId}/modes/fits`).send({ entryIds: ids, bandHz: { low: 20, high: 600 }, maxOrder: 20 }), 'fit');
    let fit: { id: string; status: string; result: { diagram: { orders: { order: number; poles: { fHz: number; stable: string }[] }[] } } } | undefined;
    for (let i = 0; i < 600 && !(fit && (fit.status === 'done' || fit.status === 'failed')); i++) {
      fit = (await lead.agent.get(`/api/campaigns/${campaignId}/modes/fits/${started.body.fit.id}`)).body.fit;
      if (fit!.status !== 'done') await new Promise((r) => setTimeout(r, 100));
    }
    expect(fit!.status).toBe('done');
    // Mode 1 of the free–free bar, 53.17 Hz (Euler–Bernoulli, field-reference §7.1).
    const top = fit!.result.diagram.orders.at(-1)!;
    const index = top.poles.reduce((best, p, i) => (Math.abs(p.fHz - 53.17) < Math.abs(top.poles[best]!.fHz - 53.17) ? i : best), 0);
    const res = await ok(lead.agent.post(`/api/campaigns/${campaignId}/modes/fits/${fit!.id}/modes`).send({ poles: [{ order: top.order, index }] }), 'shapes');
    const pairs = (res.body.modes.synthesisFrac as { response: string; reference: string }[]).map((p) => `${p.response}/${p.reference}`);
    expect(pairs).toContain('B21:+Z/B21:+Z');
    expect(pairs).toContain('B21:+Z/B05:+Z');
    expect(pairs.some((p) => p.includes('-Z'))).toBe(false);
    expect(res.body.modes.axisConvention).toMatch(/H\(i,−d\) = −H\(i,\+d\)/);
    const shape = res.body.modes.table[0].shape as { dof: string; real: number }[];
    const analytic = bar.model.modes.find((m) => Math.abs(m.fnHz - 53.17) < 1)!.shape;
    const at = (dof: string) => shape.find((s) => s.dof === dof)!.real;
    // The relative sign of B05 and B21 in the fitted shape equals that of the analytic mass-normalised shape.
    expect(Math.sign(at('B05:+Z') * at('B21:+Z'))).toBe(Math.sign(analytic['B05:+Z']! * analytic['B21:+Z']!));
  });
});
