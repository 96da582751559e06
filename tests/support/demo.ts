// The browser tests' shared start: the real API on a fresh database with the demo seeded, one
// chromium, and a sign-in through the real form in a new browser context.
import { eq } from 'drizzle-orm';
import { afterAll, beforeAll } from 'vitest';
import type { Browser, BrowserContextOptions } from 'playwright-core';
import { campaign } from '@resonote/db/schema';
import { seedDemo, DEMO_PASSWORD } from '@resonote/api/seed';
import { startTestApp, type TestApp } from './app.ts';
import { launchBrowser, viewports } from './browser.ts';
import { signInThroughForm, type SignedInPage } from './sign-in.ts';

export interface DemoRun {
  app: TestApp & { baseUrl: string };
  browser: Browser;
  /** The id of the demo campaign with this name. */
  campaignId(name: string): Promise<string>;
  /** Signs a demo account in through the form; `errors` collects what the page logs as errors. */
  signIn(email: string, viewport?: { width: number; height: number }, options?: BrowserContextOptions): Promise<SignedInPage>;
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
    // Below 1100 px the context is a touch device, as a tablet.
    signIn: (email, viewport = viewports.laptop, options = {}) =>
      signInThroughForm(browser, app.baseUrl, email, DEMO_PASSWORD, viewport, { hasTouch: viewport.width < 1100, ...options }),
    async close() {
      await browser.close();
      await app.close();
    },
  };
}

/** The demo of one test file, and the id of the campaign named in `useDemo`. */
export interface DemoFile extends DemoRun {
  /** The id of the demo campaign `useDemo` was given (read once in beforeAll). */
  readonly campaign: string;
}

/**
 * Starts the demo for this test file in a beforeAll (240 s: the seed simulates every hit) and closes
 * it in an afterAll. The object answers from inside tests and later hooks; before the demo is up, any
 * use throws. `campaignName` (a demo campaign, e.g. SKID_CAMPAIGN) gives `campaign`, its id.
 */
export function useDemo(campaignName?: string): DemoFile {
  let run: DemoRun | null = null;
  let id: string | null = null;
  const started = (): DemoRun => {
    if (!run) throw new Error('the demo is not started yet: use it inside a test or a hook after useDemo');
    return run;
  };
  beforeAll(async () => {
    run = await startDemo();
    if (campaignName) id = await run.campaignId(campaignName);
  }, 240_000);
  afterAll(async () => {
    await run?.close();
  });
  return {
    get app() {
      return started().app;
    },
    get browser() {
      return started().browser;
    },
    get campaign() {
      if (id === null) throw new Error(campaignName ? 'the demo is not started yet' : 'useDemo was given no campaign name');
      return id;
    },
    campaignId: (name) => started().campaignId(name),
    signIn: (...args) => started().signIn(...args),
    close: () => started().close(),
  };
}
