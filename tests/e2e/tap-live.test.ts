// Tap's live input in the real browser: Chromium's fake capture device plays a WAV the simulator
// wrote (tests/support/live-wav.ts: the free-free steel bar struck at B01:+Z, force on input 1,
// the B21:+Z accelerometer on input 2, scaled to digital units by the channels' volts at full
// scale) as if an audio interface delivered it. The engineer arms Tap; hits arrive by themselves
// through the AudioWorklet's trigger, go to the DOF on screen with their own keys, and get the
// verdicts the simulator built in (a double hit, a clipped hit). Chromium's fake device runs at
// 44.1 kHz and plays a file's samples at that rate without resampling them (a 48 kHz file would
// come out slowed by 44.1/48, every mode 8 % low), so the simulator writes the file at 44.1 kHz.
// Whatever Chromium does to the file, it does to both channels alike, so the FRF (their ratio)
// holds. The campaign runs at 48 kHz and allows resampling of uploads: the server brings each hit
// from the device's 44.1 kHz to 48 kHz, and the FRF says so.
// Chromium loops the file: the test stops after one pass ("Stop after" on the panel).
// Second case: the upload route answers 503 or not at all for a while mid-capture; every hit waits
// on the device, is counted on screen, and is stored exactly once, in order.
import fs from 'node:fs';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { asc, eq } from 'drizzle-orm';
import type { Browser, Page } from 'playwright-core';
import { modelFrf, steelBar } from '@resonote/sim';
import { hit } from '@resonote/db/schema';
import { startTestApp, type TestApp } from '../support/app.ts';
import { PASSWORD } from '../support/accounts.ts';
import type { Person } from '../support/campaign.ts';
import type { RigCampaign } from '../support/rig.ts';
import { liveCampaign } from '../support/live-campaign.ts';
import { fakeAudioInput, launchBrowser, screenshot, screenshotDir, settled, viewports, watchConsole } from '../support/browser.ts';
import { LIVE_FS, LIVE_HITS, liveBarWav } from '../support/live-wav.ts';

let app: TestApp & { baseUrl: string };
let browser: Browser;
let engineer: Person;
let rig: RigCampaign;
const bar = steelBar();

beforeAll(async () => {
  app = await startTestApp('resonote_tpl_e2e', process.env.RESONOTE_WEB_DIST ? { WEB_DIST: process.env.RESONOTE_WEB_DIST } : {}, { listen: true });
  ({ engineer, rig } = await liveCampaign(app));
  const wavPath = path.join(screenshotDir, '..', 'live', 'bar-b01-44k1.wav');
  fs.mkdirSync(path.dirname(wavPath), { recursive: true });
  fs.writeFileSync(wavPath, liveBarWav('B01:+Z').wav);
  browser = await launchBrowser(fakeAudioInput(wavPath));
}, 240_000);
afterAll(async () => {
  await browser?.close();
  await app?.close();
});

async function signIn(viewport: { width: number; height: number }): Promise<{ page: Page; errors: string[]; close: () => Promise<void> }> {
  const context = await browser.newContext({ viewport, hasTouch: viewport.width < 1100 });
  const page = await context.newPage();
  const errors = watchConsole(page);
  await page.goto(`${app.baseUrl}/sign-in`);
  await page.getByLabel('E-mail').fill(engineer.email);
  await page.getByLabel('Password').fill(PASSWORD);
  await page.getByRole('button', { name: 'Sign in' }).click();
  await page.waitForURL(/\/campaigns$/);
  return { page, errors, close: () => context.close() };
}

/** What a person sees without scrolling (the full-page shots show the rest). */
async function viewShot(page: Page, name: string) {
  fs.mkdirSync(screenshotDir, { recursive: true });
  await page.evaluate(() => window.scrollTo(0, 0));
  await page.screenshot({ path: path.join(screenshotDir, `${name}.png`) });
}

const entryOf = (dof: string) => rig.entries.find((e) => e.excitationDof === dof)!;
const stored = (page: Page) => page.locator('[data-testid="live-capture"][data-state="stored"]');

