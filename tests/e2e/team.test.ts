// The team and the numbers in the browser: a newcomer's next step, a lead adding an account and
// inviting one that answers in the app, archive/un-archive with the read-only banner and the list
// filter, the CSV preview's bad rows and the good-rows-only import, the reciprocal entry, settings
// history in words, log ticks and the unwrapped phase, the reciprocity check's values. Screenshots
// at 1366×768, 768×1024 and 1024×768.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { BAR_CAMPAIGN, SKID_CAMPAIGN } from '@resonote/api/seed';
import { startDemo, type DemoRun } from '../support/demo.ts';
import { screenshot, settled, viewports, watchConsole } from '../support/browser.ts';
import { signUp } from '../support/accounts.ts';

const wide = { width: 1024, height: 768 };
/** The laptop, the tablet upright and on its side. */
const sizes = [viewports.laptop, viewports.tablet, wide];
let demo: DemoRun;
let skidId: string;
let barId: string;

beforeAll(async () => {
  demo = await startDemo();
  skidId = await demo.campaignId(SKID_CAMPAIGN);
  barId = await demo.campaignId(BAR_CAMPAIGN);
}, 240_000);
afterAll(async () => {
  await demo?.close();
});

async function signUpInBrowser(name: string, email: string, viewport: { width: number; height: number }) {
  const context = await demo.browser.newContext({ viewport, hasTouch: viewport.width < 1100 });
  const page = await context.newPage();
  const errors = watchConsole(page);
  await page.goto(`${demo.app.baseUrl}/sign-up`);
  await page.getByLabel('Name').fill(name);
  await page.getByLabel('E-mail').fill(email);
  await page.getByLabel('Password').fill('correct-horse-battery');
  await page.getByRole('button', { name: 'Create account' }).click();
  await page.waitForURL(/\/campaigns$/);
  return { page, errors, close: () => context.close() };
}

