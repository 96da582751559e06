// Load benchmark (issue 18; a script that prints figures, not a test): simulated engineers each
// upload one hit per second (4 channels × 16 384 samples, 12.8 kHz) and wait for the answer that
// carries the updated averaged FRF, five hits per DOF, then the next DOF. First against the
// cluster — nginx → two API processes, two workers (scripts/cluster.mjs) — then against one API
// process doing everything, each on a fresh database of the same PostgreSQL. Loopback only.
// Prints p50/p95/p99 of hit → averaged FRF and the errors, side by side. Goal: p99 ≤ 300 ms, 0 errors.
//   npm run bench:load            (BENCH_LOAD_SECONDS=300, BENCH_LOAD_ENGINEERS=20, RESONOTE_BENCH_PORT=40280,
//                                  BENCH_LOAD_SETUPS=cluster,single — either or both)
// The machine's load average is printed before and after each run: on a shared machine the
// figures mean little without it.
import { spawn } from 'node:child_process';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { encodeWav } from '@resonote/api/recording';
import { signedInClient } from '@resonote/api/demo-client';
import { createRng, hitSeries, steelBar } from '@resonote/sim';
import { freshClusterDatabase, startCluster } from '../support/cluster.ts';
import { BENCH_LEAD, BENCH_REFS, benchCampaignAt } from './bench-campaign.ts';

const seconds = Number(process.env.BENCH_LOAD_SECONDS ?? 300);
const engineers = Number(process.env.BENCH_LOAD_ENGINEERS ?? 20);
const port = Number(process.env.RESONOTE_BENCH_PORT ?? 40280);
const setups = (process.env.BENCH_LOAD_SETUPS ?? 'cluster,single').split(',').map((x) => x.trim());
const os = await import('node:os');
const loadNow = () => os.loadavg().map((x) => x.toFixed(1)).join(' / ');
const HITS_PER_DOF = 5;
const fs = 12800;
const n = 16384;
const env = { AUTH_RATE_LIMIT_MAX: '10000', LOG_REQUESTS: 'false' };
const apiDir = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '../../apps/api');

// A pool of single-hit recordings (volts) from DOFs along the bar; each upload takes the next one.
const bar = steelBar();
const pool = bar.points.slice(0, 20).map((p, i) => {
  const [h] = hitSeries(bar.model, { excitationDof: `${p.label}:+Z`, responseDofs: BENCH_REFS, fs, samples: n, preTriggerS: 0.0051, peakForceN: 40, pulseWidthS: 0.0004, forceNoiseN: 0.02, responseNoise: 0.02, forceRangeN: 2000, responseRangeMs2: 500 }, 1, createRng(500 + i), { doubleHitProbability: 0, overloadProbability: 0 });
  return encodeWav([h!.force.map((v) => (v * 2.25) / 1000), ...h!.responses.map((r) => r.map((v) => (v * 10.2) / 1000))], fs);
});

interface Outcome {
  label: string;
  latencies: number[];
  loadBefore: string;
  loadAfter: string;
  errors: number;
  errorSamples: string[];
  late: number;
  notSent: number;
  wallS: number;
}

async function run(label: string, baseUrl: string): Promise<Outcome> {
  const dofsPerEngineer = Math.ceil(seconds / HITS_PER_DOF);
  console.log(`[${label}] building campaigns for ${engineers} engineers × ${dofsPerEngineer} DOFs…`);
  const slots: { campaignId: string; entryId: string }[] = [];
  for (let c = 1; slots.length < engineers * dofsPerEngineer; c++) {
    const { built } = await benchCampaignAt(baseUrl, `Load ${label} ${c}`);
    slots.push(...built.entries.map((e) => ({ campaignId: built.campaignId, entryId: e.id })));
  }
  const clients = [];
  for (let i = 0; i < engineers; i++) clients.push(await signedInClient(baseUrl, baseUrl, BENCH_LEAD.email, BENCH_LEAD.password));
  // Idempotency keys take letters, digits and . _ : ~ - only.
  const slug = label.replace(/[^A-Za-z0-9]+/g, '-');
  const out: Outcome = { label, latencies: [], loadBefore: loadNow(), loadAfter: '', errors: 0, errorSamples: [], late: 0, notSent: 0, wallS: 0 };
  console.log(`[${label}] ${engineers} engineers × 1 hit/s for ${seconds} s…`);
  const t0 = performance.now() + 500;
  await Promise.all(
    clients.map(async (client, e) => {
      const mine = slots.slice(e * dofsPerEngineer, (e + 1) * dofsPerEngineer);
      const offset = (1000 * e) / engineers;
      for (let k = 0; k < seconds; k++) {
        // The run lasts `seconds`: a tick an engineer cannot reach in time is not sent (counted).
        if (performance.now() > t0 + seconds * 1000) {
          out.notSent += seconds - k;
          break;
        }
        const due = t0 + offset + k * 1000;
        const wait = due - performance.now();
        if (wait > 0) await new Promise((r) => setTimeout(r, wait));
        else if (wait < -50) out.late++;
        const slot = mine[Math.floor(k / HITS_PER_DOF)]!;
        const started = performance.now();
        try {
          const res = await client.upload(`/api/campaigns/${slot.campaignId}/schedule/${slot.entryId}/hits`, pool[(e + k) % pool.length]!, 'hit.wav', { units: 'volts' }, `load-${slug}-${e}-${k}-xxxxxxxx`);
          if (res.status !== 201 || !res.body?.frf) throw new Error(`${res.status} ${JSON.stringify(res.body).slice(0, 200)}`);
          out.latencies.push(performance.now() - started);
        } catch (err) {
          out.errors++;
          if (out.errorSamples.length < 5) out.errorSamples.push((err as Error).message);
        }
      }
    }),
  );
  out.wallS = (performance.now() - t0) / 1000;
  out.loadAfter = loadNow();
  return out;
}

