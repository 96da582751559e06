// Tap at the structure with a hammer in one hand: one screen at 1366×768, 768×1024 and 1024×768
// (the DOF, the verdict, Accept/Reject and the FRF with its coherence inside the viewport without
// scrolling; no message over a plot or a button), why a DOF is flagged on Tap, Review and
// Overview, the jump to any DOF by its label, redoing a DOF, and the question before leaving a
// DOF short of its hits. Measured with element bounding boxes.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import path from 'node:path';
import type { Locator, Page } from 'playwright-core';
import { SKID_CAMPAIGN } from '@resonote/api/seed';
import { startDemo, type DemoRun } from '../support/demo.ts';
import { screenshotDir, settled } from '../support/browser.ts';

let demo: DemoRun;
let skidId: string;
/** The laptop, the tablet upright and the tablet (or small laptop) on its side. */
const sizes = [
  { width: 1366, height: 768 },
  { width: 768, height: 1024 },
  { width: 1024, height: 768 },
];

interface Entry {
  id: string;
  status: string;
  excitationLabel: string;
  excitationDof: string;
  responseDof: string;
  acceptedHits: number;
  requiredHits: number;
  flagReasons: { code: string; message: string }[];
}

beforeAll(async () => {
  demo = await startDemo();
  skidId = await demo.campaignId(SKID_CAMPAIGN);
}, 240_000);
afterAll(async () => {
  await demo?.close();
});

const schedule = (page: Page) => page.evaluate(async (id) => ((await (await fetch(`/api/campaigns/${id}/schedule`)).json()) as { entries: Entry[] }).entries, skidId);

type Box = { x: number; y: number; width: number; height: number };
async function box(locator: Locator, name: string): Promise<Box> {
  const b = await locator.boundingBox();
  expect(b, `${name} is laid out`).not.toBeNull();
  return b!;
}
async function expectInViewport(page: Page, locator: Locator, name: string) {
  const b = await box(locator, name);
  const vp = page.viewportSize()!;
  const inside = b.x >= 0 && b.y >= 0 && b.x + b.width <= vp.width + 0.5 && b.y + b.height <= vp.height + 0.5;
  expect(inside, `${name} ${JSON.stringify(b)} inside ${vp.width}×${vp.height}`).toBe(true);
}
const overlaps = (a: Box, b: Box) => a.x < b.x + b.width && b.x < a.x + a.width && a.y < b.y + b.height && b.y < a.y + a.height;

/** The plot buttons (plotly's modebar) and the legend of every drawn plot on the page lie apart. */
async function expectButtonsClearOfLegend(page: Page, where: string) {
  const plots = await page.locator('.js-plotly-plot').evaluateAll((els) =>
    els.map((el) => {
      const rect = (q: string) => {
        const r = el.querySelector(q)?.getBoundingClientRect();
        return r && r.width > 0 && r.height > 0 ? { x: r.x, y: r.y, width: r.width, height: r.height } : null;
      };
      return { label: el.getAttribute('aria-label') ?? '', modebar: rect('.modebar'), legend: rect('.legend') };
    }),
  );
  const withBoth = plots.filter((p) => p.modebar && p.legend);
  expect(withBoth.length, `${where}: plots with a legend and buttons`).toBeGreaterThan(0);
  for (const p of withBoth) expect(overlaps(p.modebar!, p.legend!), `${where}: buttons ${JSON.stringify(p.modebar)} over the legend ${JSON.stringify(p.legend)} of “${p.label}”`).toBe(false);
}

async function viewportShot(page: Page, name: string) {
  await page.screenshot({ path: path.join(screenshotDir, `${name}.png`) });
}

async function settleTap(page: Page) {
  await page.locator('[data-testid="frf-plot"] .js-plotly-plot').or(page.getByText('No accepted hit yet, so no FRF')).first().waitFor({ timeout: 45_000 });
  await settled(page);
}

