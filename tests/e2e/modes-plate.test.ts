// The Modes screen on a structure with 16 modes in the band: a simply supported steel plate
// (packages/sim ss-plate, Kirchhoff theory; Leissa 1969, "Vibration of Plates", NASA SP-160, §4.1).
// Set up through the API as a roving-hammer campaign on its 5 × 4 grid with one fixed
// accelerometer; the hits come from the simulator's modal model and are uploaded as recordings.
// In the browser the lead builds the mode table from one wide fit and from two band fits.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { createRng, hitSeries, simplySupportedPlate, SS_PLATE } from '@resonote/sim';
import { encodeWav } from '@resonote/api/recording';
import { buildCampaign } from '@resonote/api/factory';
import { signedInClient } from '@resonote/api/demo-client';
import { DEMO_PASSWORD } from '@resonote/api/seed';
import { startDemo, type DemoRun } from '../support/demo.ts';
import { screenshot, settled, viewports } from '../support/browser.ts';

let demo: DemoRun;
let plateId: string;

/** Leissa 1969 §4.1: f_mn = π²(m²/a² + n²/b²)·√(D/(ρh)) / 2π, D = Eh³/(12(1 − ν²)); the 16 modes up to 1.45 kHz. */
const { lengthXM: a, widthYM: b, thicknessM: h, youngsPa: E, poisson: nu, densityKgM3: rho } = SS_PLATE;
const D = (E * h ** 3) / (12 * (1 - nu * nu));
const LEISSA_HZ: number[] = [];
for (let m = 1; m < 10; m++) for (let n = 1; n < 10; n++) LEISSA_HZ.push((Math.PI ** 2 * ((m * m) / (a * a) + (n * n) / (b * b)) * Math.sqrt(D / (rho * h))) / (2 * Math.PI));
LEISSA_HZ.sort((x, y) => x - y);
LEISSA_HZ.splice(LEISSA_HZ.findIndex((f) => f > 1450));

// 8192 Hz so a 0.5 ms hard-tip pulse (spectrum zero at 3 kHz) is eight samples long; 2 s records give 0.5 Hz lines, ten lines across the closest pair
// (4,1)/(1,3) at 727.0/732.1 Hz (0.70 %). Three hits per DOF keep the simulation short.
const FS = 8192;
const RECORD_S = 2;
const HITS = 3;
const REF = 'P07:+Z';

beforeAll(async () => {
  expect(LEISSA_HZ).toHaveLength(16);
  demo = await startDemo();
  const plate = simplySupportedPlate();
  const lead = await signedInClient(demo.app.baseUrl, demo.app.handle.config.publicUrl, 'lead@demo.resonote.local', DEMO_PASSWORD);
  const built = await buildCampaign(lead, {
    name: 'Simply supported plate SP-5 (wide band)',
    status: 'analysis',
    structure: plate.description,
    client: 'In-house (reference check)',
    testType: 'roving-hammer',
    referenceDofs: [REF],
    simulator: 'generic',
    points: plate.points,
    directions: ['+Z'],
    lines: plate.lines,
    hammer: { model: 'Impact hammer IH-02 (demo)', serial: 'H-3301', sensitivity: 2.25, sensitivityUnit: 'mV/N', tips: ['hard'] },
    accelerometers: [{ model: 'Accelerometer AC-10 (demo)', serial: 'A-6601', sensitivity: 10.2, sensitivityUnit: 'mV/(m/s²)', dof: REF }],
    settings: {
      triggerLevelN: 5, forceWindow: { lengthS: 0.02, taperS: 0.002 }, estimator: 'H1', doubleHitRatio: 0.04, overloadPercent: 99, rollOffDb: 20, coherenceThreshold: 0.9, minPeakN: 10, forceRangeN: 2000,
      sampleRateHz: FS, recordLengthS: RECORD_S, preTriggerS: 0.01, exponentialWindow: { mode: 'end-level', endLevelPercent: 5 }, hitsToAverage: HITS, bandHz: { low: 10, high: 1500 }, responseRangeMs2: 2000,
    },
  });
  plateId = built.campaignId;
  const n = FS * RECORD_S;
  for (const [i, entry] of built.entries.entries()) {
    const hits = hitSeries(plate.model, { excitationDof: entry.excitationDof, responseDofs: [REF], fs: FS, samples: n, preTriggerS: 0.0105, peakForceN: 80, pulseWidthS: 0.0005, forceNoiseN: 0.02, responseNoise: 0.005, forceRangeN: 2000, responseRangeMs2: 2000 }, HITS, createRng(5000 + i), { doubleHitProbability: 0, overloadProbability: 0 });
    const force = new Float64Array(n * HITS);
    const accel = new Float64Array(n * HITS);
    hits.forEach((hit, k) => {
      for (let j = 0; j < n; j++) {
        force[k * n + j] = (hit.force[j]! * 2.25) / 1000;
        accel[k * n + j] = (hit.responses[0]![j]! * 10.2) / 1000;
      }
    });
    const res = await lead.upload(`/api/campaigns/${plateId}/schedule/${entry.id}/hits`, encodeWav([force, accel], FS), `${entry.excitationDof}.wav`, { units: 'volts' }, `plate-${entry.id}`);
    if (res.status >= 300) throw new Error(`hits at ${entry.excitationDof}: ${res.status} ${JSON.stringify(res.body)}`);
    if (res.body.entry.acceptedHits < HITS) throw new Error(`only ${res.body.entry.acceptedHits} hits accepted at ${entry.excitationDof}: ${JSON.stringify(res.body.hits.map((x: { reasons: unknown }) => x.reasons))}`);
  }
}, 420_000);
afterAll(async () => {
  await demo?.close();
});

