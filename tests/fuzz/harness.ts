// The fuzz run (issue 13): mutated recordings (WAV in every sample format, CSV, JSON) sent to the
// hit upload and the background-noise upload, mutated geometry CSVs to the geometry import, and
// mutated backup zips to the restore — over real HTTP against an app on a real database. Every
// answer must be below 500, arrive within the per-request timeout, and every 4xx must be in the
// one error shape { error: { code, message, details? } }. Used by `npm run fuzz` (tests/fuzz/run.ts)
// and, with a fixed seed and a few hundred cases, by tests/api/fuzz-slice.test.ts.
import { createRng, hitSeries, steelBar } from '@resonote/sim';
import { encodeWav, type WavSampleFormat } from '@resonote/api/recording';
import type { TestApp } from '../support/app.ts';
import { PASSWORD } from '../support/accounts.ts';
import { barCrew, BAR_SETTINGS } from '../support/rig.ts';
import { barCampaign, type RigCampaign } from '../support/rig.ts';
import { mutateBackup, mutateBytes, mutateCsv, mutateJsonRecording, mutateWav, picker, type Pick } from './mutate.ts';

/** Short records keep a fuzz case cheap: 0.25 s at 4096 Hz = 1024 samples (the trigger still has 10 ms pre-trigger). */
const FUZZ_SETTINGS = { recordLengthS: 0.25 };
const fs = BAR_SETTINGS.sampleRateHz;

export interface FuzzTarget {
  baseUrl: string;
  origin: string;
  cookie: string;
  rig: RigCampaign;
  geometryCampaignId: string;
  backupZip: Uint8Array;
  recordings: Recordings;
  /** Longer ones for the background-noise upload. */
  noise: Recordings;
  geometryCsv: string;
}

/** Builds the campaigns (with the test factories), the valid files to mutate and a backup zip of a campaign with hits. */
export async function prepareFuzzTarget(app: TestApp & { baseUrl: string }): Promise<FuzzTarget> {
  const { lead, rig: _first } = await barCrew(app);
  void _first;
  const rig = await barCampaign(app, lead, { name: 'Fuzz bar', settings: FUZZ_SETTINGS });
  const geometry = await barCampaign(app, lead, { name: 'Fuzz geometry', settings: FUZZ_SETTINGS });
  const signIn = await fetch(`${app.baseUrl}/api/auth/sign-in/email`, { method: 'POST', headers: { 'content-type': 'application/json', origin: app.origin }, body: JSON.stringify({ email: lead.email, password: PASSWORD }) });
  if (signIn.status !== 200) throw new Error(`fuzz sign-in: ${signIn.status}`);
  const cookie = signIn.headers.getSetCookie().map((c) => c.split(';')[0]).join('; ');

  // Two hits back to back, in volts (2.25 mV/N, 10.2 mV/(m/s²), tests/support/rig.ts).
  const bar = steelBar();
  const n = Math.round(FUZZ_SETTINGS.recordLengthS * fs);
  const hits = hitSeries(bar.model, { excitationDof: 'B11:+Z', responseDofs: ['B21:+Z'], fs, samples: n, preTriggerS: 0.0105, peakForceN: 50, pulseWidthS: 0.001, forceNoiseN: 0.02, responseNoise: 0.02, forceRangeN: 2000, responseRangeMs2: 500 }, 2, createRng(1), { doubleHitProbability: 0, overloadProbability: 0 });
  const force = hits.flatMap((h) => [...h.force].map((v) => (v * rig.hammerSensitivity) / 1000));
  const accel = hits.flatMap((h) => [...h.responses[0]!].map((v) => (v * rig.accelSensitivity) / 1000));
  const recordings = makeRecordings(force, accel);
  // A background-noise check takes 1–60 s: the same signals three times over (1.5 s).
  const tile = (x: number[]) => [...x, ...x, ...x];
  const noise = makeRecordings(tile(force), tile(accel));

  // A campaign with hits for the backup: the two hits uploaded as a float32 WAV.
  const stored = await fetch(`${app.baseUrl}/api/campaigns/${rig.campaignId}/schedule/${rig.entries[0]!.id}/hits`, { method: 'POST', headers: { cookie, origin: app.origin, 'idempotency-key': 'fuzz-seed-hits-0001' }, body: form(recordings.wav[0]!.bytes, 'seed.wav', {}) });
  if (stored.status !== 201) throw new Error(`fuzz seed upload: ${stored.status} ${await stored.text()}`);
  const backup = await fetch(`${app.baseUrl}/api/campaigns/${rig.campaignId}/backup`, { headers: { cookie, origin: app.origin } });
  if (backup.status !== 200) throw new Error(`fuzz backup: ${backup.status}`);
  const backupZip = new Uint8Array(await backup.arrayBuffer());

  const geometryCsv = ['label,x,y,z,directions', ...bar.points.map((p) => `${p.label},${p.xMm},${p.yMm},${p.zMm},+Z`)].join('\n');
  return { baseUrl: app.baseUrl, origin: app.origin, cookie, rig, geometryCampaignId: geometry.campaignId, backupZip, recordings, noise, geometryCsv };
}