describe('Tap on one screen', () => {
  for (const viewport of sizes) {
    it(`keeps the DOF, the verdict, Accept/Reject and the FRF with coherence in view at ${viewport.width}×${viewport.height}, with the message bar clear of them`, async () => {
      const { page, errors, close } = await demo.signIn('engineer@demo.resonote.local', viewport);
      try {
        await page.goto(`${demo.app.baseUrl}/campaigns/${skidId}`);
        const flagged = (await schedule(page)).find((e) => e.status === 'flagged')!;
        expect(flagged).toBeDefined();
        await page.goto(`${demo.app.baseUrl}/campaigns/${skidId}/tap?entry=${flagged.id}`);
        await page.getByTestId('current-dof').waitFor({ timeout: 30_000 });
        await settleTap(page);

        // The cautions are shown in full the first time, then fold to one caution line.
        const safety = page.getByTestId('safety-note');
        expect(await safety.getAttribute('data-expanded')).toBe('true');
        expect(await safety.textContent()).toMatch(/Wear eye protection\..*Keep clear of rotating or energised machinery/);
        await viewportShot(page, `tap-one-screen-first-visit-${viewport.width}x${viewport.height}`);
        await page.getByTestId('safety-fold').click();
        expect(await safety.getAttribute('data-expanded')).toBe('false');
        expect(await safety.textContent()).toMatch(/Before you strike:\s*secure the structure and hammer, eye protection/);
        await settled(page);

        // Strike once with Space (a foot pedal or the front end's trigger; nothing scrolls): the
        // hit's message must land in the message bar, not over the screen.
        await page.keyboard.press('Space');
        await page.getByTestId('toast').waitFor({ timeout: 20_000 });
        await settleTap(page);
        expect(await page.evaluate(() => window.scrollY)).toBe(0);
        const checks: [Locator, string][] = [
          [page.getByTestId('current-dof'), 'the DOF'],
          [page.getByTestId('flag-reasons').first(), 'why it is flagged'],
          [page.getByTestId('verdict-panel'), 'the verdict'],
          [page.getByTestId('accept'), 'Accept'],
          [page.getByTestId('reject'), 'Reject'],
          [page.getByTestId('next-dof'), 'Next DOF'],
          [page.locator('[data-testid="frf-plot"] .js-plotly-plot'), 'the FRF plot'],
          [page.locator('[data-testid="frf-plot"] .g-y3title'), 'the coherence axis'],
          [safety, 'the caution line'],
        ];
        await viewportShot(page, `tap-one-screen-${viewport.width}x${viewport.height}`);
        for (const [locator, name] of checks) await expectInViewport(page, locator, name);
        const toast = await box(page.getByTestId('toast-bar'), 'the message bar');
        // The bar is the window's bottom edge: the one screen ends above it.
        for (const [locator, name] of checks) expect(overlaps(toast, await box(locator, name)), `the message bar over ${name}`).toBe(false);
        await expectButtonsClearOfLegend(page, `Tap at ${viewport.width}×${viewport.height}`);
        expect((await page.getByTestId('toast').textContent())!.length).toBeGreaterThan(10);

        // Folded is remembered for this user: after a reload the cautions stay one line.
        await page.reload();
        await page.getByTestId('current-dof').waitFor();
        expect(await page.getByTestId('safety-note').getAttribute('data-expanded')).toBe('false');
        expect(await page.getByTestId('fold-noise').getAttribute('data-open')).toBe('false');
        expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(viewport.width);

        // Review's FRF of the same DOF (titled, H1 and H2 in the legend): its buttons clear the legend too.
        await page.goto(`${demo.app.baseUrl}/campaigns/${skidId}/review?entry=${flagged.id}&view=dof`);
        await page.locator('[data-testid="dof-detail"] .js-plotly-plot .legend').first().waitFor({ timeout: 45_000 });
        await page.locator('[data-testid="dof-detail"] .js-plotly-plot').first().scrollIntoViewIfNeeded();
        await settled(page);
        await expectButtonsClearOfLegend(page, `Review at ${viewport.width}×${viewport.height}`);
        await viewportShot(page, `review-frf-legend-${viewport.width}x${viewport.height}`);
        expect(errors).toEqual([]);
      } finally {
        await close();
      }
    }, 150_000);
  }
});

