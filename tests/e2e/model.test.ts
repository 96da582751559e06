// Test against the model in the real browser, on the demo baseplate: the lead imports the design
// model (the simulator's modes with the stiffness 4 % higher, apps/api/src/demo/fe-model.ts) as a new
// version, links the points, asks for a proposal (Effective Independence, Kammer 1991) keeping the
// accelerometer already at P07:+Z, accepts it, completes the hits on the simulated rig through the
// API, fits, and reads the correlation table on Modes. Screenshots at 1366×768 and 768×1024.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { SKID_CAMPAIGN } from '@resonote/api/seed';
import { feModelCsvFromStructure } from '@resonote/api/demo-fe-model';
import { pumpSkidBaseplate } from '@resonote/sim';
import { startDemo, type DemoRun } from '../support/demo.ts';
import { screenshot, viewports } from '../support/browser.ts';

let demo: DemoRun;
let skidId: string;

beforeAll(async () => {
  demo = await startDemo();
  skidId = await demo.campaignId(SKID_CAMPAIGN);
}, 240_000);
afterAll(async () => {
  await demo?.close();
});

/** The API from inside the signed-in page (same origin, its cookies). */
async function call(page: Page, method: string, path: string, body?: unknown): Promise<{ status: number; body: any }> {
  return page.evaluate(
    async ({ method, path, body }) => {
      const r = await fetch(`/api${path}`, { method, headers: body === undefined ? undefined : { 'content-type': 'application/json' }, body: body === undefined ? undefined : JSON.stringify(body) });
      return { status: r.status, body: await r.json().catch(() => null) };
    },
    { method, path, body },
  );
}

