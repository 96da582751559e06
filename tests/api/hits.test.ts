// The test day on the server: intake, verdicts, averaged FRFs, schedule status, overrides,
// idempotency, bad input — against the real API and database.
import { describe, expect, it } from 'vitest';
import { eq } from 'drizzle-orm';
import { averageFrf } from '@resonote/dsp';
import { createRng, modelFrf, steelBar } from '@resonote/sim';
import { hit } from '@resonote/db/schema';
import { checksAnswerSchema, entryFrfAnswerSchema, hitDetailSchema, hitsAnswerSchema } from '@resonote/contracts';
import { encodeWav } from '@resonote/api/recording';
import type { TestApp } from '../support/app.ts';
import type { Person } from '../support/campaign.ts';
import { barHitsWav, simulateBarHits } from '../support/bar-hits.ts';
import { barCampaign, useBarRig, BAR_SETTINGS, type RigCampaign } from '../support/rig.ts';

let app: TestApp;
let lead: Person;
let engineer: Person;
let viewer: Person;
let rig: RigCampaign;

const bar = steelBar();
const fs = BAR_SETTINGS.sampleRateHz;
const n = BAR_SETTINGS.sampleRateHz * BAR_SETTINGS.recordLengthS;

const simulate = simulateBarHits;
const toWav = (hits: ReturnType<typeof simulate>, format: 'float32' | 'pcm24' = 'float32') => barHitsWav(rig, hits, format);

const entry = (excitation: string) => rig.entries.find((e) => e.excitationDof === excitation)!;
const hitsOf = async (entryId: string) => app.handle.database.db.select().from(hit).where(eq(hit.scheduleEntryId, entryId));

useBarRig((r) => ({ app, lead, engineer, viewer, rig } = r), { UPLOAD_LIMIT_MB: '3' });

