// Modes through the whole chain: the demo bar's simulated hits → averaged FRFs → background LSCF
// fit → chosen poles → shapes. The fit must recover what the simulator put in (design.md, "Demo
// scenario"): the Euler–Bernoulli free–free bar of docs/methods.md#free-free-beam.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { mac } from '@resonote/dsp';
import { steelBar, STEEL_BAR_ZETA } from '@resonote/sim';
import { seedDemo, DEMO_PASSWORD, BAR_CAMPAIGN } from '@resonote/api/seed';
import { startTestApp, type TestApp } from '../support/app.ts';
import { API_TEMPLATE } from '../support/global-setup-api.ts';

let app: TestApp;
let lead: ReturnType<TestApp['agent']>;
let viewer: ReturnType<TestApp['agent']>;
let barId: string;

async function waitForFit(id: string) {
  for (let i = 0; i < 600; i++) {
    const res = await lead.get(`/api/campaigns/${barId}/modes/fits/${id}`);
    if (res.body.fit.status === 'done' || res.body.fit.status === 'failed') return res.body.fit;
    await new Promise((r) => setTimeout(r, 100));
  }
  throw new Error('the fit did not finish in 60 s');
}

beforeAll(async () => {
  app = await startTestApp(API_TEMPLATE);
  await seedDemo(app.handle, { log: () => undefined });
  lead = app.agent();
  await lead.post('/api/auth/sign-in/email').send({ email: 'lead@demo.resonote.local', password: DEMO_PASSWORD }).expect(200);
  viewer = app.agent();
  await viewer.post('/api/auth/sign-in/email').send({ email: 'viewer@demo.resonote.local', password: DEMO_PASSWORD }).expect(200);
  barId = (await lead.get('/api/campaigns')).body.campaigns.find((c: { name: string }) => c.name === BAR_CAMPAIGN).id;
}, 180_000);
afterAll(async () => {
  await app?.close();
});

// Euler–Bernoulli weak-direction bending of the 1000 × 40 × 10 mm steel bar (docs/methods.md#free-free-beam).
const HANDBOOK_HZ = [53.17, 146.55, 287.3, 474.93];
// The simulator's damping of the bar's first four weak-direction bending modes (packages/sim STEEL_BAR_ZETA,
// invented: 0.42, 0.27, 0.35, 0.61 %; docs/methods.md#demo-bar).
const SIMULATED_ZETA_PERCENT = STEEL_BAR_ZETA.weak.slice(0, 4).map((z) => 100 * z);