describe('planning from the model and correlating with it', () => {
  it('lets the lead import a model, plan points and reference, accept, test, fit and read the correlation', async () => {
    const { page, errors, close } = await demo.signIn('lead@demo.resonote.local', viewports.laptop);
    await page.goto(`${demo.app.baseUrl}/campaigns/${skidId}/plan`);
    const section = page.getByTestId('model-section');
    await section.waitFor();
    // The seeded version is listed.
    await page.getByTestId('model-versions').getByText('design v1').waitFor();

    // A broken file first: the problems are listed with their lines.
    await page.getByTestId('model-file').setInputFiles({ name: 'broken.csv', mimeType: 'text/csv', buffer: Buffer.from('format,resonote-fe-modes,1\nunits,mm,Hz,kg\nnormalisation,mass\nnode,P01,abc,0,0\n') });
    await page.getByLabel('Version label').fill('broken');
    await page.getByRole('button', { name: 'Upload model' }).click();
    await page.getByTestId('model-problems').waitFor();
    expect(await page.getByTestId('model-problems').textContent()).toMatch(/line 4, x/);

    // The real file as a new version.
    await page.getByTestId('model-file').setInputFiles({ name: 'ps300-v2.csv', mimeType: 'text/csv', buffer: Buffer.from(feModelCsvFromStructure(pumpSkidBaseplate(), 1.04, 'PS-300 baseplate, design model')) });
    await page.getByLabel('Version label').fill('design v2');
    await page.getByRole('button', { name: 'Upload model' }).click();
    await page.getByTestId('model-versions').getByText('design v2').waitFor();
    await page.getByRole('button', { name: 'Link automatically' }).click();
    await page.getByRole('textbox', { name: 'Node for point P20' }).waitFor();
    expect(await page.getByRole('textbox', { name: 'Node for point P20' }).inputValue()).toBe('P20');

    // The proposal: modes up to 120 Hz, 10 DOFs in Z, keeping the accelerometer at P07:+Z.
    await page.getByLabel('Band from (Hz)').fill('0');
    await page.getByLabel('Band to (Hz)').fill('120');
    await page.getByLabel('DOFs to keep').fill('10');
    await page.getByRole('button', { name: 'Propose' }).click();
    const result = page.getByTestId('proposal-result');
    await result.waitFor();
    expect(await page.getByTestId('proposal-table').locator('tbody tr').count()).toBe(10);
    await expect(result.getByText(/largest off-diagonal auto-MAC is/)).toBeDefinedAndVisible();
    await expect(result.locator('.matrix-heatmap .main-svg').first()).toBeDefinedAndVisible();
    // The accelerometer stays where it is: the lead keeps P07:+Z as the reference.
    await page.getByRole('radio', { name: 'Reference at P07:+Z' }).check();
    await section.scrollIntoViewIfNeeded();
    await result.scrollIntoViewIfNeeded();
    const planShot = await screenshot(page, 'model-plan-1366x768');
    await page.getByRole('button', { name: 'Accept into geometry and schedule' }).click();
    await page.getByText(/Plan accepted: .* reference P07:\+Z/).waitFor();

    // The rig: the remaining planned entries get their hits (simulated), then a fit over the band.
    const entries = (await call(page, 'GET', `/campaigns/${skidId}/schedule`)).body.entries as { id: string; status: string; acceptedHits: number }[];
    let seed = 5000;
    for (const e of entries.filter((x) => x.status === 'planned')) {
      const r = await call(page, 'POST', `/campaigns/${skidId}/schedule/${e.id}/simulate`, { count: 5, seed: seed++, tip: 'soft', peakForceN: 60, doubleHitProbability: 0, overloadProbability: 0, idempotencyKey: `e2e-model-${e.id}` });
      expect(r.status, JSON.stringify(r.body)).toBeLessThan(300);
    }
    const started = await call(page, 'POST', `/campaigns/${skidId}/modes/fits`, { bandHz: { low: 5, high: 120 }, maxOrder: 30 });
    expect(started.status, JSON.stringify(started.body)).toBeLessThan(300);
    const fitId = started.body.fit.id as string;
    await page.goto(`${demo.app.baseUrl}/campaigns/${skidId}/modes`);
    await page.waitForFunction(
      async ({ skidId, fitId }) => ['done', 'failed'].includes((await (await fetch(`/api/campaigns/${skidId}/modes/fits/${fitId}`)).json()).fit.status),
      { skidId, fitId },
      { timeout: 120_000, polling: 500 },
    );
    const fit = (await call(page, 'GET', `/campaigns/${skidId}/modes/fits/${fitId}`)).body.fit;
    expect(fit.status, fit.message).toBe('done');
    // The lead's pick: at the highest order, the poles stable in frequency and damping (or all three),
    // one per 1 % of frequency, inside 5–120 Hz.
    const top = fit.result.diagram.orders.at(-1) as { order: number; poles: { fHz: number; stable: string }[] };
    const poles: { order: number; index: number }[] = [];
    const picked: number[] = [];
    top.poles.forEach((p, index) => {
      if ((p.stable === 'all' || p.stable === 'freq-damp') && p.fHz > 5 && p.fHz < 120 && picked.every((f) => Math.abs(f / p.fHz - 1) > 0.01)) {
        poles.push({ order: top.order, index });
        picked.push(p.fHz);
      }
    });
    console.log(`[figure] baseplate fit 5–120 Hz: ${poles.length} poles picked at order ${top.order}: ${picked.map((f) => f.toFixed(2)).join(', ')} Hz`);
    expect(poles.length).toBeGreaterThan(0);
    const computed = await call(page, 'POST', `/campaigns/${skidId}/modes/fits/${fitId}/modes`, { poles });
    expect(computed.status, JSON.stringify(computed.body)).toBe(200);
    const table = (await call(page, 'GET', `/campaigns/${skidId}/modes`)).body;
    const added = await call(page, 'POST', `/campaigns/${skidId}/modes/table`, { fitId, modes: poles.map((_, i) => i + 1), baseVersion: table.version });
    expect(added.status, JSON.stringify(added.body)).toBe(201);

    // The correlation table on Modes.
    await page.reload();
    const corr = page.getByTestId('correlation');
    await corr.waitFor({ timeout: 30_000 });
    const rows = page.getByTestId('correlation-table').locator('tbody tr');
    expect(await rows.count()).toBeGreaterThan(0);
    const diffs = (await rows.locator('td:nth-child(5)').allTextContents()).map((t) => Number(t.replace('−', '-')));
    const macs = (await rows.locator('td:nth-child(6)').allTextContents()).map(Number);
    console.log(`[figure] baseplate correlation: Δf ${diffs.join(', ')} %, MAC ${macs.join(', ')}`);
    // f ∝ √k: a model 4 % stiffer reads (1/√1.04 − 1) = −1.94 % for every well-paired mode (MAC ≥ 0.9)
    const good = diffs.filter((_, i) => macs[i]! >= 0.9);
    expect(good.length).toBeGreaterThan(0);
    for (const d of good) expect(Math.abs(d - (1 / Math.sqrt(1.04) - 1) * 100)).toBeLessThan(0.5);
    await expect(corr.locator('.frequency-plot .main-svg').first()).toBeDefinedAndVisible();
    await corr.scrollIntoViewIfNeeded();
    const corrShot = await screenshot(page, 'model-correlation-1366x768');
    expect(errors).toEqual([]);
    await close();
    console.log(`[screens] ${planShot} ${corrShot}`);

    // The same screens on a tablet, as a viewer: reading only.
    const tablet = await demo.signIn('viewer@demo.resonote.local', viewports.tablet);
    await tablet.page.goto(`${demo.app.baseUrl}/campaigns/${skidId}/plan`);
    await tablet.page.getByTestId('model-versions').getByText('design v2').waitFor();
    expect(await tablet.page.getByRole('button', { name: 'Upload model' }).count()).toBe(0);
    await tablet.page.getByTestId('model-map').scrollIntoViewIfNeeded();
    const a = await screenshot(tablet.page, 'model-plan-768x1024');
    await tablet.page.goto(`${demo.app.baseUrl}/campaigns/${skidId}/modes`);
    await tablet.page.getByTestId('correlation').waitFor({ timeout: 30_000 });
    await tablet.page.getByTestId('correlation').scrollIntoViewIfNeeded();
    const b = await screenshot(tablet.page, 'model-correlation-768x1024');
    expect(tablet.errors).toEqual([]);
    await tablet.close();
    console.log(`[screens] ${a} ${b}`);
  }, 420_000);
});