async function startSingle(databaseUrl: string, apiPort: number) {
  const child = spawn(process.execPath, ['--import', 'tsx', 'src/server.ts'], { cwd: apiDir, env: { ...process.env, ...env, NODE_ENV: 'development', DATABASE_URL: databaseUrl, PORT: String(apiPort), SMTP_CAPTURE_PORT: '0', JOBS_IN_PROCESS: 'true' }, stdio: ['ignore', 'pipe', 'inherit'] });
  await new Promise<void>((resolve, reject) => {
    let text = '';
    child.stdout!.on('data', (d: Buffer) => {
      text += d.toString();
      if (text.includes('serving on')) resolve();
    });
    child.once('exit', (code) => reject(new Error(`the API exited with ${code}`)));
  });
  return { url: `http://127.0.0.1:${apiPort}`, stop: () => new Promise<void>((resolve) => (child.once('exit', () => resolve()), child.kill('SIGTERM'))) };
}

const q = (sorted: number[], p: number) => (sorted.length ? sorted[Math.min(sorted.length - 1, Math.floor(p * sorted.length))]! : NaN);
function row(o: Outcome) {
  const s = [...o.latencies].sort((a, b) => a - b);
  return `${o.label.padEnd(34)} ${String(o.latencies.length).padStart(6)} ${String(o.errors).padStart(6)} ${q(s, 0.5).toFixed(1).padStart(8)} ${q(s, 0.95).toFixed(1).padStart(8)} ${q(s, 0.99).toFixed(1).padStart(8)} ${(s.at(-1) ?? NaN).toFixed(1).padStart(8)} ${(o.latencies.length / o.wallS).toFixed(1).padStart(7)} ${String(o.late).padStart(5)} ${String(o.notSent).padStart(8)}`;
}

const results: Outcome[] = [];
if (setups.includes('cluster')) {
  const cluster = await startCluster({ databaseUrl: await freshClusterDatabase('resonote_bench_load_cluster'), port, env });
  try {
    results.push(await run('cluster (nginx, 2 API, 2 workers)', cluster.url));
  } finally {
    await cluster.stop();
  }
}
if (setups.includes('single')) {
  const single = await startSingle(await freshClusterDatabase('resonote_bench_load_single'), port + 10);
  try {
    results.push(await run('one API process', single.url));
  } finally {
    await single.stop();
  }
}
console.log(`\nhit → averaged FRF (upload of 4 × ${n} samples answered with the updated average), ${engineers} engineers × 1 hit/s × ${seconds} s, loopback; goal p99 ≤ 300 ms, 0 errors`);
console.log(`${'setup'.padEnd(34)} ${'hits'.padStart(6)} ${'errors'.padStart(6)} ${'p50 ms'.padStart(8)} ${'p95 ms'.padStart(8)} ${'p99 ms'.padStart(8)} ${'max ms'.padStart(8)} ${'hits/s'.padStart(7)} ${'late'.padStart(5)} ${'not sent'.padStart(8)}`);
for (const r of results) console.log(row(r));
for (const r of results) if (r.errorSamples.length) console.log(`${r.label} errors, first ones: ${r.errorSamples.join(' | ')}`);
for (const r of results) console.log(`${r.label}: load average (1 / 5 / 15 min) ${r.loadBefore} at the start, ${r.loadAfter} at the end`);
console.log(`(machine: ${os.cpus().length} cores, shared with other work — load average now ${os.loadavg().map((x) => x.toFixed(1)).join(' / ')} over 1 / 5 / 15 min; "late": ticks an engineer could not keep because the previous answer had not come back; "not sent": ticks left when the time was up)`);