describe('the team in the browser', () => {
  it('tells a newcomer what to do next, and shows a lead’s direct add at once', async () => {
    const newcomer = await signUpInBrowser('Nico Newcomer', 'nico@lab.test', viewports.tablet);
    const hint = newcomer.page.getByTestId('next-step');
    await expect(hint).toHaveTextEventually(/Ask your lead to add nico@lab\.test/);
    await settled(newcomer.page);
    await screenshot(newcomer.page, 'team-newcomer-768');

    const { page, errors, close } = await demo.signIn('lead@demo.resonote.local', viewports.laptop);
    await page.goto(`${demo.app.baseUrl}/campaigns/${skidId}/plan`);
    await page.getByLabel('E-mail address').fill('nico@lab.test');
    await page.getByLabel('Role', { exact: true }).selectOption('viewer');
    await page.getByRole('button', { name: 'Add now' }).click();
    await expect(page.getByText('Nico Newcomer added as viewer.')).toBeDefinedAndVisible();
    await expect(page.getByTestId('members')).toHaveTextEventually(/Nico Newcomer/);
    // An address without an account is told to send an invitation instead, beside the field.
    await page.getByLabel('E-mail address').fill('nobody@lab.test');
    await page.getByRole('button', { name: 'Add now' }).click();
    await expect(page.getByText(/No account here uses nobody@lab\.test/)).toBeDefinedAndVisible();
    await page.getByTestId('members').scrollIntoViewIfNeeded();
    await settled(page);
    await screenshot(page, 'team-members-1366');

    await newcomer.page.reload();
    await expect(newcomer.page.locator('tbody')).toHaveTextEventually(SKID_CAMPAIGN);
    expect(errors.filter((e) => !/status of 404/.test(e))).toEqual([]);
    expect(newcomer.errors).toEqual([]);
    await newcomer.close();
    await close();
  }, 150_000);

  it('lets an invited person accept in the app after signing in with the invited address', async () => {
    await signUp(demo.app, 'Nina Analyst', 'nina@lab.test');
    const lead = await demo.signIn('lead@demo.resonote.local', wide);
    await lead.page.goto(`${demo.app.baseUrl}/campaigns/${barId}/plan`);
    await lead.page.getByLabel('E-mail address').fill('nina@lab.test');
    await lead.page.getByRole('button', { name: 'Send invitation' }).click();
    await expect(lead.page.getByText('Invitation sent to nina@lab.test as engineer.')).toBeDefinedAndVisible();
    await lead.close();

    const context = await demo.browser.newContext({ viewport: wide });
    const page = await context.newPage();
    const errors = watchConsole(page);
    await page.goto(`${demo.app.baseUrl}/sign-in`);
    await page.getByLabel('E-mail').fill('nina@lab.test');
    await page.getByLabel('Password').fill('correct-horse-battery');
    await page.getByRole('button', { name: 'Sign in' }).click();
    const mine = page.getByTestId('my-invitations');
    await expect(mine).toHaveTextEventually(/as engineer, invited by/);
    await settled(page);
    await screenshot(page, 'team-invitation-1024');
    await page.getByRole('button', { name: `Accept the invitation to ${BAR_CAMPAIGN}` }).click();
    await page.waitForURL(new RegExp(`/campaigns/${barId}$`));
    await expect(page.getByTestId('my-role')).toHaveTextEventually('Engineer');
    expect(errors).toEqual([]);
    await context.close();
  });

  it('archives a campaign read-only with a banner, filters the list, and un-archives it', async () => {
    const { page, errors, close } = await demo.signIn('lead@demo.resonote.local', viewports.laptop);
    await page.goto(`${demo.app.baseUrl}/campaigns/${skidId}/plan`);
    await page.getByLabel('Reason (optional)').fill('handed over to the client');
    await page.getByRole('button', { name: 'Archive campaign' }).click();
    const banner = page.getByTestId('archived-banner');
    await expect(banner).toHaveTextEventually(/Archived on .* handed over to the client\. Read-only/);
    // Read-only: no import, no generate, no add.
    expect(await page.getByRole('heading', { name: /Import points from CSV/ }).count()).toBe(0);
    expect(await page.getByRole('button', { name: 'Add now' }).count()).toBe(0);
    await settled(page);
    await screenshot(page, 'team-archived-1366');

    await page.goto(`${demo.app.baseUrl}/campaigns`);
    await expect(page.locator('tbody')).toHaveTextEventually(BAR_CAMPAIGN);
    expect(await page.locator('tbody').textContent()).not.toContain(SKID_CAMPAIGN);
    await page.getByLabel('Show campaigns').selectOption('archived');
    await expect(page.locator('tbody')).toHaveTextEventually(SKID_CAMPAIGN);
    expect(await page.locator('tbody').textContent()).not.toContain(BAR_CAMPAIGN);
    await screenshot(page, 'team-list-archived-1366');

    await page.getByRole('link', { name: SKID_CAMPAIGN }).click();
    await page.getByRole('button', { name: 'Un-archive' }).click();
    await expect(page.getByText(/is active again/)).toBeDefinedAndVisible();
    await page.getByTestId('archived-banner').waitFor({ state: 'detached' });
    expect(errors).toEqual([]);
    await close();
  });

  it('marks bad CSV rows before import, imports the good rows only when asked, and plans a reciprocal entry', async () => {
    const { page, errors, close } = await demo.signIn('lead@demo.resonote.local', viewports.tablet);
    await page.getByRole('button', { name: 'New campaign' }).click();
    await page.getByLabel('Name').fill('Bracket survey');
    await page.getByRole('button', { name: 'Create campaign' }).click();
    await page.waitForURL(/\/campaigns\/[0-9a-f-]+\/plan$/);
    const csv = 'label,x,y,z,directions\nA1,0,0,0,+Z\nA2,100,0,abc,+Z\nA3,200,0,0,+Z\nA3,300,0,0,+Z\n';
    await page.getByTestId('csv-file').setInputFiles({ name: 'bracket.csv', mimeType: 'text/csv', buffer: Buffer.from(csv) });
    const check = page.getByTestId('csv-check');
    await expect(check).toHaveTextEventually(/2 of 4 rows have a problem; 2 are good/);
    expect(await page.locator('[data-bad-row]').count()).toBe(2);
    expect(await page.getByRole('button', { name: /^Import \d+ points?$/ }).isDisabled()).toBe(true);
    await page.getByTestId('skip-bad-rows').check();
    await settled(page);
    await screenshot(page, 'team-csv-bad-rows-768');
    await page.getByRole('button', { name: 'Import 2 points' }).click();
    await expect(page.getByText(/Imported bracket\.csv: 2 added.*2 bad rows skipped/)).toBeDefinedAndVisible();

    await page.getByLabel('Reference DOFs').fill('A1:+Z');
    await page.getByRole('button', { name: 'Save campaign settings' }).click();
    await expect(page.getByText('Campaign settings saved.')).toBeDefinedAndVisible();
    await page.getByRole('button', { name: 'Generate schedule' }).click();
    await expect(page.getByText(/Schedule generated/)).toBeDefinedAndVisible();
    await page.getByRole('button', { name: 'Add the reciprocal of A1:+Z / A3:+Z' }).click();
    await expect(page.locator('tr[data-entry="A3:+Z / A1:+Z"]')).toBeDefinedAndVisible();
    expect(errors).toEqual([]);
    await close();
  });
});

