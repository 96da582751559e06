// The Modes screen in the real browser on the demo bar: the lead runs a fit, picks the stable
// poles of the first four bending modes, computes shapes and reads the mode table, the MAC matrix
// and the animated shape; a viewer reads the same modes without any action controls.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { BAR_CAMPAIGN } from '@resonote/api/seed';
import { startDemo, type DemoRun } from '../support/demo.ts';
import { screenshot, viewports } from '../support/browser.ts';

let demo: DemoRun;
let barId: string;

const HANDBOOK_HZ = [53.17, 146.55, 287.3, 474.93];

beforeAll(async () => {
  demo = await startDemo();
  barId = await demo.campaignId(BAR_CAMPAIGN);
}, 240_000);
afterAll(async () => {
  await demo?.close();
});

// Reduced motion: the mode-shape animation starts still (a test presses Play itself).
const signedIn = (email: string, viewport: { width: number; height: number } = viewports.laptop) => demo.signIn(email, viewport, { reducedMotion: 'reduce' });

/**
 * Chooses, at the highest order, the fully stable pole nearest each target frequency by sending
 * the diagram the click event plotly itself sends (clicking markers a few pixels wide in a
 * headless browser is unreliable; the handler under test is the same).
 */
async function choosePoles(page: Page, targets: number[]) {
  return page.evaluate((targets) => {
    type Gd = HTMLElement & { data: { name: string; x: number[]; y: number[]; customdata: unknown[] }[]; emit(name: string, ev: unknown): void };
    const gd = document.querySelector('.stabilization-plot') as Gd;
    const curve = gd.data.findIndex((t) => t.name.startsWith('all ('));
    const trace = gd.data[curve]!;
    const top = Math.max(...trace.y);
    return targets.map((f0) => {
      let best = -1;
      trace.x.forEach((f, i) => {
        if (trace.y[i] !== top) return;
        if (best < 0 || Math.abs(f - f0) < Math.abs(trace.x[best]! - f0)) best = i;
      });
      gd.emit('plotly_click', { points: [{ curveNumber: curve, pointNumber: best, customdata: trace.customdata[best] }] });
      return trace.x[best]!;
    });
  }, targets);
}

async function waitForAnimation(page: Page) {
  await page.locator('[data-testid="mode-animation"] canvas').first().waitFor({ timeout: 20_000 });
  await page.waitForTimeout(800);
}

