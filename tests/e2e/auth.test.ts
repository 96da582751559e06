// Sign-up, sign-in, sign-out and a wrong password in the real browser, against the built web app
// served by the real API.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser } from 'playwright-core';
import { startTestApp, type TestApp } from '../support/app.ts';
import { launchBrowser, screenshot, settled, viewports, watchConsole } from '../support/browser.ts';

let app: TestApp & { baseUrl: string };
let browser: Browser;

beforeAll(async () => {
  app = await startTestApp('resonote_tpl_e2e', {}, { listen: true });
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
  await app?.close();
});

describe('signing in and out in the browser', () => {
  it('signs up, lands on the empty campaign list, signs out, refuses a wrong password and signs in again', async () => {
    const context = await browser.newContext({ viewport: viewports.laptop });
    const page = await context.newPage();
    const errors = watchConsole(page);

    await page.goto(`${app.baseUrl}/campaigns`);
    await page.waitForURL(/\/sign-in\?next=/);
    await page.getByRole('heading', { name: 'Sign in' }).waitFor();
    await screenshot(page, 'sign-in-1366');

    await page.getByRole('link', { name: 'Create an account' }).click();
    await page.getByLabel('Name').fill('Ines Impact');
    await page.getByLabel('E-mail').fill('ines@lab.test');
    await page.getByLabel('Password').fill('short');
    await page.getByRole('button', { name: 'Create account' }).click();
    await expect(page.getByText('Use at least 10 characters.')).toBeDefinedAndVisible();
    await page.getByLabel('Password').fill('a-long-enough-password');
    await page.getByRole('button', { name: 'Create account' }).click();

    await page.waitForURL(/\/campaigns$/);
    await page.getByTestId('campaigns-empty').waitFor();
    expect(await page.getByTestId('user-name').textContent()).toBe('Ines Impact');
    // The first account on the instance is its admin and sees the captured mail.
    await expect(page.getByRole('link', { name: 'Mail' })).toBeDefinedAndVisible();
    await screenshot(page, 'campaigns-empty-1366');

    await page.getByRole('link', { name: 'Mail' }).click();
    await page.getByText('Confirm your e-mail address for Resonote').waitFor();
    await screenshot(page, 'admin-mail-1366');

    await page.getByRole('button', { name: 'Sign out' }).click();
    await page.waitForURL(/\/sign-in$/);

    await page.getByLabel('E-mail').fill('ines@lab.test');
    await page.getByLabel('Password').fill('not-my-password');
    await page.getByRole('button', { name: 'Sign in' }).click();
    await page.getByRole('alert').waitFor();
    expect(await page.getByRole('alert').textContent()).toContain('The e-mail address or the password is wrong.');
    await screenshot(page, 'sign-in-wrong-password-1366');

    await page.getByLabel('Password').fill('a-long-enough-password');
    await page.getByRole('button', { name: 'Sign in' }).click();
    await page.waitForURL(/\/campaigns$/);
    await page.getByTestId('campaigns-empty').waitFor();

    expect(errors).toEqual([]);
    await context.close();
  });

  it('shows the sign-in page and the signed-in shell at tablet width, in the dark theme too', async () => {
    const context = await browser.newContext({ viewport: viewports.tablet });
    const page = await context.newPage();
    await page.goto(`${app.baseUrl}/sign-in`);
    await page.getByRole('heading', { name: 'Sign in' }).waitFor();
    await screenshot(page, 'sign-in-768');
    await page.getByLabel('E-mail').fill('ines@lab.test');
    await page.getByLabel('Password').fill('a-long-enough-password');
    await page.getByRole('button', { name: 'Sign in' }).click();
    await page.getByTestId('campaigns-empty').waitFor();
    await screenshot(page, 'campaigns-empty-768');
    await page.getByRole('button', { name: /Switch to the dark theme/ }).click();
    expect(await page.evaluate(() => document.documentElement.dataset.theme)).toBe('dark');
    await settled(page); // the colour transitions finish before the picture
    await screenshot(page, 'campaigns-empty-768-dark');
    await context.close();
  });
});
