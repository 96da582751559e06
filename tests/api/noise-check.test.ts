// Background-noise checks before testing: a quiet recording from the simulated rig or an upload,
// read per channel (RMS in the band, peak against the trigger level, tones such as mains hum),
// stored with its samples and an audit line, replayed for a repeated key, refused with a clear
// message for bad input — against the real API and database.
import { describe, expect, it } from 'vitest';
import { and, eq } from 'drizzle-orm';
import { auditEvent, noiseCheck } from '@resonote/db/schema';
import { createRng } from '@resonote/sim';
import type { TestApp } from '../support/app.ts';
import type { Person } from '../support/campaign.ts';
import { useBarRig, BAR_SETTINGS, type RigCampaign } from '../support/rig.ts';

let app: TestApp;
let lead: Person;
let engineer: Person;
let viewer: Person;
let rig: RigCampaign;

const fs = BAR_SETTINGS.sampleRateHz;
const band = BAR_SETTINGS.bandHz;
/** White noise of rms σ spread over 0…fs/2: its rms within the band is σ·√(B/(fs/2)) (definition of a one-sided PSD; Bendat & Piersol 2010). */
const inBand = (sigma: number) => sigma * Math.sqrt((band.high - band.low) / (fs / 2));

interface Reading {
  channel: number;
  role: 'force' | 'response';
  dof: string;
  unit: string;
  rmsInBand: number;
  peak: number;
  tones: { testedHz: number; fHz: number; aboveFloorDb: number }[];
  status: 'ok' | 'caution';
  message: string;
}

/** Gaussian samples from the simulator's seeded generator, so the upload is the same every run. */
function gaussianNoise(n: number, sigma: number, seed: number): number[] {
  const rng = createRng(seed);
  return Array.from({ length: n }, () => sigma * rng.gaussian());
}

function jsonRecording(channels: number[][]) {
  return Buffer.from(JSON.stringify({ sampleRateHz: fs, channels }));
}

useBarRig((r) => ({ app, lead, engineer, viewer, rig } = r));