interface Recordings {
  wav: { name: string; bytes: Uint8Array }[];
  csvWithTime: string;
  csvNoTime: string;
  json: { sampleRateHz: number; channels: number[][] };
}

/** The same two channels (volts) as WAV in every sample format the decoder reads, CSV with and without a time column, and JSON. */
function makeRecordings(force: number[], accel: number[]): Recordings {
  const formats: [WavSampleFormat, boolean][] = [['float32', false], ['float64', false], ['pcm16', false], ['pcm24', false], ['pcm32', false], ['float32', true], ['pcm24', true]];
  const wav = formats.map(([format, extensible]) => ({ name: `${format}${extensible ? '-ext' : ''}`, bytes: new Uint8Array(encodeWav([force, accel], fs, format, 1, { extensible })) }));
  const rows = force.map((f, i) => `${f.toPrecision(6)},${accel[i]!.toPrecision(6)}`);
  const csvNoTime = ['force,accel', ...rows].join('\n');
  const csvWithTime = ['time,force,accel', ...rows.map((r, i) => `${(i / fs).toPrecision(9)},${r}`)].join('\n');
  const json = { sampleRateHz: fs, channels: [force.map((v) => +v.toPrecision(6)), accel.map((v) => +v.toPrecision(6))] };
  return { wav, csvWithTime, csvNoTime, json };
}

/** A multipart form; `duplicate` repeats a field or the file part (a duplicated field). */
function form(file: Uint8Array, name: string, fields: Record<string, string>, type = 'application/octet-stream', duplicate: 'field' | 'file' | null = null): FormData {
  const f = new FormData();
  for (const [k, v] of Object.entries(fields)) f.append(k, v);
  if (duplicate === 'field') f.append(Object.keys(fields)[0] ?? 'units', 'volts');
  f.append('file', new Blob([new Uint8Array(file)], { type }), name);
  if (duplicate === 'file') f.append('file', new Blob([new Uint8Array(file)], { type }), name);
  return f;
}

interface Case {
  target: 'hits' | 'noise' | 'geometry' | 'restore';
  how: string;
  request: () => { path: string; init: RequestInit };
}

/** Form fields of an upload: usually the right ones, sometimes hostile. */
function uploadFields(p: Pick, needsRate: boolean): Record<string, string> {
  const fields: Record<string, string> = {};
  if (needsRate || p.chance(0.1)) fields.sampleRateHz = p.chance(0.85) ? String(fs) : p.one(['0', '-1', '1e400', 'abc', '4096.0001', '', '0x1000']);
  if (p.chance(0.15)) fields.units = p.one(['volts', 'engineering', 'bogus', '']);
  if (p.chance(0.15)) fields.fullScaleVolts = p.one(['1', '10', '0', '-5', '1e400', '1000', '1001', 'NaN']);
  if (p.chance(0.05)) fields[p.one(['extra', 'file2', '__proto__', 'constructor'])] = 'x';
  return fields;
}

