// Lab kit, calibration on Tap, the large-change confirmation and notes/photos per DOF, in the real
// browser against the real API and database. Screenshots at 1366 × 768, 768 × 1024 and 1024 × 768.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser } from 'playwright-core';
import { startTestApp, type TestApp } from '../support/app.ts';
import { screenshot, settled, viewports } from '../support/browser.ts';
import { PASSWORD } from '../support/accounts.ts';
import { signInThroughForm } from '../support/sign-in.ts';
import { makeCrew, type CampaignCrew } from '../support/campaign.ts';
import { platePng } from '../support/photo.ts';
import { launchBrowserWithWebgl, seedCampaign } from './campaign-fixtures.ts';

let app: TestApp & { baseUrl: string };
let browser: Browser;
let crew: CampaignCrew;
let labHammerId: string;
const landscape = { width: 1024, height: 768 };
const day = (offset: number) => new Date(Date.now() + offset * 86_400_000).toISOString().slice(0, 10);

beforeAll(async () => {
  app = await startTestApp('resonote_tpl_e2e', {}, { listen: true });
  crew = await makeCrew(app, 'lab');
  await seedCampaign(crew);
  // The lab inventory: a hammer with three tips (booked by the other campaign), a triaxial sensor
  // with per-axis sensitivities, a conditioner.
  const hammer = await crew.lead.agent.post('/api/lab/items').send({ kind: 'hammer', model: 'IH-10 impact hammer', serial: 'LH-501', sensitivity: 10, sensitivityUnit: 'mV/lbf', tips: ['rubber', 'plastic', 'steel'] });
  labHammerId = hammer.body.item.id;
  await crew.lead.agent.post(`/api/lab/items/${labHammerId}/calibrations`).send({ calibratedOn: day(-100), dueOn: day(265), certificateRef: 'LAB-CAL-77', performedBy: 'Metrology lab (fictional)' });
  const triax = await crew.admin.agent.post('/api/lab/items').send({ kind: 'accelerometer', model: 'TA-300 triaxial', serial: 'LT-88', sensitivity: 100, sensitivityUnit: 'mV/g', axes: ['X', 'Y', 'Z'], axisSensitivities: { X: 98.2, Y: 101.5, Z: 100.3 } });
  await crew.admin.agent.post(`/api/lab/items/${triax.body.item.id}/calibrations`).send({ calibratedOn: day(-400), dueOn: day(-35), certificateRef: 'LAB-CAL-12', performedBy: 'Metrology lab (fictional)' });
  await crew.admin.agent.post('/api/lab/items').send({ kind: 'conditioner', model: 'SC-4 four-channel conditioner', serial: 'LC-3' });
  await crew.outsider.agent.post(`/api/campaigns/${crew.otherCampaignId}/bookings`).send({ labItemId: labHammerId, fromOn: day(2), toOn: day(9) });
  browser = await launchBrowserWithWebgl();
}, 120_000);
afterAll(async () => {
  await browser?.close();
  await app?.close();
});

const signedIn = (email: string, viewport: { width: number; height: number } = viewports.laptop) => signInThroughForm(browser, app.baseUrl, email, PASSWORD, viewport);