describe('the Modes screen', () => {
  it('lets the lead run a fit, choose the stable poles of the bar and compute its modes', async () => {
    const { page, errors, close } = await signedIn('lead@demo.resonote.local');
    await page.goto(`${demo.app.baseUrl}/campaigns/${barId}/modes`);
    await page.getByRole('link', { name: 'Modes' }).waitFor();
    await expect(page.getByTestId('modes-empty')).toBeDefinedAndVisible();
    await expect(page.getByText(/Decisions about the structure belong to licensed practice/)).toBeDefinedAndVisible();

    await page.getByLabel('Band from').fill('20');
    await page.getByLabel('Band to').fill('600');
    await page.getByLabel('Max model order').fill('30');
    await page.getByRole('button', { name: 'Run fit' }).click();
    await page.getByTestId('stabilization').waitFor({ timeout: 60_000 });
    await page.locator('.stabilization-plot .scatterlayer').first().waitFor();
    expect(await page.getByTestId('fit-caption').textContent()).toMatch(/20–600 Hz · orders 2–30/);
    // The legend names every stability class.
    const legend = await page.locator('.stabilization-plot .legend').textContent();
    for (const name of ['new pole', 'stable in frequency', 'frequency and damping', 'all (frequency, damping and vector)', 'CMIF']) expect(legend).toContain(name);

    const picked = await choosePoles(page, HANDBOOK_HZ);
    picked.forEach((f, i) => expect(Math.abs(f / HANDBOOK_HZ[i]! - 1), `stable pole near ${HANDBOOK_HZ[i]} Hz`).toBeLessThan(0.01));
    await expect(page.getByTestId('chosen-poles')).toBeDefinedAndVisible();
    expect(await page.getByTestId('chosen-poles').locator('tbody tr').count()).toBe(4);

    // The suggestion from the whole diagram finds the same four modes (poles persisting across orders).
    await page.getByRole('button', { name: 'Clear' }).click();
    await page.getByTestId('suggest-modes').click();
    await page.getByTestId('chosen-poles').locator('tbody tr').nth(3).waitFor();
    const suggested = (await page.getByTestId('chosen-poles').locator('tbody tr').evaluateAll((trs) => trs.map((tr) => Number(tr.getAttribute('data-pole-fhz'))))).sort((a, b) => a - b);
    expect(suggested).toHaveLength(4);
    suggested.forEach((f, i) => expect(Math.abs(f / HANDBOOK_HZ[i]! - 1), `suggested mode near ${HANDBOOK_HZ[i]} Hz`).toBeLessThan(0.01));

    // Record the toasts: the first software-rendered 3D scene can hold the page longer than a toast stays.
    await page.evaluate(() => {
      const seen: string[] = ((window as unknown as { toasts: string[] }).toasts = []);
      new MutationObserver(() => document.querySelectorAll('[data-testid="toasts"] [role]').forEach((t) => seen.push(t.textContent ?? ''))).observe(document.querySelector('[data-testid="toasts"]')!, { childList: true, subtree: true });
    });
    await page.getByRole('button', { name: 'Compute shapes' }).click();
    const rows = page.getByTestId('mode-table').locator('tbody tr');
    await rows.nth(3).waitFor({ timeout: 30_000 });
    expect(await rows.count()).toBe(4);
    const f1 = Number(await rows.first().getAttribute('data-fhz'));
    // Euler–Bernoulli first weak-direction bending mode, 53.17 Hz, within 0.5 % (docs/methods.md#free-free-beam).
    expect(Math.abs(f1 / 53.17 - 1)).toBeLessThan(0.005);
    expect(await page.getByTestId('damping-correction').textContent()).toMatch(/exponential window/);
    await page.locator('.mac-heatmap .heatmaplayer, .mac-heatmap .hm').first().waitFor({ state: 'attached' });
    const macLabels = await page.locator('.mac-heatmap .xtick text').allTextContents();
    expect(macLabels[0]).toMatch(/^mode 1 \(53\.\d Hz\)$/);
    await page.locator('.synthesis-plot .scatterlayer').first().waitFor();
    await waitForAnimation(page);
    expect(await page.evaluate(() => (window as unknown as { toasts: string[] }).toasts.join(' | '))).toMatch(/Shapes computed for 4 modes/);
    await page.evaluate(() => window.scrollTo(0, 0));
    await screenshot(page, 'modes-1366');

    // Change the mode shown, play the animation and pause it.
    await page.getByRole('button', { name: /^2 · 14\d\.\d Hz$/ }).click();
    expect(await page.getByRole('button', { name: /^2 · / }).getAttribute('aria-pressed')).toBe('true');
    await page.getByRole('button', { name: 'Play' }).click();
    await page.waitForTimeout(500);
    await page.getByRole('button', { name: 'Pause' }).click();

    expect(errors).toEqual([]);
    await close();
  }, 120_000);

  it('shows the newest chosen modes on load, at tablet width too', async () => {
    const { page, errors, close } = await signedIn('lead@demo.resonote.local', viewports.tablet);
    await page.goto(`${demo.app.baseUrl}/campaigns/${barId}/modes`);
    await page.getByTestId('mode-table').locator('tbody tr').nth(3).waitFor({ timeout: 20_000 });
    await page.locator('.stabilization-plot .scatterlayer').first().waitFor();
    expect(await page.getByTestId('chosen-poles').locator('tbody tr').count()).toBe(4);
    await waitForAnimation(page);
    await page.locator('.synthesis-plot .scatterlayer').first().waitFor();
    // Nothing wider than the screen.
    expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(768);
    await page.evaluate(() => window.scrollTo(0, 0));
    await screenshot(page, 'modes-768');
    expect(errors).toEqual([]);
    await close();
  });

  it('shows a viewer the modes without any action controls', async () => {
    const { page, errors, close } = await signedIn('viewer@demo.resonote.local');
    await page.goto(`${demo.app.baseUrl}/campaigns/${barId}/modes`);
    const rows = page.getByTestId('mode-table').locator('tbody tr');
    await rows.nth(3).waitFor({ timeout: 20_000 });
    expect(await rows.count()).toBe(4);
    await page.locator('.stabilization-plot .scatterlayer').first().waitFor();
    await waitForAnimation(page);
    expect(await page.getByRole('button', { name: 'Run fit' }).count()).toBe(0);
    expect(await page.getByRole('button', { name: 'Compute shapes' }).count()).toBe(0);
    expect(await page.getByRole('button', { name: /Choose the stable poles/ }).count()).toBe(0);
    expect(await page.getByRole('button', { name: /Suggest modes/ }).count()).toBe(0);
    expect(await page.getByRole('button', { name: /Remove the pole/ }).count()).toBe(0);
    expect(await page.getByText('Fit settings').count()).toBe(0);
    await page.evaluate(() => window.scrollTo(0, 0));
    await screenshot(page, 'modes-viewer-1366');
    expect(errors).toEqual([]);
    await close();
  });
});
