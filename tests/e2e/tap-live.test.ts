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
import { auditEvent, hit, sensitivityCheck } from '@resonote/db/schema';
import { encodeWav } from '@resonote/api/recording';
import { startTestApp, type TestApp } from '../support/app.ts';
import { PASSWORD } from '../support/accounts.ts';
import type { Person } from '../support/campaign.ts';
import type { RigCampaign } from '../support/rig.ts';
import { liveCampaign } from '../support/live-campaign.ts';
import { fakeAudioInput, launchBrowser, screenshot, screenshotDir, settled, viewports, watchConsole } from '../support/browser.ts';
import { FAKE_DEVICE_FS, LIVE_FS, LIVE_HITS, LIVE_KIT, LIVE_LEAD_IN_S, LIVE_SPACING_S, liveBarWav } from '../support/live-wav.ts';

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

/** The engineer signed in, in a new context of `from` (the file's browser unless another device is asked for). */
async function signIn(
  viewport: { width: number; height: number },
  { from = browser, touch = viewport.width < 1100, init }: { from?: Browser; touch?: boolean; init?: () => void } = {},
): Promise<{ page: Page; errors: string[]; close: () => Promise<void> }> {
  const context = await from.newContext({ viewport, hasTouch: touch });
  if (init) await context.addInitScript(init);
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

/** The engineer has read the cautions once: they fold to their one-line header (never hidden). */
async function foldCautions(page: Page) {
  const fold = page.getByTestId('safety-fold').first();
  if (await fold.count()) await fold.click();
  await page.locator('[data-testid="safety-note"][data-expanded="false"]').first().waitFor();
}

const entryOf = (dof: string) => rig.entries.find((e) => e.excitationDof === dof)!;
const stored = (page: Page) => page.locator('[data-testid="live-capture"][data-state="stored"]');

async function openLive(page: Page, dof: string, stopAfter: number) {
  await page.goto(`${app.baseUrl}/campaigns/${rig.campaignId}/tap?entry=${entryOf(dof).id}`);
  await page.getByTestId('current-dof').waitFor({ timeout: 30_000 });
  // The geometry view draws in WebGL (software-rendered here): let the page settle before the click.
  await settled(page);
  await foldCautions(page);
  await page.getByRole('tab', { name: 'Live input' }).click({ timeout: 60_000 });
  const panel = page.getByTestId('live-panel');
  await panel.or(page.getByText(/could not be loaded/)).first().waitFor({ timeout: 30_000 });
  expect(await panel.count(), (await page.getByRole('tabpanel', { name: 'Live input' }).textContent()) ?? '').toBe(1);
  await page.getByTestId('live-stop-after').fill(String(stopAfter));
  await page.getByTestId('live-start').click();
  await page.locator('[data-testid="live-panel"][data-engine="armed"]').waitFor({ timeout: 20_000 });
}

// Tap's one screen while capturing, first in the file so no other DOF is flagged yet (a flagged DOF
// adds a line to the DOF bar). Its own fake device plays clean hits only, so the verdict on screen
// is always an accepted hit's ("All checks passed…"), whichever hit is the latest; they come 30 s
// apart, so the FRF is seldom redrawn while its boxes are read (each box waits for its element).
describe('Tap with the live input on one screen', () => {
  let cleanBrowser: Browser;
  beforeAll(async () => {
    const wavPath = path.join(screenshotDir, '..', 'live', 'bar-clean-44k1.wav');
    fs.mkdirSync(path.dirname(wavPath), { recursive: true });
    fs.writeFileSync(wavPath, liveBarWav('B01:+Z', { kinds: ['clean', 'clean'], spacingS: 30 }).wav);
    cleanBrowser = await launchBrowser(fakeAudioInput(wavPath));
  }, 60_000);
  afterAll(async () => {
    await cleanBrowser?.close();
  });

  it('keeps the live strip (state in words, a meter per channel with its headroom in dB) in view with the DOF, the verdict, Accept/Reject and the FRF with coherence at 1366×768, 768×1024 and 1024×768, none over another', { timeout: 240_000 }, async () => {
    // Issue 17's one-screen rule for Tap (as tests/e2e/tap-one-screen.test.ts checks it for the
    // rig), with the live input capturing: measured with element bounding boxes at each size.
    const { page, errors, close } = await signIn(viewports.laptop, { from: cleanBrowser });
    const entry = rig.entries.find((e) => !['B01:+Z', 'B11:+Z'].includes(e.excitationDof))!;
    try {
      // Stopped by hand below: "Stop after" far above what is captured while the boxes are read.
      await openLive(page, entry.excitationDof, 50);
      // Every hit of this file is clean: the verdict on screen is an accepted hit's, whichever it is.
      await page.locator('[data-testid="live-capture"][data-verdict="accept"]').first().waitFor({ timeout: 90_000 });
      await page.locator('[data-testid="frf-plot"] .js-plotly-plot').waitFor({ timeout: 30_000 });
      for (const viewport of [viewports.laptop, viewports.tablet, { width: 1024, height: 768 }]) {
        await page.setViewportSize(viewport);
        await page.evaluate(() => window.scrollTo(0, 0));
        await settled(page);
        // The plot follows the window's size (useFitHeight): wait until it has its new width.
        await page.waitForFunction(() => {
          const plot = document.querySelector('[data-testid="frf-plot"] .main-svg');
          const box = document.querySelector('[data-testid="frf-plot"]');
          return !!plot && !!box && Math.abs(plot.getBoundingClientRect().width - box.getBoundingClientRect().width) < 2;
        });
        await settled(page);
        await viewShot(page, `tap-live-one-screen-${viewport.width}x${viewport.height}`);
        const at = `at ${viewport.width}×${viewport.height}`;
        const vp = page.viewportSize()!;
        type Box = { x: number; y: number; width: number; height: number };
        const boxOf = async (testId: string | ReturnType<Page['locator']>, name: string): Promise<Box> => {
          const locator = typeof testId === 'string' ? page.getByTestId(testId).first() : testId;
          await locator.waitFor();
          const b = await locator.boundingBox();
          expect(b, `${name} is laid out ${at}`).not.toBeNull();
          const inside = b!.x >= 0 && b!.y >= 0 && b!.x + b!.width <= vp.width + 0.5 && b!.y + b!.height <= vp.height + 0.5;
          expect(inside, `${name} ${JSON.stringify(b)} inside the window ${at}`).toBe(true);
          return b!;
        };
        const strip = await boxOf('live-strip', 'the live strip');
        await boxOf('live-state-word', 'the state word');
        expect(await page.getByTestId('live-state-word').textContent()).toMatch(/^(armed|recording)$/);
        const meters = page.locator('#tap-live-strip [data-testid="live-meter"]');
        expect(await meters.count(), `a meter per channel of the map ${at}`).toBe(2);
        for (let i = 0; i < 2; i++) {
          await boxOf(meters.nth(i), `meter ${i + 1}`);
          expect(await meters.nth(i).textContent()).toMatch(/ch \d [Fa].*(\d+\.\d dB left|silent|✕ overload)/);
        }
        const parts: [string, Box][] = [
          ['the DOF', await boxOf('current-dof', 'the DOF')],
          ['the live strip', strip],
          ['the verdict', await boxOf('verdict-panel', 'the verdict')],
          ['the FRF plot', await boxOf(page.locator('[data-testid="frf-plot"] .js-plotly-plot'), 'the FRF plot')],
        ];
        const buttons: [string, Box][] = [
          ['Accept', await boxOf('accept', 'Accept')],
          ['Reject', await boxOf('reject', 'Reject')],
          ['the coherence axis', await boxOf(page.locator('[data-testid="frf-plot"] .g-y3title'), 'the coherence axis')],
        ];
        const overlaps = (a: Box, b: Box) => a.x < b.x + b.width - 0.5 && b.x < a.x + a.width - 0.5 && a.y < b.y + b.height - 0.5 && b.y < a.y + a.height - 0.5;
        for (let i = 0; i < parts.length; i++) for (let j = i + 1; j < parts.length; j++) expect(overlaps(parts[i]![1], parts[j]![1]), `${parts[i]![0]} over ${parts[j]![0]} ${at}`).toBe(false);
        // The message bar is the window's bottom edge: the one screen ends above it.
        const bar = (await page.getByTestId('toast-bar').boundingBox())!;
        for (const [name, b] of [...parts, ...buttons]) expect(overlaps(bar, b), `the message bar over ${name} ${JSON.stringify(b)} ${at}`).toBe(false);
        expect(await page.evaluate(() => window.scrollY), at).toBe(0);
      }
      await page.getByTestId('live-stop').click();
      await page.locator('[data-testid="live-panel"][data-engine="off"]').waitFor();
      // A hit captured before the stop is still sent: the test ends once none is on its way.
      await page.waitForFunction(() => document.querySelector('[data-testid="live-pending"]')?.getAttribute('data-count') === '0' && !document.querySelector('[data-testid="live-capture"][data-state="checking"]'), undefined, { timeout: 60_000 });
      expect(errors.filter((e) => !/status of 404/.test(e)), JSON.stringify(errors)).toEqual([]);
    } finally {
      await close();
    }
  });
});

describe('Tap with the live input', () => {
  it('captures hits from the interface by itself, gives the simulator’s verdicts, keeps force and response aligned, leaves out records with a break in the stream, and averages an FRF within 2 % and 2° of the closed form', { timeout: 240_000 }, async () => {
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
      // With the first accepted hit in, the verdict and the FRF are there too.
      await page.locator('[data-testid="live-capture"][data-verdict="accept"]').first().waitFor({ timeout: 90_000 });
      await page.locator('[data-testid="frf-plot"] .js-plotly-plot').waitFor({ timeout: 30_000 });
      await settled(page);
      await viewShot(page, 'tap-live-capturing-1366-view');

      await stored(page).nth(LIVE_HITS.length - 1).waitFor({ timeout: 200_000 });
      // The panel stopped by itself after one pass of the looping file.
      await page.locator('[data-testid="live-panel"][data-engine="off"]').waitFor();
      expect(await page.getByTestId('live-pending').getAttribute('data-count')).toBe('0');
      // Under load the fake device can drop frames mid-record: such a record is shown as
      // interrupted and not sent, and the next hit of the looping file is taken instead. Which hit
      // of the file each capture is follows from its trigger frame (hits 8 s apart from 1.2 s into
      // a 49 s file, support/live-wav.ts); the first capture is the file's first hit.
      const captures = (await page.getByTestId('live-capture').evaluateAll((els) => els.map((e) => ({ state: e.getAttribute('data-state'), verdict: e.getAttribute('data-verdict'), trigger: Number(e.getAttribute('data-trigger-frame')) })))).reverse();
      const interrupted = captures.filter((c) => c.state === 'interrupted');
      expect(Number(await page.getByTestId('live-interrupted').getAttribute('data-count'))).toBe(interrupted.length);
      const fileS = LIVE_LEAD_IN_S + LIVE_HITS.length * LIVE_SPACING_S;
      const kindOf = (trigger: number) => {
        const t = (((trigger - captures[0]!.trigger) / rate + LIVE_LEAD_IN_S + 0.2) % fileS) - LIVE_LEAD_IN_S - 0.2;
        return LIVE_HITS[Math.round(t / LIVE_SPACING_S) % LIVE_HITS.length]!;
      };
      const storedKinds = captures.filter((c) => c.state === 'stored').map((c) => kindOf(c.trigger));
      if (interrupted.length === 0) expect(storedKinds).toEqual(LIVE_HITS);
      // What the simulator put in (support/live-wav.ts): clean → accept, double → reject, clipped → reject.
      expect(captures.filter((c) => c.state === 'stored').map((c) => c.verdict)).toEqual(storedKinds.map((k) => (k === 'clean' ? 'accept' : 'reject')));
      if (interrupted.length) expect(await page.locator('[data-testid="live-capture"][data-state="interrupted"]').first().textContent()).toMatch(/input stream interrupted — hit again/);
      await page.locator('[data-testid="frf-plot"] .js-plotly-plot').waitFor({ timeout: 30_000 });
      await settled(page);
      await screenshot(page, 'tap-live-stored-1366');

      const entry = entryOf('B01:+Z');
      const hits = (await engineer.agent.get(`/api/campaigns/${rig.campaignId}/schedule/${entry.id}/hits`)).body.hits as { verdict: string; reasons: { code: string }[] }[];
      expect(hits).toHaveLength(LIVE_HITS.length);
      storedKinds.forEach((k, i) => {
        if (k === 'double') expect(hits[i]!.reasons.map((r) => r.code)).toContain('double-hit');
        if (k === 'clipped') expect(hits[i]!.reasons.map((r) => r.code)).toContain('overload');
      });
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

      // The averaged FRF of the stored clean hits against the closed form: modal superposition of
      // the Euler–Bernoulli bar (sim modelFrf), read between resonances at 0.85·fn and 1.15·fn as in
      // tests/api/api-tokens.test.ts; 2 % and 2° as the issue asks. A record with a break in the
      // stream never reaches the average (above), so a dropped 10 ms cannot bend it.
      const frf = (await engineer.agent.get(`/api/campaigns/${rig.campaignId}/schedule/${entry.id}/frf?kind=accelerance`)).body;
      expect(frf.averages).toBe(storedKinds.filter((k) => k === 'clean').length);
      if (rate !== LIVE_FS) expect(frf).toMatchObject({ resampled: true, resampledFromHz: rate });
      const f: number[] = frf.f;
      const h1 = frf.channels[0].h1;
      const exact = modelFrf(bar.model, 'B21:+Z', 'B01:+Z', Float64Array.from(f), 'accelerance');
      const seen: string[] = [];
      for (const fn of [53.17, 146.55, 287.3]) {
        for (const target of [0.85 * fn, 1.15 * fn]) {
          const k = f.findIndex((x) => x >= target);
          const ratio = Math.hypot(h1.re[k], h1.im[k]) / Math.hypot(exact.re[k]!, exact.im[k]!);
          const dphase = Math.atan2(h1.im[k], h1.re[k]) - Math.atan2(exact.im[k]!, exact.re[k]!);
          const deg = Math.abs(Math.atan2(Math.sin(dphase), Math.cos(dphase))) * (180 / Math.PI);
          seen.push(`${f[k]!.toFixed(2)} Hz: ${((ratio - 1) * 100).toFixed(2)} %, ${deg.toFixed(2)}°`);
          expect(Math.abs(ratio - 1), `|H1|/|H| at ${f[k]} Hz (${interrupted.length} records interrupted); ${seen.join('; ')}`).toBeLessThan(0.02);
          expect(deg, `phase at ${f[k]} Hz; ${seen.join('; ')}`).toBeLessThan(2);
        }
      }
      console.log(`live FRF against the closed form (${interrupted.length} records interrupted): ${seen.join('; ')}`);

      expect(errors.filter((e) => !/status of 404/.test(e)), JSON.stringify(errors)).toEqual([]);
    } finally {
      await close();
    }
  });

  it('keeps hits on the device while the server is away, counts them on screen, and stores each once in capture order', { timeout: 240_000 }, async () => {
    const { page, errors, close } = await signIn(viewports.tablet);
    // The server goes away right after the first hit reaches it (whatever the machine's speed, the
    // other three are captured while it is away) and comes back when the test says so.
    let down = true;
    let refusals = 0;
    const sentKeys: string[] = [];
    await page.route('**/schedule/*/hits', async (route) => {
      if (route.request().method() !== 'POST') return route.continue();
      const key = route.request().headers()['idempotency-key'] ?? '';
      sentKeys.push(key);
      if (!down || key === sentKeys[0]) return route.continue();
      refusals += 1;
      // Alternately the answer of a server whose database restarts, and no answer at all.
      if (refusals % 2 === 1) return route.fulfill({ status: 503, headers: { 'retry-after': '1', 'content-type': 'application/json' }, body: JSON.stringify({ error: { code: 'database-unavailable', message: 'The database cannot be reached at the moment (it may be restarting).' } }) });
      return route.abort('connectionrefused');
    });
    const count = 4;
    try {
      await openLive(page, 'B11:+Z', count);
      await stored(page).first().waitFor({ timeout: 60_000 });
      await page.locator(`[data-testid="live-pending"][data-count="${count - 1}"]`).waitFor({ timeout: 90_000 });
      expect(await page.getByTestId('live-pending').textContent()).toMatch(new RegExp(`${count - 1} hits waiting to be sent.*kept on this device, sent in order`));
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

// A handheld accelerometer calibrator on the response channel (common practice: 10 m/s² RMS at
// 159.2 Hz, ω = 1000 rad/s). The simulated sensor is 10.5 mV/(m/s²) while the kit says 10.2, so
// the interface sees 10 m/s² × 10.5 mV/(m/s²) = 0.105 V RMS, 0.021 of its 5 V full scale; the
// force input carries the hammer's noise floor only. Expected on screen (sensitivity = V_rms /
// level; deviation = (measured − kit)/kit and 20·log10(measured/kit)): 10.500 mV/(m/s²),
// +2.94 %, +0.25 dB. The file is 6 s long, so any 2 s recording holds only the tone.
const CAL = { levelMs2: 10, hz: 159.2, trueMvPerMs2: 10.5 };
function calibratorWav(): Buffer {
  const fs = FAKE_DEVICE_FS;
  const n = 6 * fs;
  const force = new Float64Array(n);
  const accel = new Float64Array(n);
  const amp = (Math.SQRT2 * CAL.levelMs2 * CAL.trueMvPerMs2) / 1000 / LIVE_KIT.accelFullScaleV;
  for (let i = 0; i < n; i++) {
    // A deterministic noise floor of 0.02 N on the force input (never digital silence).
    force[i] = ((0.02 * Math.sin(i * 12.9898) * LIVE_KIT.hammerMvPerN) / 1000 / LIVE_KIT.forceFullScaleV);
    accel[i] = amp * Math.sin((2 * Math.PI * CAL.hz * i) / fs);
  }
  return encodeWav([force, accel], fs, 'float32', 1);
}

describe('Tap with the live input on a calibrator', () => {
  let calBrowser: Browser;
  beforeAll(async () => {
    const wavPath = path.join(screenshotDir, '..', 'live', 'calibrator-44k1.wav');
    fs.writeFileSync(wavPath, calibratorWav());
    calBrowser = await launchBrowser(fakeAudioInput(wavPath));
  }, 60_000);
  afterAll(async () => {
    await calBrowser?.close();
  });

  async function calPage(viewport: { width: number; height: number }, init?: () => void) {
    const { page, errors, close } = await signIn(viewport, { from: calBrowser, touch: false, init });
    await page.goto(`${app.baseUrl}/campaigns/${rig.campaignId}/tap?entry=${entryOf('B11:+Z').id}`);
    await page.getByTestId('current-dof').waitFor({ timeout: 30_000 });
    await settled(page);
    await foldCautions(page);
    await page.getByRole('tab', { name: 'Live input' }).click({ timeout: 60_000 });
    await page.getByTestId('live-panel').waitFor({ timeout: 30_000 });
    return { page, errors, close };
  }

  it('records the calibrator on the response channel and shows the measured sensitivity and its deviation from the kit in % and dB, stored as an audited check', { timeout: 120_000 }, async () => {
    const { page, errors, close } = await calPage(viewports.laptop);
    try {
      await page.getByTestId('live-start').click();
      await page.locator('[data-testid="live-panel"][data-engine="armed"]').waitFor({ timeout: 20_000 });
      await page.getByTestId('sensitivity-check').locator('summary').click();
      const result = page.getByTestId('sensitivity-result');
      const irregular = page.getByText(/came out irregular .* record the calibrator again/);
      // A loaded machine can drop a quantum of the fake device's stream: the page then says so and
      // stores nothing, and the engineer records again (at most three tries here).
      for (let attempt = 1; ; attempt++) {
        await page.getByRole('button', { name: 'Record the calibrator' }).click();
        await result.filter({ hasText: 'Stored as a check.' }).or(irregular).first().waitFor({ timeout: 30_000 });
        if (!(await irregular.count())) break;
        expect(attempt, (await irregular.textContent()) ?? '').toBeLessThan(3);
      }
      const text = (await result.textContent())!;
      const m = /Measured ([\d.]+) mV\/\(m\/s²\) at ([\d.]+) Hz against the kit's ([\d.]+) mV\/\(m\/s²\): ([+-][\d.]+) % \(([+-][\d.]+) dB\)/.exec(text);
      expect(m, text).not.toBeNull();
      const [measured, hz, kit, pct, db] = m!.slice(1).map(Number) as [number, number, number, number, number];
      // sensitivity = V_rms / level = 0.105 V / 10 m/s² = 10.5 mV/(m/s²); the tone's RMS over 2 s of a
      // sine is exact to well under 0.1 % (a whole number of cycles ± one).
      expect(Math.abs(measured / CAL.trueMvPerMs2 - 1)).toBeLessThan(0.001);
      expect(Math.abs(hz - CAL.hz)).toBeLessThan(0.2);
      expect(kit).toBe(LIVE_KIT.accelMvPerMs2);
      expect(pct).toBeCloseTo(((CAL.trueMvPerMs2 - LIVE_KIT.accelMvPerMs2) / LIVE_KIT.accelMvPerMs2) * 100, 1); // +2.94 %
      expect(db).toBeCloseTo(20 * Math.log10(CAL.trueMvPerMs2 / LIVE_KIT.accelMvPerMs2), 1); // +0.25 dB
      await settled(page);
      await screenshot(page, 'tap-live-calibrator-1366');

      const db0 = app.handle.database.db;
      const rows = await db0.select().from(sensitivityCheck).where(eq(sensitivityCheck.campaignId, rig.campaignId));
      expect(rows).toHaveLength(1);
      expect(rows[0]!.channelNumber).toBe(2);
      expect(rows[0]!.referenceMs2Rms).toBe(CAL.levelMs2);
      expect(rows[0]!.referenceHz).toBe(CAL.hz);
      expect(rows[0]!.measuredSensitivity).toBeCloseTo(measured, 3);
      expect(rows[0]!.deviationDb).toBeCloseTo(20 * Math.log10(rows[0]!.measuredSensitivity / rows[0]!.kitSensitivity), 9);
      const audits = await db0.select().from(auditEvent).where(eq(auditEvent.entityId, rows[0]!.id));
      expect(audits.map((a) => [a.entity, a.action])).toEqual([['sensitivity-check', 'create']]);
      const listed = (await engineer.agent.get(`/api/campaigns/${rig.campaignId}/sensitivity-checks`)).body.checks;
      expect(listed[0].deviationPercent).toBeCloseTo(pct, 2);
      await page.getByTestId('live-stop').click();
      expect(errors.filter((e) => !/status of 404/.test(e)), JSON.stringify(errors)).toEqual([]);
    } finally {
      await close();
    }
  });

  it('says in words why it cannot arm when the chosen input is not there (a device constraint that cannot be met), and stays stopped', { timeout: 120_000 }, async () => {
    // The page asks for an input by an id no device has, as when the interface used last time has
    // been unplugged: Chromium refuses getUserMedia with an OverconstrainedError on deviceId.
    const { page, errors, close } = await calPage(viewports.tablet, () => {
      const md = navigator.mediaDevices;
      const real = md.getUserMedia.bind(md);
      md.getUserMedia = (c?: MediaStreamConstraints) => real(c && typeof c.audio === 'object' ? { ...c, audio: { ...c.audio, deviceId: { exact: 'unplugged-interface' } } } : c);
    });
    try {
      await page.getByTestId('live-start').click();
      const notice = page.getByTestId('live-panel').getByText(/cannot deliver what was asked/);
      await notice.waitFor({ timeout: 20_000 });
      expect(await notice.textContent()).toMatch(/that device is not connected.*Choose another input/);
      expect(await page.getByTestId('live-panel').getAttribute('data-engine')).toBe('off');
      await expect(page.getByTestId('live-start')).toBeDefinedAndVisible();
      await settled(page);
      await viewShot(page, 'tap-live-arming-failed-768-view');
      expect(errors, JSON.stringify(errors)).toEqual([]);
    } finally {
      await close();
    }
  });
});

