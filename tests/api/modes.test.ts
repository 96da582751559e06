// Modes through the whole chain: the demo bar's simulated hits → averaged FRFs → background LSCF
// fit → chosen poles → shapes. The fit must recover what the simulator put in (design.md, "Demo
// scenario"): the Euler–Bernoulli free–free bar of docs/methods.md#free-free-beam.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { mac } from '@resonote/dsp';
import { steelBar, STEEL_BAR_ZETA } from '@resonote/sim';
import { BAR_CAMPAIGN } from '@resonote/api/seed';
import type { TestApp } from '../support/app.ts';
import { campaignIdByName, signInDemo, startSeededApp, waitForFit } from '../support/demo-api.ts';

let app: TestApp;
let lead: ReturnType<TestApp['agent']>;
let viewer: ReturnType<TestApp['agent']>;
let barId: string;

beforeAll(async () => {
  app = await startSeededApp();
  lead = await signInDemo(app, 'lead@demo.resonote.local');
  viewer = await signInDemo(app, 'viewer@demo.resonote.local');
  barId = await campaignIdByName(lead, BAR_CAMPAIGN);
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
    fit = await waitForFit(lead, barId, fitId);
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
    expect(table).toHaveLength(HANDBOOK_HZ.length);
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
      // Unit modal mass from the driving point B21:+Z (Ewins 2000): the least-squares scale of the fitted
      // mass-normalised shape onto the simulator's mass-normalised one (φ̃/√(ρAL), 1/√kg) is 1 within 10 %.
      const massShape = (m as unknown as { massShape: { dof: string; real: number }[] | null }).massShape;
      expect(massShape, `mode ${i + 1} mass-normalised`).not.toBeNull();
      const a = massShape!.map((x) => elastic[i]!.shape[x.dof] ?? 0);
      const b = massShape!.map((x) => x.real);
      const scale = a.reduce((acc, v, j) => acc + v * b[j]!, 0) / a.reduce((acc, v) => acc + v * v, 0);
      // A shape's overall sign is arbitrary (the fitted one puts the driving point positive), so |scale|.
      expect(Math.abs(Math.abs(scale) - 1), `mode ${i + 1} modal-mass scale ${scale}`).toBeLessThan(0.1);
    });
    expect(res.body.modes.massNote).toMatch(/driving point B21:\+Z/);
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
    // Computing shapes does not fill the campaign's mode table: the lead adds modes to it.
    const current = await viewer.get(`/api/campaigns/${barId}/modes`);
    expect(current.body.modes).toHaveLength(0);
    expect(current.body.version).toBe(0);
    expect(current.body.points).toHaveLength(21);
  });

  it('suggests the four bending modes on the server, one representative pole each, within 0.5 % of the handbook (docs/methods.md#free-free-beam)', async () => {
    const res = await viewer.get(`/api/campaigns/${barId}/modes/fits/${fitId}/suggestion`);
    expect(res.status).toBe(200);
    const modes = res.body.modes as { fHz: number; representative: { order: number; index: number }; count: number }[];
    for (const f0 of HANDBOOK_HZ) {
      const near = modes.filter((m) => Math.abs(m.fHz / f0 - 1) < 0.005);
      expect(near, `one suggested mode near ${f0} Hz`).toHaveLength(1);
      const pole = fit.result.diagram.orders.find((o) => o.order === near[0]!.representative.order)!.poles[near[0]!.representative.index]!;
      expect(pole.stable).toBe('all');
    }
    expect(res.body.rule).toMatch(/orders/);
  });

  it('warns in words, with the frequency, when the CMIF peaks where no stable column stands', async () => {
    // Orders 2 and 4 only: too few orders for any mode to be suggested, so every CMIF peak lacks a column.
    const res = await lead.post(`/api/campaigns/${barId}/modes/fits`).send({ bandHz: { low: 20, high: 600 }, maxOrder: 4 });
    const low = await waitForFit(lead, barId, res.body.fit.id);
    expect(low.status).toBe('done');
    const warnings = (await viewer.get(`/api/campaigns/${barId}/modes/fits/${res.body.fit.id}`)).body.fit.warnings as { code: string; fHz: number; message: string }[];
    const cmifPeaks = warnings.filter((w) => w.code === 'cmif-peak-without-column');
    // The bar's bending modes (docs/methods.md#free-free-beam) are the CMIF peaks.
    for (const f0 of HANDBOOK_HZ) expect(cmifPeaks.some((w) => Math.abs(w.fHz / f0 - 1) < 0.01), `${f0} Hz`).toBe(true);
    expect(cmifPeaks[0]!.message).toMatch(/CMIF peaks at \d+(\.\d+)? Hz but no stable column/);
    // The good fit has no such warning.
    const good = (await viewer.get(`/api/campaigns/${barId}/modes/fits/${fitId}`)).body.fit.warnings as { code: string; fHz?: number }[];
    expect(good.filter((w) => w.code === 'cmif-peak-without-column' && HANDBOOK_HZ.some((f0) => Math.abs(w.fHz! / f0 - 1) < 0.01))).toEqual([]);
  });

  it('keeps the chosen poles of a fit on the server before shapes are computed, with optimistic concurrency', async () => {
    const before = (await viewer.get(`/api/campaigns/${barId}/modes/fits/${fitId}`)).body.fit.draft;
    const poles = [{ order: 30, index: 0 }];
    const saved = await lead.put(`/api/campaigns/${barId}/modes/fits/${fitId}/draft`).send({ poles, baseVersion: before.version });
    expect(saved.status).toBe(200);
    expect(saved.body.draft).toEqual({ poles, version: before.version + 1 });
    expect((await viewer.get(`/api/campaigns/${barId}/modes/fits/${fitId}`)).body.fit.draft).toEqual({ poles, version: before.version + 1 });
    const stale = await lead.put(`/api/campaigns/${barId}/modes/fits/${fitId}/draft`).send({ poles: [], baseVersion: before.version });
    expect(stale.status).toBe(409);
    expect(stale.body.error.code).toBe('stale-version');
    const bad = await lead.put(`/api/campaigns/${barId}/modes/fits/${fitId}/draft`).send({ poles: [{ order: 99, index: 0 }], baseVersion: before.version + 1 });
    expect(bad.status).toBe(400);
    expect((await viewer.put(`/api/campaigns/${barId}/modes/fits/${fitId}/draft`).send({ poles: [], baseVersion: before.version + 1 })).status).toBe(403);
    const audit = (await lead.get(`/api/campaigns/${barId}/audit`)).body;
    expect(JSON.stringify(audit)).toContain('draft-poles');
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

describe("the campaign's mode table", () => {
  async function bandFit(low: number, high: number, maxOrder = 30) {
    const res = await lead.post(`/api/campaigns/${barId}/modes/fits`).send({ bandHz: { low, high }, maxOrder });
    expect(res.status === 202 || res.status === 200).toBe(true);
    const done = await waitForFit(lead, barId, res.body.fit.id);
    expect(done.status).toBe('done');
    return done as { id: string; result: { diagram: { orders: { order: number; poles: { fHz: number; stable: string }[] }[] } } };
  }
  /** Computes shapes for the server's suggestion of a fit; returns the computed table. */
  async function computeSuggested(fitId: string) {
    const suggestion = (await lead.get(`/api/campaigns/${barId}/modes/fits/${fitId}/suggestion`)).body.modes as { representative: { order: number; index: number } }[];
    const res = await lead.post(`/api/campaigns/${barId}/modes/fits/${fitId}/modes`).send({ poles: suggestion.map((m) => m.representative) });
    expect(res.status).toBe(200);
    return res.body.modes as { table: { mode: number; fHz: number }[]; warnings: { code: string; message: string }[]; massNote: string };
  }

  let low: Awaited<ReturnType<typeof bandFit>>;
  let high: Awaited<ReturnType<typeof bandFit>>;
  let version = 0;

  it('is built from two band fits: every handbook mode once, each row with its fit, band, order and input hash', async () => {
    low = await bandFit(20, 220);
    high = await bandFit(220, 600);
    const a = await computeSuggested(low.id);
    const b = await computeSuggested(high.id);
    const addA = await lead.post(`/api/campaigns/${barId}/modes/table`).send({ fitId: low.id, modes: a.table.map((m) => m.mode), baseVersion: 0 });
    expect(addA.status).toBe(201);
    version = addA.body.version;
    const addB = await lead.post(`/api/campaigns/${barId}/modes/table`).send({ fitId: high.id, modes: b.table.map((m) => m.mode), baseVersion: version });
    expect(addB.status).toBe(201);
    version = addB.body.version;
    const table = (await viewer.get(`/api/campaigns/${barId}/modes`)).body;
    expect(table.version).toBe(version);
    const rows = table.modes as { mode: number; fHz: number; zetaPercent: number; estimated: { zetaPercent: number }; source: { fitId: string; bandHz: number[]; order: number; references: string[]; inputHash: string }; duplicate: unknown }[];
    // Euler–Bernoulli free–free bar, docs/methods.md#free-free-beam: each of the four modes exactly once, within 0.5 %.
    for (const f0 of HANDBOOK_HZ) expect(rows.filter((r) => Math.abs(r.fHz / f0 - 1) < 0.005), `${f0} Hz`).toHaveLength(1);
    expect(rows.map((r) => r.mode)).toEqual(rows.map((_, i) => i + 1));
    for (const r of rows) {
      expect([low.id, high.id]).toContain(r.source.fitId);
      expect(r.source.bandHz).toEqual(r.source.fitId === low.id ? [20, 220] : [220, 600]);
      expect(r.source.references).toEqual(['B21:+Z']);
      expect(r.source.inputHash).toMatch(/^[0-9a-f]{64}$/);
      expect(r.source.order).toBeGreaterThan(0);
      expect(r.duplicate).toBeNull();
      expect(r.estimated.zetaPercent).toBeGreaterThan(r.zetaPercent);
      expect((r as unknown as { massShape: unknown }).massShape).not.toBeNull();
    }
    expect(table.mac).toHaveLength(rows.length);
    expect(table.axisConvention).toMatch(/positive axis/);
    const audit = JSON.stringify((await lead.get(`/api/campaigns/${barId}/audit`)).body);
    expect(audit).toContain('mode-table-row');
  });

  it('synthesizes the driving-point FRF over the whole band from the rows of both fits', async () => {
    const res = await viewer.get(`/api/campaigns/${barId}/modes/synthesis?response=B21:%2BZ&reference=B21:%2BZ`);
    expect(res.status).toBe(200);
    expect(res.body.bandHz).toEqual([20, 600]);
    expect(res.body.f[0]).toBeGreaterThanOrEqual(20);
    expect(res.body.f.at(-1)).toBeLessThanOrEqual(600);
    expect(res.body.modesUsed.length).toBeGreaterThanOrEqual(4);
    // Near each mode the synthesis (no residual terms) matches the measured magnitude within 3 dB
    // (a pole–residue model reproduces the resonance peak; common practice).
    const { f, measured: m, synthesized: s } = res.body as { f: number[]; measured: { re: number[]; im: number[] }; synthesized: { re: number[]; im: number[] } };
    for (const f0 of HANDBOOK_HZ) {
      const k = f.reduce((best, x, i) => (Math.abs(x - f0) < Math.abs(f[best]! - f0) ? i : best), 0);
      const db = 20 * Math.log10(Math.hypot(s.re[k]!, s.im[k]!) / Math.hypot(m.re[k]!, m.im[k]!));
      expect(Math.abs(db), `${f0} Hz`).toBeLessThan(3);
    }
  });

  it('points out the same mode found again in the wide fit (within 1 % and MAC ≥ 0.9) and says which row holds it', async () => {
    // The describe above chose the four handbook modes in the wide 20–600 Hz fit.
    const fits = (await viewer.get(`/api/campaigns/${barId}/modes/fits`)).body.fits as { id: string; bandHz: number[]; modeCount: number }[];
    const wide = fits.find((x) => x.bandHz[0] === 20 && x.bandHz[1] === 600 && x.modeCount === 4)!;
    const res = await lead.post(`/api/campaigns/${barId}/modes/table`).send({ fitId: wide.id, modes: [2], baseVersion: version });
    expect(res.status).toBe(201);
    version = res.body.version;
    const rows = res.body.modes as { id: string; mode: number; fHz: number; duplicate: { of: number; note: string } | null }[];
    const added = rows.find((r) => r.id === res.body.added[0])!;
    expect(added.duplicate).not.toBeNull();
    const twin = rows.find((r) => r.mode === added.duplicate!.of)!;
    expect(Math.abs(twin.fHz / added.fHz - 1)).toBeLessThan(0.01);
    expect(added.duplicate!.note).toMatch(/MAC 0\.9\d\d|MAC 1\.000/);
    // Synthesis leaves the duplicate out.
    const syn = (await viewer.get(`/api/campaigns/${barId}/modes/synthesis?response=B21:%2BZ&reference=B21:%2BZ`)).body;
    expect(syn.modesUsed).not.toContain(added.mode);
  });

  it('refuses a duplicate add, a stale version, an unknown fit, a fit of another campaign and a mode the fit does not have — with clear 4xx', async () => {
    const again = await lead.post(`/api/campaigns/${barId}/modes/table`).send({ fitId: low.id, modes: [1], baseVersion: version });
    expect(again.status).toBe(409);
    expect(again.body.error.message).toMatch(/already in the mode table/);
    const stale = await lead.post(`/api/campaigns/${barId}/modes/table`).send({ fitId: low.id, modes: [1], baseVersion: version - 1 });
    expect(stale.status).toBe(409);
    expect(stale.body.error.code).toBe('stale-version');
    const unknown = await lead.post(`/api/campaigns/${barId}/modes/table`).send({ fitId: '00000000-0000-4000-8000-000000000000', modes: [1], baseVersion: version });
    expect(unknown.status).toBe(404);
    const notUuid = await lead.post(`/api/campaigns/${barId}/modes/table`).send({ fitId: 'nope', modes: [1], baseVersion: version });
    expect(notUuid.status).toBe(404);
    const noMode = await lead.post(`/api/campaigns/${barId}/modes/table`).send({ fitId: low.id, modes: [99], baseVersion: version });
    expect(noMode.status).toBe(400);
    expect(noMode.body.error.message).toMatch(/no computed mode 99/);
    const empty = await lead.post(`/api/campaigns/${barId}/modes/table`).send({ fitId: low.id, modes: [], baseVersion: version });
    expect(empty.status).toBe(400);
    const extra = await lead.post(`/api/campaigns/${barId}/modes/table`).send({ fitId: low.id, modes: [1], baseVersion: version, colour: 'red' });
    expect(extra.status).toBe(400);
    // A fit of another campaign: the lead's skid campaign holds none of this campaign's fits, so the bar's fit is 404 there.
    const skidId = (await lead.get('/api/campaigns')).body.campaigns.find((c: { name: string }) => c.name !== BAR_CAMPAIGN).id;
    const foreign = await lead.post(`/api/campaigns/${skidId}/modes/table`).send({ fitId: low.id, modes: [1], baseVersion: 0 });
    expect(foreign.status).toBe(404);
    const foreignSyn = await lead.get(`/api/campaigns/${skidId}/modes/synthesis?response=B21:%2BZ&reference=B21:%2BZ`);
    expect(foreignSyn.status).toBe(409);
    expect((await viewer.post(`/api/campaigns/${barId}/modes/table`).send({ fitId: low.id, modes: [1], baseVersion: version })).status).toBe(403);
    const unknownPair = await viewer.get(`/api/campaigns/${barId}/modes/synthesis?response=B99:%2BZ&reference=B21:%2BZ`);
    expect(unknownPair.status).toBe(404);
  });

  it('removes a row with the table version, clears the duplicate flag it caused, and audits the removal', async () => {
    const table = (await viewer.get(`/api/campaigns/${barId}/modes`)).body;
    const dup = (table.modes as { id: string; duplicate: unknown }[]).find((r) => r.duplicate)!;
    const stale = await lead.delete(`/api/campaigns/${barId}/modes/table/${dup.id}?baseVersion=${table.version - 1}`);
    expect(stale.status).toBe(409);
    const missing = await lead.delete(`/api/campaigns/${barId}/modes/table/00000000-0000-4000-8000-000000000000?baseVersion=${table.version}`);
    expect(missing.status).toBe(404);
    const noVersion = await lead.delete(`/api/campaigns/${barId}/modes/table/${dup.id}`);
    expect(noVersion.status).toBe(400);
    const gone = await lead.delete(`/api/campaigns/${barId}/modes/table/${dup.id}?baseVersion=${table.version}`);
    expect(gone.status).toBe(200);
    expect((gone.body.modes as { duplicate: unknown }[]).every((r) => r.duplicate === null)).toBe(true);
    expect(gone.body.modes).toHaveLength(table.modes.length - 1);
    const audit = (await lead.get(`/api/campaigns/${barId}/audit`)).body;
    expect(JSON.stringify(audit)).toMatch(/"action":"remove"/);
  });
});
