// Hand-over (issue 8): the report (HTML and PDF), the CSV/JSON bundles read back with outside
// parsers (fflate, papaparse) against the API's own numbers, and sharing — a signed, expiring
// report link that opens that one report only, and viewer invitations.
import { createHash, createHmac } from 'node:crypto';
import { writeFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import os from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { seedDemo, DEMO_PASSWORD, BAR_CAMPAIGN, SKID_CAMPAIGN } from '@resonote/api/seed';
import { eq } from 'drizzle-orm';
import { hit } from '@resonote/db/schema';
import { startTestApp, type TestApp } from '../support/app.ts';
import { signUp } from '../support/accounts.ts';
import { waitForMail } from '../support/campaign.ts';
import { SEEDED_API_TEMPLATE } from '../setup/seeded-demo-templates.ts';
import { API_TEMPLATE } from '../support/global-setup-api.ts';

// The zip and CSV readers are the API package's own dependencies, loaded from there.
const apiRequire = createRequire(new URL('../../apps/api/package.json', import.meta.url));
const { unzipSync } = apiRequire('fflate') as { unzipSync: (data: Uint8Array) => Record<string, Uint8Array> };
const Papa = apiRequire('papaparse') as { parse: <T>(text: string, options: Record<string, unknown>) => { data: T[]; errors: unknown[] } };

type Agent = ReturnType<TestApp['agent']>;
let app: TestApp;
let lead: Agent;
let viewer: Agent;
let engineer: Agent;
let barId: string;
let skidId: string;

const binary = (req: request.Test) =>
  req.buffer(true).parse((res, done) => {
    const chunks: Buffer[] = [];
    res.on('data', (c: Buffer) => chunks.push(c));
    res.on('end', () => done(null, Buffer.concat(chunks)));
  });

const csv = <T>(bytes: Uint8Array | undefined) => {
  expect(bytes, 'file present in the zip').toBeDefined();
  const parsed = Papa.parse<T>(Buffer.from(bytes!).toString('utf8'), { header: true, dynamicTyping: true, skipEmptyLines: true });
  expect(parsed.errors).toEqual([]);
  return parsed.data;
};

async function signIn(email: string) {
  const agent = app.agent();
  await agent.post('/api/auth/sign-in/email').send({ email, password: DEMO_PASSWORD }).expect(200);
  return agent;
}

// Euler–Bernoulli free–free bar (docs/methods.md#free-free-beam), as in modes.test.ts.
const HANDBOOK_HZ = [53.17, 146.55, 287.3, 474.93];

beforeAll(async () => {
  // A small JSON raw limit: the skid's raw data (≈ 1.2 million values) fits, the bar's (≈ 2.8 million) does not.
  // Against the cluster the template holds the demo already (tests/setup/seeded-demo-templates.ts); seedDemo then adds nothing.
  app = await startTestApp(process.env.RESONOTE_SEEDED_DEMO === '1' ? SEEDED_API_TEMPLATE : API_TEMPLATE, { EXPORT_JSON_RAW_MAX_VALUES: '2000000' });
  await seedDemo(app.handle, { log: () => undefined });
  lead = await signIn('lead@demo.resonote.local');
  viewer = await signIn('viewer@demo.resonote.local');
  engineer = await signIn('engineer@demo.resonote.local');
  const list = (await lead.get('/api/campaigns')).body.campaigns as { id: string; name: string }[];
  barId = list.find((c) => c.name === BAR_CAMPAIGN)!.id;
  skidId = list.find((c) => c.name === SKID_CAMPAIGN)!.id;
  // A modal fit with the four bending modes chosen, so the report and bundle have modes.
  const started = await lead.post(`/api/campaigns/${barId}/modes/fits`).send({ bandHz: { low: 20, high: 600 }, maxOrder: 30 });
  let fit = started.body.fit;
  for (let i = 0; i < 600 && fit.status !== 'done' && fit.status !== 'failed'; i++) {
    await new Promise((r) => setTimeout(r, 100));
    fit = (await lead.get(`/api/campaigns/${barId}/modes/fits/${started.body.fit.id}`)).body.fit;
  }
  expect(fit.status).toBe('done');
  const top = fit.result.diagram.orders.at(-1);
  const poles = HANDBOOK_HZ.map((f0) => {
    let best = -1;
    top.poles.forEach((p: { fHz: number; stable: string }, i: number) => {
      if (p.stable === 'all' && (best < 0 || Math.abs(p.fHz - f0) < Math.abs(top.poles[best].fHz - f0))) best = i;
    });
    return { order: top.order, index: best };
  });
  await lead.post(`/api/campaigns/${barId}/modes/fits/${fit.id}/modes`).send({ poles }).expect(200);
  // …and the four added to the campaign's mode table, which the hand-over carries.
  await lead.post(`/api/campaigns/${barId}/modes/table`).send({ fitId: fit.id, modes: [1, 2, 3, 4], baseVersion: 0 }).expect(201);
}, 240_000);
afterAll(async () => {
  await app?.close();
});

describe('hand-over report', () => {
  it('is one self-contained HTML page that a viewer can read, with units, the dB reference, the cautions and the modes', async () => {
    const res = await viewer.get(`/api/campaigns/${barId}/report.html`);
    expect(res.status).toBe(200);
    expect(res.headers['content-type']).toMatch(/text\/html/);
    const html = res.text;
    // No external assets and no scripts: it prints the same anywhere.
    expect(html).not.toMatch(/<script|<link\b|<img\b|src="http|url\(http/i);
    expect(html).toContain(BAR_CAMPAIGN.replace(/–/g, '–'));
    expect(html).toContain('dB re 1 (m/s²)/N');
    expect(html).toContain('B21:+Z');
    expect(html).toContain('e<sup>+jωt</sup>');
    expect(html).toMatch(/eye protection/);
    expect(html).toMatch(/rotating or energised machinery/);
    expect(html).toMatch(/licensed practice under local codes/);
    expect(html).toMatch(/@page \{ size: A4/);
    // The mode table shows the frequencies the Modes API holds (rounded to 0.01 Hz).
    const modes = (await viewer.get(`/api/campaigns/${barId}/modes`)).body.modes as { fHz: number; zetaPercent: number }[];
    expect(modes).toHaveLength(4);
    for (const m of modes) expect(html).toContain(`>${m.fHz.toFixed(2)}<`);
    // The demo's background-noise check before the first hit, each channel's floor with its reading.
    const noise = (await viewer.get(`/api/campaigns/${barId}/noise-checks`)).body.checks as { channels: { rmsInBand: number; unit: string }[] }[];
    expect(noise).toHaveLength(1);
    expect(html).toContain('<h3>Background noise</h3>');
    for (const ch of noise[0]!.channels) expect(html).toContain(`${ch.rmsInBand.toPrecision(3)} ${ch.unit}`);
    expect(html).toMatch(/Quiet enough\./);
    // One geometry picture, 21 FRF thumbnails, 4 mode-shape pictures.
    expect(html.match(/<svg /g)!.length).toBe(1 + 21 + 4);
  });

  it('traces each FRF in its appendix to the accepted hit ids, the settings version and the input hash the Results API reports', async () => {
    const html = (await viewer.get(`/api/campaigns/${barId}/report.html`)).text;
    const entries = (await viewer.get(`/api/campaigns/${barId}/schedule`)).body.entries as { id: string }[];
    for (const e of entries.slice(0, 5)) {
      const frf = (await viewer.get(`/api/campaigns/${barId}/schedule/${e.id}/frf`)).body;
      expect(html).toContain(frf.inputHash);
      const hits = (await viewer.get(`/api/campaigns/${barId}/schedule/${e.id}/hits`)).body.hits as { id: string; verdict: string }[];
      for (const h of hits.filter((x) => x.verdict === 'accept')) expect(html).toContain(h.id);
    }
    const table = (await viewer.get(`/api/campaigns/${barId}/modes`)).body;
    for (const row of table.modes as { source: { fitId: string; inputHash: string } }[]) {
      expect(html).toContain(row.source.fitId);
      expect(html).toContain(row.source.inputHash.slice(0, 16));
    }
    // The sign convention in words, and a clear note where shapes are not mass-normalised.
    expect(html).toContain('positive axis of each point');
    if ((table.modes as { massShape: unknown }[]).some((m) => !m.massShape)) expect(html).toMatch(/Not mass-normalised: /);
  });

  it('prints to an A4 PDF for the lead, and refuses the PDF to a viewer', async () => {
    const res = await binary(lead.get(`/api/campaigns/${barId}/report.pdf`));
    expect(res.status).toBe(200);
    expect(res.headers['content-type']).toBe('application/pdf');
    const pdf = res.body as Buffer;
    expect(pdf.subarray(0, 5).toString('latin1')).toBe('%PDF-');
    // A4 is 210 × 297 mm = 595.28 × 841.89 pt (ISO 216; 1 pt = 1/72 in).
    const box = pdf.toString('latin1').match(/\/MediaBox\s*\[\s*0\s+0\s+([\d.]+)\s+([\d.]+)\s*\]/);
    expect(box).not.toBeNull();
    expect(Number(box![1])).toBeCloseTo(595.28, 0);
    expect(Number(box![2])).toBeCloseTo(841.89, 0);
    expect((pdf.toString('latin1').match(/\/Type\s*\/Page[^s]/g) ?? []).length).toBeGreaterThan(3);
    writeFileSync(path.join(os.tmpdir(), 'resonote-handover-report.pdf'), pdf);
    const refused = await viewer.get(`/api/campaigns/${barId}/report.pdf`);
    expect(refused.status).toBe(403);
  }, 60_000);
});

describe('hand-over bundle', () => {
  let files: Record<string, Uint8Array>;
  beforeAll(async () => {
    const res = await binary(lead.get(`/api/campaigns/${barId}/export/bundle.zip`));
    expect(res.status).toBe(200);
    expect(res.headers['content-type']).toBe('application/zip');
    files = unzipSync(new Uint8Array(res.body as Buffer));
  }, 60_000);

  it('holds geometry.csv with the same points, in mm, as GET points', async () => {
    const rows = csv<{ label: string; x_mm: number; y_mm: number; z_mm: number; directions: string }>(files['geometry.csv']);
    const points = (await viewer.get(`/api/campaigns/${barId}/points`)).body.points as { label: string; x: number; y: number; z: number; directions: string[] }[];
    expect(rows).toHaveLength(points.length);
    const byLabel = new Map(rows.map((r) => [String(r.label), r]));
    for (const p of points) {
      const r = byLabel.get(p.label)!;
      expect([r.x_mm, r.y_mm, r.z_mm]).toEqual([p.x, p.y, p.z]);
      expect(String(r.directions).split(' ')).toEqual(p.directions);
    }
  });

  it('holds one FRF file per DOF pair whose every line equals GET frf?band=all to full precision', async () => {
    const index = csv<{ file: string; response_dof: string; excitation_dof: string; entry_id: string; input_hash: string; hit_ids: string }>(files['frf/index.csv']);
    expect(index).toHaveLength(21);
    expect(index.map((r) => r.file)).toContain('frf/B21+Z_B05+Z.csv');
    for (const row of index) {
      const api = (await viewer.get(`/api/campaigns/${barId}/schedule/${row.entry_id}/frf?band=all`)).body;
      expect(row.input_hash).toBe(api.inputHash);
      expect(row.hit_ids.split(' ')).toEqual(api.hitIds);
      expect(`${row.response_dof}|${row.excitation_dof}`).toBe(`${api.channels[0].responseDof}|${api.excitationDof}`);
      const lines = csv<{ frequency_hz: number; h1_re: number; h1_im: number; h2_re: number; h2_im: number; coherence: number }>(files[row.file]);
      expect(lines.map((l) => l.frequency_hz)).toEqual(api.f);
      expect(lines.map((l) => l.h1_re)).toEqual(api.channels[0].h1.re);
      expect(lines.map((l) => l.h1_im)).toEqual(api.channels[0].h1.im);
      expect(lines.map((l) => l.h2_re)).toEqual(api.channels[0].h2.re);
      expect(lines.map((l) => l.h2_im)).toEqual(api.channels[0].h2.im);
      expect(lines.map((l) => l.coherence)).toEqual(api.channels[0].coherence);
    }
  }, 60_000);

  it('holds the modes, the schedule, the settings with their history, and a README that states units and conventions', async () => {
    const modes = csv<{ mode: number; f_hz: number; zeta_percent: number; mpc: number }>(files['modes.csv']);
    const api = (await viewer.get(`/api/campaigns/${barId}/modes`)).body;
    expect(modes.map((m) => [m.mode, m.f_hz, m.zeta_percent, m.mpc])).toEqual(api.modes.map((m: { mode: number; fHz: number; zetaPercent: number; mpc: number }) => [m.mode, m.fHz, m.zetaPercent, m.mpc]));
    // Each row of the campaign's mode table keeps its fit, band, order and input hash (Resonote design, "Mode table").
    const traced = csv<{ fit_id: string; band_low_hz: number; band_high_hz: number; model_order: number; fit_input_hash: string; references: string }>(files['modes.csv']);
    expect(traced.map((m) => [m.fit_id, m.band_low_hz, m.band_high_hz, m.model_order, m.fit_input_hash, m.references])).toEqual(
      api.modes.map((m: { source: { fitId: string; bandHz: number[]; order: number; inputHash: string; references: string[] } }) => [m.source.fitId, m.source.bandHz[0], m.source.bandHz[1], m.source.order, m.source.inputHash, m.source.references.join(' ')]),
    );
    expect(files['mode-shapes-mass-normalised.csv']).toBeDefined();
    const shapes = csv<{ mode: number; dof: string; real: number }>(files['mode-shapes.csv']);
    expect(shapes.filter((s) => s.mode === 1).map((s) => [s.dof, s.real])).toEqual(api.modes[0].shape.map((s: { dof: string; real: number }) => [s.dof, s.real]));
    const schedule = csv<{ entry_id: string; response_dof: string }>(files['schedule.csv']);
    expect(schedule.map((s) => s.entry_id)).toEqual((await viewer.get(`/api/campaigns/${barId}/schedule`)).body.entries.map((e: { id: string }) => e.id));
    // Background noise: one row per check and channel, the same numbers as the API.
    const noiseRows = csv<{ channel: number; rms_in_band: number; peak: number; status: string }>(files['noise.csv']);
    const apiNoise = (await viewer.get(`/api/campaigns/${barId}/noise-checks`)).body.checks[0].channels as { channel: number; rmsInBand: number; peak: number; status: string }[];
    expect(noiseRows.map((r) => [r.channel, r.rms_in_band, r.peak, r.status])).toEqual(apiNoise.map((c) => [c.channel, c.rmsInBand, c.peak, c.status]));
    const settings = JSON.parse(Buffer.from(files['settings.json']!).toString('utf8'));
    const apiSettings = (await viewer.get(`/api/campaigns/${barId}/settings`)).body;
    expect(settings.currentVersion).toBe(apiSettings.current.version);
    expect(settings.current.sampleRateHz).toBe(4096);
    expect(settings.history.length).toBeGreaterThanOrEqual(1);
    const readme = Buffer.from(files['README.txt']!).toString('utf8');
    for (const words of ['(m/s^2)/N', 'H1 = G_fx / G_ff', 'B05:+Z', 'e^{+jwt}', 'dB re 1 (m/s²)/N', 'input_hash']) expect(readme).toContain(words);
  });

  it('adds the raw time data with ?raw=1, equal sample for sample to the stored hits', async () => {
    const res = await binary(lead.get(`/api/campaigns/${barId}/export/bundle.zip?raw=1`));
    expect(res.status).toBe(200);
    const raw = unzipSync(new Uint8Array(res.body as Buffer));
    const index = csv<{ file: string; hit_id: string; sha256: string; samples: number }>(raw['hits/index.csv']);
    expect(index.length).toBeGreaterThanOrEqual(84);
    const first = index[0]!;
    const rows = csv<Record<string, number>>(raw[first.file]);
    expect(rows).toHaveLength(first.samples);
    const columns = Object.keys(rows[0]!);
    expect(columns[0]).toBe('time_s');
    // The stored bytes are float32 LE, channel after channel: rebuild them from the CSV and hash.
    const f32 = new Float32Array(rows.length * (columns.length - 1));
    columns.slice(1).forEach((col, c) => rows.forEach((r, i) => (f32[c * rows.length + i] = r[col]!)));
    expect(createHash('sha256').update(Buffer.from(f32.buffer)).digest('hex')).toBe(first.sha256);
    const api = (await viewer.get(`/api/campaigns/${barId}/hits/${first.hit_id}?maxPoints=100000`)).body;
    // The text is the shortest decimal of each float32: rounding it to float32 gives the stored value
    // (JSON has no −0, so both sides are compared with −0 folded into 0).
    expect(rows.map((r) => Math.fround(r[columns[1]!]!) + 0)).toEqual(api.channels[0].values.map((v: number) => v + 0));
  }, 120_000);

  it('streams every raw hit into the zip, each file matching its SHA-256 in the index', async () => {
    const res = await binary(lead.get(`/api/campaigns/${barId}/export/bundle.zip?raw=1`));
    const raw = unzipSync(new Uint8Array(res.body as Buffer));
    const index = csv<{ file: string; sha256: string }>(raw['hits/index.csv']);
    const db = app.handle.database.db;
    const stored = await db.select({ id: hit.id }).from(hit).where(eq(hit.campaignId, barId));
    expect(index).toHaveLength(stored.length);
    expect(index.every((h) => raw[h.file] !== undefined)).toBe(true);
    const last = index.at(-1)!;
    const rows = csv<Record<string, number>>(raw[last.file]);
    const columns = Object.keys(rows[0]!);
    const f32 = new Float32Array(rows.length * (columns.length - 1));
    columns.slice(1).forEach((col, c) => rows.forEach((r, i) => (f32[c * rows.length + i] = r[col]!)));
    expect(createHash('sha256').update(Buffer.from(f32.buffer)).digest('hex')).toBe(last.sha256);
  }, 120_000);

  it('carries raw data in the JSON bundle up to EXPORT_JSON_RAW_MAX_VALUES and points to the zip above it', async () => {
    const skid = await lead.get(`/api/campaigns/${skidId}/export/bundle.json?raw=1`);
    expect(skid.status).toBe(200);
    const hits = skid.body.hits as { hitId: string; values: number[][]; sha256: string }[];
    expect(hits.length).toBeGreaterThan(0);
    const one = (await viewer.get(`/api/campaigns/${skidId}/hits/${hits[0]!.hitId}?maxPoints=100000`)).body;
    expect(hits[0]!.values[0]!.map((v) => v + 0)).toEqual(one.channels[0].values.map((v: number) => v + 0));
    const big = await lead.get(`/api/campaigns/${barId}/export/bundle.json?raw=1`);
    expect(big.status).toBe(413);
    expect(big.body.error.message).toMatch(/million values, more than one JSON document carries \(2 million\)\. Download bundle\.zip\?raw=1 instead/);
  }, 120_000);

  it('gives the same content as one JSON document, and refuses both bundles to a viewer and an engineer', async () => {
    const res = await lead.get(`/api/campaigns/${barId}/export/bundle.json`);
    expect(res.status).toBe(200);
    expect(res.body.format).toBe('resonote-handover-bundle');
    const fromZip = csv<{ h1_re: number }>(files['frf/B21+Z_B05+Z.csv']);
    const frf = res.body.frfs.find((x: { file: string }) => x.file === 'frf/B21+Z_B05+Z.csv');
    expect(frf.h1.re).toEqual(fromZip.map((l) => l.h1_re));
    expect(res.body.geometry.points).toHaveLength(21);
    for (const agent of [viewer, engineer]) {
      for (const url of ['export/bundle.zip', 'export/bundle.json', 'backup']) {
        const refused = await agent.get(`/api/campaigns/${barId}/${url}`);
        expect(refused.status, url).toBe(403);
        expect(refused.body.error.code).toBe('forbidden');
      }
    }
  }, 60_000);
});

describe('sharing the hand-over', () => {
  const signed = (payload: object) => {
    // The documented token: base64url(JSON payload) "." base64url(HMAC-SHA256(secret, "resonote.report-link.v1." + payload part)).
    const body = Buffer.from(JSON.stringify(payload)).toString('base64url');
    const mac = createHmac('sha256', app.config.authSecret).update(`resonote.report-link.v1.${body}`).digest('base64url');
    return `${body}.${mac}`;
  };

  it('mails an expiring link that opens this report, read-only, to someone without an account', async () => {
    const res = await lead.post(`/api/campaigns/${barId}/share`).send({ recipients: ['Client.Engineer@example.test'], mode: 'report-link', expiresInDays: 7, message: 'Results of the bar check.' });
    expect(res.status).toBe(200);
    expect(res.body.sent).toEqual(['client.engineer@example.test']);
    expect(Date.parse(res.body.expiresAt) - Date.now()).toBeGreaterThan(6.9 * 86_400_000);
    const mail = await waitForMail(app, 'client.engineer@example.test', /hand-over report/);
    expect(mail.text).toContain('Results of the bar check.');
    const link = mail.text.match(/https?:\/\/\S+\/api\/shared\/reports\/([A-Za-z0-9_-]+\.[A-Za-z0-9_-]+)/);
    expect(link).not.toBeNull();
    const token = link![1]!;
    const open = await request(app.handle.app).get(`/api/shared/reports/${token}`);
    expect(open.status).toBe(200);
    expect(open.text).toContain(BAR_CAMPAIGN);
    expect(open.text).not.toContain(SKID_CAMPAIGN);
    expect(open.text).toMatch(/Shared read-only copy/);
    // The share is in the audit trail.
    const events = (await lead.get(`/api/campaigns/${barId}/audit?entity=share`)).body.events as { action: string; after: { recipients: string[] } }[];
    expect(events[0]!.action).toBe('share-report-link');
    expect(events[0]!.after.recipients).toEqual(['client.engineer@example.test']);
  });

  it('gives no other access: not another campaign, not the API, not a forged payload', async () => {
    const res = await lead.post(`/api/campaigns/${barId}/share`).send({ recipients: ['reader@example.test'], mode: 'report-link' });
    const token = res.body.link.split('/').at(-1) as string;
    const [body, mac] = token.split('.') as [string, string];
    const payload = JSON.parse(Buffer.from(body, 'base64url').toString('utf8'));
    expect(payload.campaignId).toBe(barId);
    // The same signature over a payload naming the other campaign is refused.
    const forged = `${Buffer.from(JSON.stringify({ ...payload, campaignId: skidId })).toString('base64url')}.${mac}`;
    const refused = await request(app.handle.app).get(`/api/shared/reports/${forged}`);
    expect(refused.status).toBe(404);
    expect(refused.body.error.code).toBe('not-found');
    // The token is not a credential for the rest of the API.
    for (const url of [`/api/campaigns/${barId}`, `/api/campaigns/${skidId}/report.html`, `/api/campaigns/${barId}/export/bundle.json`]) {
      const r = await request(app.handle.app).get(url).set('authorization', `Bearer ${token}`).set('cookie', `better-auth.session_token=${token}`);
      expect(r.status, url).toBe(401);
    }
    expect((await request(app.handle.app).get(`/api/shared/reports/${token}x`)).status).toBe(404);
    expect((await request(app.handle.app).get('/api/shared/reports/not-a-token')).status).toBe(404);
  });

  it('refuses an expired link with 410 and says so', async () => {
    const token = signed({ campaignId: barId, exp: Math.floor(Date.now() / 1000) - 60, nonce: 'expired-test-nonce' });
    const res = await request(app.handle.app).get(`/api/shared/reports/${token}`);
    expect(res.status).toBe(410);
    expect(res.body.error.code).toBe('link-expired');
    expect(res.body.error.message).toMatch(/expired/);
    // A link signed the same way but still valid opens: the 410 is about time, not the signature.
    const valid = signed({ campaignId: barId, exp: Math.floor(Date.now() / 1000) + 600, nonce: 'valid-test-nonce' });
    expect((await request(app.handle.app).get(`/api/shared/reports/${valid}`)).status).toBe(200);
  });

  it('invites recipients as viewers through the same invitation flow, skipping people who are members already', async () => {
    const res = await lead.post(`/api/campaigns/${barId}/share`).send({ recipients: ['designer@example.test', 'viewer@demo.resonote.local'], mode: 'viewer-invitation', expiresInDays: 3 });
    expect(res.status).toBe(200);
    expect(res.body.sent).toEqual(['designer@example.test']);
    expect(res.body.skipped).toEqual([{ email: 'viewer@demo.resonote.local', reason: 'already a member of this campaign' }]);
    const mail = await waitForMail(app, 'designer@example.test', /invites you/);
    const token = mail.text.match(/\/invitations\/([A-Za-z0-9_-]+)/)![1]!;
    const offer = await request(app.handle.app).get(`/api/invitations/${token}`);
    expect(offer.body.role).toBe('viewer');
    expect(Date.parse(offer.body.expiresAt) - Date.now()).toBeLessThan(3 * 86_400_000 + 60_000);
    const designer = await signUp(app, 'Dana Designer', 'designer@example.test');
    await designer.agent.post(`/api/invitations/${token}/accept`).send({}).expect(200);
    expect((await designer.agent.get(`/api/campaigns/${barId}`)).body.myRole).toBe('viewer');
    expect((await designer.agent.get(`/api/campaigns/${barId}/report.pdf`)).status).toBe(403);
  });

  it('refuses bad share requests with a clear 400, and refuses sharing to viewers and engineers', async () => {
    const bad = [
      [{ recipients: [], mode: 'report-link' }, /recipient/],
      [{ recipients: Array.from({ length: 21 }, (_, i) => `p${i}@example.test`), mode: 'report-link' }, /20/],
      [{ recipients: ['not-an-address'], mode: 'report-link' }, /e-mail/],
      [{ recipients: ['a@example.test'], mode: 'report-link', expiresInDays: 91 }, /expiresInDays/],
      [{ recipients: ['a@example.test'], mode: 'fax' }, /mode/],
      [{ recipients: ['a@example.test'], mode: 'report-link', extra: 1 }, /extra/],
    ] as const;
    for (const [body, message] of bad) {
      const res = await lead.post(`/api/campaigns/${barId}/share`).send(body);
      expect(res.status, JSON.stringify(body)).toBe(400);
      expect(res.body.error.code).toBe('invalid-input');
      expect(res.body.error.message).toMatch(message);
    }
    for (const agent of [viewer, engineer]) {
      expect((await agent.post(`/api/campaigns/${barId}/share`).send({ recipients: ['a@example.test'], mode: 'report-link' })).status).toBe(403);
    }
  });
});