describe('the lab kit in the browser', () => {
  it('lists hammers with tips, a triaxial sensor per axis and a conditioner, with calibration and bookings, at three sizes', async () => {
    for (const [name, viewport] of [
      ['lab-kit-1366', viewports.laptop],
      ['lab-kit-768', viewports.tablet],
      ['lab-kit-1024-landscape', landscape],
    ] as const) {
      const { page, errors, close } = await signedIn(crew.lead.email, viewport);
      await page.getByRole('link', { name: 'Lab kit' }).click();
      await page.getByTestId('lab-kit-page').waitFor();
      const hammer = page.locator('[data-testid="lab-item"][data-serial="LH-501"]');
      await expect(hammer).toBeDefinedAndVisible();
      // 10 mV/lbf = 2.248 mV/N (1 lbf = 4.4482216152605 N exactly).
      expect(await hammer.textContent()).toMatch(/Tips: rubber, plastic, steel.*10 mV\/lbf = 2\.248 mV\/N/);
      // The lead is no member of the campaign that booked it: the dates, not that campaign's name (routes/lab.ts).
      const booking = await hammer.getByTestId('lab-bookings').textContent();
      expect(booking).toContain(`${day(2)} → ${day(9)} booked by another campaign`);
      expect(booking).not.toContain('Other campaign lab');
      const triax = page.locator('[data-testid="lab-item"][data-serial="LT-88"]');
      // 98.2 mV/g = 10.01 mV/(m/s²) with g = 9.80665 m/s².
      expect(await triax.textContent()).toMatch(/X 10\.01 · Y 10\.35 · Z 10\.23 mV\/\(m\/s²\)/);
      expect(await triax.locator('[data-calibration="overdue"]').count()).toBe(1);
      await settled(page);
      await screenshot(page, name);
      expect(errors).toEqual([]);
      await close();
    }
  }, 240_000);

  it('asks before storing 2.30 as mV/lbf on the 10 mV/lbf hammer, showing both values in mV/N and mV/lbf, and stores it only when confirmed', async () => {
    const { page, errors, close } = await signedIn(crew.lead.email);
    await page.goto(`${app.baseUrl}/lab`);
    const hammer = page.locator('[data-testid="lab-item"][data-serial="LH-501"]');
    await hammer.getByTestId('lab-calibrate').click();
    await hammer.getByLabel('Calibrated on').fill(day(0));
    await hammer.getByLabel('Due on').fill(day(365));
    await hammer.getByLabel('Certificate reference').fill('LAB-CAL-78');
    await hammer.getByLabel('Calibrated by').fill('Metrology lab (fictional)');
    await hammer.getByLabel('Stated sensitivity (mV/lbf)').fill('2.30');
    await hammer.getByTestId('lab-calibration-save').click();
    const dialog = page.getByTestId('large-change-dialog');
    await expect(dialog).toBeDefinedAndVisible();
    const text = (await dialog.textContent()) ?? '';
    // |2.30 − 10| / 10 = 77 %; 10 mV/lbf = 2.2481 mV/N, 2.30 mV/lbf = 0.51706 mV/N.
    expect(text).toContain('77.0 %');
    expect(text).toMatch(/Previous\s*2\.2481 mV\/N\s*10 mV\/lbf/);
    expect(text).toMatch(/New\s*0\.51706 mV\/N\s*2\.3 mV\/lbf/);
    await settled(page);
    await screenshot(page, 'large-change-dialog-1366');
    await page.getByTestId('large-change-back').click();
    await dialog.waitFor({ state: 'detached' });
    let items = (await crew.lead.agent.get('/api/lab/items')).body.items as { id: string; sensitivity: number; calibrations: unknown[] }[];
    expect(items.find((i) => i.id === labHammerId)).toMatchObject({ sensitivity: 10, calibrations: [expect.anything()] });

    await hammer.getByLabel('Stated sensitivity (mV/lbf)').fill('10.1');
    await hammer.getByTestId('lab-calibration-save').click(); // 1 %: no question
    await expect(page.getByText(/Calibration of IH-10 impact hammer \(SN LH-501\) recorded/)).toBeDefinedAndVisible();
    items = (await crew.lead.agent.get('/api/lab/items')).body.items;
    expect(items.find((i) => i.id === labHammerId)).toMatchObject({ sensitivity: 10.1 });
    expect(errors.filter((e) => !/status of 409/.test(e))).toEqual([]);
    await close();
  }, 180_000);

  it('books a lab item into a campaign’s Kit and says another campaign has it on overlapping dates, without naming a campaign the lead is not in', async () => {
    const { page, errors, close } = await signedIn(crew.lead.email);
    await page.goto(`${app.baseUrl}/campaigns/${crew.campaignId}/kit`);
    await page.getByTestId('book-item').click();
    const form = page.getByRole('form', { name: 'Book a lab kit item' });
    await form.getByLabel('Item', { exact: true }).selectOption({ label: 'Hammer IH-10 impact hammer (SN LH-501)' });
    await form.getByLabel('Booked from').fill(day(5));
    await form.getByLabel('Booked until (inclusive)').fill(day(12));
    await form.getByTestId('book-save').click();
    const overlap = page.getByTestId('booking-overlap');
    await expect(overlap).toBeDefinedAndVisible();
    // The lead is no member of the other campaign (support/campaign.ts): its dates, not its name or person.
    const overlapText = await overlap.textContent();
    expect(overlapText).toContain(`booked by another campaign ${day(2)} → ${day(9)}`);
    expect(overlapText).not.toContain('Other campaign lab');
    expect(overlapText).not.toContain('Otto Outsider');
    await expect(page.getByText('IH-10 impact hammer').first()).toBeDefinedAndVisible();
    await page.getByTestId('bookings').scrollIntoViewIfNeeded();
    await settled(page);
    await screenshot(page, 'kit-bookings-1366');
    expect(errors).toEqual([]);
    await close();
  }, 240_000);
});

