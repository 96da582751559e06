// The demo seed (design.md, "Demo scenario"): role-named accounts and two invented campaigns —
// a free-free steel calibration bar, fully measured, and a pump-skid baseplate for a fictional
// client, part way through. Hits come from the simulator (@resonote/sim) through the same API
// and checks as real ones. Idempotent: what exists is left as it is.
import { eq } from 'drizzle-orm';
import { createRng, pumpSkidBaseplate, simulateHit, steelBar } from '@resonote/sim';
import { DEMO_MODEL_STIFFNESS_FACTOR, feModelCsvFromStructure } from './demo/fe-model.ts';
import { campaign, campaignMember, user } from '@resonote/db/schema';
import type { AppHandle } from './app.ts';
import { buildCampaign, type CampaignSpec } from './demo/factory.ts';
import { signedInClient, withLoopback } from './demo/client.ts';
import { encodeWav } from './hits/recording.ts';

export const DEMO_PASSWORD = 'resonote-demo-2026';

export const demoAccounts = [
  { role: 'admin', name: 'Ada Admin', email: 'admin@demo.resonote.local' },
  { role: 'lead', name: 'Lena Lead', email: 'lead@demo.resonote.local' },
  { role: 'engineer', name: 'Emil Engineer', email: 'engineer@demo.resonote.local' },
  { role: 'viewer', name: 'Vera Viewer', email: 'viewer@demo.resonote.local' },
] as const;

export const BAR_CAMPAIGN = 'Calibration bar CB-1 (free–free)';
export const SKID_CAMPAIGN = 'Pump skid PS-300 baseplate';

export async function ensureAccount(handle: AppHandle, account: { name: string; email: string }, password: string): Promise<string> {
  const db = handle.database.db;
  const [existing] = await db.select({ id: user.id }).from(user).where(eq(user.email, account.email));
  if (existing) return existing.id;
  const created = await handle.auth.api.signUpEmail({ body: { name: account.name, email: account.email, password } });
  await db.update(user).set({ emailVerified: true }).where(eq(user.id, created.user.id));
  return created.user.id;
}

function isoDay(offsetDays: number): string {
  return new Date(Date.now() + offsetDays * 86_400_000).toISOString().slice(0, 10);
}

const common = {
  triggerLevelN: 5,
  forceWindow: { lengthS: 0.02, taperS: 0.002 },
  estimator: 'H1',
  doubleHitRatio: 0.04,
  overloadPercent: 99,
  rollOffDb: 20,
  coherenceThreshold: 0.9,
  minPeakN: 10,
  forceRangeN: 2000,
};

function barSpec(): CampaignSpec {
  const bar = steelBar();
  return {
    name: BAR_CAMPAIGN,
    status: 'analysis',
    structure: 'Steel bar 1000 × 40 × 10 mm on soft supports at the mode-1 nodes',
    client: 'In-house (reference check)',
    testType: 'roving-hammer',
    referenceDofs: ['B21:+Z'],
    simulator: 'steel-bar',
    notes: 'Free–free bar as a check of the whole chain: the weak-direction bending modes should come out at 53.17, 146.55, 287.30 and 474.93 Hz (Euler–Bernoulli; Blevins 1979, Table 8-1).',
    points: bar.points,
    directions: ['+Z'],
    lines: bar.lines,
    hammer: { model: 'Impact hammer IH-02 (demo)', serial: 'H-1187', sensitivity: 2.25, sensitivityUnit: 'mV/N', tips: ['soft', 'medium', 'hard'] },
    accelerometers: [{ model: 'Accelerometer AC-10 (demo)', serial: 'A-5521', sensitivity: 100, sensitivityUnit: 'mV/g', dof: 'B21:+Z' }],
    calibration: { calibratedOn: isoDay(-200), dueOn: isoDay(165), certificateRef: 'CAL-2026-0412 (demo)', performedBy: 'Demo calibration lab' },
    settings: { ...common, sampleRateHz: 4096, recordLengthS: 4, preTriggerS: 0.01, exponentialWindow: { mode: 'end-level', endLevelPercent: 5 }, hitsToAverage: 4, bandHz: { low: 10, high: 800 }, responseRangeMs2: 500 },
  };
}