const tableRows = (page: Page) => page.getByTestId('mode-table').locator('tbody tr');
const tableHz = (page: Page) => tableRows(page).evaluateAll((trs) => trs.map((tr) => Number(tr.getAttribute('data-fhz'))).sort((x, y) => x - y));

/** Runs a fit over a band from the form and waits for its diagram. */
async function runFit(page: Page, low: number, high: number, order: number) {
  await page.getByLabel('Band from').fill(String(low));
  await page.getByLabel('Band to').fill(String(high));
  await page.getByLabel('Max model order').fill(String(order));
  await page.getByRole('button', { name: 'Run fit' }).click();
  await page.waitForFunction((caption) => document.querySelector('[data-testid="fit-caption"]')?.textContent?.includes(caption) && document.querySelector('.stabilization-plot .scatterlayer'), `${low}–${high} Hz · orders 2–${order}`, { timeout: 240_000 });
}

/** Takes the server's suggestion, computes shapes and adds the fit's modes to the table. */
async function suggestComputeAdd(page: Page, atLeast: number) {
  await page.getByTestId('suggest-modes').click();
  await page.getByTestId('chosen-poles').locator('tbody tr').nth(atLeast - 1).waitFor({ timeout: 30_000 });
  await page.locator('[data-testid="draft-state"][data-state="saved"]').waitFor();
  await page.getByRole('button', { name: 'Compute shapes' }).click();
  await page.getByTestId('fit-modes').locator(`tr[data-fit-mode="${atLeast}"]`).waitFor({ timeout: 120_000 });
  const before = await tableRows(page).count();
  await page.getByTestId('add-to-table').click();
  await page.waitForFunction((n) => document.querySelectorAll('[data-testid="mode-table"] tbody tr').length > n, before, { timeout: 30_000 });
}

/** Each Leissa frequency is in the list within 0.1 % (Leissa 1969 §4.1, the bound). */
function expectEveryLeissaMode(found: number[]) {
  for (const f0 of LEISSA_HZ) expect(found.some((f) => Math.abs(f / f0 - 1) < 0.001), `a mode within 0.1 % of ${f0.toFixed(2)} Hz in ${found.map((f) => f.toFixed(2)).join(', ')}`).toBe(true);
}

describe('the Modes screen on a simply supported plate with 16 modes', () => {
  it('builds the mode table from one wide fit and from two band fits, pointing out the modes found twice', async () => {
    const { page, errors, close } = await demo.signIn('lead@demo.resonote.local', viewports.laptop, { reducedMotion: 'reduce' });
    await page.goto(`${demo.app.baseUrl}/campaigns/${plateId}/modes`);
    await page.getByTestId('modes-empty').waitFor();

    // One wide fit over all 16 modes (the form allows orders up to 80).
    await runFit(page, 100, 1450, 80);
    await settled(page);
    await screenshot(page, 'modes-plate-wide-diagram-1366');
    await suggestComputeAdd(page, 16);
    const wide = await tableHz(page);
    console.log(`[plate] wide fit: ${wide.map((f) => f.toFixed(2)).join(', ')}`);
    expectEveryLeissaMode(wide);
    await settled(page);
    await screenshot(page, 'modes-plate-wide-table-1366');

    // Empty the table, then two band fits that overlap at 650–700 Hz (mode (3,2) at 673.1 Hz is in both).
    for (let left = await tableRows(page).count(); left > 0; left--) {
      await page.getByRole('button', { name: /^Remove mode 1 at/ }).click();
      await page.waitForFunction((n) => document.querySelectorAll('[data-testid="mode-table"] tbody tr').length === n, left - 1);
    }
    await runFit(page, 100, 700, 60);
    await suggestComputeAdd(page, 6);
    await runFit(page, 650, 1450, 60);
    await suggestComputeAdd(page, 10);
    const bands = await tableHz(page);
    console.log(`[plate] two band fits: ${bands.map((f) => f.toFixed(2)).join(', ')}`);
    expectEveryLeissaMode(bands);
    await page.getByTestId('duplicate-flag').first().waitFor();
    expect(await page.getByTestId('duplicate-notes').textContent()).toMatch(/Same mode as the row at 673\.\d\d Hz .*MAC 0\.9\d\d/);
    const text = await page.getByTestId('mode-table').textContent();
    expect(text).toContain('100–700 Hz');
    expect(text).toContain('650–1450 Hz');
    await settled(page);
    await screenshot(page, 'modes-plate-bands-table-1366');
    expect(errors).toEqual([]);
    await close();

    const tablet = await demo.signIn('lead@demo.resonote.local', viewports.tablet, { reducedMotion: 'reduce' });
    await tablet.page.goto(`${demo.app.baseUrl}/campaigns/${plateId}/modes`);
    await tablet.page.getByTestId('mode-table').locator('tbody tr').nth(15).waitFor({ timeout: 30_000 });
    await tablet.page.locator('.stabilization-plot .scatterlayer').first().waitFor();
    await settled(tablet.page);
    await screenshot(tablet.page, 'modes-plate-768');
    expect(await tablet.page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(768);
    expect(tablet.errors).toEqual([]);
    await tablet.close();
  }, 900_000);
});
