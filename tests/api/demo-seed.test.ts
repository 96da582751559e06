// The demo seed: accounts per role, the finished bar, the baseplate part way through with a
// flagged DOF and rejected hits — and seeding twice changes nothing.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { count } from 'drizzle-orm';
import { campaign, hit } from '@resonote/db/schema';
import { seedDemo, BAR_CAMPAIGN, SKID_CAMPAIGN, DEMO_PASSWORD } from '@resonote/api/seed';
import { startTestApp, type TestApp } from '../support/app.ts';
import { API_TEMPLATE } from '../support/global-setup-api.ts';

let app: TestApp;
beforeAll(async () => {
  app = await startTestApp(API_TEMPLATE);
  const started = performance.now();
  await seedDemo(app.handle, { log: () => undefined });
  console.log(`[figure] demo seed: ${((performance.now() - started) / 1000).toFixed(1)} s`);
}, 180_000);
afterAll(async () => {
  await app?.close();
});

describe('demo seed', () => {
  it('makes the two invented campaigns, the bar done and the baseplate part way with one flagged DOF', async () => {
    const lead = app.agent();
    await lead.post('/api/auth/sign-in/email').send({ email: 'lead@demo.resonote.local', password: DEMO_PASSWORD }).expect(200);
    const list = (await lead.get('/api/campaigns')).body.campaigns as { id: string; name: string; myRole: string; progress: Record<string, number> }[];
    const bar = list.find((c) => c.name === BAR_CAMPAIGN)!;
    const skid = list.find((c) => c.name === SKID_CAMPAIGN)!;
    expect(bar.myRole).toBe('lead');
    expect(bar.progress.done).toBe(21);
    // 12 measured, the loose-cable DOF, and the reciprocal of the fourth entry.
    expect(skid.progress.done + skid.progress.flagged + skid.progress['in-progress']).toBe(14);
    expect(skid.progress.flagged).toBeGreaterThanOrEqual(1);
    expect(skid.progress.planned).toBe(7);
    const progress = (await lead.get(`/api/campaigns/${skid.id}/progress`)).body;
    expect(Object.keys(progress.rejectedByReason).length).toBeGreaterThan(0);
  });

  it('gives the baseplate a measured reciprocity pair whose FRFs agree (Maxwell–Betti reciprocity: H_ij = H_ji, Ewins 2000)', async () => {
    const lead = app.agent();
    await lead.post('/api/auth/sign-in/email').send({ email: 'lead@demo.resonote.local', password: DEMO_PASSWORD }).expect(200);
    const skid = ((await lead.get('/api/campaigns')).body.campaigns as { id: string; name: string }[]).find((c) => c.name === SKID_CAMPAIGN)!;
    const checks = (await lead.get(`/api/campaigns/${skid.id}/checks`)).body;
    expect(checks.reciprocity).toHaveLength(1);
    const pair = checks.reciprocity[0];
    expect(pair.a.excitation).toBe(pair.b.response);
    expect(pair.a.response).toBe(pair.b.excitation);
    // The simulator's model is symmetric, so only the chain noise separates the two: FRAC close to 1.
    expect(pair.frac).toBeGreaterThan(0.95);
    expect(pair.peaks.length).toBeGreaterThan(0);
    for (const p of pair.peaks) expect(Math.abs(p.dbDifference)).toBeLessThan(1);
    // The accelerometer went back to the reference after the reciprocal hits.
    const channels = (await lead.get(`/api/campaigns/${skid.id}/channels`)).body.channels as { kind: string; dof: string }[];
    expect(channels.find((c) => c.kind === 'accelerometer')!.dof).toBe('P07:+Z');
  });

  it('puts the bar’s first bending mode where the handbook says (53.17 Hz, docs/methods.md#free-free-beam)', async () => {
    const lead = app.agent();
    await lead.post('/api/auth/sign-in/email').send({ email: 'lead@demo.resonote.local', password: DEMO_PASSWORD }).expect(200);
    const bar = ((await lead.get('/api/campaigns')).body.campaigns as { id: string; name: string }[]).find((c) => c.name === BAR_CAMPAIGN)!;
    const frfs = (await lead.get(`/api/campaigns/${bar.id}/frfs`)).body.frfs as { excitationDof: string; f: number[]; h1: { re: number[]; im: number[] } }[];
    const drive = frfs.find((x) => x.excitationDof === 'B21:+Z')!;
    let best = 0;
    for (let k = 0; k < drive.f.length; k++) if (drive.f[k]! < 100 && Math.hypot(drive.h1.re[k]!, drive.h1.im[k]!) > Math.hypot(drive.h1.re[best]!, drive.h1.im[best]!)) best = k;
    // Peak within one line (0.25 Hz) of the Euler–Bernoulli value.
    expect(Math.abs(drive.f[best]! - 53.17)).toBeLessThan(0.3);
  });

  it('changes nothing when it runs again', async () => {
    const db = app.handle.database.db;
    const before = [(await db.select({ n: count() }).from(campaign))[0]!.n, (await db.select({ n: count() }).from(hit))[0]!.n];
    await seedDemo(app.handle, { log: () => undefined });
    const after = [(await db.select({ n: count() }).from(campaign))[0]!.n, (await db.select({ n: count() }).from(hit))[0]!.n];
    expect(after).toEqual(before);
  });
});
