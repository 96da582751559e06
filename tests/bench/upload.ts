// Benchmark (issue 5): hit upload → updated averaged FRF returned, over loopback HTTP.
// 200 sequential uploads of one hit each, 4 channels × 16384 samples (12.8 kHz, 1.28 s), spread
// over 40 schedule entries × 5 hits, each answer carrying the updated averaged FRF. Prints p50/p95.
// Run after `npm test` has created the test cluster (or with RESONOTE_TEST_DATABASE_URL set):
//   node --import tsx tests/bench/upload.ts
import { createRng, hitSeries } from '@resonote/sim';
import { encodeWav } from '@resonote/api/recording';
import { benchCampaign, BENCH_REFS } from './bench-campaign.ts';

const { app, client, bar, built } = await benchCampaign('resonote_tpl_bench', 'Upload benchmark');
const refs = BENCH_REFS;
try {
  const entries = built.entries.filter((e) => e.responseDof === 'B21:+Z').slice(0, 20).concat(built.entries.filter((e) => e.responseDof === 'B11:+Z').slice(0, 20));
  const fs = 12800;
  const n = 16384;
  console.log(`generating 200 hits (${entries.length} entries × 5), 4 channels × ${n} samples…`);
  const files: Buffer[] = [];
  let seed = 1;
  for (const e of entries) {
    const hits = hitSeries(bar.model, { excitationDof: e.excitationDof, responseDofs: refs, fs, samples: n, preTriggerS: 0.0051, peakForceN: 40, pulseWidthS: 0.0004, forceNoiseN: 0.02, responseNoise: 0.02, forceRangeN: 2000, responseRangeMs2: 500 }, 5, createRng(seed++));
    for (const h of hits) files.push(encodeWav([h.force.map((v) => (v * 2.25) / 1000), ...h.responses.map((r) => r.map((v) => (v * 10.2) / 1000))], fs));
  }
  const times: number[] = [];
  let accepted = 0;
  for (let i = 0; i < files.length; i++) {
    const entry = entries[Math.floor(i / 5)]!;
    const started = performance.now();
    let res;
    try {
      res = await client.upload(`/api/campaigns/${built.campaignId}/schedule/${entry.id}/hits`, files[i]!, `hit-${i}.wav`, { units: 'volts' }, `bench-${i}-xxxxxxxx`);
    } catch (err) {
      throw new Error(`upload ${i} (${files[i]!.length} bytes): ${(err as Error).message} ${(err as { cause?: Error }).cause?.message ?? ''}`);
    }
    times.push(performance.now() - started);
    if (res.status !== 201) throw new Error(`upload ${i}: ${res.status} ${JSON.stringify(res.body).slice(0, 300)}`);
    if (!res.body.frf) throw new Error(`upload ${i} answered without an FRF`);
    accepted += res.body.hits.filter((h: { verdict: string }) => h.verdict === 'accept').length;
  }
  const sorted = [...times].sort((a, b) => a - b);
  const q = (p: number) => sorted[Math.min(sorted.length - 1, Math.floor(p * sorted.length))]!;
  console.log(`uploads: ${times.length} (accepted hits ${accepted}); upload → averaged FRF returned: p50 ${q(0.5).toFixed(1)} ms, p95 ${q(0.95).toFixed(1)} ms, max ${sorted.at(-1)!.toFixed(1)} ms (target p95 ≤ 150 ms)`);
} finally {
  await app.close();
}
