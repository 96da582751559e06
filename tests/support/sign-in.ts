// Signing in through the real form in a fresh browser context: what every browser test does first.
import type { Browser, BrowserContextOptions, Page } from 'playwright-core';
import { viewports, watchConsole } from './browser.ts';

export interface SignedInPage {
  page: Page;
  /** What the page logs as errors (see watchConsole); a test expects it to stay empty. */
  errors: string[];
  close: () => Promise<void>;
}

/**
 * Opens a new context of `browser` at `viewport` (with `options`, e.g. hasTouch), signs `email` in with
 * `password` on `${baseUrl}/sign-in` and waits for the campaign list.
 */
export async function signInThroughForm(
  browser: Browser,
  baseUrl: string,
  email: string,
  password: string,
  viewport: { width: number; height: number } = viewports.laptop,
  options: BrowserContextOptions = {},
): Promise<SignedInPage> {
  const context = await browser.newContext({ viewport, ...options });
  const page = await context.newPage();
  const errors = watchConsole(page);
  await page.goto(`${baseUrl}/sign-in`);
  await page.getByLabel('E-mail').fill(email);
  await page.getByLabel('Password').fill(password);
  await page.getByRole('button', { name: 'Sign in' }).click();
  await page.waitForURL(/\/campaigns$/);
  return { page, errors, close: () => context.close() };
}
