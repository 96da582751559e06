// Benchmark (hand-over): memory and time of the hand-over zip with raw time data for a large campaign.
// 600 hits (120 DOFs × 5) of 4 channels × 16 384 samples are written straight into the database
// (the upload path is measured by tests/bench/upload.ts), then GET …/export/bundle.zip?raw=1 is read
// over loopback while the server's resident memory is sampled every 20 ms. Prints the time, the
// zip's size and the peak growth of the resident set over its level before the request.
// Run after `npm test` has created the test cluster (or with RESONOTE_TEST_DATABASE_URL set):
//   node --import tsx tests/bench/export.ts
import { createRng } from '@resonote/sim';
import { hit } from '@resonote/db/schema';
import { benchCampaign, BENCH_REFS } from './bench-campaign.ts';

const HITS_PER_ENTRY = 5;
const ENTRIES = 120;
const N = 16384;
const CHANNELS = 4;

const { app, client, built } = await benchCampaign('resonote_tpl_bench_export', 'Export benchmark');
const refs = BENCH_REFS;
try {
  // 120 entries: the 63 of the campaign, each used twice where needed (a second pass of the day).
  const entries = Array.from({ length: ENTRIES }, (_, i) => built.entries[i % built.entries.length]!);
  const rng = createRng(5);
  const channels = [{ channel: 1, role: 'force', dof: 'B01:+Z', unit: 'N' }, ...refs.map((dof, i) => ({ channel: i + 2, role: 'response', dof, unit: 'm/s²' }))].map((c) => ({ ...c, kitItemId: '00000000-0000-4000-8000-000000000000', model: 'bench', serial: 'b', sensitivityBase: 1, sign: 1, calibration: null }));
  console.log(`writing ${ENTRIES * HITS_PER_ENTRY} hits of ${CHANNELS} × ${N} samples into the database…`);
  const db = app.handle.database.db;
  const sequences = new Map<string, number>();
  for (let e = 0; e < ENTRIES; e++) {
    const entry = entries[e]!;
    const rows = Array.from({ length: HITS_PER_ENTRY }, (_, h) => {
      const samples = Buffer.alloc(CHANNELS * N * 4);
      for (let i = 0; i < CHANNELS * N; i++) samples.writeFloatLE(rng.gaussian() * 0.01, i * 4);
      const sequence = (sequences.get(entry.id) ?? 0) + 1;
      sequences.set(entry.id, sequence);
      return { campaignId: built.campaignId, scheduleEntryId: entry.id, sequence, settingsVersion: 1, sampleRateHz: 12800, samplesPerChannel: N, channels, samples, source: 'bench', idempotencyKey: `bench-${e}-${h}`, autoVerdict: 'reject' as const, verdict: 'reject' as const, reasons: [], metrics: {} };
    });
    await db.insert(hit).values(rows);
  }

  const base = process.memoryUsage().rss;
  let peak = base;
  const timer = setInterval(() => (peak = Math.max(peak, process.memoryUsage().rss)), 20);
  const started = performance.now();
  const res = await fetch(`${app.baseUrl}/api/campaigns/${built.campaignId}/export/bundle.zip?raw=1`, { headers: { cookie: client.cookie } });
  if (res.status !== 200) throw new Error(`export: ${res.status} ${await res.text()}`);
  let bytes = 0;
  for await (const chunk of res.body as unknown as AsyncIterable<Uint8Array>) bytes += chunk.byteLength;
  const seconds = (performance.now() - started) / 1000;
  clearInterval(timer);
  const raw = ENTRIES * HITS_PER_ENTRY * CHANNELS * N * 4;
  console.log(`export of ${ENTRIES * HITS_PER_ENTRY} raw hits (${(raw / 1e6).toFixed(0)} MB stored float32): ${seconds.toFixed(1)} s, zip ${(bytes / 1e6).toFixed(0)} MB`);
  console.log(`resident memory: ${(base / 1e6).toFixed(0)} MB before, peak ${(peak / 1e6).toFixed(0)} MB during (growth ${((peak - base) / 1e6).toFixed(0)} MB; server and client in one process)`);
} finally {
  await app.close();
}
