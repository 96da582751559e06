// Benchmark (issues 16 and 18): the server's side of a live hit. The live campaign of the browser
// test (support/live-campaign.ts: 48 kHz, resampling of uploads allowed, 1 s records) in this
// process, with the server's fast FFT installed as apps/api/src/server.ts does; hits uploaded one
// after the other as Tap's live input sends them: a 44.1 kHz float32 stereo WAV in volts, one
// hit each (support/live-wav.ts), resampled to 48 kHz on the server. Prints the time of the POST
// (upload → answer, in process, so no network) and the process's CPU time per hit (the client's
// share is included: building the form and reading a short answer).
//   RESONOTE_TEST_DATABASE_URL=… node --import tsx tests/bench/live-hit-cost.ts   (npm run bench:live-hit-cost)
//   BENCH_HITS=60 measured after BENCH_WARMUP=10; add --cpu-prof --cpu-prof-dir=<dir> to node for a profile.
import os from 'node:os';
import { useFastFft } from '@resonote/dsp/fast-fft';
import { decodeWav, encodeWav } from '@resonote/api/recording';
import { startTestApp } from '../support/app.ts';
import { createTemplate } from '../support/db.ts';
import { liveCampaign } from '../support/live-campaign.ts';
import { LIVE_KIT, liveBarWav } from '../support/live-wav.ts';

const measured = Number(process.env.BENCH_HITS ?? 60);
const warmup = Number(process.env.BENCH_WARMUP ?? 10);
const loadNow = () => os.loadavg().map((x) => x.toFixed(2)).join(' / ');

const fast = await useFastFft();
const template = 'resonote_tpl_live_hit_cost';
await createTemplate(template);
const app = await startTestApp(template);
try {
  const { engineer, rig } = await liveCampaign(app, { recordLengthS: 1, hitsToAverage: 5 });
  // One clean hit per file, in volts (digital units × the channel's volts at full scale).
  const fileFor = (excitationDof: string, i: number) => {
    const digital = decodeWav(liveBarWav(excitationDof, { kinds: ['clean'], spacingS: 1.3, seed: 300 + i }).wav);
    const [force, accel] = digital.channels;
    return encodeWav([force!.map((v) => v * LIVE_KIT.forceFullScaleV), accel!.map((v) => v * LIVE_KIT.accelFullScaleV)], digital.sampleRateHz!);
  };
  const total = warmup + measured;
  // Made before the clock starts: the simulator's cost is no part of the server's.
  const slotOf = (i: number) => rig.entries[Math.floor(i / 5) % rig.entries.length]!;
  const files = Array.from({ length: total }, (_, i) => fileFor(slotOf(i).excitationDof, i % 10));
  const times: number[] = [];
  let cpuBefore = process.cpuUsage();
  const loadBefore = loadNow();
  for (let i = 0; i < total; i++) {
    if (i === warmup) cpuBefore = process.cpuUsage();
    const entry = slotOf(i);
    const file = files[i]!;
    const started = performance.now();
    const res = await engineer.agent
      .post(`/api/campaigns/${rig.campaignId}/schedule/${entry.id}/hits`)
      .set('Idempotency-Key', `live-cost-${i}-xxxxxxxx`)
      .field('units', 'volts')
      .attach('file', file, 'live.wav');
    if (res.status !== 201 || !res.body?.resampled) throw new Error(`upload ${i}: ${res.status} ${JSON.stringify(res.body).slice(0, 300)}`);
    if (i >= warmup) times.push(performance.now() - started);
  }
  const cpu = process.cpuUsage(cpuBefore);
  const sorted = [...times].sort((a, b) => a - b);
  const q = (p: number) => sorted[Math.min(sorted.length - 1, Math.floor(p * sorted.length))]!;
  console.log(`live hit (44.1 kHz float32 stereo, resampled to 48 kHz, 1 s record; FFT ${fast ? 'PFFFT WebAssembly SIMD where it takes the length' : 'fft.js'}):`);
  console.log(`process CPU time per hit: ${((cpu.user + cpu.system) / 1000 / measured).toFixed(1)} ms (user + system over ${measured} uploads after ${warmup} to warm up, client included)`);
  console.log(`POST → answer: p50 ${q(0.5).toFixed(1)} ms, p95 ${q(0.95).toFixed(1)} ms, max ${sorted.at(-1)!.toFixed(1)} ms`);
  console.log(`load average (1 / 5 / 15 min): ${loadBefore} at the start, ${loadNow()} at the end (${os.cpus().length} cores, shared)`);
} finally {
  await app.close();
}