describe('calibration and notes at the structure', () => {
  it('warns on Tap about the overdue accelerometer before the first hit, then blocks hits when the lead says so', async () => {
    const { page, errors, close } = await signedIn(crew.engineer.email);
    await page.goto(`${app.baseUrl}/campaigns/${crew.campaignId}/tap`);
    await page.waitForURL(/\/tap\?entry=/);
    const banner = page.getByTestId('calibration-banner');
    await expect(banner).toBeDefinedAndVisible();
    expect(await banner.getAttribute('data-policy')).toBe('warn');
    // The seeded triaxial sensor (channels 2 and 3) is 35 days overdue.
    expect(await banner.textContent()).toMatch(/Calibration overdue or missing2 channels: 2, 3\./);
    await settled(page);
    await screenshot(page, 'tap-calibration-warn-1366');

    const policy = (await crew.lead.agent.get(`/api/campaigns/${crew.campaignId}/kit-policy`)).body.policy;
    await crew.lead.agent.put(`/api/campaigns/${crew.campaignId}/kit-policy`).send({ baseVersion: policy.version, calibration: 'block', changeTolerancePct: 5 }).expect(200);
    await page.reload();
    await expect(page.locator('[data-testid="calibration-banner"][data-policy="block"]')).toBeDefinedAndVisible();
    expect(await banner.textContent()).toContain('Hits are blocked: calibration overdue or missing');
    await page.getByTestId('strike').click();
    await expect(page.getByText(/This campaign does not take hits with an overdue or missing calibration/).first()).toBeDefinedAndVisible();
    await settled(page);
    await screenshot(page, 'tap-calibration-block-1366');
    await crew.lead.agent.put(`/api/campaigns/${crew.campaignId}/kit-policy`).send({ baseVersion: policy.version + 1, calibration: 'warn', changeTolerancePct: 5 }).expect(200);
    expect(errors.filter((e) => !/status of 409/.test(e))).toEqual([]);
    await close();
  }, 180_000);

  it('leaves a note with a photo from Tap’s compact Notes button and shows it, with its photo, on Review', async () => {
    const { page, errors, close } = await signedIn(crew.engineer.email);
    await page.goto(`${app.baseUrl}/campaigns/${crew.campaignId}/tap`);
    await page.waitForURL(/\/tap\?entry=/);
    const entryId = new URL(page.url()).searchParams.get('entry')!;
    // The calibration banner (the seeded accelerometer is overdue) arrives with its own query and
    // moves the header down: wait for it so the click lands on the button.
    await expect(page.getByTestId('calibration-banner')).toBeDefinedAndVisible();
    await settled(page);
    const button = page.getByTestId('notes-button');
    await expect(button).toBeDefinedAndVisible();
    expect(await button.textContent()).toMatch(/Notes \(0\)/);
    // The Notes button sits in the DOF header: the FRF panel starts as high as without it.
    const header = await page.locator('section').first().boundingBox();
    const buttonBox = await button.boundingBox();
    expect(buttonBox!.y + buttonBox!.height).toBeLessThanOrEqual(header!.y + header!.height);
    await button.click();
    const panel = page.getByTestId('notes-panel');
    await expect(panel).toBeDefinedAndVisible();
    // The hammer on channel 1 has the tips steel, plastic, rubber registered in Kit.
    expect(await panel.getByTestId('tip-choice').allTextContents()).toEqual(['steel', 'plastic', 'rubber']);
    await panel.getByLabel('Note', { exact: true }).fill('Reference sensor on a stud, thread cleaned; cable taped down 50 mm from the base.');
    await panel.getByTestId('note-photo-input').setInputFiles({ name: 'mount.png', mimeType: 'image/png', buffer: platePng(320, 240) });
    await panel.getByTestId('note-save').click();
    await expect(panel.getByTestId('note-photo')).toBeDefinedAndVisible();
    await panel.getByTestId('tip-choice').filter({ hasText: 'plastic' }).click();
    await expect(panel.getByText('Tip fitted: plastic')).toBeDefinedAndVisible();
    await page.waitForFunction(() => {
      const img = document.querySelector('[data-testid="note-photo"]') as HTMLImageElement | null;
      return Boolean(img && img.complete && img.naturalWidth === 320);
    });
    await settled(page);
    await screenshot(page, 'tap-notes-panel-1366');
    await page.keyboard.press('Escape');
    await expect(button).toHaveTextEventually(/Notes \(2\)\s*▣ 1/);

    for (const [name, viewport] of [
      ['review-notes-1366', viewports.laptop],
      ['review-notes-768', viewports.tablet],
      ['review-notes-1024-landscape', landscape],
    ] as const) {
      await page.setViewportSize(viewport);
      await page.goto(`${app.baseUrl}/campaigns/${crew.campaignId}/review?entry=${entryId}&view=dof`);
      const notes = page.getByTestId('review-notes');
      await expect(notes).toBeDefinedAndVisible();
      await expect(notes.getByTestId('note-photo')).toBeDefinedAndVisible();
      expect(await notes.getByTestId('note').count()).toBe(2);
      expect(await notes.textContent()).toContain('Reference sensor on a stud');
      await page.waitForFunction(() => {
        const img = document.querySelector('[data-testid="review-notes"] img') as HTMLImageElement | null;
        return Boolean(img && img.complete && img.naturalWidth === 320);
      });
      await notes.scrollIntoViewIfNeeded();
      await settled(page);
      await screenshot(page, name);
    }
    expect(errors).toEqual([]);
    await close();
  }, 240_000);
});
