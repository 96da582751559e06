// Tap and the kit and the team around it, at 1366×768, 768×1024 and 1024×768: the tip choice lists
// the hammer's registered tips (and says so when there are none), the chosen tip is recorded with
// the hit; the FRF plot's three row titles stay apart when the plot is short; notes per DOF are
// edited and deleted in the notes panel, and on Review by their author or a lead (a viewer only
// reads), and their photos are listed as small thumbnails; an archived campaign's Tap offers no
// recording and says why in words.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Locator, Page } from 'playwright-core';
import { BAR_CAMPAIGN, SKID_CAMPAIGN } from '@resonote/api/seed';
import { startDemo, type DemoRun } from '../support/demo.ts';
import path from 'node:path';
import { screenshot, screenshotDir, settled } from '../support/browser.ts';
import { platePng } from '../support/photo.ts';

let demo: DemoRun;
let skidId: string;
let barId: string;

beforeAll(async () => {
  demo = await startDemo();
  skidId = await demo.campaignId(SKID_CAMPAIGN);
  barId = await demo.campaignId(BAR_CAMPAIGN);
}, 240_000);
afterAll(async () => {
  await demo?.close();
});

const viewports = [
  { width: 1366, height: 768 },
  { width: 768, height: 1024 },
  { width: 1024, height: 768 },
];
type Box = { x: number; y: number; width: number; height: number };
const overlaps = (a: Box, b: Box) => a.x < b.x + b.width && b.x < a.x + a.width && a.y < b.y + b.height && b.y < a.y + a.height;
async function box(locator: Locator, name: string): Promise<Box> {
  const b = await locator.boundingBox();
  expect(b, `${name} is laid out`).not.toBeNull();
  return b!;
}
const getJson = <T>(page: Page, url: string) => page.evaluate(async (u) => (await (await fetch(u)).json()) as unknown, url) as Promise<T>;
const sendJson = (page: Page, url: string, method: string, body: unknown) =>
  page.evaluate(async ([u, m, b]) => (await fetch(u as string, { method: m as string, headers: { 'content-type': 'application/json' }, body: JSON.stringify(b) })).status, [url, method, body] as const);

async function openTap(page: Page, campaignId: string) {
  await page.goto(`${demo.app.baseUrl}/campaigns/${campaignId}/tap`);
  await page.waitForURL(/\/tap\?entry=/);
  await page.getByTestId('current-dof').waitFor({ timeout: 30_000 });
}

