// The Hand-over screen in the real browser on the demo bar: the lead sees the report, bundles,
// sharing and backup controls and downloads bundle.zip (when the server part is in); a viewer
// sees the report link only.
import fs from 'node:fs';
import { beforeAll, describe, expect, it } from 'vitest';
import { DEMO_PASSWORD, BAR_CAMPAIGN } from '@resonote/api/seed';
import { useDemo } from '../support/demo.ts';
import { screenshot, viewports } from '../support/browser.ts';

const demo = useDemo(BAR_CAMPAIGN);
let zipStatus: number;

beforeAll(async () => {
  const lead = demo.app.agent();
  await lead.post('/api/auth/sign-in/email').send({ email: 'lead@demo.resonote.local', password: DEMO_PASSWORD }).expect(200);
  zipStatus = (await lead.get(`/api/campaigns/${demo.campaign}/export/bundle.zip`).buffer(true).parse((res, cb) => { res.on('data', () => undefined); res.on('end', () => cb(null, null)); })).status;
});

const signedIn = (email: string, viewport: { width: number; height: number } = viewports.laptop) => demo.signIn(email, viewport, { acceptDownloads: true });

describe('the Hand-over screen', () => {
  it('gives the lead the report, the bundles, sharing and backup, and downloads bundle.zip', async () => {
    const { page, errors, close } = await signedIn('lead@demo.resonote.local');
    await page.goto(`${demo.app.baseUrl}/campaigns/${demo.campaign}`);
    await page.getByRole('link', { name: 'Hand-over' }).click();
    await page.waitForURL(/\/handover$/);
    await expect(page.getByRole('link', { name: /Open report/ })).toBeDefinedAndVisible();
    expect(await page.getByRole('link', { name: /Open report/ }).getAttribute('href')).toBe(`/api/campaigns/${demo.campaign}/report.html`);
    expect(await page.getByRole('link', { name: /Open report/ }).getAttribute('target')).toBe('_blank');
    for (const name of ['Download PDF', 'Download bundle.zip', 'Download bundle.json', 'Send', 'Download backup', 'Restore as a new campaign']) {
      await expect(page.getByRole('button', { name })).toBeDefinedAndVisible();
    }
    await expect(page.getByLabel('include raw time data')).toBeDefinedAndVisible();
    const contents = await page.getByTestId('bundle-contents').textContent();
    for (const name of ['geometry.csv', 'schedule.csv', 'frf/', 'modes.csv', 'settings.json', 'README.txt']) expect(contents).toContain(name);
    await expect(page.getByText(/traces back to the hits and the settings/)).toBeDefinedAndVisible();

    // Recipients are checked before anything is sent.
    await page.getByLabel('Recipients').fill('ana@client.test, not-an-address');
    await page.getByRole('button', { name: 'Send' }).click();
    await expect(page.getByText('Not an e-mail address: not-an-address')).toBeDefinedAndVisible();
    await page.evaluate(() => window.scrollTo(0, 0));
    await screenshot(page, 'handover-1366');

    if (zipStatus === 200) {
      const [download] = await Promise.all([page.waitForEvent('download', { timeout: 60_000 }), page.getByRole('button', { name: 'Download bundle.zip' }).click()]);
      const file = await download.path();
      const head = fs.readFileSync(file).subarray(0, 2).toString('latin1');
      expect(head).toBe('PK');
      await expect(page.getByText(/Downloaded .*\.zip/)).toBeDefinedAndVisible();
    } else {
      console.log(`[handover] GET …/export/bundle.zip answered ${zipStatus}; the server part is not in yet, download not checked`);
    }
    expect(errors).toEqual([]);
    await close();
  }, 120_000);

  it('fits the tablet width', async () => {
    const { page, errors, close } = await signedIn('lead@demo.resonote.local', viewports.tablet);
    await page.goto(`${demo.app.baseUrl}/campaigns/${demo.campaign}/handover`);
    await expect(page.getByRole('button', { name: 'Download bundle.zip' })).toBeDefinedAndVisible();
    expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(768);
    await screenshot(page, 'handover-768');
    expect(errors).toEqual([]);
    await close();
  });

  it('shows a viewer the report link only', async () => {
    const { page, errors, close } = await signedIn('viewer@demo.resonote.local');
    await page.goto(`${demo.app.baseUrl}/campaigns/${demo.campaign}/handover`);
    await expect(page.getByRole('link', { name: /Open report/ })).toBeDefinedAndVisible();
    for (const name of ['Download PDF', 'Download bundle.zip', 'Download bundle.json', 'Send', 'Download backup', 'Restore as a new campaign']) {
      expect(await page.getByRole('button', { name }).count(), name).toBe(0);
    }
    expect(await page.getByLabel('Recipients').count()).toBe(0);
    await screenshot(page, 'handover-viewer-1366');
    expect(errors).toEqual([]);
    await close();
  });
});