function nextCase(p: Pick, t: FuzzTarget, index: number): Case {
  const auth = { cookie: t.cookie, origin: t.origin };
  const roll = p.rng.uniform();
  if (roll < 0.6 || roll >= 0.96) {
    // A recording, to the hit upload (mostly) or the background-noise upload.
    const target = roll < 0.5 || roll >= 0.96 ? 'hits' : 'noise';
    const base = target === 'hits' ? t.recordings : t.noise;
    const kind = p.int(0, 3);
    let bytes: Uint8Array;
    let name: string;
    let how: string;
    let needsRate = false;
    if (kind <= 1) {
      const wav = p.one(base.wav);
      const m = p.chance(0.7) ? mutateWav(p, wav.bytes) : mutateBytes(p, wav.bytes);
      bytes = m.bytes;
      name = p.chance(0.95) ? 'rec.wav' : p.one(['rec.csv', 'rec.json', 'rec', 'rec.WAV', 'rec.bin']);
      how = `${wav.name} wav: ${m.how}`;
    } else if (kind === 2) {
      const withTime = p.chance(0.5);
      const m = mutateCsv(p, withTime ? base.csvWithTime : base.csvNoTime);
      bytes = new TextEncoder().encode(m.text);
      needsRate = !withTime;
      name = p.chance(0.95) ? 'rec.csv' : p.one(['rec.txt', 'rec.wav', 'rec.json']);
      how = `csv${withTime ? ' with time' : ''}: ${m.how}`;
    } else {
      const m = mutateJsonRecording(p, base.json);
      bytes = new TextEncoder().encode(m.text);
      name = p.chance(0.95) ? 'rec.json' : p.one(['rec.csv', 'rec.wav']);
      how = `json: ${m.how}`;
    }
    const fields = uploadFields(p, needsRate);
    const entry = p.one(t.rig.entries);
    const path = target === 'hits' ? `/api/campaigns/${t.rig.campaignId}/schedule/${entry.id}/hits` : `/api/campaigns/${t.rig.campaignId}/noise-checks`;
    const key = p.chance(0.98) ? `fuzz-${index}-${p.int(0, 1e9)}` : p.one(['', 'short', 'x'.repeat(300)]);
    return { target, how, request: () => ({ path, init: { method: 'POST', headers: { ...auth, ...(key ? { 'idempotency-key': key } : {}) }, body: form(bytes, name, fields, undefined, p.chance(0.04) ? p.one(['field', 'file'] as const) : null) } }) };
  }
  if (roll < 0.85) {
    const m = mutateCsv(p, t.geometryCsv);
    const path = `/api/campaigns/${t.geometryCampaignId}/geometry/import`;
    const mode = p.chance(0.9) ? 'merge' : p.one(['replace', 'bogus', '']);
    if (p.chance(0.7)) {
      const body = p.chance(0.9) ? JSON.stringify({ csv: m.text, mode }) : p.one([`{"csv":${JSON.stringify(m.text)},"csv":1}`, `{"csv":${JSON.stringify(m.text)},"mode":"merge","extra":1}`, `{"csv":`, '[]', 'null', `{"csv":${JSON.stringify(m.text)},"directions":["+Q"]}`]);
      return { target: 'geometry', how: `json: ${m.how}`, request: () => ({ path, init: { method: 'POST', headers: { ...auth, 'content-type': 'application/json' }, body } }) };
    }
    return { target: 'geometry', how: `multipart: ${m.how}`, request: () => ({ path, init: { method: 'POST', headers: auth, body: form(new TextEncoder().encode(m.text), 'points.csv', { mode }, 'text/csv') } }) };
  }
  const m = mutateBackup(p, t.backupZip);
  const members = p.chance(0.9) ? '' : '?members=1';
  return { target: 'restore', how: `zip: ${m.how}`, request: () => ({ path: `/api/campaigns/restore${members}`, init: { method: 'POST', headers: auth, body: form(m.bytes, 'backup.zip', {}, 'application/zip') } }) };
}

export interface FuzzOptions {
  seed: number;
  cases: number;
  /** Per request, ms: no answer by then counts as a hang. */
  timeoutMs: number;
  /** The whole run stops after this long, ms (the cases done so far are reported). */
  maxMs: number;
  onProgress?: (done: number, elapsedMs: number) => void;
}