describe('Tap with the kit’s hammer tips', () => {
  for (const viewport of viewports) {
    it(`offers the skid hammer’s registered tips, records the chosen one with the hit, and keeps the FRF row titles apart at ${viewport.width}×${viewport.height}`, async () => {
      const { page, errors, close } = await demo.signIn('engineer@demo.resonote.local', viewport);
      try {
        await openTap(page, skidId);
        const select = page.getByLabel('Hammer tip');
        await select.waitFor();
        // The seed registers the skid hammer IH-05 with the tips "soft (rubber)" and "medium (plastic)".
        await page.locator('[data-testid="tip-select"][data-registered="true"]').waitFor();
        expect(await select.locator('option').allTextContents()).toEqual(['soft (rubber)', 'medium (plastic)']);
        await select.selectOption('tip:medium (plastic)');
        // contracts rigHardnessOf: "medium" in the name wins (common practice: plastic tips are medium).
        expect(await page.getByTestId('tip-as-rig').textContent()).toBe('Tips registered in Kit for Impact hammer IH-05 (demo) H-2203; the simulated rig strikes with its medium tip for this one.');
        // Fold the cautions (read once) so the plot gets the height it has at work.
        await page.getByTestId('safety-fold').click();
        const entryId = new URL(page.url()).searchParams.get('entry')!;
        const before = (await getJson<{ hits: { id: string }[] }>(page, `/api/campaigns/${skidId}/schedule/${entryId}/hits`)).hits.map((h) => h.id);
        // The rig strikes with the API's default chances of a double hit (0.1) and an overload
        // (0.03), as at a structure: strike again until one hit is accepted, so the FRF is drawn.
        type Hits = { hits: { id: string; verdict: string }[] };
        const hitsNow = async () => (await getJson<Hits>(page, `/api/campaigns/${skidId}/schedule/${entryId}/hits`)).hits.filter((h) => !before.includes(h.id));
        let after: Hits['hits'] = [];
        for (let strike = 1; strike <= 6 && !after.some((h) => h.verdict === 'accept'); strike++) {
          await page.getByTestId('strike').click();
          await expect.poll(async () => (after = await hitsNow()).length, { timeout: 20_000 }).toBe(strike);
          await page.getByTestId('strike').and(page.locator(':enabled')).waitFor({ timeout: 20_000 });
        }
        expect(after.some((h) => h.verdict === 'accept'), JSON.stringify(after)).toBe(true);
        const detail = await getJson<{ hit: { source: string } }>(page, `/api/campaigns/${skidId}/hits/${after[0]!.id}`);
        expect(detail.hit.source).toMatch(/:tip=medium:tip-name=medium%20\(plastic\)$/);

        // The plot's row titles (magnitude, phase, coherence) and the one frequency title do not overlap.
        await page.locator('[data-testid="frf-plot"] .g-y3title').waitFor({ timeout: 30_000 });
        await settled(page);
        const titles = await Promise.all(['.g-ytitle', '.g-y2title', '.g-y3title', '.g-xtitle'].map((c) => box(page.locator(`[data-testid="frf-plot"] ${c}`).first(), c)));
        for (let i = 0; i < titles.length; i++) for (let j = i + 1; j < titles.length; j++) expect(overlaps(titles[i]!, titles[j]!), `axis titles ${i} and ${j} overlap`).toBe(false);
        const plotHeight = (await box(page.locator('[data-testid="frf-plot"] .js-plotly-plot'), 'the plot')).height;
        if (plotHeight < 320) expect(await page.locator('[data-testid="frf-plot"] .g-ytitle').textContent()).toBe('|H| dB');
        await screenshot(page, `tap-tips-${viewport.width}x${viewport.height}`);
        await page.screenshot({ path: path.join(screenshotDir, `tap-tips-window-${viewport.width}x${viewport.height}.png`) });
        expect(errors).toEqual([]);
      } finally {
        await close();
      }
    }, 120_000);
  }

  it('says so when the hammer has no registered tips and offers the rig’s soft, medium and hard instead', async () => {
    const lead = await demo.signIn('lead@demo.resonote.local', { width: 1024, height: 768 });
    try {
      await lead.page.goto(`${demo.app.baseUrl}/campaigns/${barId}`);
      const kit = await getJson<{ items: { id: string; kind: string; version: number }[] }>(lead.page, `/api/campaigns/${barId}/kit`);
      const hammer = kit.items.find((i) => i.kind === 'hammer')!;
      expect(await sendJson(lead.page, `/api/campaigns/${barId}/kit/${hammer.id}`, 'PATCH', { version: hammer.version, tips: [] })).toBe(200);
      // The demo measured the whole bar: open its first entry (Tap offers no next one).
      const { entries } = await getJson<{ entries: { id: string }[] }>(lead.page, `/api/campaigns/${barId}/schedule`);
      await lead.page.goto(`${demo.app.baseUrl}/campaigns/${barId}/tap?entry=${entries[0]!.id}`);
      await lead.page.locator('[data-testid="tip-select"][data-registered="false"]').waitFor();
      expect(await lead.page.getByLabel('Hammer tip').locator('option').allTextContents()).toEqual(['Soft — long pulse, low band', 'Medium', 'Hard — short pulse, wide band']);
      expect(await lead.page.getByTestId('tip-fallback').textContent()).toBe("The hammer Impact hammer IH-02 (demo) H-1187 has no tips registered in Kit, so the rig's own soft, medium and hard tips are offered. A lead adds the hammer's tips in Kit.");
      await settled(lead.page);
      await screenshot(lead.page, 'tap-tips-none-registered-1024x768');
      expect(lead.errors).toEqual([]);
    } finally {
      await lead.close();
    }
  }, 120_000);
});