describe('modal fit of the demo bar', () => {
  let fitId: string;
  let fit: { status: string; result: { cmif: { f: number[]; values: number[][] }; diagram: { orders: { order: number; poles: { fHz: number; zeta: number; stable: string }[] }[] } } };

  it('runs as a background job that reports progress, and reuses an identical request', async () => {
    const started = performance.now();
    const res = await lead.post(`/api/campaigns/${barId}/modes/fits`).send({ bandHz: { low: 20, high: 600 }, maxOrder: 30 });
    expect(res.status).toBe(202);
    fitId = res.body.fit.id;
    // The API answers while the fit runs.
    expect((await lead.get('/api/health')).status).toBe(200);
    fit = await waitForFit(fitId);
    console.log(`[figure] modal fit of the demo bar (21 FRFs, orders 2–30): ${((performance.now() - started) / 1000).toFixed(1)} s`);
    expect(fit.status).toBe('done');
    const again = await lead.post(`/api/campaigns/${barId}/modes/fits`).send({ bandHz: { low: 20, high: 600 }, maxOrder: 30 });
    expect(again.status).toBe(200);
    expect(again.body.fit.id).toBe(fitId);
  });

  it('recovers the first four bending modes within 0.5 % of the handbook, damping within 10 % after the window correction, MAC ≥ 0.98 against the analytic shapes', async () => {
    const top = fit.result.diagram.orders.at(-1)!;
    const picks = HANDBOOK_HZ.map((f0) => {
      let best = -1;
      top.poles.forEach((p, i) => {
        if (p.stable !== 'all') return;
        if (best < 0 || Math.abs(p.fHz - f0) < Math.abs(top.poles[best]!.fHz - f0)) best = i;
      });
      expect(best, `a stable pole near ${f0} Hz`).toBeGreaterThanOrEqual(0);
      return { order: top.order, index: best };
    });
    const res = await lead.post(`/api/campaigns/${barId}/modes/fits/${fitId}/modes`).send({ poles: picks });
    expect(res.status).toBe(200);
    const table = res.body.modes.table as { fHz: number; zetaPercent: number; estimated: { zetaPercent: number }; mpc: number; shape: { dof: string; real: number }[] }[];
    const bar = steelBar();
    table.forEach((m, i) => {
      expect(Math.abs(m.fHz / HANDBOOK_HZ[i]! - 1), `mode ${i + 1} frequency ${m.fHz} Hz`).toBeLessThan(0.005);
      // The window added damping; the corrected value is back near the simulated one of this mode.
      expect(m.estimated.zetaPercent).toBeGreaterThan(m.zetaPercent);
      expect(Math.abs(m.zetaPercent / SIMULATED_ZETA_PERCENT[i]! - 1), `mode ${i + 1} damping ${m.zetaPercent} %`).toBeLessThan(0.1);
      // Analytic shape: the simulator's mass-normalised Euler–Bernoulli mode at the 21 points (bending modes
      // only; the rigid-body modes on the supports sit below 3 Hz, under the fit band).
      const elastic = bar.model.modes.filter((x) => x.fnHz > 10 && Object.keys(x.shape).some((k) => k.endsWith(':+Z')));
      const analytic = m.shape.map((s) => elastic[i]!.shape[s.dof] ?? 0);
      const measured = m.shape.map((s) => s.real);
      expect(mac(measured, analytic), `MAC of mode ${i + 1}`).toBeGreaterThanOrEqual(0.98);
      expect(m.mpc).toBeGreaterThan(0.9);
    });
    // Auto-MAC of distinct bending modes is small off the diagonal.
    const macM = res.body.modes.mac as number[][];
    for (let a = 0; a < 4; a++) for (let b = 0; b < 4; b++) if (a !== b) expect(macM[a]![b]!).toBeLessThan(0.2);
  });

  it('synthesizes the driving-point FRF from the chosen modes close to the measured one', async () => {
    const res = await viewer.get(`/api/campaigns/${barId}/modes/fits/${fitId}/synthesis?response=B21:%2BZ&reference=B21:%2BZ`);
    expect(res.status).toBe(200);
    expect(res.body.unit).toBe('(m/s²)/N');
    const m = res.body.measured;
    const s = res.body.synthesized;
    let num = 0;
    let den = 0;
    for (let k = 0; k < m.re.length; k++) {
      num += (m.re[k] - s.re[k]) ** 2 + (m.im[k] - s.im[k]) ** 2;
      den += m.re[k] ** 2 + m.im[k] ** 2;
    }
    expect(Math.sqrt(num / den)).toBeLessThan(0.2);
    const current = await viewer.get(`/api/campaigns/${barId}/modes`);
    expect(current.body.modes).toHaveLength(4);
    expect(current.body.points).toHaveLength(21);
  });

  it('refuses a fit over too few FRFs, a band without data, and poles that do not exist — with clear messages', async () => {
    const one = (await lead.get(`/api/campaigns/${barId}/schedule`)).body.entries[0].id;
    const few = await lead.post(`/api/campaigns/${barId}/modes/fits`).send({ entryIds: [one] });
    expect(few.status).toBe(400);
    expect(few.body.error.message).toMatch(/at least 2 FRFs/);
    const empty = await lead.post(`/api/campaigns/${barId}/modes/fits`).send({ bandHz: { low: 3000, high: 3001 } });
    expect(empty.status).toBe(400);
    expect(empty.body.error.message).toMatch(/frequency lines/);
    const bad = await lead.post(`/api/campaigns/${barId}/modes/fits/${fitId}/modes`).send({ poles: [{ order: 99, index: 0 }] });
    expect(bad.status).toBe(400);
    expect(bad.body.error.message).toMatch(/no pole 0 at order 99/);
    expect((await viewer.post(`/api/campaigns/${barId}/modes/fits`).send({})).status).toBe(403);
  });
});
