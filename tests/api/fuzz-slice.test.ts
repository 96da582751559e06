// A fixed-seed slice of the fuzz run (`npm run fuzz` runs ≥ 10 000 cases): 300 mutated
// recordings, geometry CSVs and backup zips against the real API and database. None may answer
// 5xx, hang past the per-request timeout, or refuse outside the one error shape.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startTestApp, type TestApp } from '../support/app.ts';
import { API_TEMPLATE } from '../support/global-setup-api.ts';
import { histogramLines, prepareFuzzTarget, runFuzz, type FuzzTarget } from '../fuzz/harness.ts';

let app: TestApp & { baseUrl: string };
let target: FuzzTarget;

beforeAll(async () => {
  app = await startTestApp(API_TEMPLATE, { UPLOAD_LIMIT_MB: '8' }, { listen: true });
  target = await prepareFuzzTarget(app);
}, 120_000);
afterAll(async () => {
  await app?.close();
});

describe('fuzzed input (fixed seed)', () => {
  it('answers 300 mutated uploads, imports and restores below 500, in time, every refusal in the one error shape', async () => {
    const result = await runFuzz(target, { seed: 13, cases: 300, timeoutMs: 20_000, maxMs: 170_000 });
    expect(result.failures, histogramLines(result).join('\n')).toEqual([]);
    expect(result.cases).toBe(300);
    // The slice reaches every target, and some mutated files are still valid (2xx) while most are refused (4xx).
    const targets = new Set([...result.byTarget.keys()].map((k) => k.split(' ')[0]));
    expect([...targets].sort()).toEqual(['geometry', 'hits', 'noise', 'restore']);
    const classes = [...result.byStatus.keys()].map((s) => s[0]);
    expect(classes).toContain('2');
    expect(classes).toContain('4');
  }, 200_000);
});
