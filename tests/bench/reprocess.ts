// Campaign reprocess benchmark (issue 18; prints figures, not a test): every DOF of a bench
// campaign × 5 hits × 4 channels × 16 384 samples — the steel bar at 40 points × 3 fixed
// accelerometers = 120 DOFs (BENCH_REPROCESS_POINTS, default 40), 12.8 kHz — the settings changed,
// then every DOF's averaged FRF recomputed by the reprocess job: first with one worker process, then
// with two, in one run on one database. The API process only queues (JOBS_IN_PROCESS=false); the
// parts (REPROCESS_CHUNK DOFs each, default 10) are shared out by the queue.  npm run bench:reprocess
import { spawn } from 'node:child_process';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { encodeWav } from '@resonote/api/recording';
import { createRng, hitSeries } from '@resonote/sim';
import { freshClusterDatabase } from '../support/cluster.ts';
import { startWorker, type WorkerProcess } from '../support/processes.ts';
import { BENCH_REFS, barWithPoints, benchCampaignAt } from './bench-campaign.ts';

const port = Number(process.env.RESONOTE_BENCH_PORT ?? 40290);
const fs = 12800;
const n = 16384;
const apiDir = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '../../apps/api');
const databaseUrl = await freshClusterDatabase('resonote_bench_reprocess');
const env = { AUTH_RATE_LIMIT_MAX: '10000', LOG_REQUESTS: 'false', JOB_POLL_S: '0.5' };

const api = spawn(process.execPath, ['--import', 'tsx', 'src/server.ts'], { cwd: apiDir, env: { ...process.env, ...env, NODE_ENV: 'development', DATABASE_URL: databaseUrl, PORT: String(port), SMTP_CAPTURE_PORT: '0', JOBS_IN_PROCESS: 'false' }, stdio: ['ignore', 'pipe', 'inherit'] });
await new Promise<void>((resolve, reject) => {
  let text = '';
  api.stdout!.on('data', (d: Buffer) => {
    text += d.toString();
    if (text.includes('serving on')) resolve();
  });
  api.once('exit', (code) => reject(new Error(`the API exited with ${code}`)));
});
const baseUrl = `http://127.0.0.1:${port}`;
const workers: WorkerProcess[] = [];
try {
  const { client, bar, built } = await benchCampaignAt(baseUrl, 'Reprocess benchmark', barWithPoints(Number(process.env.BENCH_REPROCESS_POINTS ?? 40)));
  console.log(`uploading 5 hits at each of ${built.entries.length} DOFs…`);
  let seed = 1;
  for (const e of built.entries) {
    const hits = hitSeries(bar.model, { excitationDof: e.excitationDof, responseDofs: BENCH_REFS, fs, samples: n, preTriggerS: 0.0051, peakForceN: 40, pulseWidthS: 0.0004, forceNoiseN: 0.02, responseNoise: 0.02, forceRangeN: 2000, responseRangeMs2: 500 }, 5, createRng(seed++), { doubleHitProbability: 0, overloadProbability: 0 });
    const join = (pick: (h: (typeof hits)[number]) => Float64Array, scale: number) => {
      const out = new Float64Array(n * hits.length);
      hits.forEach((h, i) => out.set(pick(h).map((v) => (v * scale) / 1000), i * n));
      return out;
    };
    const wav = encodeWav([join((h) => h.force, 2.25), ...BENCH_REFS.map((_, r) => join((h) => h.responses[r]!, 10.2))], fs);
    const res = await client.upload(`/api/campaigns/${built.campaignId}/schedule/${e.id}/hits`, wav, 'five.wav', { units: 'volts' }, `reprocess-${e.id}`);
    if (res.status !== 201) throw new Error(`upload: ${res.status} ${JSON.stringify(res.body).slice(0, 200)}`);
  }
  const base = `/api/campaigns/${built.campaignId}`;
  async function reprocess(band: number) {
    const current = (await client.request('GET', `${base}/settings`)).body.current;
    const saved = await client.request('PUT', `${base}/settings`, { baseVersion: current.version, settings: { ...current.settings, bandHz: { low: 10, high: band } }, reason: `band to ${band} Hz` });
    if (saved.status !== 200) throw new Error(`settings: ${saved.status} ${JSON.stringify(saved.body)}`);
    const started = performance.now();
    const job = (await client.request('POST', `${base}/jobs`, { kind: 'reprocess' })).body.job;
    for (;;) {
      const now = (await client.request('GET', `${base}/jobs/${job.id}`)).body.job;
      if (now.status === 'done' || now.status === 'failed') return { wallS: (performance.now() - started) / 1000, job: now };
      await new Promise((r) => setTimeout(r, 100));
    }
  }
  const loadBefore = (await import('node:os')).loadavg().map((x) => x.toFixed(1)).join(' / ');
  workers.push(await startWorker(databaseUrl, env));
  const one = await reprocess(1900);
  workers.push(await startWorker(databaseUrl, env));
  const two = await reprocess(1800);
  console.log(`\ncampaign reprocess of ${built.entries.length} DOFs × 5 hits × 4 channels × ${n} samples (H1, H2, coherence), settings changed before each run`);
  for (const [label, r] of [['1 worker', one], ['2 workers', two]] as const) {
    console.log(`  ${label.padEnd(10)} ${r.wallS.toFixed(2)} s from POST to done (job: ${r.job.status}, ${r.job.partsDone}/${r.job.parts} parts, ${r.job.result?.averaged} FRFs averaged, ${r.job.elapsedMs} ms from first claim to last part)`);
  }
  const os = await import('node:os');
  console.log(`  speed-up with two workers: ${(one.wallS / two.wallS).toFixed(2)}× (machine: ${os.cpus().length} cores, shared with other work — load average at the end ${os.loadavg().map((x) => x.toFixed(1)).join(' / ')} over 1 / 5 / 15 min; before the runs ${loadBefore})`);
} finally {
  await Promise.all(workers.map((w) => w.stop()));
  await new Promise<void>((resolve) => (api.once('exit', () => resolve()), api.kill('SIGTERM')));
}
