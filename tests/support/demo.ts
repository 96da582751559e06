// The browser tests' shared start: the real API on a fresh database with the demo seeded, one
// chromium, and a sign-in through the real form in a new browser context.
import { eq } from 'drizzle-orm';
import type { Browser, BrowserContextOptions, Page } from 'playwright-core';
import { campaign } from '@resonote/db/schema';
import { seedDemo, DEMO_PASSWORD } from '@resonote/api/seed';
import { startTestApp, type TestApp } from './app.ts';
import { launchBrowser, viewports, watchConsole } from './browser.ts';

export interface DemoRun {
  app: TestApp & { baseUrl: string };
  browser: Browser;
  /** The id of the demo campaign with this name. */
  campaignId(name: string): Promise<string>;
  /** Signs a demo account in through the form; `errors` collects what the page logs as errors. */
  signIn(email: string, viewport?: { width: number; height: number }, options?: BrowserContextOptions): Promise<{ page: Page; errors: string[]; close: () => Promise<void> }>;
  close(): Promise<void>;
}

export async function startDemo(): Promise<DemoRun> {
  // RESONOTE_WEB_DIST lets a run use its own build while someone else rebuilds apps/web/dist.
  const app = await startTestApp('resonote_tpl_e2e', process.env.RESONOTE_WEB_DIST ? { WEB_DIST: process.env.RESONOTE_WEB_DIST } : {}, { listen: true });
  await seedDemo(app.handle, { log: () => undefined });
  const browser = await launchBrowser();
  return {
    app,
    browser,
    async campaignId(name) {
      const [row] = await app.handle.database.db.select({ id: campaign.id }).from(campaign).where(eq(campaign.name, name));
      if (!row) throw new Error(`no demo campaign named ${name}`);
      return row.id;
    },
    async signIn(email, viewport = viewports.laptop, options = {}) {
      const context = await browser.newContext({ viewport, hasTouch: viewport.width < 1100, ...options });
      const page = await context.newPage();
      const errors = watchConsole(page);
      await page.goto(`${app.baseUrl}/sign-in`);
      await page.getByLabel('E-mail').fill(email);
      await page.getByLabel('Password').fill(DEMO_PASSWORD);
      await page.getByRole('button', { name: 'Sign in' }).click();
      await page.waitForURL(/\/campaigns$/);
      return { page, errors, close: () => context.close() };
    },
    async close() {
      await browser.close();
      await app.close();
    },
  };
}