describe('notes per DOF on Tap', () => {
  for (const viewport of viewports) {
    it(`lists a photo as its small thumbnail, and lets the author edit and delete the note at ${viewport.width}×${viewport.height}`, async () => {
      const { page, errors, close } = await demo.signIn('engineer@demo.resonote.local', viewport);
      try {
        await openTap(page, skidId);
        await settled(page);
        await page.getByTestId('notes-button').click();
        const panel = page.getByTestId('notes-panel');
        await panel.waitFor();
        const text = `Accelerometer on wax at ${viewport.width}×${viewport.height}.`;
        await panel.getByLabel('Note', { exact: true }).fill(text);
        // A 1200 × 900 photo: the list shows a thumbnail of 320 × 240 (photo-thumbnail.ts, 320 px on the longer side).
        await panel.getByTestId('note-photo-input').setInputFiles({ name: 'mount.png', mimeType: 'image/png', buffer: platePng(1200, 900) });
        await panel.getByTestId('note-save').click();
        const note = panel.getByTestId('note').filter({ hasText: text });
        await note.waitFor();
        await page.waitForFunction((t) => {
          const li = Array.from(document.querySelectorAll('[data-testid="note"]')).find((n) => n.textContent?.includes(t as string));
          const img = li?.querySelector('img') as HTMLImageElement | null;
          return Boolean(img && img.complete && img.naturalWidth === 320 && img.naturalHeight === 240 && img.src.endsWith('/thumbnail'));
        }, text);
        await settled(page);
        await screenshot(page, `tap-notes-thumbnail-${viewport.width}x${viewport.height}`);

        await note.getByTestId('note-edit').click();
        await note.getByTestId('note-edit-text').fill(`${text} Re-seated after hit 2.`);
        await note.getByTestId('note-edit-save').click();
        await note.getByTestId('note-edited').waitFor();
        await expect(note).toHaveTextEventually(/Re-seated after hit 2\./);
        await settled(page);
        await screenshot(page, `tap-notes-edited-${viewport.width}x${viewport.height}`);

        await note.getByTestId('note-delete').click();
        await note.getByTestId('note-delete-confirm').waitFor();
        await settled(page);
        await screenshot(page, `tap-notes-delete-question-${viewport.width}x${viewport.height}`);
        await note.getByTestId('note-delete-confirm').click();
        await note.waitFor({ state: 'detached' });
        expect(errors).toEqual([]);
      } finally {
        await close();
      }
    }, 120_000);
  }
});

describe('notes per DOF on Review', () => {
  for (const viewport of viewports) {
    it(`lets the author edit and a lead delete a note on Review, with the same controls as Tap, and a viewer only read it, at ${viewport.width}×${viewport.height}`, async () => {
      const size = `${viewport.width}x${viewport.height}`;
      const text = `Review note at ${size}: sensor cable taped down.`;
      const engineer = await demo.signIn('engineer@demo.resonote.local', viewport);
      const signedIn = [engineer];
      try {
        const { page } = engineer;
        await page.goto(`${demo.app.baseUrl}/campaigns/${skidId}`);
        const { entries } = await getJson<{ entries: { id: string; acceptedHits: number }[] }>(page, `/api/campaigns/${skidId}/schedule`);
        const entry = entries.find((e) => e.acceptedHits > 0)!;
        expect(entry).toBeDefined();
        // The note is left as Tap leaves it (multipart, with an Idempotency-Key).
        const status = await page.evaluate(
          async ([url, t, key]) => {
            const form = new FormData();
            form.set('topic', 'sensor-mounting');
            form.set('text', t as string);
            return (await fetch(url as string, { method: 'POST', headers: { 'Idempotency-Key': key as string }, body: form })).status;
          },
          [`/api/campaigns/${skidId}/schedule/${entry.id}/notes`, text, `review-note-${size}`] as const,
        );
        expect(status).toBe(201);
        const review = `${demo.app.baseUrl}/campaigns/${skidId}/review?entry=${entry.id}&view=dof`;
        const noteIn = (p: Page) => p.getByTestId('review-notes').getByTestId('note').filter({ hasText: `Review note at ${size}` });

        // The author edits it on Review.
        await page.goto(review);
        const mine = noteIn(page);
        await mine.waitFor({ timeout: 30_000 });
        await mine.getByTestId('note-edit').click();
        await mine.getByTestId('note-edit-text').fill(`${text} Checked again after the redo.`);
        await mine.getByTestId('note-edit-save').click();
        await mine.getByTestId('note-edited').waitFor();
        await expect(mine).toHaveTextEventually(/Checked again after the redo\./);
        await mine.scrollIntoViewIfNeeded();
        await settled(page);
        expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(viewport.width);
        await screenshot(page, `review-notes-edited-${size}`);
        expect(engineer.errors).toEqual([]);

        // A viewer reads it without Edit or Delete.
        const viewer = await demo.signIn('viewer@demo.resonote.local', viewport);
        signedIn.push(viewer);
        await viewer.page.goto(review);
        await expect(noteIn(viewer.page)).toHaveTextEventually(/Checked again after the redo\./);
        expect(await noteIn(viewer.page).getByTestId('note-edit').count()).toBe(0);
        expect(await noteIn(viewer.page).getByTestId('note-delete').count()).toBe(0);
        expect(viewer.errors).toEqual([]);

        // A lead deletes the engineer's note there, after the question.
        const lead = await demo.signIn('lead@demo.resonote.local', viewport);
        signedIn.push(lead);
        await lead.page.goto(review);
        const theirs = noteIn(lead.page);
        await theirs.waitFor({ timeout: 30_000 });
        await theirs.getByTestId('note-delete').click();
        await theirs.getByTestId('note-delete-confirm').waitFor();
        await theirs.scrollIntoViewIfNeeded();
        await settled(lead.page);
        await screenshot(lead.page, `review-notes-delete-question-${size}`);
        await theirs.getByTestId('note-delete-confirm').click();
        await theirs.waitFor({ state: 'detached' });
        const left = await getJson<{ notes: { text: string }[] }>(lead.page, `/api/campaigns/${skidId}/notes?entryId=${entry.id}`);
        expect(left.notes.filter((n) => n.text.includes(`Review note at ${size}`))).toEqual([]);
        expect(lead.errors).toEqual([]);
      } finally {
        for (const s of signedIn) await s.close();
      }
    }, 150_000);
  }
});

