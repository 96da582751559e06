// Review in the real browser: a viewer overlays all 21 FRFs of the finished calibration bar,
// switches views and FRF kind, opens one DOF and one hit, reads the checks, and finds no action
// controls anywhere. Screenshots at 1366 px and 768 px.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { BAR_CAMPAIGN, SKID_CAMPAIGN } from '@resonote/api/seed';
import { startDemo, type DemoRun } from '../support/demo.ts';
import { screenshot, settled, viewports } from '../support/browser.ts';

let demo: DemoRun;
let barId: string;

beforeAll(async () => {
  demo = await startDemo();
  barId = await demo.campaignId(BAR_CAMPAIGN);
}, 240_000);
afterAll(async () => {
  await demo?.close();
});

const signIn = (email: string, viewport: { width: number; height: number } = viewports.laptop) => demo.signIn(email, viewport);

const drawCount = (page: Page) => page.evaluate(() => window.__resonoteOverlayTimings?.length ?? 0);
async function waitForRedraw(page: Page, before: number) {
  await page.waitForFunction((n) => (window.__resonoteOverlayTimings?.length ?? 0) > n, before, { timeout: 30_000 });
  await settled(page);
}
const yTitles = (page: Page) => page.locator('[data-testid="overlay-plot"] .g-ytitle, [data-testid="overlay-plot"] .g-y2title').allTextContents();

async function noActionControls(page: Page) {
  for (const name of [/Strike/, /Accept/, /Reject/, /Upload/, /Simulat/]) expect(await page.getByRole('button', { name }).count()).toBe(0);
  expect(await page.locator('input[type="file"]').count()).toBe(0);
}