async function openLive(page: Page, dof: string, stopAfter: number) {
  await page.goto(`${app.baseUrl}/campaigns/${rig.campaignId}/tap?entry=${entryOf(dof).id}`);
  await page.getByTestId('current-dof').waitFor({ timeout: 30_000 });
  // The geometry view draws in WebGL (software-rendered here): let the page settle before the click.
  await settled(page);
  await page.getByRole('tab', { name: 'Live input' }).click({ timeout: 60_000 });
  const panel = page.getByTestId('live-panel');
  await panel.or(page.getByText(/could not be loaded/)).first().waitFor({ timeout: 30_000 });
  expect(await panel.count(), (await page.getByRole('tabpanel', { name: 'Live input' }).textContent()) ?? '').toBe(1);
  await page.getByTestId('live-stop-after').fill(String(stopAfter));
  await page.getByTestId('live-start').click();
  await page.locator('[data-testid="live-panel"][data-engine="armed"]').waitFor({ timeout: 20_000 });
}

describe('Tap with the live input', () => {
  it('captures hits from the interface by itself, gives the simulator’s verdicts, keeps force and response aligned, and says the FRF was resampled', { timeout: 240_000 }, async () => {
    const { page, errors, close } = await signIn(viewports.laptop);
    try {
      await openLive(page, 'B01:+Z', LIVE_HITS.length);
      await expect(page.getByTestId('live-instrument-note')).toBeDefinedAndVisible();
      expect(await page.getByTestId('live-instrument-note').textContent()).toMatch(/not a calibrated measurement instrument.*unless its scaling has been checked/);
      await expect(page.getByTestId('live-panel').getByTestId('safety-note')).toBeDefinedAndVisible();
      const info = (await page.getByTestId('live-device-info').textContent())!;
      const rate = Number(/(\d+) Hz/.exec(info)![1]);
      expect(info).toMatch(/\d+ Hz, 2 channels/);
      if (rate !== LIVE_FS) expect(await page.getByTestId('live-rate-differs').textContent()).toMatch(new RegExp(`runs at ${rate} Hz.*ask for ${LIVE_FS} Hz.*resampled to the settings’ rate on the server`));
      // The band starts at 10 Hz, above the 3 Hz low cut-off entered in Kit: no warning.
      expect(await page.getByTestId('live-low-cut').count()).toBe(0);
      await page.getByTestId('live-meter').first().waitFor();
      // The live input arms its DOF, so everyone on the campaign sees who captures where.
      await page.getByLabel('Armed DOFs').getByText(/Eric Engineer: B01:\+Z → B21:\+Z/).waitFor({ timeout: 15_000 });
      expect(await page.getByTestId('live-state-word').textContent()).toMatch(/^(armed|recording)$/);
      await settled(page);
      await screenshot(page, 'tap-live-armed-1366');
      await viewShot(page, 'tap-live-armed-1366-view');

      await stored(page).nth(LIVE_HITS.length - 1).waitFor({ timeout: 200_000 });
      // The panel stopped by itself after one pass of the looping file.
      await page.locator('[data-testid="live-panel"][data-engine="off"]').waitFor();
      expect(await page.getByTestId('live-pending').getAttribute('data-count')).toBe('0');
      const verdicts = (await page.getByTestId('live-capture').evaluateAll((els) => els.map((e) => e.getAttribute('data-verdict')))).reverse();
      // What the simulator put in (support/live-wav.ts): clean → accept, double → reject, clipped → reject.
      expect(verdicts).toEqual(LIVE_HITS.map((k) => (k === 'clean' ? 'accept' : 'reject')));
      await page.locator('[data-testid="frf-plot"] .js-plotly-plot').waitFor({ timeout: 30_000 });
      await settled(page);
      await screenshot(page, 'tap-live-stored-1366');

      const entry = entryOf('B01:+Z');
      const hits = (await engineer.agent.get(`/api/campaigns/${rig.campaignId}/schedule/${entry.id}/hits`)).body.hits as { verdict: string; reasons: { code: string }[] }[];
      expect(hits).toHaveLength(LIVE_HITS.length);
      expect(hits[1]!.reasons.map((r) => r.code)).toContain('double-hit');
      expect(hits[3]!.reasons.map((r) => r.code)).toContain('overload');
      const rows = await app.handle.database.db.select({ key: hit.idempotencyKey, source: hit.source, fs: hit.sampleRateHz }).from(hit).where(eq(hit.scheduleEntryId, entry.id)).orderBy(asc(hit.sequence));
      expect(new Set(rows.map((r) => r.key)).size).toBe(LIVE_HITS.length);
      for (const r of rows) expect(r.fs).toBe(LIVE_FS);

      // Force and response stay aligned through the interface path: in the simulator's hits the
      // response first reaches 10 % of its peak within 3 ms of the force peak (support/live-wav.ts:
      // a 1 ms pulse on a bar whose response rises within the pulse).
      const raw = await app.handle.database.db.select({ samples: hit.samples, n: hit.samplesPerChannel, fs: hit.sampleRateHz, verdict: hit.verdict }).from(hit).where(eq(hit.scheduleEntryId, entry.id)).orderBy(asc(hit.sequence));
      const lagsMs = raw.map((r) => {
        const all = new Float32Array(Uint8Array.from(r.samples).buffer);
        const force = all.subarray(0, r.n);
        const resp = all.subarray(r.n, 2 * r.n);
        let fPeak = 0;
        for (let i = 1; i < r.n; i++) if (force[i]! > force[fPeak]!) fPeak = i;
        let aMax = 0;
        for (let i = 0; i < r.n; i++) aMax = Math.max(aMax, Math.abs(resp[i]!));
        let onset = 0;
        while (Math.abs(resp[onset]!) < 0.1 * aMax) onset += 1;
        return ((onset - fPeak) / r.fs) * 1000;
      });
      for (const lag of lagsMs) expect(Math.abs(lag), `response onset − force peak per hit (ms): ${lagsMs.map((l) => l.toFixed(2)).join(', ')}`).toBeLessThan(3);

      expect(errors.filter((e) => !/status of 404/.test(e)), JSON.stringify(errors)).toEqual([]);
    } finally {
      await close();
    }
  });

  it('keeps hits on the device while the server is away, counts them on screen, and stores each once in capture order', { timeout: 240_000 }, async () => {
    const { page, errors, close } = await signIn(viewports.tablet);
    let down = false;
    let refusals = 0;
    const sentKeys: string[] = [];
    await page.route('**/schedule/*/hits', async (route) => {
      if (route.request().method() !== 'POST') return route.continue();
      sentKeys.push(route.request().headers()['idempotency-key'] ?? '');
      if (!down) return route.continue();
      refusals += 1;
      // Alternately the answer of a server whose database restarts, and no answer at all.
      if (refusals % 2 === 1) return route.fulfill({ status: 503, headers: { 'retry-after': '1', 'content-type': 'application/json' }, body: JSON.stringify({ error: { code: 'database-unavailable', message: 'The database cannot be reached at the moment (it may be restarting).' } }) });
      return route.abort('connectionrefused');
    });
    const count = 4;
    try {
      await openLive(page, 'B11:+Z', count);
      await stored(page).first().waitFor({ timeout: 60_000 });
      down = true;
      await page.locator('[data-testid="live-pending"][data-count="2"]').waitFor({ timeout: 60_000 });
      expect(await page.getByTestId('live-pending').textContent()).toMatch(/2 hits waiting to be sent.*kept on this device, sent in order/);
      await settled(page);
      await screenshot(page, 'tap-live-waiting-768');
      await viewShot(page, 'tap-live-waiting-768-view');
      down = false;
      await stored(page).nth(count - 1).waitFor({ timeout: 120_000 });
      await page.locator('[data-testid="live-pending"][data-count="0"]').waitFor();
      expect(refusals).toBeGreaterThan(0);

      const rows = await app.handle.database.db.select({ key: hit.idempotencyKey, sequence: hit.sequence }).from(hit).where(eq(hit.scheduleEntryId, entryOf('B11:+Z').id)).orderBy(asc(hit.sequence));
      expect(rows).toHaveLength(count);
      expect(new Set(rows.map((r) => r.key)).size).toBe(count);
      // Capture order is send order: the stored sequence follows the first try of each key.
      const firstTries = [...new Set(sentKeys)];
      expect(rows.map((r) => r.key)).toEqual(firstTries);
      expect(errors.filter((e) => !/status of (503|404)|net::ERR_CONNECTION_REFUSED/.test(e)), JSON.stringify(errors)).toEqual([]);
    } finally {
      await close();
    }
  });
});