function skidSpec(): CampaignSpec {
  const skid = pumpSkidBaseplate();
  return {
    name: SKID_CAMPAIGN,
    status: 'testing',
    structure: 'Welded steel baseplate 1200 × 800 × 20 mm of a pump skid, on its mounts',
    client: 'Northwind Pumping Systems (fictional)',
    testType: 'roving-hammer',
    referenceDofs: ['P07:+Z'],
    simulator: 'pump-skid',
    notes: 'Invented demo scenario. Pump and motor removed; baseplate on its four anti-vibration mounts. Hammer roves over the 5 × 4 grid; accelerometer fixed at P07.',
    points: skid.points,
    directions: ['+Z'],
    lines: skid.lines,
    hammer: { model: 'Impact hammer IH-05 (demo)', serial: 'H-2203', sensitivity: 1.12, sensitivityUnit: 'mV/N', tips: ['soft (rubber)', 'medium (plastic)'] },
    accelerometers: [{ model: 'Accelerometer AC-10 (demo)', serial: 'A-5530', sensitivity: 10.2, sensitivityUnit: 'mV/(m/s²)', dof: 'P07:+Z' }],
    calibration: { calibratedOn: isoDay(-350), dueOn: isoDay(12), certificateRef: 'CAL-2025-1187 (demo)', performedBy: 'Demo calibration lab' },
    settings: { ...common, forceWindow: { lengthS: 0.04, taperS: 0.004 }, sampleRateHz: 2048, recordLengthS: 4, preTriggerS: 0.02, exponentialWindow: { mode: 'end-level', endLevelPercent: 5 }, hitsToAverage: 5, bandHz: { low: 5, high: 400 }, responseRangeMs2: 200 },
  };
}

async function seedReciprocalPair(lead: Awaited<ReturnType<typeof signedInClient>>, engineer: Awaited<ReturnType<typeof signedInClient>>, base: string, entryId: string) {
  const must = async (res: Promise<{ status: number; body: any }>, what: string) => {
    const r = await res;
    if (r.status >= 300) throw new Error(`demo reciprocal pair, ${what}: ${r.status} ${JSON.stringify(r.body)}`);
    return r.body;
  };
  const { entry } = await must(lead.request('POST', `${base}/schedule/${entryId}/reciprocal`, {}), 'entry');
  const { channels } = await must(lead.request('GET', `${base}/channels`, undefined), 'channels');
  const accel = channels.find((c: { kind: string }) => c.kind === 'accelerometer');
  const moved = await must(lead.request('PATCH', `${base}/channels/${accel.id}`, { version: accel.version, dof: entry.responseDof }), 'move the accelerometer');
  await must(engineer.request('POST', `${base}/schedule/${entry.id}/simulate`, { count: 5, seed: 2900, tip: 'soft', peakForceN: 60, doubleHitProbability: 0, overloadProbability: 0, idempotencyKey: `demo-reciprocal-${entry.id}` }), 'hits');
  await must(lead.request('PATCH', `${base}/channels/${accel.id}`, { version: moved.channel.version, dof: accel.dof }), 'accelerometer back');
}