describe('numbers and words in the browser', () => {
  for (const viewport of sizes) {
    const size = `${viewport.width}x${viewport.height}`;
    it(`lists settings changes in words with units on Kit at ${size}`, async () => {
      const { page, errors, close } = await demo.signIn('lead@demo.resonote.local', viewport);
      await page.goto(`${demo.app.baseUrl}/campaigns/${skidId}/kit`);
      const history = page.getByTestId('settings-history');
      await expect(history).toHaveTextEventually(/force window length 20 → 40 ms/);
      expect(await history.textContent()).not.toMatch(/forceWindow\.|lengthS/);
      await history.scrollIntoViewIfNeeded();
      await settled(page);
      await screenshot(page, `numbers-settings-history-${size}`);
      expect(errors).toEqual([]);
      await close();
    });
  }

  for (const viewport of sizes) {
    const size = `${viewport.width}x${viewport.height}`;
    it(`draws log frequency ticks as 10, 20, 50 and the phase unwrapped on request; the reciprocity check has values, at ${size}`, async () => {
      const { page, errors, close } = await demo.signIn('viewer@demo.resonote.local', viewport);
      await page.goto(`${demo.app.baseUrl}/campaigns/${barId}/review`);
      const plot = page.locator('[data-testid="dof-detail"] .js-plotly-plot').first();
      await plot.waitFor({ timeout: 20_000 });
      await page.getByTestId('frequency-choice').getByRole('radio', { name: 'Log' }).click();
      await page.getByTestId('phase-choice').getByRole('radio', { name: 'Unwrapped' }).click();
      // Both choices redraw the plot: wait until the log ticks and the unwrapped phase axis are drawn.
      await page.waitForFunction(() => {
        const texts = (sel: string) => Array.from(document.querySelectorAll(`[data-testid="dof-detail"] ${sel}`)).map((t) => t.textContent ?? '');
        return texts('.xtick text').includes('100') && texts('.y2tick text').some((t) => Number(t.replace('−', '-')) < -180);
      });
      const ticks = await page.locator('[data-testid="dof-detail"] .xtick text').allTextContents();
      expect(ticks.some((t) => /\.00$/.test(t))).toBe(false);
      // Unwrapped: the phase axis is no longer held to ±180°.
      const phaseTicks = (await page.locator('[data-testid="dof-detail"] .y2tick text').allTextContents()).map((t) => Number(t.replace('−', '-')));
      expect(Math.min(...phaseTicks)).toBeLessThan(-180);
      await settled(page);
      await screenshot(page, `numbers-review-log-unwrapped-${size}`);

      await page.goto(`${demo.app.baseUrl}/campaigns/${skidId}/review?view=checks`);
      const checks = page.getByTestId('checks');
      await expect(checks).toHaveTextEventually(/P07:\+Z/);
      await settled(page);
      await screenshot(page, `numbers-reciprocity-${size}`);
      expect(errors).toEqual([]);
      await close();
    });
  }

  for (const viewport of sizes) {
    const size = `${viewport.width}x${viewport.height}`;
    it(`draws flagged points in 3D with the legend’s ✖ at ${size}`, async () => {
      const { page, errors, close } = await demo.signIn('lead@demo.resonote.local', viewport);
      await page.goto(`${demo.app.baseUrl}/campaigns/${skidId}`);
      // The legend is SVG over the 3D canvas; it lists Flagged once the geometry and the schedule are drawn.
      const legend = page.locator('.js-plotly-plot .legend').first();
      await legend.waitFor({ timeout: 30_000 });
      await expect(legend).toHaveTextEventually('Flagged');
      await settled(page);
      await screenshot(page, `numbers-overview-3d-${size}`);
      expect(errors).toEqual([]);
      await close();
    });
  }
});

