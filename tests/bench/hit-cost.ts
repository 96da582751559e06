// Benchmark (issue 18): the server's CPU time per hit. One API process of its own (as in
// production: `node --import tsx src/server.ts`, jobs in process) on a fresh database, one client
// uploading hits one after the other (4 channels × 16 384 samples, 12.8 kHz, five hits per DOF,
// each answer carrying the updated averaged FRF). The API's user + system CPU time is read from
// /proc/<pid>/stat before and after the measured uploads, so the figure does not depend on what
// else runs on a shared machine (the wall-clock latency does; the load average is printed beside it).
//   npm run bench:hit-cost     (BENCH_HITS=200 measured after BENCH_WARMUP=25, RESONOTE_BENCH_PORT (a free port);
//                               BENCH_CPU_PROF=<dir> writes a V8 CPU profile of the API there,
//                               BENCH_API_NODE_FLAGS='--trace-gc' passes flags to the API's node)
import { spawn } from 'node:child_process';
import { readFileSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import pg from 'pg';
import { encodeWav } from '@resonote/api/recording';
import { createRng, hitSeries, steelBar } from '@resonote/sim';
import { RESULT_WRITE_DELAY_MS } from '../../apps/api/src/hits/result-cache.ts';
import { freePort } from '../support/app.ts';
import { adminUrl } from '../support/db.ts';
import { BENCH_REFS, benchCampaignAt } from './bench-campaign.ts';

const measured = Number(process.env.BENCH_HITS ?? 200);
const warmup = Number(process.env.BENCH_WARMUP ?? 25);
const profileDir = process.env.BENCH_CPU_PROF;
const apiDir = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '../../apps/api');
const fs = 12800;
const n = 16384;
const loadNow = () => os.loadavg().map((x) => x.toFixed(2)).join(' / ');

const dbName = 'resonote_bench_hit_cost';
const admin = new pg.Client({ connectionString: adminUrl });
await admin.connect();
await admin.query(`DROP DATABASE IF EXISTS "${dbName}" WITH (FORCE)`);
await admin.query(`CREATE DATABASE "${dbName}"`);
await admin.end();
const dbUrl = new URL(adminUrl);
dbUrl.pathname = `/${dbName}`;

const port = process.env.RESONOTE_BENCH_PORT ? Number(process.env.RESONOTE_BENCH_PORT) : await freePort();
const args = [...(profileDir ? ['--cpu-prof', '--cpu-prof-dir', profileDir] : []), ...(process.env.BENCH_API_NODE_FLAGS ?? '').split(' ').filter(Boolean), '--import', 'tsx', 'src/server.ts'];
const child = spawn(process.execPath, args, {
  cwd: apiDir,
  env: { ...process.env, NODE_ENV: 'development', DATABASE_URL: dbUrl.toString(), PORT: String(port), PUBLIC_URL: `http://127.0.0.1:${port}`, SMTP_CAPTURE_PORT: '0', LOG_REQUESTS: 'false', AUTH_RATE_LIMIT_MAX: '10000' },
  stdio: ['ignore', 'pipe', 'inherit'],
});
await new Promise<void>((resolve, reject) => {
  let text = '';
  child.stdout!.on('data', (d: Buffer) => {
    text += d.toString();
    if (text.includes('serving on')) resolve();
    // What the flags print (e.g. --trace-gc) goes through.
    if (process.env.BENCH_API_NODE_FLAGS) process.stdout.write(d);
  });
  child.once('exit', (code) => reject(new Error(`the API exited with ${code}:\n${text}`)));
});
const ticksPerS = 100; // USER_HZ on Linux
/** User + system CPU time of the API process so far, ms (/proc/<pid>/stat fields 14 and 15). */
function apiCpuMs(): number {
  const fields = readFileSync(`/proc/${child.pid}/stat`, 'utf8').split(') ')[1]!.split(' ');
  return ((Number(fields[11]) + Number(fields[12])) * 1000) / ticksPerS;
}

try {
  const baseUrl = `http://127.0.0.1:${port}`;
  const total = warmup + measured;
  const slots: { campaignId: string; entryId: string }[] = [];
  let client!: Awaited<ReturnType<typeof benchCampaignAt>>['client'];
  for (let c = 1; slots.length * 5 < total; c++) {
    const made = await benchCampaignAt(baseUrl, `Hit cost ${c}`);
    client = made.client;
    slots.push(...made.built.entries.map((e) => ({ campaignId: made.built.campaignId, entryId: e.id })));
  }
  const bar = steelBar();
  const files = bar.points.slice(0, 20).map((p, i) => {
    const [h] = hitSeries(bar.model, { excitationDof: `${p.label}:+Z`, responseDofs: BENCH_REFS, fs, samples: n, preTriggerS: 0.0051, peakForceN: 40, pulseWidthS: 0.0004, forceNoiseN: 0.02, responseNoise: 0.02, forceRangeN: 2000, responseRangeMs2: 500 }, 1, createRng(900 + i), { doubleHitProbability: 0, overloadProbability: 0 });
    return encodeWav([h!.force.map((v) => (v * 2.25) / 1000), ...h!.responses.map((r) => r.map((v) => (v * 10.2) / 1000))], fs);
  });
  const times: number[] = [];
  let cpuBefore = 0;
  const loadBefore = loadNow();
  for (let i = 0; i < total; i++) {
    if (i === warmup) cpuBefore = apiCpuMs();
    const slot = slots[Math.floor(i / 5)]!;
    const started = performance.now();
    const res = await client.upload(`/api/campaigns/${slot.campaignId}/schedule/${slot.entryId}/hits`, files[i % files.length]!, 'hit.wav', { units: 'volts' }, `cost-${i}-xxxxxxxx`);
    if (res.status !== 201 || !res.body?.frf) throw new Error(`upload ${i}: ${res.status} ${JSON.stringify(res.body).slice(0, 300)}`);
    if (i >= warmup) times.push(performance.now() - started);
  }
  // The FRF writes run RESULT_WRITE_DELAY_MS after a DOF's last hit (hits/result-cache.ts): wait for them so their CPU counts too.
  await new Promise((r) => setTimeout(r, RESULT_WRITE_DELAY_MS + 1000));
  const cpu = apiCpuMs() - cpuBefore;
  const sorted = [...times].sort((a, b) => a - b);
  const q = (p: number) => sorted[Math.min(sorted.length - 1, Math.floor(p * sorted.length))]!;
  console.log(`API CPU time per hit: ${(cpu / measured).toFixed(1)} ms (user + system over ${measured} sequential uploads after ${warmup} to warm up; 4 × ${n} samples, answer with the averaged FRF)`);
  console.log(`upload → answer: p50 ${q(0.5).toFixed(1)} ms, p95 ${q(0.95).toFixed(1)} ms, max ${sorted.at(-1)!.toFixed(1)} ms`);
  console.log(`load average (1 / 5 / 15 min): ${loadBefore} at the start, ${loadNow()} at the end (${os.cpus().length} cores, shared)`);
} finally {
  await new Promise<void>((resolve) => {
    child.once('exit', () => resolve());
    child.kill('SIGTERM');
  });
  if (profileDir) console.log(`CPU profile of the API written to ${profileDir}`);
}