export async function seedDemo(handle: AppHandle, options: { log?: (m: string) => void } = {}) {
  const log = options.log ?? ((m: string) => console.log(m));
  const db = handle.database.db;
  const ids: Record<string, string> = {};
  for (const account of demoAccounts) ids[account.role] = await ensureAccount(handle, account, DEMO_PASSWORD);
  // The demo admin is admin whatever the order of creation; the others are members.
  await db.update(user).set({ role: 'admin' }).where(eq(user.id, ids.admin!));
  // A lead must already lead a campaign to create one; the demo lead starts as the admin's pick.
  const existing = new Set((await db.select({ name: campaign.name }).from(campaign)).map((c) => c.name));
  const missing = [barSpec(), skidSpec()].filter((s) => !existing.has(s.name));
  if (missing.length) {
    await withLoopback(handle.app, async (baseUrl) => {
      const origin = handle.config.publicUrl;
      const admin = await signedInClient(baseUrl, origin, 'admin@demo.resonote.local', DEMO_PASSWORD);
      const engineer = await signedInClient(baseUrl, origin, 'engineer@demo.resonote.local', DEMO_PASSWORD);
      for (const spec of missing) {
        const started = Date.now();
        const built = await buildCampaign(admin, spec);
        if (spec.simulator === 'pump-skid') {
          // The baseplate's FE model: the simulator's modes with the stiffness 4 % higher (demo/fe-model.ts).
          const model = await admin.request('POST', `/api/campaigns/${built.campaignId}/fe-models`, { text: feModelCsvFromStructure(pumpSkidBaseplate(), DEMO_MODEL_STIFFNESS_FACTOR, 'PS-300 baseplate, design model'), versionLabel: 'design v1', fileName: 'ps300-baseplate-modes.csv' });
          if (model.status >= 300) throw new Error(`demo FE model: ${model.status} ${JSON.stringify(model.body)}`);
          const map = await admin.request('POST', `/api/campaigns/${built.campaignId}/fe-models/${model.body.model.id}/map/auto`, { by: 'label' });
          if (map.status >= 300) throw new Error(`demo FE map: ${map.status} ${JSON.stringify(map.body)}`);
        }
        // The demo lead leads it; the admin steps back to the instance role only.
        await db.insert(campaignMember).values([
          { campaignId: built.campaignId, userId: ids.lead!, role: 'lead' },
          { campaignId: built.campaignId, userId: ids.engineer!, role: 'engineer' },
          { campaignId: built.campaignId, userId: ids.viewer!, role: 'viewer' },
        ]);
        await db.delete(campaignMember).where(eq(campaignMember.userId, ids.admin!));
        const base = `/api/campaigns/${built.campaignId}`;
        const isBar = spec.simulator === 'steel-bar';
        // A background-noise check before the first hit; on the baseplate the plant's mains hum shows.
        const noise = await engineer.request('POST', `${base}/noise-checks/simulate`, isBar ? { durationS: 10, seed: 900, idempotencyKey: `demo-noise-${built.campaignId}` } : { durationS: 10, seed: 1900, humHz: 50, humMs2: 0.003, idempotencyKey: `demo-noise-${built.campaignId}` });
        if (noise.status >= 300) throw new Error(`demo noise check: ${noise.status} ${JSON.stringify(noise.body)}`);
        // The bar is measured completely; the baseplate part way.
        const toMeasure = isBar ? built.entries : built.entries.slice(0, 12);
        let seed = isBar ? 1000 : 2000;
        for (const entry of toMeasure) {
          const count = isBar ? 4 : 5;
          const res = await engineer.request('POST', `${base}/schedule/${entry.id}/simulate`, {
            count,
            seed: seed++,
            tip: isBar ? 'medium' : 'soft',
            peakForceN: isBar ? 50 : 60,
            doubleHitProbability: isBar ? 0.05 : 0.15,
            overloadProbability: isBar ? 0 : 0.05,
            idempotencyKey: `demo-${spec.simulator}-${entry.id}`,
          });
          if (res.status >= 300) throw new Error(`demo hits at ${entry.excitationDof} failed: ${res.status} ${JSON.stringify(res.body)}`);
          // Top up entries whose rejected hits left them short.
          if (res.body.entry.acceptedHits < count) {
            await engineer.request('POST', `${base}/schedule/${entry.id}/simulate`, { count: count - res.body.entry.acceptedHits, seed: seed++, tip: isBar ? 'medium' : 'soft', peakForceN: isBar ? 50 : 60, doubleHitProbability: 0, overloadProbability: 0, idempotencyKey: `demo-topup-${entry.id}` });
          }
        }
        if (!isBar) {
          // One DOF measured with a loose accelerometer cable: the response is unrelated noise
          // that dies away, so the hits pass their checks but the coherence stays low — flagged.
          const entry = built.entries[12]!;
          const skid = pumpSkidBaseplate();
          const rng = createRng(77);
          const fs = 2048;
          const n = 8192;
          const force = new Float64Array(n * 5);
          const accel = new Float64Array(n * 5);
          for (let h = 0; h < 5; h++) {
            const sim = simulateHit(skid.model, { excitationDof: entry.excitationDof, responseDofs: ['P07:+Z'], fs, samples: n, preTriggerS: 0.0205, peakForceN: 60, pulseWidthS: 0.002, forceNoiseN: 0.02, responseNoise: 0.01, forceRangeN: 2000, responseRangeMs2: 200 }, rng);
            for (let k = 0; k < n; k++) {
              force[h * n + k] = (sim.force[k]! * 1.12) / 1000;
              accel[h * n + k] = (0.8 * rng.gaussian() * Math.exp(-k / fs / 0.25) * 10.2) / 1000;
            }
          }
          await engineer.upload(`${base}/schedule/${entry.id}/hits`, encodeWav([force, accel], fs), 'p13-loose-cable.wav', { units: 'volts' }, `demo-flagged-${entry.id}`);
          // A reciprocity pair: the reciprocal of the fourth entry (hammer at the reference P07, the
          // accelerometer moved to the roving point for these hits and back afterwards), so Review's
          // reciprocity check has H_ij and H_ji to compare (Ewins 2000, ch. 3).
          await seedReciprocalPair(admin, engineer, base, built.entries[3]!.id);
        }
        log(`[resonote] demo campaign “${spec.name}” seeded in ${((Date.now() - started) / 1000).toFixed(1)} s`);
      }
    });
  }
  return { password: DEMO_PASSWORD, accounts: demoAccounts.map((a) => ({ ...a, id: ids[a.role] })) };
}