describe('background-noise checks', () => {
  it("reads the simulated rig's sensor noise: rms in the band as white noise predicts, far below the trigger, stored with an audit line", async () => {
    const res = await engineer.agent.post(`/api/campaigns/${rig.campaignId}/noise-checks/simulate`).send({ durationS: 10, seed: 11, idempotencyKey: 'noise-sim-0001' });
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    const check = res.body.check;
    expect(check.durationS).toBe(10);
    expect(check.status).toBe('ok');
    const [force, accel] = check.channels as Reading[];
    expect(force!.role).toBe('force');
    expect(force!.unit).toBe('N');
    // The rig's chain noise: 0.02 N and 0.005 m/s² rms white (apps/api/src/hits/simulated-rig.ts).
    expect(Math.abs(force!.rmsInBand / inBand(0.02) - 1)).toBeLessThan(0.05);
    expect(Math.abs(accel!.rmsInBand / inBand(0.005) - 1)).toBeLessThan(0.05);
    expect(accel!.dof).toBe('B21:+Z');
    expect(force!.message).toMatch(/of the 5 N trigger level/);
    expect(accel!.message).toMatch(/dB below the 500 m\/s² range.*Quiet enough\.$/);
    // The PSD of white noise is flat at 2σ²/fs (one-sided density): the mean level within 1 dB.
    const psd = check.spectra.find((s: { channel: number }) => s.channel === accel!.channel) as { f: number[]; levelDb: number[]; unit: string };
    expect(psd.unit).toBe('dB re 1 (m/s²)²/Hz');
    const inside = psd.levelDb.filter((_, k) => psd.f[k]! >= band.low && psd.f[k]! <= band.high);
    const meanPower = inside.reduce((a, v) => a + 10 ** (v / 10), 0) / inside.length;
    expect(Math.abs(10 * Math.log10(meanPower) - 10 * Math.log10((2 * 0.005 ** 2) / fs))).toBeLessThan(1);
    expect(psd.f.at(-1)!).toBeLessThanOrEqual(1.25 * band.high);

    const db = app.handle.database.db;
    const [row] = await db.select().from(noiseCheck).where(eq(noiseCheck.id, check.id));
    expect(row!.samples.byteLength).toBe(2 * 10 * fs * 4); // two channels, float32
    const audits = await db.select().from(auditEvent).where(and(eq(auditEvent.campaignId, rig.campaignId), eq(auditEvent.entity, 'noise-check')));
    expect(audits.map((a) => a.entityId)).toEqual([check.id]);

    // A retry (same request, same key) answers the stored check, nothing new is stored.
    const again = await engineer.agent.post(`/api/campaigns/${rig.campaignId}/noise-checks/simulate`).send({ durationS: 10, seed: 11, idempotencyKey: 'noise-sim-0001' });
    expect(again.status).toBe(200);
    expect(again.body.replayed).toBe(true);
    expect(again.body.check.id).toBe(check.id);
    // The same key with another request (another seed) is refused, not answered with the first check.
    const reused = await engineer.agent.post(`/api/campaigns/${rig.campaignId}/noise-checks/simulate`).send({ durationS: 10, seed: 99, idempotencyKey: 'noise-sim-0001' });
    expect(reused.status).toBe(422);
    expect(reused.body.error.code).toBe('idempotency-key-reused');
    expect(await db.select().from(noiseCheck).where(eq(noiseCheck.campaignId, rig.campaignId))).toHaveLength(1);
  });

  it('finds mains hum at 50 Hz on the accelerometer and says so in words', async () => {
    const res = await engineer.agent.post(`/api/campaigns/${rig.campaignId}/noise-checks/simulate`).send({ durationS: 8, seed: 5, humHz: 50, humMs2: 0.01 });
    expect(res.status).toBe(201);
    const accel = (res.body.check.channels as Reading[]).find((c) => c.role === 'response')!;
    expect(accel.status).toBe('caution');
    expect(accel.tones.map((t) => t.testedHz)).toContain(50);
    expect(accel.message).toMatch(/a tone at 50\.0 Hz stands \d+ dB above the floor \(mains hum\?\)/);
    // Mean square adds: A²/2 of the hum plus the white floor in the band (Parseval).
    expect(Math.abs(accel.rmsInBand / Math.sqrt(0.01 ** 2 / 2 + inBand(0.005) ** 2) - 1)).toBeLessThan(0.05);
    expect(res.body.check.status).toBe('caution');
  });

  it('warns when the force channel noise comes within half of the trigger level (an upload in engineering units)', async () => {
    const n = 4 * fs;
    const file = jsonRecording([gaussianNoise(n, 1.2, 1), gaussianNoise(n, 0.002, 2)]);
    const res = await engineer.agent.post(`/api/campaigns/${rig.campaignId}/noise-checks`).set('idempotency-key', 'noise-upload-0001').field('units', 'engineering').attach('file', file, 'quiet.json');
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    const force = (res.body.check.channels as Reading[])[0]!;
    // Largest of 16 384 Gaussian samples of σ = 1.2 N is about 4σ ≈ 4.8 N, above 2.5 N (half the 5 N trigger).
    expect(force.peak).toBeGreaterThan(2.5);
    expect(force.status).toBe('caution');
    expect(force.message).toMatch(/may start records by itself: raise the trigger level or check the hammer cable/);
    expect(res.body.check.source).toBe('upload:quiet.json');
  });

  it('lists checks newest first for a viewer and shows one with its spectra', async () => {
    const list = await viewer.agent.get(`/api/campaigns/${rig.campaignId}/noise-checks`);
    expect(list.status).toBe(200);
    const checks = list.body.checks as { id: string; recordedAt: string; recordedBy: string; spectra?: unknown }[];
    expect(checks).toHaveLength(3);
    expect(checks.map((c) => c.recordedAt)).toEqual([...checks.map((c) => c.recordedAt)].sort().reverse());
    expect(checks[0]!.recordedBy).toBe('Eric Engineer');
    expect(checks[0]!.spectra).toBeUndefined();
    const one = await viewer.agent.get(`/api/campaigns/${rig.campaignId}/noise-checks/${checks[0]!.id}`);
    expect(one.status).toBe(200);
    expect(one.body.check.spectra).toHaveLength(2);
    expect((await viewer.agent.get(`/api/campaigns/${rig.campaignId}/noise-checks/00000000-0000-4000-8000-000000000000`)).status).toBe(404);
    expect((await viewer.agent.get(`/api/campaigns/${rig.campaignId}/noise-checks/not-an-id`)).status).toBe(404);
  });

  it('refuses bad input with a message and stores nothing', async () => {
    const db = app.handle.database.db;
    const before = (await db.select().from(noiseCheck).where(eq(noiseCheck.campaignId, rig.campaignId))).length;
    const post = (key: string, file: Buffer, name = 'q.json') => engineer.agent.post(`/api/campaigns/${rig.campaignId}/noise-checks`).set('idempotency-key', key).field('units', 'engineering').attach('file', file, name);

    const short = await post('noise-short-0001', jsonRecording([gaussianNoise(fs / 2, 0.02, 3), gaussianNoise(fs / 2, 0.005, 4)]));
    expect(short.status).toBe(400);
    expect(short.body.error.message).toMatch(/lasts 0\.50 s; record at least 1 s of quiet\. Nothing was stored\./);

    const oneChannel = await post('noise-chan-0001', jsonRecording([gaussianNoise(fs * 2, 0.02, 3)]));
    expect(oneChannel.status).toBe(400);
    expect(oneChannel.body.error.message).toMatch(/The file has 1 channel; the channel map has 2/);

    const notJson = await post('noise-json-0001', Buffer.from('{"channels": [[1, 2], [3]]'), 'broken.json');
    expect(notJson.status).toBe(400);
    expect(notJson.body.error.message).toMatch(/not valid JSON/);

    const noKey = await engineer.agent.post(`/api/campaigns/${rig.campaignId}/noise-checks`).attach('file', jsonRecording([[0, 1], [0, 1]]), 'q.json');
    expect(noKey.status).toBe(400);
    expect(noKey.body.error.message).toMatch(/Idempotency-Key/);

    const tooShortSim = await engineer.agent.post(`/api/campaigns/${rig.campaignId}/noise-checks/simulate`).send({ durationS: 0.2 });
    expect(tooShortSim.status).toBe(400);
    expect(JSON.stringify(tooShortSim.body.error)).toMatch(/durationS/);
    const oddHum = await engineer.agent.post(`/api/campaigns/${rig.campaignId}/noise-checks/simulate`).send({ humHz: 55 });
    expect(oddHum.status).toBe(400);
    const otherEntry = await engineer.agent.post(`/api/campaigns/${rig.campaignId}/noise-checks/simulate`).send({ entryId: '00000000-0000-4000-8000-000000000000' });
    expect(otherEntry.status).toBe(404);

    expect((await db.select().from(noiseCheck).where(eq(noiseCheck.campaignId, rig.campaignId))).length).toBe(before);
  });
});