describe('hit intake and averaged FRFs', () => {
  it('splits a WAV of three hits by the trigger, judges each, and averages them exactly as packages/dsp does', async () => {
    const hits = simulate('B11:+Z', 3, 11);
    const res = await engineer.agent.post(`/api/campaigns/${rig.campaignId}/schedule/${entry('B11:+Z').id}/hits`).set('idempotency-key', 'upload-b11-0001').attach('file', toWav(hits), 'b11.wav');
    expect(res.status).toBe(201);
    expect(res.body.hits.map((h: { verdict: string }) => h.verdict)).toEqual(['accept', 'accept', 'accept']);
    expect(res.body.frf.averages).toBe(3);
    // The same samples through packages/dsp directly: records start 10 ms (pre-trigger) before the
    // trigger, offsets removed from the pre-trigger, force window as the settings say.
    const stored = await hitsOf(entry('B11:+Z').id);
    const direct = averageFrf(
      stored.map((h) => {
        const buf = new Uint8Array(h.samples.length);
        buf.set(h.samples);
        const all = new Float32Array(buf.buffer);
        const pre = Math.round(BAR_SETTINGS.preTriggerS * fs);
        const chan = (c: number) => {
          const x = Float64Array.from(all.subarray(c * n, (c + 1) * n));
          let m = 0;
          for (let i = 0; i < pre; i++) m += x[i]!;
          m /= pre;
          return x.map((v) => v - m);
        };
        return { force: chan(0), responses: [chan(1)] };
      }),
      fs,
      { forceWindow: { startS: 0, lengthS: 0.02, taperS: 0.002 }, exponentialWindow: null },
    );
    const f: number[] = res.body.frf.f;
    const k0 = Math.round(f[0]! / (fs / n));
    for (const j of [0, 100, 500, 1000]) {
      expect(res.body.frf.channels[0].h1.re[j]).toBeCloseTo(direct.h1[0]!.re[k0 + j]!, 10);
      expect(res.body.frf.channels[0].coherence[j]).toBeCloseTo(direct.coherence[0]![k0 + j]!, 10);
    }
    // Volts → engineering units with the kit's sensitivities: the stored force peak is the simulated one.
    const peak = Math.max(...Array.from(hits[0]!.force).map(Math.abs));
    expect(res.body.hits[0].metrics.peakForceN).toBeCloseTo(peak, 0);
  });

  it('gives an H1 that matches the simulator’s closed-form accelerance near the first three bending modes', async () => {
    const hits = simulate('B01:+Z', 3, 21);
    const res = await engineer.agent.post(`/api/campaigns/${rig.campaignId}/schedule/${entry('B01:+Z').id}/hits`).set('idempotency-key', 'upload-b01-0001').attach('file', toWav(hits, 'pcm24'), { filename: 'b01.wav' }).field('fullScaleVolts', '10');
    expect(res.status).toBe(201);
    const f: number[] = res.body.frf.f;
    const h1 = res.body.frf.channels[0].h1;
    // Closed form: modal superposition of the Euler–Bernoulli bar (docs/methods.md#modal-model, #free-free-beam).
    const exact = modelFrf(bar.model, 'B21:+Z', 'B01:+Z', Float64Array.from(f), 'accelerance');
    for (const fn of [53.17, 146.55, 287.3]) {
      // 0.85·fn and 1.15·fn: off the peak, where the 4 s record (over 6 time constants of mode 1, docs/methods.md#record-length) holds the response without leakage.
      for (const target of [0.85 * fn, 1.15 * fn]) {
        const k = f.findIndex((x) => x >= target);
        const ratio = Math.hypot(h1.re[k], h1.im[k]) / Math.hypot(exact.re[k]!, exact.im[k]!);
        expect(Math.abs(ratio - 1), `|H1|/|H| at ${f[k]} Hz`).toBeLessThan(0.02);
        const dphase = Math.atan2(h1.im[k], h1.re[k]) - Math.atan2(exact.im[k]!, exact.re[k]!);
        expect(Math.abs(Math.atan2(Math.sin(dphase), Math.cos(dphase))) * (180 / Math.PI)).toBeLessThan(2);
      }
    }
    expect(res.body.frf.unit).toBe('(m/s²)/N');
  });

  it('returns the FRF in receptance or mobility on request, with the unit', async () => {
    const acc = await viewer.agent.get(`/api/campaigns/${rig.campaignId}/schedule/${entry('B01:+Z').id}/frf?kind=accelerance`);
    const rec = await viewer.agent.get(`/api/campaigns/${rig.campaignId}/schedule/${entry('B01:+Z').id}/frf?kind=receptance`);
    expect(entryFrfAnswerSchema.safeParse(acc.body).error).toBeUndefined();
    expect(rec.body.unit).toBe('m/N');
    const k = 200;
    const w = 2 * Math.PI * acc.body.f[k];
    // Receptance = accelerance / (jω)² = −accelerance/ω² (docs/methods.md#frf-kinds).
    expect(rec.body.channels[0].h1.re[k]).toBeCloseTo(-acc.body.channels[0].h1.re[k] / w ** 2, 12);
  });

  it('marks the entry done once the required accepted hits are in with good coherence, and offers the next entry', async () => {
    const res = await viewer.agent.get(`/api/campaigns/${rig.campaignId}/schedule`);
    const b11 = res.body.entries.find((e: { excitationDof: string }) => e.excitationDof === 'B11:+Z');
    expect(b11.status).toBe('done');
    expect(b11.acceptedHits).toBe(3);
    const next = await engineer.agent.get(`/api/campaigns/${rig.campaignId}/schedule/next`);
    // The rule of the route: the first entry in progress, else the first planned, in schedule order.
    const entries = res.body.entries as { id: string; status: string }[];
    const expected = entries.find((e) => e.status === 'in-progress') ?? entries.find((e) => e.status === 'planned');
    expect(expected).toBeDefined();
    expect(next.body.next.id).toBe(expected!.id);
    expect(next.body.next.excitationDof).not.toBe('B11:+Z');
  });

  it('flags an entry whose hits are in but whose coherence stays low', async () => {
    const target = entry('B05:+Z');
    const hits = simulate('B05:+Z', 3, 31);
    // Replace the response with noise unrelated to the force, decaying like a response would
    // (so the decay check passes) but carrying nothing of the force: low coherence.
    const rng = createRng(5);
    for (const h of hits) for (let k = 0; k < n; k++) h.responses[0]![k] = 5 * rng.gaussian() * Math.exp(-k / fs / 0.2);
    const res = await engineer.agent.post(`/api/campaigns/${rig.campaignId}/schedule/${target.id}/hits`).set('idempotency-key', 'upload-b05-noise').attach('file', toWav(hits), 'noise.wav');
    expect(res.status).toBe(201);
    expect(res.body.entry.status).toBe('flagged');
  });

  it('rejects a double hit with its reason and counts it in the progress by reason', async () => {
    const hits = simulate('B07:+Z', 1, 41, { doubleHit: { delayS: 0.004, ratio: 0.4 } });
    const res = await engineer.agent.post(`/api/campaigns/${rig.campaignId}/schedule/${entry('B07:+Z').id}/hits`).set('idempotency-key', 'upload-b07-double').attach('file', toWav(hits), 'double.wav');
    expect(res.status).toBe(201);
    expect(res.body.hits[0].verdict).toBe('reject');
    expect(res.body.hits[0].reasons.map((r: { code: string }) => r.code)).toContain('double-hit');
    expect(res.body.entry.status).toBe('in-progress');
    const progress = await viewer.agent.get(`/api/campaigns/${rig.campaignId}/progress`);
    expect(progress.body.rejectedByReason['double-hit']).toBeGreaterThanOrEqual(1);
    expect(progress.body.byStatus.done).toBeGreaterThanOrEqual(1);
    expect(progress.body.byEngineer[0].name).toBe('Eric Engineer');
  });
});