describe('Review in the browser', () => {
  it('overlays the 21 done FRFs of the bar, switches views and kind, and shows a viewer no action controls', async () => {
    const { page, errors, close } = await signIn('viewer@demo.resonote.local', viewports.laptop);
    await page.goto(`${demo.app.baseUrl}/campaigns/${barId}/review`);
    await page.getByTestId('entry-list').waitFor();
    // The first DOF with hits opens by itself.
    await page.locator('[data-testid="dof-detail"] .js-plotly-plot').first().waitFor({ timeout: 20_000 });
    expect(await page.getByTestId('pick-all-done').textContent()).toBe('All done (21)');

    await page.getByTestId('pick-all-done').click();
    await page.locator('[data-testid="overlay-plot"][data-overlay-count="21"]').waitFor({ timeout: 30_000 });
    await page.waitForFunction(() => (window.__resonoteOverlayTimings?.length ?? 0) > 0, undefined, { timeout: 30_000 });
    expect(await page.locator('[data-testid="overlay-plot"] .scatterlayer, [data-testid="overlay-plot"] canvas').count()).toBeGreaterThan(0);
    expect((await yTitles(page)).join(' | ')).toContain('|H| (dB re 1 (m/s²)/N)');
    expect((await yTitles(page)).join(' | ')).toContain('Phase (°)');
    await settled(page);
    await screenshot(page, 'review-1366');

    // Zoom: a drag across the magnitude plot. The curves are decimated again over the visible band,
    // so a zoomed peak shows every measured line instead of the whole axis' min/max envelope.
    const firstTrace = () =>
      page.evaluate(() => {
        const gd = document.querySelector('[data-testid="overlay-plot"]') as unknown as { data: { x: ArrayLike<number> }[]; layout: { xaxis: { range: [number, number] } } };
        return { x: Array.from(gd.data[0]!.x), range: gd.layout.xaxis.range };
      });
    const whole = await firstTrace();
    // The mouse works in window coordinates: the plot is brought into view before its box is read.
    await page.locator('[data-testid="overlay-plot"]').scrollIntoViewIfNeeded();
    const drag = (await page.locator('[data-testid="overlay-plot"] .nsewdrag').first().boundingBox())!;
    await page.mouse.move(drag.x + drag.width * 0.2, drag.y + drag.height / 2);
    await page.mouse.down();
    await page.mouse.move(drag.x + drag.width * 0.22, drag.y + drag.height / 2 + 2, { steps: 6 });
    await page.mouse.up();
    await page.waitForFunction((n) => {
      const gd = document.querySelector('[data-testid="overlay-plot"]') as unknown as { data: { x: ArrayLike<number> }[] };
      return gd.data[0]!.x.length !== n;
    }, whole.x.length);
    const zoomed = await firstTrace();
    const [lo, hi] = zoomed.range;
    expect(hi - lo).toBeLessThan((whole.x.at(-1)! - whole.x[0]!) / 20);
    // The drawn lines cover the band (one line beyond each edge) at the FRF's own line spacing: none left out.
    expect(zoomed.x[0]!).toBeLessThanOrEqual(lo);
    expect(zoomed.x.at(-1)!).toBeGreaterThanOrEqual(hi);
    const steps = zoomed.x.slice(1).map((x, i) => x - zoomed.x[i]!);
    expect(Math.max(...steps) - Math.min(...steps)).toBeLessThan(1e-6);
    const inBand = (x: number[]) => x.filter((v) => v >= lo && v <= hi).length;
    expect(inBand(zoomed.x)).toBeGreaterThan(2 * inBand(whole.x));
    await page.mouse.move(5, 5); // no hover label over the picture
    await settled(page);
    await screenshot(page, 'review-zoomed-1366');
    // A double-click returns to the whole axis and its decimated curves.
    await page.locator('[data-testid="overlay-plot"]').scrollIntoViewIfNeeded();
    const again = (await page.locator('[data-testid="overlay-plot"] .nsewdrag').first().boundingBox())!;
    await page.mouse.dblclick(again.x + again.width / 2, again.y + again.height / 2);
    await page.waitForFunction((n) => {
      const gd = document.querySelector('[data-testid="overlay-plot"]') as unknown as { data: { x: ArrayLike<number> }[] };
      return gd.data[0]!.x.length === n;
    }, whole.x.length);

    let n = await drawCount(page);
    await page.getByTestId('view-choice').getByRole('radio', { name: 'Nyquist' }).click();
    await waitForRedraw(page, n);
    expect(await page.locator('[data-testid="overlay-plot"] .g-xtitle').textContent()).toBe('Re(H) ((m/s²)/N)');
    await screenshot(page, 'review-nyquist-1366');

    n = await drawCount(page);
    await page.getByTestId('view-choice').getByRole('radio', { name: 'Real / imaginary' }).click();
    await waitForRedraw(page, n);
    expect((await yTitles(page)).join(' | ')).toContain('Im(H) ((m/s²)/N)');

    n = await drawCount(page);
    await page.getByLabel('FRF kind').selectOption('mobility');
    await waitForRedraw(page, n);
    await page.locator('[data-testid="overlay-plot"][data-overlay-count="21"]').waitFor();
    expect((await yTitles(page)).join(' | ')).toContain('Re(H) ((m/s)/N)');
    await noActionControls(page);

    n = await drawCount(page);
    await page.getByTestId('view-choice').getByRole('radio', { name: 'Magnitude / phase' }).click();
    await page.getByTestId('frequency-choice').getByRole('radio', { name: 'Log' }).click();
    await waitForRedraw(page, n);
    expect((await yTitles(page)).join(' | ')).toContain('|H| (dB re 1 (m/s)/N)');
    await screenshot(page, 'review-mobility-log-1366');

    // One DOF and one of its hits, read-only.
    await page.getByRole('tab', { name: 'One DOF' }).click();
    await page.locator('[data-testid="dof-detail"] .js-plotly-plot').first().waitFor();
    await page.getByRole('button', { name: 'Show hit 1' }).click();
    await page.locator('[data-testid="hit-plots"] .js-plotly-plot').nth(1).waitFor({ timeout: 20_000 });
    await noActionControls(page);
    await settled(page);
    await screenshot(page, 'review-dof-1366');

    await page.getByRole('tab', { name: 'Reciprocity and linearity' }).click();
    await expect(page.getByTestId('checks-note')).toBeDefinedAndVisible();
    expect(await page.getByTestId('checks-note').textContent()).toMatch(/No normative pass\/fail threshold/);
    await screenshot(page, 'review-checks-1366');
    expect(errors).toEqual([]);
    await close();
  }, 180_000);

  it('fits a 768 px tablet', async () => {
    const { page, errors, close } = await signIn('viewer@demo.resonote.local', viewports.tablet);
    await page.goto(`${demo.app.baseUrl}/campaigns/${barId}/review`);
    await page.getByTestId('pick-all-done').click();
    await page.locator('[data-testid="overlay-plot"][data-overlay-count="21"]').waitFor({ timeout: 30_000 });
    await page.waitForFunction(() => (window.__resonoteOverlayTimings?.length ?? 0) > 0, undefined, { timeout: 30_000 });
    await settled(page);
    expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(768);
    await noActionControls(page);
    await screenshot(page, 'review-768');
    expect(errors).toEqual([]);
    await close();
  }, 120_000);
});

type Entry = { id: string; responseDof: string; excitationDof: string; drivingPoint: boolean; acceptedHits: number; requiredHits: number };

/** A call with the page's session (a POST carries the app's Origin, as the web app's own do). */
async function call(page: Page, method: 'GET' | 'POST', path: string, body?: unknown): Promise<{ status: number; body: any }> {
  const r = await page.request.fetch(`${demo.app.baseUrl}/api${path}`, { method, data: body, headers: { origin: demo.app.baseUrl } });
  return { status: r.status(), body: await r.json().catch(() => null) };
}


