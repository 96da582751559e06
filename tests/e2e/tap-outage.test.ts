// The Tap screen while the server cannot take hits: a strike whose request first gets 503 (the
// database restarting) and then no answer at all is kept, announced in a banner in words above the
// plots, sent again with the same Idempotency-Key until the server has it, and stored once. With
// no hit pending, the screen says the same when /api/health reports the database unreachable.
import { describe, expect, it } from 'vitest';
import { eq } from 'drizzle-orm';
import { hit } from '@resonote/db/schema';
import { SKID_CAMPAIGN } from '@resonote/api/seed';
import { useDemo } from '../support/demo.ts';
import { screenshot, viewports } from '../support/browser.ts';

const demo = useDemo(SKID_CAMPAIGN);

describe('Tap while the server cannot take hits', () => {
  // No retry: the states are awaited in order, never timed.
  it('keeps a strike through a 503 and a dropped connection, says so in a banner, and stores it once with the same key', { retry: 0, timeout: 120_000 }, async () => {
    const { page, errors, close } = await demo.signIn('engineer@demo.resonote.local', viewports.laptop);
    const keys: string[] = [];
    let tries = 0;
    // Each next try is held until the test has seen the banner of the one before, so the states
    // are checked in order however slow the machine is.
    const gate = () => {
      let open = () => {};
      const opened = new Promise<void>((r) => (open = r));
      return { open, opened };
    };
    const secondTry = gate();
    const thirdTry = gate();
    await page.route('**/simulate', async (route) => {
      const body = JSON.parse(route.request().postData() ?? '{}') as { idempotencyKey?: string };
      keys.push(body.idempotencyKey ?? '');
      tries += 1;
      // Try 1: the server answers 503 as it does while PostgreSQL restarts; try 2: no answer.
      if (tries === 1) return route.fulfill({ status: 503, headers: { 'retry-after': '1', 'content-type': 'application/json' }, body: JSON.stringify({ error: { code: 'database-unavailable', message: 'The database cannot be reached at the moment (it may be restarting).' } }) });
      if (tries === 2) {
        await secondTry.opened;
        return route.abort('connectionrefused');
      }
      await thirdTry.opened;
      return route.continue({ postData: JSON.stringify({ ...body, seed: 8101 }) });
    });
    try {
      await page.goto(`${demo.app.baseUrl}/campaigns/${demo.campaign}/tap`);
      await page.waitForURL(/\/tap\?entry=/);
      const entryId = new URL(page.url()).searchParams.get('entry')!;
      await page.getByTestId('current-dof').waitFor({ timeout: 30_000 });
      await page.getByText(/No hits at this DOF yet|^#$/).first().waitFor();
      const rows = page.locator('[data-testid="hit-list"] tbody tr');
      const storedAtEntry = () => demo.app.handle.database.db.select({ key: hit.idempotencyKey }).from(hit).where(eq(hit.scheduleEntryId, entryId));
      const already = (await storedAtEntry()).length;

      await page.getByTestId('strike').click();
      const banner = page.getByTestId('server-banner');
      await page.locator('[data-testid="server-banner"][data-reason="unavailable"]').waitFor({ timeout: 15_000 });
      expect(await banner.textContent()).toMatch(/database is not answering.*sent again automatically with the same key, so it is stored exactly once/);
      await screenshot(page, 'tap-server-banner-503');
      secondTry.open();
      await page.locator('[data-testid="server-banner"][data-reason="unreachable"]').waitFor({ timeout: 15_000 });
      expect(await banner.textContent()).toMatch(/The server cannot be reached/);
      thirdTry.open();

      // The third try reaches the server: the hit appears and the banner goes.
      await rows.nth(already).waitFor({ timeout: 30_000 });
      await banner.waitFor({ state: 'detached', timeout: 15_000 });
      expect(tries).toBe(3);
      expect(new Set(keys).size).toBe(1);
      const stored = await storedAtEntry();
      expect(stored.filter((h) => h.key === keys[0])).toHaveLength(1);
      expect(stored).toHaveLength(already + 1);

      // Idle, with /api/health reporting the database unreachable: the banner says so by itself.
      await page.route('**/api/health', (route) => route.fulfill({ status: 503, headers: { 'retry-after': '3', 'content-type': 'application/json' }, body: JSON.stringify({ status: 'degraded', database: { status: 'unreachable', since: new Date().toISOString() } }) }));
      await page.locator('[data-testid="server-banner"][data-reason="unavailable"]').waitFor({ timeout: 20_000 });
      expect(await banner.textContent()).toMatch(/Hits you record now are kept and sent as soon as the server answers again/);
      await page.unroute('**/api/health');
      await banner.waitFor({ state: 'detached', timeout: 20_000 });

      // Only the responses the test forced were errors in the console (and the 404 of the averaged
      // FRF an entry has before its first accepted hit, as in tap.test.ts).
      expect(errors.filter((e) => !/status of (503|404)|net::ERR_CONNECTION_REFUSED/.test(e)), JSON.stringify(errors)).toEqual([]);
    } finally {
      await close();
    }
  });
});