describe('overrides and retries', () => {
  it('stores one hit when the same idempotency key arrives twice', async () => {
    const target = entry('B09:+Z');
    const wav = toWav(simulate('B09:+Z', 1, 51));
    const first = await engineer.agent.post(`/api/campaigns/${rig.campaignId}/schedule/${target.id}/hits`).set('idempotency-key', 'retry-key-0001').attach('file', wav, 'a.wav');
    const second = await engineer.agent.post(`/api/campaigns/${rig.campaignId}/schedule/${target.id}/hits`).set('idempotency-key', 'retry-key-0001').attach('file', wav, 'a.wav');
    expect(first.status).toBe(201);
    expect(second.status).toBe(200);
    expect(second.body.replayed).toBe(true);
    expect(second.body.hits[0].id).toBe(first.body.hits[0].id);
    expect(await hitsOf(target.id)).toHaveLength(1);
  });

  it('lets one of two simultaneous overrides win; the other gets 409 and the audit trail keeps the winner', async () => {
    const target = entry('B09:+Z');
    const [h] = await hitsOf(target.id);
    const url = `/api/campaigns/${rig.campaignId}/hits/${h!.id}/verdict`;
    const [a, b] = await Promise.all([
      engineer.agent.post(url).send({ verdict: 'reject', note: 'hammer slipped on the edge', version: h!.version }),
      lead.agent.post(url).send({ verdict: 'reject', note: 'looks odd to me', version: h!.version }),
    ]);
    expect([a.status, b.status].sort()).toEqual([200, 409]);
    const trail = await lead.agent.get(`/api/campaigns/${rig.campaignId}/audit?entity=hit`);
    expect(trail.body.events.filter((e: { action: string; entityId: string }) => e.action === 'override' && e.entityId === h!.id)).toHaveLength(1);
    const [after] = await hitsOf(target.id);
    expect(after!.verdict).toBe('reject');
    expect(after!.autoVerdict).toBe('accept');
    // The raw record is kept whatever the verdict.
    expect(after!.samples.length).toBe(2 * n * 4);
  });

  it('does not let a viewer record or override hits', async () => {
    const target = entry('B09:+Z');
    const res = await viewer.agent.post(`/api/campaigns/${rig.campaignId}/schedule/${target.id}/simulate`).send({ count: 1 });
    expect(res.status).toBe(403);
  });
});