export interface FuzzFailure {
  index: number;
  target: string;
  how: string;
  problem: string;
}

export interface FuzzResult {
  cases: number;
  elapsedMs: number;
  /** "target status" → count, and "status" → count over all targets. */
  byTarget: Map<string, number>;
  byStatus: Map<string, number>;
  /** Total answer time per target, ms. */
  msByTarget: Map<string, number>;
  failures: FuzzFailure[];
}

function oneShape(body: unknown): boolean {
  if (!body || typeof body !== 'object' || Object.keys(body).join() !== 'error') return false;
  const e = (body as { error: Record<string, unknown> }).error;
  if (!e || typeof e !== 'object') return false;
  if (typeof e.code !== 'string' || !e.code || typeof e.message !== 'string' || !e.message) return false;
  return Object.keys(e).every((k) => k === 'code' || k === 'message' || k === 'details');
}

export async function runFuzz(t: FuzzTarget, options: FuzzOptions): Promise<FuzzResult> {
  const p = picker(createRng(options.seed));
  const byTarget = new Map<string, number>();
  const byStatus = new Map<string, number>();
  const failures: FuzzFailure[] = [];
  const msByTarget = new Map<string, number>();
  const bump = (m: Map<string, number>, k: string) => m.set(k, (m.get(k) ?? 0) + 1);
  const started = performance.now();
  let done = 0;
  for (let i = 0; i < options.cases; i++) {
    if (performance.now() - started > options.maxMs) break;
    const c = nextCase(p, t, i);
    const { path, init } = c.request();
    let status: string;
    const sent = performance.now();
    try {
      const res = await fetch(`${t.baseUrl}${path}`, { ...init, signal: AbortSignal.timeout(options.timeoutMs) });
      const text = await res.text();
      status = String(res.status);
      if (res.status >= 500) failures.push({ index: i, target: c.target, how: c.how, problem: `${res.status} ${text.slice(0, 300)}` });
      else if (res.status >= 400) {
        let body: unknown;
        try {
          body = JSON.parse(text);
        } catch {
          body = undefined;
        }
        if (!oneShape(body)) failures.push({ index: i, target: c.target, how: c.how, problem: `${res.status} not in the one error shape: ${text.slice(0, 300)}` });
      }
    } catch (err) {
      const e = err as Error & { cause?: { code?: string } };
      status = e.name === 'TimeoutError' ? 'hang' : `network error ${e.cause?.code ?? e.message}`;
      failures.push({ index: i, target: c.target, how: c.how, problem: status });
    }
    msByTarget.set(c.target, (msByTarget.get(c.target) ?? 0) + performance.now() - sent);
    bump(byStatus, status);
    bump(byTarget, `${c.target} ${status}`);
    done++;
    if (options.onProgress && done % 500 === 0) options.onProgress(done, performance.now() - started);
  }
  return { cases: done, elapsedMs: performance.now() - started, byTarget, byStatus, msByTarget, failures };
}

/** The histogram as printed lines: by status, then by target and status. */
export function histogramLines(r: FuzzResult): string[] {
  const sorted = (m: Map<string, number>) => [...m.entries()].sort((a, b) => a[0].localeCompare(b[0], 'en', { numeric: true }));
  return [
    `${r.cases} cases in ${(r.elapsedMs / 1000).toFixed(1)} s (${((r.cases / r.elapsedMs) * 1000).toFixed(0)} per s)`,
    'status  count',
    ...sorted(r.byStatus).map(([k, v]) => `${k.padEnd(7)} ${v}`),
    'target   status  count',
    ...sorted(r.byTarget).map(([k, v]) => {
      const [target, status] = k.split(' ');
      return `${target!.padEnd(8)} ${status!.padEnd(7)} ${v}`;
    }),
    'target   cases  mean answer time',
    ...sorted(r.msByTarget).map(([target, ms]) => {
      const n = [...r.byTarget].filter(([k]) => k.startsWith(`${target} `)).reduce((a, [, v]) => a + v, 0);
      return `${target.padEnd(8)} ${String(n).padEnd(6)} ${(ms / n).toFixed(1)} ms`;
    }),
  ];
}
