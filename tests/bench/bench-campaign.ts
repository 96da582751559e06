// The campaign both database benchmarks start from: a fresh database, one signed-up lead, and the
// steel bar measured by roving hammer against three fixed accelerometers at 12.8 kHz, 16 384 samples.
import { buildCampaign } from '@resonote/api/factory';
import { signedInClient } from '@resonote/api/demo-client';
import { steelBar } from '@resonote/sim';
import { startTestApp } from '../support/app.ts';
import { createTemplate } from '../support/db.ts';

export const BENCH_REFS = ['B21:+Z', 'B11:+Z', 'B01:+Z'];

export async function benchCampaign(template: string, name: string) {
  await createTemplate(template);
  const app = await startTestApp(template, {}, { listen: true });
  const { client, bar, built } = await benchCampaignAt(app.baseUrl, name);
  return { app, client, bar, built };
}

export const BENCH_LEAD = { email: 'bench@lab.test', password: 'bench-password-1' };

/** Signs up the bench lead (first account: admin) unless it exists, and builds the bench campaign through `baseUrl`. */
export async function benchCampaignAt(baseUrl: string, name: string) {
  const origin = baseUrl;
  const signUp = await fetch(`${baseUrl}/api/auth/sign-up/email`, { method: 'POST', headers: { 'content-type': 'application/json', origin }, body: JSON.stringify({ name: 'Bench Lead', ...BENCH_LEAD }) });
  if (!signUp.ok) {
    const text = await signUp.text();
    if (!text.includes('already exists')) throw new Error(`sign-up: ${signUp.status} ${text}`);
  }
  const client = await signedInClient(baseUrl, origin, BENCH_LEAD.email, BENCH_LEAD.password);
  const bar = steelBar();
  const built = await buildCampaign(client, {
    name,
    structure: 'bar',
    client: 'bench',
    testType: 'roving-hammer',
    referenceDofs: BENCH_REFS,
    simulator: 'steel-bar',
    points: bar.points,
    directions: ['+Z'],
    lines: bar.lines,
    hammer: { model: 'H', serial: '1', sensitivity: 2.25, sensitivityUnit: 'mV/N', tips: [] },
    accelerometers: BENCH_REFS.map((dof, i) => ({ model: 'A', serial: `A${i}`, sensitivity: 10.2, sensitivityUnit: 'mV/(m/s²)' as const, dof })),
    settings: { sampleRateHz: 12800, recordLengthS: 1.28, preTriggerS: 0.005, triggerLevelN: 5, forceWindow: { lengthS: 0.01, taperS: 0.001 }, exponentialWindow: { mode: 'end-level', endLevelPercent: 1 }, hitsToAverage: 5, bandHz: { low: 10, high: 2000 }, estimator: 'H1', doubleHitRatio: 0.04, overloadPercent: 99, rollOffDb: 20, coherenceThreshold: 0.9, minPeakN: 10, forceRangeN: 2000, responseRangeMs2: 500 },
  });
  return { client, bar, built };
}