describe('bad recordings are refused with a message and store nothing', () => {
  const target = () => entry('B13:+Z');
  const post = (file: Buffer, name: string, key: string, fields: Record<string, string> = {}) => {
    let req = engineer.agent.post(`/api/campaigns/${rig.campaignId}/schedule/${target().id}/hits`).set('idempotency-key', key);
    for (const [k, v] of Object.entries(fields)) req = req.field(k, v);
    return req.attach('file', file, name);
  };

  it('refuses a wrong channel count', async () => {
    const res = await post(encodeWav([new Float64Array(n)], fs), 'one.wav', 'bad-0000001');
    expect(res.status).toBe(400);
    expect(res.body.error.message).toMatch(/The file has 1 channel; the channel map has 2/);
  });

  it('refuses a CSV without any sample rate', async () => {
    const res = await post(Buffer.from('force,accel\n0,0\n0,0\n1,1\n'), 'x.csv', 'bad-0000002');
    expect(res.status).toBe(400);
    expect(res.body.error.message).toMatch(/Unknown sample rate/);
  });

  it('refuses a recording at another sample rate than the settings', async () => {
    const res = await post(encodeWav([new Float64Array(100), new Float64Array(100)], 48000), 'x.wav', 'bad-0000003');
    expect(res.status).toBe(400);
    expect(res.body.error.message).toMatch(/sampled at 48000 Hz but the campaign's settings ask for 4096 Hz/);
  });

  it('refuses a NaN in a CSV, naming the line', async () => {
    const res = await post(Buffer.from('time,force,accel\n0,0,0\n0.000244140625,NaN,0\n0.00048828125,0,0\n'), 'x.csv', 'bad-0000004');
    expect(res.status).toBe(400);
    expect(res.body.error.message).toMatch(/Line 3, column 2 \("force"\): the value "NaN" is not a decimal number/);
  });

  it('refuses a truncated WAV and an empty one', async () => {
    const whole = toWav(simulate('B13:+Z', 1, 61));
    const truncated = await post(whole.subarray(0, 5000), 't.wav', 'bad-0000005');
    expect(truncated.status).toBe(400);
    expect(truncated.body.error.message).toMatch(/truncated/);
    const empty = await post(Buffer.alloc(0), 'e.wav', 'bad-0000006');
    expect(empty.status).toBe(400);
  });

  it('refuses a file over the configured limit with 413', async () => {
    const res = await post(Buffer.alloc(4 * 1024 * 1024), 'big.wav', 'bad-0000007');
    expect(res.status).toBe(413);
    expect(res.body.error.message).toMatch(/larger than 3 MB/);
  });

  it('refuses a recording with no hit in it', async () => {
    const res = await post(encodeWav([new Float64Array(n), new Float64Array(n)], fs), 'quiet.wav', 'bad-0000008');
    expect(res.status).toBe(422);
    expect(res.body.error.message).toMatch(/never reached the trigger level of 5 N/);
  });

  it('answers 404 for a schedule entry of another campaign', async () => {
    const other = await barCampaign(app, lead, { name: 'Second bar' });
    const res = await engineer.agent.post(`/api/campaigns/${rig.campaignId}/schedule/${other.entries[0]!.id}/hits`).set('idempotency-key', 'bad-0000009').attach('file', toWav(simulate('B13:+Z', 1, 62)), 'x.wav');
    expect(res.status).toBe(404);
    expect(await hitsOf(other.entries[0]!.id)).toHaveLength(0);
  });

  it('stored nothing for any of them', async () => {
    expect(await hitsOf(target().id)).toHaveLength(0);
  });
});

describe('simulated rig, reciprocity and linearity', () => {
  it('takes hits from the simulated rig through the same checks', async () => {
    const res = await engineer.agent.post(`/api/campaigns/${rig.campaignId}/schedule/${entry('B15:+Z').id}/simulate`).send({ count: 3, seed: 7, doubleHitProbability: 0, overloadProbability: 0 });
    expect(res.status).toBe(201);
    expect(res.body.hits).toHaveLength(3);
    expect(res.body.frf.averages).toBeGreaterThanOrEqual(1);
    const detail = await viewer.agent.get(`/api/campaigns/${rig.campaignId}/hits/${res.body.hits[0].id}?maxPoints=2000`);
    expect(detail.status).toBe(200);
    // Both answers are the shapes their routes declare (packages/contracts), which the web reads its types from.
    expect(hitsAnswerSchema.safeParse(res.body).error).toBeUndefined();
    expect(hitDetailSchema.safeParse(detail.body).error).toBeUndefined();
    expect(detail.body.channels.map((c: { unit: string }) => c.unit)).toEqual(['N', 'm/s²']);
    expect(detail.body.t.length).toBeLessThanOrEqual(2000);
    expect(detail.body.forceSpectrum.levelDb[0]).toBeCloseTo(0, 10);
    // The −10 dB mark sits on the plotted curve (one force spectrum for the check and the plot,
    // dsp forcePulseSpectrum): the line before it is above −10 dB, the line after at or below.
    const spectrum = detail.body.forceSpectrum as { f: number[]; levelDb: number[]; rollOff10dBHz: number | null };
    expect(spectrum.rollOff10dBHz).not.toBeNull();
    const after = spectrum.f.findIndex((f) => f >= spectrum.rollOff10dBHz!);
    expect(after).toBeGreaterThan(0);
    expect(spectrum.levelDb[after - 1]!).toBeGreaterThan(-10);
    expect(spectrum.levelDb[after]!).toBeLessThanOrEqual(-10);
  });

  it('reports reciprocity between H(B21,B05) and H(B05,B21) with FRAC near 1 on a reciprocal structure', async () => {
    const two = await barCampaign(app, lead, { references: ['B21:+Z', 'B05:+Z'], name: 'Two references' });
    const ab = two.entries.find((e) => e.responseDof === 'B21:+Z' && e.excitationDof === 'B05:+Z')!;
    const ba = two.entries.find((e) => e.responseDof === 'B05:+Z' && e.excitationDof === 'B21:+Z')!;
    for (const [e, seed] of [[ab, 71], [ba, 72]] as const) {
      const r = await lead.agent.post(`/api/campaigns/${two.campaignId}/schedule/${e.id}/simulate`).send({ count: 3, seed, peakForceN: 30, doubleHitProbability: 0, overloadProbability: 0 });
      expect(r.body.hits.map((h: { verdict: string }) => h.verdict)).toEqual(['accept', 'accept', 'accept']);
      expect(r.status).toBe(201);
    }
    const checks = await lead.agent.get(`/api/campaigns/${two.campaignId}/checks`);
    // Maxwell–Betti reciprocity: H_ij = H_ji for symmetric M, C, K (docs/methods.md#modal-model).
    const pair = checks.body.reciprocity[0];
    expect(pair).toBeDefined();
    expect(pair.frac).toBeGreaterThan(0.98);
    for (const p of pair.peaks) expect(Math.abs(p.dbDifference)).toBeLessThan(1);
  });

  it('reports linearity from hits at two force levels at one DOF', async () => {
    const target = entry('B17:+Z');
    await engineer.agent.post(`/api/campaigns/${rig.campaignId}/schedule/${target.id}/simulate`).send({ count: 3, seed: 81, peakForceN: 25, doubleHitProbability: 0, overloadProbability: 0 }).expect(201);
    await engineer.agent.post(`/api/campaigns/${rig.campaignId}/schedule/${target.id}/simulate`).send({ count: 3, seed: 82, peakForceN: 100, doubleHitProbability: 0, overloadProbability: 0 }).expect(201);
    const checks = await viewer.agent.get(`/api/campaigns/${rig.campaignId}/checks`);
    // The answer is the shape GET …/checks declares (packages/contracts), which the web reads its types from.
    expect(checksAnswerSchema.safeParse(checks.body).error).toBeUndefined();
    // Asked again with no new hit, the check is served under the same input hash: the same numbers.
    const again = await viewer.agent.get(`/api/campaigns/${rig.campaignId}/checks`);
    expect(again.body.linearity).toEqual(checks.body.linearity);
    const lin = checks.body.linearity.find((l: { entry: { excitation: string } }) => l.entry.excitation === 'B17:+Z');
    expect(lin.forceRatio).toBeGreaterThan(2.5);
    // The simulated structure is linear, so the two levels overlay (docs/methods.md#validity-checks).
    expect(lin.frac).toBeGreaterThan(0.98);
    for (const p of lin.peaks) expect(Math.abs(p.peakShiftHz)).toBeLessThan(0.5);
  });
});
