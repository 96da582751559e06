// Review in the real browser: a viewer overlays all 21 FRFs of the finished calibration bar,
// switches views and FRF kind, opens one DOF and one hit, reads the checks, and finds no action
// controls anywhere. Screenshots at 1366 px and 768 px.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { eq } from 'drizzle-orm';
import { chromium, type Browser, type Page } from 'playwright-core';
import { campaign } from '@resonote/db/schema';
import { seedDemo, DEMO_PASSWORD, BAR_CAMPAIGN } from '@resonote/api/seed';
import { startTestApp, type TestApp } from '../support/app.ts';
import { screenshot, viewports, watchConsole } from '../support/browser.ts';

let app: TestApp & { baseUrl: string };
let browser: Browser;
let barId: string;

beforeAll(async () => {
  // RESONOTE_WEB_DIST lets a run use its own build while someone else rebuilds apps/web/dist.
  app = await startTestApp('resonote_tpl_e2e', process.env.RESONOTE_WEB_DIST ? { WEB_DIST: process.env.RESONOTE_WEB_DIST } : {}, { listen: true });
  await seedDemo(app.handle, { log: () => undefined });
  const [row] = await app.handle.database.db.select({ id: campaign.id }).from(campaign).where(eq(campaign.name, BAR_CAMPAIGN));
  barId = row!.id;
  browser = await chromium.launch({
    executablePath: process.env.RESONOTE_CHROMIUM ?? '/usr/bin/chromium',
    headless: true,
    args: ['--no-sandbox', '--use-angle=swiftshader', '--enable-unsafe-swiftshader', '--ignore-gpu-blocklist', '--disable-quic', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync'],
  });
}, 180_000);
afterAll(async () => {
  await browser?.close();
  await app?.close();
});

async function signIn(email: string, viewport: { width: number; height: number }) {
  const context = await browser.newContext({ viewport, hasTouch: viewport.width < 1100 });
  const page = await context.newPage();
  const errors = watchConsole(page);
  await page.goto(`${app.baseUrl}/sign-in`);
  await page.getByLabel('E-mail').fill(email);
  await page.getByLabel('Password').fill(DEMO_PASSWORD);
  await page.getByRole('button', { name: 'Sign in' }).click();
  await page.waitForURL(/\/campaigns$/);
  return { page, errors, close: () => context.close() };
}

const drawCount = (page: Page) => page.evaluate(() => window.__resonoteOverlayTimings?.length ?? 0);
async function waitForRedraw(page: Page, before: number) {
  await page.waitForFunction((n) => (window.__resonoteOverlayTimings?.length ?? 0) > n, before, { timeout: 30_000 });
  await page.waitForTimeout(300);
}
const yTitles = (page: Page) => page.locator('[data-testid="overlay-plot"] .g-ytitle, [data-testid="overlay-plot"] .g-y2title').allTextContents();

async function noActionControls(page: Page) {
  for (const name of [/Strike/, /Accept/, /Reject/, /Upload/, /Simulat/]) expect(await page.getByRole('button', { name }).count()).toBe(0);
  expect(await page.locator('input[type="file"]').count()).toBe(0);
}

describe('Review in the browser', () => {
  it('overlays the 21 done FRFs of the bar, switches views and kind, and shows a viewer no action controls', async () => {
    const { page, errors, close } = await signIn('viewer@demo.resonote.local', viewports.laptop);
    await page.goto(`${app.baseUrl}/campaigns/${barId}/review`);
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
    await page.waitForTimeout(500);
    await screenshot(page, 'review-1366');

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
    await page.waitForTimeout(600);
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
    await page.goto(`${app.baseUrl}/campaigns/${barId}/review`);
    await page.getByTestId('pick-all-done').click();
    await page.locator('[data-testid="overlay-plot"][data-overlay-count="21"]').waitFor({ timeout: 30_000 });
    await page.waitForFunction(() => (window.__resonoteOverlayTimings?.length ?? 0) > 0, undefined, { timeout: 30_000 });
    await page.waitForTimeout(600);
    expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(768);
    await noActionControls(page);
    await screenshot(page, 'review-768');
    expect(errors).toEqual([]);
    await close();
  }, 120_000);
});
