// The Modes screen in the real browser on the demo bar: the lead runs a fit, picks the stable
// poles of the first four bending modes (the choice survives a reload), computes shapes, and
// builds the campaign's mode table from one wide fit and from two band fits; the synthesis always
// shows the current pole set; a viewer reads the same table without any action controls.
import { describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { BAR_CAMPAIGN } from '@resonote/api/seed';
import { useDemo } from '../support/demo.ts';
import { screenshot, settled, viewports } from '../support/browser.ts';

const demo = useDemo(BAR_CAMPAIGN);

const HANDBOOK_HZ = [53.17, 146.55, 287.3, 474.93];

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

/** Waits until the mode-shape view has drawn its scene (data-drawn after Plotly.react) and painted it. */
async function waitForAnimation(page: Page) {
  await page.locator('[data-testid="mode-animation"][data-drawn="yes"] canvas').first().waitFor({ timeout: 20_000 });
  await settled(page);
}

/** Runs a fit over a band from the form and waits for its diagram. */
async function runFit(page: Page, low: number, high: number, order = 30) {
  await page.getByLabel('Band from').fill(String(low));
  await page.getByLabel('Band to').fill(String(high));
  await page.getByLabel('Max model order').fill(String(order));
  await page.getByRole('button', { name: 'Run fit' }).click();
  await page.waitForFunction((caption) => document.querySelector('[data-testid="fit-caption"]')?.textContent?.includes(caption) && document.querySelector('.stabilization-plot .scatterlayer'), `${low}–${high} Hz · orders 2–${order}`, { timeout: 60_000 });
}

/** Waits until the choice of poles is saved on the server. */
async function choiceSaved(page: Page) {
  await page.locator('[data-testid="draft-state"][data-state="saved"]').waitFor();
}

/**
 * Waits until the plotted synthesized magnitude (dB) equals what the API synthesizes now for the fit
 * (the defect: a cached synthesis of the previous pole set stayed on the screen until a reload).
 */
async function synthesisShowsCurrentPoles(page: Page, fitId: string) {
  const url = `/api/campaigns/${demo.campaign}/modes/fits/${fitId}/synthesis?response=B21:%2BZ&reference=B21:%2BZ&kind=accelerance`;
  await page.waitForFunction(
    async (url) => {
      const plot = document.querySelector('[data-testid="fit-synthesis"] .synthesis-plot') as (HTMLElement & { data?: { y: number[] }[] }) | null;
      const y = plot?.data?.[1]?.y;
      if (!y) return false;
      const api = (await (await fetch(url)).json()) as { synthesized: { re: number[]; im: number[] } };
      const want = api.synthesized.re.map((re, k) => 20 * Math.log10(Math.max(Math.hypot(re, api.synthesized.im[k]!), 1e-30)));
      return want.length === y.length && want.every((v, k) => Math.abs(v - y[k]!) < 1e-9);
    },
    url,
    { timeout: 20_000, polling: 250 },
  );
}

const tableRows = (page: Page) => page.getByTestId('mode-table').locator('tbody tr');

describe('the Modes screen', () => {
  it('keeps the chosen poles over a reload, computes shapes and builds the mode table from one wide fit', async () => {
    const { page, errors, close } = await signedIn('lead@demo.resonote.local');
    await page.goto(`${demo.app.baseUrl}/campaigns/${demo.campaign}/modes`);
    await page.getByRole('link', { name: 'Modes' }).waitFor();
    await expect(page.getByTestId('modes-empty')).toBeDefinedAndVisible();
    await expect(page.getByTestId('mode-table-empty')).toBeDefinedAndVisible();
    await expect(page.getByText(/Decisions about the structure belong to licensed practice/)).toBeDefinedAndVisible();

    await runFit(page, 20, 600);
    // The legend names the CMIF and every stability class the diagram holds (at least the new and the fully stable poles).
    const legend = await page.locator('.stabilization-plot .legend').textContent();
    const traces = await page.evaluate(() => (document.querySelector('.stabilization-plot') as HTMLElement & { data: { name: string; x: unknown[] }[] }).data.filter((t) => t.x.length > 0).map((t) => t.name));
    for (const name of ['new pole', 'all (frequency, damping and vector)', 'CMIF']) expect(legend).toContain(name);
    for (const name of traces) expect(legend).toContain(name.replace(/<[^>]+>/g, '').slice(0, 12));

    const picked = await choosePoles(page, HANDBOOK_HZ);
    picked.forEach((f, i) => expect(Math.abs(f / HANDBOOK_HZ[i]! - 1), `stable pole near ${HANDBOOK_HZ[i]} Hz`).toBeLessThan(0.01));
    await page.getByTestId('chosen-poles').locator('tbody tr').nth(3).waitFor();
    expect(await page.getByTestId('chosen-poles').locator('tbody tr').count()).toBe(4);
    await choiceSaved(page);

    // The defect: the choice was lost on a reload before "Compute shapes". It is the fit's draft on the server now.
    await page.reload();
    await page.getByTestId('chosen-poles').locator('tbody tr').nth(3).waitFor({ timeout: 20_000 });
    const kept = (await page.getByTestId('chosen-poles').locator('tbody tr').evaluateAll((trs) => trs.map((tr) => Number(tr.getAttribute('data-pole-fhz'))))).sort((a, b) => a - b);
    expect(kept).toEqual([...picked].sort((a, b) => a - b));

    // The server's suggestion from the whole diagram finds the same four modes (poles persisting across orders).
    await page.getByRole('button', { name: 'Clear' }).click();
    await page.getByTestId('suggest-modes').click();
    await page.getByTestId('chosen-poles').locator('tbody tr').nth(3).waitFor();
    const suggested = (await page.getByTestId('chosen-poles').locator('tbody tr').evaluateAll((trs) => trs.map((tr) => Number(tr.getAttribute('data-pole-fhz'))))).sort((a, b) => a - b);
    expect(suggested).toHaveLength(4);
    suggested.forEach((f, i) => expect(Math.abs(f / HANDBOOK_HZ[i]! - 1), `suggested mode near ${HANDBOOK_HZ[i]} Hz`).toBeLessThan(0.01));
    await choiceSaved(page);

    await page.getByRole('button', { name: 'Compute shapes' }).click();
    await page.getByTestId('fit-modes').locator('tr[data-fit-mode="4"]').waitFor({ timeout: 30_000 });
    expect(await page.getByTestId('mass-note').textContent()).toMatch(/driving point B21:\+Z/);
    const fitId = await page.evaluate(async (campaignId) => ((await (await fetch(`/api/campaigns/${campaignId}/modes/fits`)).json()) as { fits: { id: string }[] }).fits[0]!.id, demo.campaign);
    await synthesisShowsCurrentPoles(page, fitId);

    // The other defect: after a new "Compute shapes" the synthesis showed the previous pole set. Three poles now.
    await page.getByRole('button', { name: /^Remove the pole at 47/ }).click();
    await choiceSaved(page);
    await page.getByRole('button', { name: 'Compute shapes' }).click();
    await page.locator('[data-testid="fit-synthesis"][data-modes="3"]').waitFor({ timeout: 30_000 });
    await synthesisShowsCurrentPoles(page, fitId);
    await page.getByTestId('chosen-poles').locator('tbody tr').nth(2).waitFor();
    await page.getByTestId('suggest-modes').click();
    await page.getByTestId('chosen-poles').locator('tbody tr').nth(3).waitFor();
    await choiceSaved(page);
    await page.getByRole('button', { name: 'Compute shapes' }).click();
    await page.locator('[data-testid="fit-synthesis"][data-modes="4"]').waitFor({ timeout: 30_000 });
    await synthesisShowsCurrentPoles(page, fitId);

    // Into the campaign's mode table.
    await page.getByTestId('add-to-table').click();
    await tableRows(page).nth(3).waitFor({ timeout: 20_000 });
    expect(await tableRows(page).count()).toBe(4);
    const f1 = Number(await tableRows(page).first().getAttribute('data-fhz'));
    // Euler–Bernoulli first weak-direction bending mode, 53.17 Hz, within 0.5 % (docs/methods.md#free-free-beam).
    expect(Math.abs(f1 / 53.17 - 1)).toBeLessThan(0.005);
    expect(await page.getByTestId('mode-table').textContent()).toContain('20–600 Hz');
    expect(await page.getByTestId('axis-convention').textContent()).toMatch(/positive axis/);
    await page.locator('.mac-heatmap .heatmaplayer, .mac-heatmap .hm').first().waitFor({ state: 'attached' });
    const macLabels = await page.locator('.mac-heatmap .xtick text').allTextContents();
    expect(macLabels[0]).toMatch(/^mode 1 \(53\.\d Hz\)$/);
    await page.locator('[data-testid="table-synthesis"][data-modes-used="4"] .synthesis-plot .scatterlayer').first().waitFor({ timeout: 20_000 });
    await waitForAnimation(page);
    await screenshot(page, 'modes-table-wide-1366');

    // Change the mode shown, play the animation and pause it.
    await page.getByRole('button', { name: /^2 · 14\d\.\d Hz$/ }).click();
    expect(await page.getByRole('button', { name: /^2 · / }).getAttribute('aria-pressed')).toBe('true');
    await page.getByRole('button', { name: 'Play' }).click();
    await page.getByRole('button', { name: 'Pause' }).click();

    expect(errors).toEqual([]);
    await close();
  }, 180_000);

  it('builds the table from two band fits, points out a mode found twice, and reads at tablet width', async () => {
    const { page, errors, close } = await signedIn('lead@demo.resonote.local');
    await page.goto(`${demo.app.baseUrl}/campaigns/${demo.campaign}/modes`);
    await tableRows(page).nth(3).waitFor({ timeout: 20_000 });
    // Empty the table (the wide fit keeps its modes).
    for (let left = 4; left > 0; left--) {
      await page.getByRole('button', { name: /^Remove mode 1 at/ }).click();
      // One removal at a time, each after the synthesis of the table as it then stands has loaded.
      if (left > 1) await page.locator(`[data-testid="table-synthesis"][data-modes-used="${left - 1}"] .synthesis-plot .scatterlayer`).first().waitFor({ timeout: 20_000 });
    }
    await expect(page.getByTestId('mode-table-empty')).toBeDefinedAndVisible();

    for (const [low, high] of [[20, 220], [220, 600]] as const) {
      await runFit(page, low, high);
      await page.getByTestId('suggest-modes').click();
      await page.getByTestId('chosen-poles').locator('tbody tr').nth(1).waitFor();
      await choiceSaved(page);
      await page.getByRole('button', { name: 'Compute shapes' }).click();
      await page.getByTestId('add-to-table').and(page.getByRole('button', { name: /^Add \d mode/ })).waitFor({ timeout: 30_000 });
      const before = await page.locator('[data-testid="mode-table"] tbody tr').count();
      await page.getByTestId('add-to-table').click();
      await page.waitForFunction((n) => document.querySelectorAll('[data-testid="mode-table"] tbody tr').length > n, before);
    }
    const fs = (await tableRows(page).evaluateAll((trs) => trs.map((tr) => Number(tr.getAttribute('data-fhz'))))).sort((a, b) => a - b);
    // Each handbook mode exactly once (docs/methods.md#free-free-beam, within 0.5 %).
    for (const f0 of HANDBOOK_HZ) expect(fs.filter((f) => Math.abs(f / f0 - 1) < 0.005), `${f0} Hz`).toHaveLength(1);
    const text = await page.getByTestId('mode-table').textContent();
    expect(text).toContain('20–220 Hz');
    expect(text).toContain('220–600 Hz');
    await page.locator('[data-testid="table-synthesis"] .synthesis-plot .scatterlayer').first().waitFor({ timeout: 20_000 });
    await waitForAnimation(page);
    await screenshot(page, 'modes-table-two-bands-1366');

    // Mode 2 again from the wide fit: pointed out as found twice, with the row that holds it.
    const wide = await page.locator('#fit-picker option', { hasText: /^20–600 Hz/ }).first().getAttribute('value');
    await page.locator('#fit-picker').selectOption(wide!);
    await page.getByTestId('fit-modes').locator('tr[data-fit-mode="4"]').waitFor({ timeout: 20_000 });
    for (const n of [1, 3, 4]) await page.getByTestId('fit-modes').locator(`tr[data-fit-mode="${n}"] input[type="checkbox"]`).uncheck();
    await page.getByTestId('add-to-table').click();
    await page.getByTestId('duplicate-flag').waitFor();
    expect(await page.getByTestId('duplicate-notes').textContent()).toMatch(/Same as the row at 14\d\.\d\d Hz .*MAC 0\.9\d\d|MAC 1\.000/);
    await screenshot(page, 'modes-table-duplicate-1366');
    expect(errors).toEqual([]);
    await close();

    const tablet = await signedIn('lead@demo.resonote.local', viewports.tablet);
    await tablet.page.goto(`${demo.app.baseUrl}/campaigns/${demo.campaign}/modes`);
    await tablet.page.getByTestId('mode-table').locator('tbody tr').nth(4).waitFor({ timeout: 20_000 });
    await tablet.page.locator('.stabilization-plot .scatterlayer').first().waitFor();
    await waitForAnimation(tablet.page);
    await tablet.page.locator('[data-testid="table-synthesis"] .synthesis-plot .scatterlayer').first().waitFor();
    // Nothing wider than the screen.
    expect(await tablet.page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(768);
    await screenshot(tablet.page, 'modes-table-768');
    expect(tablet.errors).toEqual([]);
    await tablet.close();
  }, 240_000);

  it('shows a viewer the mode table without any action controls', async () => {
    const { page, errors, close } = await signedIn('viewer@demo.resonote.local');
    await page.goto(`${demo.app.baseUrl}/campaigns/${demo.campaign}/modes`);
    await tableRows(page).nth(4).waitFor({ timeout: 20_000 });
    await page.locator('.stabilization-plot .scatterlayer').first().waitFor();
    await waitForAnimation(page);
    expect(await page.getByRole('button', { name: 'Run fit' }).count()).toBe(0);
    expect(await page.getByRole('button', { name: 'Compute shapes' }).count()).toBe(0);
    expect(await page.getByRole('button', { name: /Choose the stable poles/ }).count()).toBe(0);
    expect(await page.getByRole('button', { name: /Suggest modes/ }).count()).toBe(0);
    expect(await page.getByRole('button', { name: /Remove the pole/ }).count()).toBe(0);
    expect(await page.getByRole('button', { name: /Remove mode/ }).count()).toBe(0);
    expect(await page.getByTestId('add-to-table').count()).toBe(0);
    expect(await page.getByText('Fit settings').count()).toBe(0);
    await screenshot(page, 'modes-viewer-1366');
    expect(errors).toEqual([]);
    await close();
  });
});