describe('Tap on an archived campaign', () => {
  it('offers no recording, verdicts or arming, and says in words that the campaign is read-only, at every size', async () => {
    const lead = await demo.signIn('lead@demo.resonote.local');
    try {
      await lead.page.goto(`${demo.app.baseUrl}/campaigns/${barId}`);
      const { campaign } = await getJson<{ campaign: { version: number } }>(lead.page, `/api/campaigns/${barId}`);
      expect(await sendJson(lead.page, `/api/campaigns/${barId}/archive`, 'POST', { version: campaign.version, reason: 'Bar checked, test over' })).toBe(200);
    } finally {
      await lead.close();
    }
    for (const viewport of viewports) {
      const { page, errors, close } = await demo.signIn('engineer@demo.resonote.local', viewport);
      try {
        await page.goto(`${demo.app.baseUrl}/campaigns/${barId}`);
        // An entry with hits (the demo recorded the bar), so there would be verdicts to judge.
        const { entries } = await getJson<{ entries: { id: string; acceptedHits: number }[] }>(page, `/api/campaigns/${barId}/schedule`);
        const withHits = entries.find((e) => e.acceptedHits > 0)!;
        await page.goto(`${demo.app.baseUrl}/campaigns/${barId}/tap?entry=${withHits.id}`);
        const words = page.getByTestId('tap-archived');
        await words.waitFor({ timeout: 30_000 });
        await page.getByTestId('verdict-panel').waitFor();
        expect(await words.textContent()).toMatch(/^Archived on .+: read-only\. Its hits and FRFs can be read; nothing is recorded or judged here\. A lead can un-archive it on the Plan tab\.$/);
        expect(await page.getByTestId('safety-note').count()).toBe(0);
        for (const id of ['strike', 'accept', 'reject', 'redo-dof', 'tip-select']) expect(await page.getByTestId(id).count(), id).toBe(0);
        expect(await page.getByRole('tab', { name: 'Upload recording' }).count()).toBe(0);
        expect(await page.getByRole('tab', { name: 'Live input' }).count()).toBe(0);
        expect(await page.getByRole('button', { name: /^Arm / }).count()).toBe(0);
        // Tap's compact header carries the state too, beside the campaign's name.
        expect(await page.getByTestId('tap-archived-badge').textContent()).toBe('Archived · read-only');
        await settled(page);
        await screenshot(page, `tap-archived-${viewport.width}x${viewport.height}`);
        expect(errors).toEqual([]);
      } finally {
        await close();
      }
    }
  }, 180_000);
});