describe('why a DOF is flagged, and moving freely', () => {
  for (const viewport of sizes) {
    const size = `${viewport.width}x${viewport.height}`;
    it(`shows the flag reason in words with numbers on Tap, Review and Overview at ${viewport.width}×${viewport.height}`, async () => {
      const { page, errors, close } = await demo.signIn('viewer@demo.resonote.local', viewport);
      try {
        await page.goto(`${demo.app.baseUrl}/campaigns/${skidId}`);
        const flagged = (await schedule(page)).find((e) => e.status === 'flagged')!;
        const words = /coherence 0\.\d\d mean over \d+–\d+ Hz, below 0\.\d\d/;
        expect(flagged.flagReasons[0]!.message).toMatch(words);

        const overview = page.locator(`[data-testid="flagged-list"] li[data-entry="${flagged.id}"]`);
        await overview.waitFor({ timeout: 20_000 });
        expect(await overview.textContent()).toMatch(words);
        expect(await overview.textContent()).toMatch(/Try: Re-hit nearer the point/);
        await settled(page);
        await viewportShot(page, `overview-flagged-${size}`);

        await page.goto(`${demo.app.baseUrl}/campaigns/${skidId}/review?entry=${flagged.id}`);
        const review = page.locator('[data-testid="dof-detail"] [data-testid="flag-reasons"]');
        await review.waitFor({ timeout: 20_000 });
        expect(await review.textContent()).toMatch(words);
        await review.scrollIntoViewIfNeeded();
        await settled(page);
        await viewportShot(page, `review-flagged-${size}`);

        await page.goto(`${demo.app.baseUrl}/campaigns/${skidId}/tap?entry=${flagged.id}`);
        const tap = page.locator('[data-testid="dof-bar"] [data-testid="flag-reasons"]');
        await tap.waitFor({ timeout: 20_000 });
        expect(await tap.textContent()).toMatch(words);
        await expectInViewport(page, tap, 'why it is flagged on Tap');
        // Elsewhere on Tap the flagged DOF is named, so Tap never moves on from it in silence.
        const other = (await schedule(page)).find((e) => e.status !== 'flagged')!;
        await page.goto(`${demo.app.baseUrl}/campaigns/${skidId}/tap?entry=${other.id}`);
        await expect(page.getByTestId('other-flagged').getByText(`${flagged.excitationDof} → ${flagged.responseDof}`)).toBeDefinedAndVisible();
        expect(errors).toEqual([]);
      } finally {
        await close();
      }
    }, 120_000);
  }

  it('jumps to a DOF by its label, asks before leaving one short of its hits, and redoes a DOF keeping the old hits', async () => {
    const { page, errors, close } = await demo.signIn('engineer@demo.resonote.local', { width: 1024, height: 768 });
    try {
      await page.goto(`${demo.app.baseUrl}/campaigns/${skidId}`);
      const entries = await schedule(page);
      const open = entries.filter((e) => e.status === 'planned');
      expect(open.length).toBeGreaterThanOrEqual(2);
      const [start, target] = [open[0]!, open[open.length - 1]!];
      await page.goto(`${demo.app.baseUrl}/campaigns/${skidId}/tap?entry=${start.id}`);
      await page.getByTestId('current-dof').waitFor({ timeout: 30_000 });
      await page.getByTestId('safety-fold').click();

      // One hit, so the DOF is started and short of its hits.
      await page.getByTestId('strike').click();
      await page.locator('[data-testid="hit-list"] tbody tr').first().waitFor({ timeout: 20_000 });
      await page.getByTestId('strike').and(page.locator(':not([disabled])')).waitFor();

      // Jump by search: the target's point label finds it.
      const search = page.getByLabel('Jump to a DOF');
      await search.fill(target.excitationLabel);
      const option = page.locator(`#dof-jump-list [role="option"][data-entry="${target.id}"]`);
      await option.waitFor();
      await option.click();
      // The question first; staying keeps the DOF.
      const question = page.getByTestId('leave-short-dialog');
      await question.waitFor();
      expect(await question.textContent()).toMatch(/Leave .+ short of its hits\?.*This DOF has \d of 5 good hits/);
      await settled(page);
      await viewportShot(page, 'tap-leave-short-1024x768');
      await page.getByTestId('leave-stay').click();
      await question.waitFor({ state: 'detached' });
      expect(new URL(page.url()).searchParams.get('entry')).toBe(start.id);

      // Redo: the hit is set aside with the reason, the count starts again.
      await page.getByTestId('redo-dof').click();
      const redo = page.getByTestId('redo-dialog');
      await redo.waitFor();
      expect(await page.getByTestId('redo-confirm').isDisabled()).toBe(true);
      await page.getByTestId('redo-reason').fill('accelerometer wax had let go');
      await page.getByTestId('redo-confirm').click();
      await redo.waitFor({ state: 'detached' });
      await expect(page.getByTestId('set-aside')).toHaveTextEventually(/set aside by a redo \(Emil Engineer, .+\): “accelerometer wax had let go”\. Kept, not counted\./);
      await expect(page.getByTestId('good-hits')).toHaveTextEventually(/^0 of 5 good hits/);
      expect(await page.locator('[data-testid="hit-list"] tbody tr').count()).toBe(0);

      // With nothing started, the jump goes straight there.
      await search.fill(target.excitationLabel);
      await page.keyboard.press('Enter');
      await page.waitForURL((u) => u.searchParams.get('entry') === target.id);
      await expect(page.getByTestId('current-dof')).toHaveTextEventually(`Hammer at ${target.excitationLabel} `);
      expect(errors).toEqual([]);
    } finally {
      await close();
    }
  }, 120_000);
});
