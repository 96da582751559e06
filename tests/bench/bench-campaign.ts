// The campaign both database benchmarks start from: a fresh database, one signed-up lead, and the
// steel bar measured by roving hammer against three fixed accelerometers at 12.8 kHz, 16 384 samples.
import { buildCampaign } from '@resonote/api/factory';
import { signedInClient } from '@resonote/api/demo-client';
import { STEEL_BAR, steelBar, steelBarModel, type DemoStructure } from '@resonote/sim';
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

/**
 * The free–free steel bar measured at `count` evenly spaced points B01 … (the simulator's model of
 * STEEL_BAR with these points; steelBar() has 21). 40 points × the three references = 120 DOFs.
 */
export function barWithPoints(count: number): DemoStructure {
  const base = steelBar();
  const lengthMm = STEEL_BAR.lengthM * 1000;
  const points = Array.from({ length: count }, (_, i) => ({ label: `B${String(i + 1).padStart(2, '0')}`, xMm: (i * lengthMm) / (count - 1), yMm: 0, zMm: 0 }));
  const lines = points.slice(1).map((p, i) => [points[i]!.label, p.label] as [string, string]);
  return { ...base, points, lines, model: steelBarModel({ points: points.map((p) => ({ label: p.label, xM: p.xMm / 1000 })) }) };
}

/** Signs up the bench lead (first account: admin) unless it exists, and builds the bench campaign through `baseUrl` (on `bar`, steelBar() by default). */
export async function benchCampaignAt(baseUrl: string, name: string, bar: DemoStructure = steelBar()) {
  const origin = baseUrl;
  const signUp = await fetch(`${baseUrl}/api/auth/sign-up/email`, { method: 'POST', headers: { 'content-type': 'application/json', origin }, body: JSON.stringify({ name: 'Bench Lead', ...BENCH_LEAD }) });
  if (!signUp.ok) {
    const text = await signUp.text();
    if (!text.includes('already exists')) throw new Error(`sign-up: ${signUp.status} ${text}`);
  }
  const client = await signedInClient(baseUrl, origin, BENCH_LEAD.email, BENCH_LEAD.password);
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