describe('team screens at every size', () => {
  for (const viewport of sizes) {
    const size = `${viewport.width}x${viewport.height}`;
    it(`lays out members, invitations, archive/delete and the list filter without overflow at ${size}`, async () => {
      const name = `Size check ${size}`;
      const invitee = `invitee-${viewport.width}@lab.test`;
      await signUp(demo.app, `Ivo ${viewport.width}`, invitee);
      const { page, errors, close } = await demo.signIn('lead@demo.resonote.local', viewport);
      const noSideways = async (what: string) => expect(await page.evaluate(() => document.documentElement.scrollWidth), `${what} fits ${viewport.width} px`).toBeLessThanOrEqual(viewport.width);
      try {
        await page.goto(`${demo.app.baseUrl}/campaigns`);
        const created = await page.evaluate(async (n) => (await (await fetch('/api/campaigns', { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ name: n }) })).json()) as { campaign: { id: string } }, name);
        const id = created.campaign.id;

        // Members and invitations: an invitation to an account that exists shows among the open ones.
        await page.goto(`${demo.app.baseUrl}/campaigns/${id}/plan`);
        await page.getByLabel('E-mail address').fill(invitee);
        await page.getByRole('button', { name: 'Send invitation' }).click();
        await expect(page.getByText(`Invitation sent to ${invitee} as engineer.`)).toBeDefinedAndVisible();
        await expect(page.getByText(invitee, { exact: false }).first()).toBeDefinedAndVisible();
        await expect(page.getByTestId('members')).toHaveTextEventually(/Lena Lead/);
        await page.getByTestId('members').scrollIntoViewIfNeeded();
        await settled(page);
        await noSideways('the members card');
        await screenshot(page, `team-members-invitations-${size}`);

        // The invited person sees it in the app after signing in.
        const context = await demo.browser.newContext({ viewport });
        const other = await context.newPage();
        const otherErrors = watchConsole(other);
        await other.goto(`${demo.app.baseUrl}/sign-in`);
        await other.getByLabel('E-mail').fill(invitee);
        await other.getByLabel('Password').fill('correct-horse-battery');
        await other.getByRole('button', { name: 'Sign in' }).click();
        await expect(other.getByTestId('my-invitations')).toHaveTextEventually(new RegExp(`${name}.*as engineer, invited by`));
        // The empty list below points to that invitation instead of telling them to ask a lead.
        await expect(other.getByTestId('campaigns-empty')).toHaveTextEventually(/one invitation waits for you/);
        const step = (await other.getByTestId('next-step').textContent()) ?? '';
        expect(step).toBe(`Accept the invitation to “${name}” above to join it as engineer; it then shows in this list.`);
        expect(step).not.toMatch(/ask your lead/i);
        const [invBox, emptyBox] = [await other.getByTestId('my-invitations').boundingBox(), await other.getByTestId('campaigns-empty').boundingBox()];
        expect(invBox!.y + invBox!.height, 'the invitation sits above the empty list').toBeLessThanOrEqual(emptyBox!.y);
        await settled(other);
        expect(await other.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(viewport.width);
        await screenshot(other, `team-my-invitation-${size}`);
        expect(otherErrors).toEqual([]);
        await context.close();

        // Archive: the banner, read-only; the list filters by status.
        const card = page.getByRole('button', { name: 'Archive campaign' });
        await card.scrollIntoViewIfNeeded();
        await settled(page);
        await noSideways('the archive card');
        await screenshot(page, `team-lifecycle-${size}`);
        await page.getByLabel('Reason (optional)').fill('size check over');
        await card.click();
        await expect(page.getByTestId('archived-banner')).toHaveTextEventually(/Archived on .* size check over\. Read-only/);
        await settled(page);
        await noSideways('the archived banner');
        await screenshot(page, `team-archived-${size}`);
        await page.goto(`${demo.app.baseUrl}/campaigns`);
        await page.getByLabel('Show campaigns').selectOption('archived');
        await expect(page.locator('tbody')).toHaveTextEventually(name);
        await settled(page);
        await noSideways('the campaign list');
        await screenshot(page, `team-list-archived-${size}`);

        // Delete (no hits were recorded): after the question, back to the list without it.
        await page.getByRole('link', { name }).click();
        page.once('dialog', (d) => void d.accept());
        await page.getByRole('button', { name: 'Delete…' }).click();
        await page.waitForURL(/\/campaigns$/);
        await expect(page.getByText(`“${name}” deleted.`)).toBeDefinedAndVisible();
        expect(errors.filter((e) => !/status of 404/.test(e))).toEqual([]);
      } finally {
        await close();
      }
    }, 150_000);
  }
});