// The checks stay current while hits arrive, and the page asks for them (GET …/checks reads every
// entry's result) only for hits that can change them: a viewer keeps Review open while an engineer
// strikes the pump-skid baseplate from another browser.
describe('Review checks while hits arrive', () => {
  it('asks for the checks once per hit that can change them, and shows the new linearity and reciprocity figures', async () => {
    const skidId = await demo.campaignId(SKID_CAMPAIGN);
    const isChecks = (url: string) => new URL(url).pathname === `/api/campaigns/${skidId}/checks`;
    const viewer = await demo.signIn('viewer@demo.resonote.local', viewports.laptop);
    const engineer = await demo.signIn('engineer@demo.resonote.local', viewports.laptop);
    const checkRequests: string[] = [];
    viewer.page.on('request', (r) => {
      if (isChecks(r.url())) checkRequests.push(r.url());
    });

    const { entries } = (await call(engineer.page, 'GET', `/campaigns/${skidId}/schedule`)).body as { entries: Entry[] };
    // The seed measures the first 13 entries and the reciprocal of the 4th (lib seed.ts): a later
    // roving entry has no hit and nobody's reciprocal; the 4th has its reciprocal measured.
    const fresh = entries.find((e, i) => i > 13 && e.acceptedHits === 0 && !e.drivingPoint)!;
    const paired = entries[3]!;
    expect(fresh).toBeDefined();
    expect(paired.acceptedHits).toBeGreaterThan(0);

    let seed = 7000;
    const strike = async (e: Entry, peakForceN: number) => {
      const r = await call(engineer.page, 'POST', `/campaigns/${skidId}/schedule/${e.id}/simulate`, { count: 1, seed: seed++, tip: 'soft', peakForceN, doubleHitProbability: 0, overloadProbability: 0, idempotencyKey: `e2e-checks-${seed}` });
      expect(r.status).toBe(201);
      return r.body.entry.acceptedHits as number;
    };
    const hitsCell = (e: Entry) => viewer.page.locator(`[data-testid="entry-list"] tr[data-entry="${e.id}"] td:last-child`);
    const waitForCount = (e: Entry, n: number) => hitsCell(e).filter({ hasText: new RegExp(`^${n}/`) }).waitFor({ timeout: 20_000 });

    // The One DOF view does not read the checks at all, hits or not.
    await viewer.page.goto(`${demo.app.baseUrl}/campaigns/${skidId}/review`);
    await viewer.page.locator('[data-testid="dof-detail"] .js-plotly-plot').first().waitFor({ timeout: 20_000 });
    expect(await strike(fresh, 60)).toBe(1);
    await waitForCount(fresh, 1);
    expect(checkRequests).toHaveLength(0);

    await viewer.page.getByRole('tab', { name: 'Reciprocity and linearity' }).click();
    await viewer.page.getByTestId('checks').waitFor({ timeout: 30_000 });
    expect(checkRequests).toHaveLength(1);
    const linearity = viewer.page.getByTestId('linearity-checks');
    const reciprocity = viewer.page.getByTestId('reciprocity-checks');
    const label = (e: Entry) => `${e.responseDof} / ${e.excitationDof}`;
    expect(await linearity.innerText()).not.toContain(label(fresh));

    // Hits 2 and 3 at an entry with no reciprocal: fewer than 4 accepted hits give no linearity line
    // (apps/api/src/hits/checks.ts entryLinearity), so the checks cannot change and are not read.
    for (const n of [2, 3]) {
      expect(await strike(fresh, 60)).toBe(n);
      await waitForCount(fresh, n);
    }
    // Hit 4 at 150 N: the medians of the lighter and heavier halves are 60 N and 150 N, a ratio of
    // 2.5 ≥ 1.5, so the entry gets its linearity line. The notices are applied one after the
    // other, so this read also shows that hits 2 and 3 made none.
    const fourth = viewer.page.waitForResponse((r) => isChecks(r.url()) && r.status() === 200, { timeout: 30_000 });
    expect(await strike(fresh, 150)).toBe(4);
    await fourth;
    await linearity.getByText(label(fresh)).waitFor({ timeout: 20_000 });
    expect(checkRequests).toHaveLength(2);
    const line = await linearity.locator('tr', { hasText: label(fresh) }).innerText();
    expect(line).toMatch(/ N \/ 1\d\d N/); // the heavier half's median force, about 150 N

    // Three hits at the entry whose reciprocal is measured: each changes its averaged FRF and so the
    // reciprocity figures, and each is read once.
    const pairRow = () => reciprocity.locator('tbody').innerText();
    const before = await pairRow();
    for (let k = 1; k <= 3; k++) {
      const answer = viewer.page.waitForResponse((r) => isChecks(r.url()) && r.status() === 200, { timeout: 30_000 });
      expect(await strike(paired, 60)).toBe(paired.acceptedHits + k);
      await answer;
      await waitForCount(paired, paired.acceptedHits + k);
    }
    await settled(viewer.page);
    expect(checkRequests).toHaveLength(5);
    expect(await pairRow()).not.toBe(before);
    await screenshot(viewer.page, 'review-checks-1366');
    expect(viewer.errors).toEqual([]);
    await viewer.close();
    await engineer.close();
  }, 180_000);
});
