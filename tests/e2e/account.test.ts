// The account page with personal API tokens, and arming a DOF on Tap, in the real browser
// against the seeded demo (issue 16).
import { describe, expect, it } from 'vitest';
import { useDemo } from '../support/demo.ts';
import { screenshot, viewports } from '../support/browser.ts';
import { SKID_CAMPAIGN } from '@resonote/api/seed';

const demo = useDemo();

describe('account page and armed DOFs', () => {
  it('creates a token shown once, lists it, revokes it, and arms a DOF on Tap for everyone to see', async () => {
    const { page, errors, close } = await demo.signIn('engineer@demo.resonote.local', viewports.laptop);
    try {
      await page.getByTestId('user-name').click();
      await page.waitForURL(/\/account$/);
      await page.getByRole('heading', { name: 'Your account' }).waitFor();
      await page.getByLabel('Name').fill('bridge on the test PC');
      await page.getByLabel('Expires after (days)').fill('30');
      await page.getByRole('button', { name: 'Create token' }).click();
      const secret = await page.getByLabel('New token').textContent();
      expect(secret).toMatch(/^rn_[A-Za-z0-9_-]{43}$/);
      await page.getByRole('cell', { name: 'bridge on the test PC', exact: true }).waitFor();
      await page.getByRole('cell', { name: `${secret!.slice(0, 9)}…` }).waitFor();
      await screenshot(page, 'account-tokens-1366');

      page.once('dialog', (d) => void d.accept());
      await page.getByRole('button', { name: 'Revoke bridge on the test PC' }).click();
      await page.getByText(/^Revoked /).waitFor();
      // Leaving and coming back: the secret is not shown again.
      await page.getByRole('button', { name: 'I have copied it' }).click();
      expect(await page.getByLabel('New token').count()).toBe(0);

      const skidId = await demo.campaignId(SKID_CAMPAIGN);
      await page.goto(`${demo.app.baseUrl}/campaigns/${skidId}/tap`);
      await page.waitForURL(/\/tap\?entry=/);
      await page.getByRole('button', { name: /^Arm / }).click();
      await page.getByText(/^Armed: your bridge’s files go to/).waitFor();
      await page.getByRole('list', { name: 'Armed DOFs' }).getByText(/Emil Engineer:/).waitFor();
      await screenshot(page, 'tap-armed-1366');
      // A DOF with no accepted hit yet answers its FRF request 200 with that state in words: no error to filter.
      expect(errors).toEqual([]);
    } finally {
      await close();
    }

    const tablet = await demo.signIn('viewer@demo.resonote.local', viewports.tablet);
    try {
      // A viewer sees who armed what but has no Arm button.
      const skidId = await demo.campaignId(SKID_CAMPAIGN);
      await tablet.page.goto(`${demo.app.baseUrl}/campaigns/${skidId}/tap`);
      await tablet.page.getByRole('list', { name: 'Armed DOFs' }).getByText(/Emil Engineer:/).waitFor();
      expect(await tablet.page.getByRole('button', { name: /^Arm / }).count()).toBe(0);
      await tablet.page.goto(`${demo.app.baseUrl}/account`);
      await tablet.page.getByRole('heading', { name: 'Your account' }).waitFor();
      await tablet.page.getByText('You have no API tokens yet.').waitFor();
      await screenshot(tablet.page, 'account-tokens-768');
      expect(tablet.errors).toEqual([]);
    } finally {
      await tablet.close();
    }
  }, 240_000);
});
