// Review's reciprocity and linearity checks stay current while hits arrive, and the page asks for
// them (GET …/checks, which reads every entry's result) only for hits that can change them: a viewer
// keeps Review open while an engineer strikes the pump-skid baseplate in another browser.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { SKID_CAMPAIGN } from '@resonote/api/seed';
import { startDemo, type DemoRun } from '../support/demo.ts';
import { screenshot, settled, viewports } from '../support/browser.ts';

let demo: DemoRun;
let skidId: string;

beforeAll(async () => {
  demo = await startDemo();
  skidId = await demo.campaignId(SKID_CAMPAIGN);
}, 240_000);
afterAll(async () => {
  await demo?.close();
});

type Entry = { id: string; responseDof: string; excitationDof: string; drivingPoint: boolean; acceptedHits: number; requiredHits: number };

async function call(page: Page, method: string, path: string, body?: unknown): Promise<{ status: number; body: any }> {
  return page.evaluate(
    async ({ method, path, body }) => {
      const r = await fetch(`/api${path}`, { method, headers: body === undefined ? undefined : { 'content-type': 'application/json' }, body: body === undefined ? undefined : JSON.stringify(body) });
      return { status: r.status, body: await r.json().catch(() => null) };
    },
    { method, path, body },
  );
}

const isChecks = (url: string) => new URL(url).pathname === `/api/campaigns/${skidId}/checks`;

describe('Review checks while hits arrive', () => {
  it('asks for the checks once per hit that can change them, and shows the new linearity and reciprocity figures', async () => {
    const viewer = await demo.signIn('viewer@demo.resonote.local', viewports.laptop);
    const engineer = await demo.signIn('engineer@demo.resonote.local', viewports.laptop);
    const checkRequests: string[] = [];
    viewer.page.on('request', (r) => {
      if (isChecks(r.url())) checkRequests.push(r.url());
    });

    const { entries } = (await call(engineer.page, 'GET', `/campaigns/${skidId}/schedule`)).body as { entries: Entry[] };
    // The seed measures the first 13 entries and the reciprocal of the 4th (lib seed.ts): a later
    // roving entry has no hit and nobody's reciprocal; the 4th has its reciprocal measured.
    const fresh = entries.find((e, i) => i > 13 && e.acceptedHits === 0 && !e.drivingPoint)!;
    const paired = entries[3]!;
    expect(fresh).toBeDefined();
    expect(paired.acceptedHits).toBeGreaterThan(0);

    let seed = 7000;
    const strike = async (e: Entry, peakForceN: number) => {
      const r = await call(engineer.page, 'POST', `/campaigns/${skidId}/schedule/${e.id}/simulate`, { count: 1, seed: seed++, tip: 'soft', peakForceN, doubleHitProbability: 0, overloadProbability: 0, idempotencyKey: `e2e-checks-${seed}` });
      expect(r.status).toBe(201);
      return r.body.entry.acceptedHits as number;
    };
    const hitsCell = (e: Entry) => viewer.page.locator(`[data-testid="entry-list"] tr[data-entry="${e.id}"] td:last-child`);
    const waitForCount = (e: Entry, n: number) => hitsCell(e).filter({ hasText: new RegExp(`^${n}/`) }).waitFor({ timeout: 20_000 });

    // The One DOF view does not read the checks at all, hits or not.
    await viewer.page.goto(`${demo.app.baseUrl}/campaigns/${skidId}/review`);
    await viewer.page.locator('[data-testid="dof-detail"] .js-plotly-plot').first().waitFor({ timeout: 20_000 });
    expect(await strike(fresh, 60)).toBe(1);
    await waitForCount(fresh, 1);
    expect(checkRequests).toHaveLength(0);

    await viewer.page.getByRole('tab', { name: 'Reciprocity and linearity' }).click();
    await viewer.page.getByTestId('checks').waitFor({ timeout: 30_000 });
    expect(checkRequests).toHaveLength(1);
    const linearity = viewer.page.getByTestId('linearity-checks');
    const reciprocity = viewer.page.getByTestId('reciprocity-checks');
    const label = (e: Entry) => `${e.responseDof} / ${e.excitationDof}`;
    expect(await linearity.innerText()).not.toContain(label(fresh));

    // Hits 2 and 3 at an entry with no reciprocal: fewer than 4 accepted hits give no linearity line
    // (apps/api/src/hits/checks.ts entryLinearity), so the checks cannot change and are not read.
    for (const n of [2, 3]) {
      expect(await strike(fresh, 60)).toBe(n);
      await waitForCount(fresh, n);
    }
    // Hit 4 at 150 N: the medians of the lighter and heavier halves are 60 N and 150 N, a ratio of
    // 2.5 ≥ 1.5, so the entry gets its linearity line. The notices are applied one after the
    // other, so this read also shows that hits 2 and 3 made none.
    const fourth = viewer.page.waitForResponse((r) => isChecks(r.url()) && r.status() === 200, { timeout: 30_000 });
    expect(await strike(fresh, 150)).toBe(4);
    await fourth;
    await linearity.getByText(label(fresh)).waitFor({ timeout: 20_000 });
    expect(checkRequests).toHaveLength(2);
    const line = await linearity.locator('tr', { hasText: label(fresh) }).innerText();
    expect(line).toMatch(/ N \/ 1\d\d N/); // the heavier half's median force, about 150 N

    // Three hits at the entry whose reciprocal is measured: each changes its averaged FRF and so the
    // reciprocity figures, and each is read once.
    const pairRow = () => reciprocity.locator('tbody').innerText();
    const before = await pairRow();
    for (let k = 1; k <= 3; k++) {
      const answer = viewer.page.waitForResponse((r) => isChecks(r.url()) && r.status() === 200, { timeout: 30_000 });
      expect(await strike(paired, 60)).toBe(paired.acceptedHits + k);
      await answer;
      await waitForCount(paired, paired.acceptedHits + k);
    }
    await settled(viewer.page);
    expect(checkRequests).toHaveLength(5);
    expect(await pairRow()).not.toBe(before);
    await screenshot(viewer.page, 'review-checks-1366');
    expect(viewer.errors).toEqual([]);
    await viewer.close();
    await engineer.close();
  }, 180_000);
});
