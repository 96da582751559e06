// Review in the real browser: a viewer overlays all 21 FRFs of the finished calibration bar,
// switches views and FRF kind, opens one DOF and one hit, reads the checks, and finds no action
// controls anywhere. Screenshots at 1366 px and 768 px.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { BAR_CAMPAIGN } from '@resonote/api/seed';
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
