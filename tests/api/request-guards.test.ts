// Guards in front of every route: cookie-carrying writes must come from this Resonote's own
// pages (Origin, else Referer), /api answers are never cached, and sign-in attempts are limited
// per e-mail address and, more loosely, per client IP.
import { describe, expect, it } from 'vitest';
import request from 'supertest';
import { eq } from 'drizzle-orm';
import { campaign, hit } from '@resonote/db/schema';
import { loadConfig } from '@resonote/api/config';
import { startTestApp, type TestApp } from '../support/app.ts';
import { PASSWORD, signUp } from '../support/accounts.ts';
import type { Person } from '../support/campaign.ts';
import { useBarRig, type RigCampaign } from '../support/rig.ts';
import { barWav } from '../support/bar-recording.ts';
import { API_TEMPLATE } from '../support/global-setup-api.ts';

let app: TestApp;
let lead: Person;
let engineer: Person;
let rig: RigCampaign;
const foreign = 'https://attacker.example';

useBarRig((r) => ({ app, lead, engineer, rig } = r));

const campaignRow = async () => (await app.handle.database.db.select().from(campaign).where(eq(campaign.id, rig.campaignId)))[0]!;

describe('cookie-carrying writes from another site', () => {
  it('refuses a PATCH of a campaign from a foreign Origin with 403 naming the origin, and changes nothing', async () => {
    const before = await campaignRow();
    const res = await lead.agent.patch(`/api/campaigns/${rig.campaignId}`).set('origin', foreign).send({ name: 'Renamed by another site', version: before.version });
    expect(res.status).toBe(403);
    expect(res.body.error.code).toBe('origin-mismatch');
    expect(res.body.error.message).toContain('"https://attacker.example" is not this Resonote');
    const after = await campaignRow();
    expect(after.name).toBe(before.name);
    expect(after.version).toBe(before.version);
  });

  it('refuses a multipart hit upload from a foreign Origin (key as a form field) and stores nothing; the same upload from the app is stored', async () => {
    const target = rig.entries.find((e) => e.excitationDof === 'B05:+Z')!;
    const wav = barWav(rig, 'B05:+Z', 1, 31);
    const url = `/api/campaigns/${rig.campaignId}/schedule/${target.id}/hits`;
    const forged = await engineer.agent.post(url).set('origin', foreign).field('idempotencyKey', 'csrf-upload-0001').attach('file', wav, 'x.wav');
    expect(forged.status).toBe(403);
    expect(forged.body.error.code).toBe('origin-mismatch');
    expect(await app.handle.database.db.select({ id: hit.id }).from(hit).where(eq(hit.scheduleEntryId, target.id))).toHaveLength(0);

    const own = await engineer.agent.post(url).field('idempotencyKey', 'csrf-upload-0001').attach('file', wav, 'x.wav');
    expect(own.status).toBe(201);
    expect(own.body.hits).toHaveLength(1);
  });

  it('refuses a cookie-carrying write that names neither Origin nor Referer', async () => {
    const before = await campaignRow();
    const res = await lead.agent.patch(`/api/campaigns/${rig.campaignId}`).unset('origin').send({ notes: 'no origin', version: before.version });
    expect(res.status).toBe(403);
    expect(res.body.error.code).toBe('origin-missing');
    expect(res.body.error.message).toMatch(/names no Origin \(nor Referer\)/);
    expect((await campaignRow()).version).toBe(before.version);
  });

  it('takes the Referer when a browser leaves Origin out: a page of this Resonote passes, another site does not', async () => {
    const before = await campaignRow();
    const bad = await lead.agent.patch(`/api/campaigns/${rig.campaignId}`).unset('origin').set('referer', `${foreign}/page`).send({ notes: 'via referer', version: before.version });
    expect(bad.status).toBe(403);
    expect(bad.body.error.message).toContain('Referer');
    const good = await lead.agent.patch(`/api/campaigns/${rig.campaignId}`).unset('origin').set('referer', `${app.config.publicUrl}/campaigns/${rig.campaignId}`).send({ notes: 'via referer', version: before.version });
    expect(good.status).toBe(200);
    expect(good.body.campaign.notes).toBe('via referer');
  });

  it('refuses the opaque Origin "null" (sandboxed frames, data: pages)', async () => {
    const res = await lead.agent.delete(`/api/campaigns/${rig.campaignId}/invitations/00000000-0000-4000-8000-000000000000`).set('origin', 'null');
    expect(res.status).toBe(403);
    expect(res.body.error.code).toBe('origin-mismatch');
  });

  it('checks sign-out and the other auth writes too', async () => {
    const res = await engineer.agent.post('/api/auth/sign-out').set('origin', foreign).send({});
    expect(res.status).toBe(403);
    expect((await engineer.agent.get('/api/me')).status).toBe(200);
  });

  it('leaves reads and cookie-less requests to the other rules (a signed-out write answers 401, not 403)', async () => {
    expect((await lead.agent.get(`/api/campaigns/${rig.campaignId}`).set('origin', foreign)).status).toBe(200);
    const anonymous = await request(app.handle.app).post('/api/campaigns').set('origin', foreign).send({ name: 'x' });
    expect(anonymous.status).toBe(401);
  });

  it('accepts the 127.0.0.1/localhost twin of a loopback public URL outside production only, and TRUSTED_ORIGINS', () => {
    expect(loadConfig({ PORT: '3000' }).allowedOrigins).toEqual(['http://127.0.0.1:3000', 'http://localhost:3000']);
    expect(loadConfig({ PUBLIC_URL: 'http://localhost:8080/' }).allowedOrigins).toEqual(['http://localhost:8080', 'http://127.0.0.1:8080']);
    const production = { NODE_ENV: 'production', AUTH_SECRET: 'x'.repeat(40), SMTP_URL: 'smtp://mail.lab.test:25' };
    expect(loadConfig({ ...production, PORT: '3000' }).allowedOrigins).toEqual(['http://127.0.0.1:3000']);
    expect(loadConfig({ ...production, PUBLIC_URL: 'https://resonote.lab.test' }).allowedOrigins).toEqual(['https://resonote.lab.test']);
    expect(loadConfig({ PUBLIC_URL: 'https://resonote.lab.test', TRUSTED_ORIGINS: 'http://127.0.0.1:5173/, https://x.lab.test' }).allowedOrigins).toEqual(['https://resonote.lab.test', 'http://127.0.0.1:5173', 'https://x.lab.test']);
    expect(() => loadConfig({ TRUSTED_ORIGINS: 'not a url' })).toThrow(/TRUSTED_ORIGINS/);
  });

  it('lets a page served under the localhost twin write in a test instance', async () => {
    const twin = app.config.allowedOrigins[1]!;
    expect(twin).toMatch(/^http:\/\/localhost:\d+$/);
    const before = await campaignRow();
    const res = await lead.agent.patch(`/api/campaigns/${rig.campaignId}`).set('origin', twin).send({ notes: 'from localhost', version: before.version });
    expect(res.status).toBe(200);
  });
});

describe('no caching of API answers', () => {
  it('marks signed-in JSON, error answers and the session as no-store', async () => {
    for (const path of ['/api/me', '/api/campaigns', `/api/campaigns/${rig.campaignId}`, `/api/campaigns/${rig.campaignId}/schedule`, '/api/auth/get-session']) {
      const res = await lead.agent.get(path);
      expect(res.status, path).toBe(200);
      expect(res.headers['cache-control'], path).toBe('no-store');
    }
    const refused = await request(app.handle.app).get('/api/me');
    expect(refused.status).toBe(401);
    expect(refused.headers['cache-control']).toBe('no-store');
  });

  it('marks a shared report page as no-store', async () => {
    const shared = await lead.agent.post(`/api/campaigns/${rig.campaignId}/share`).send({ mode: 'report-link', recipients: ['client@customer.test'], expiresInDays: 1 });
    expect(shared.status).toBe(200);
    const page = await request(app.handle.app).get(new URL(shared.body.link).pathname);
    expect(page.status).toBe(200);
    expect(page.headers['cache-control']).toBe('no-store');
  });
});

describe('sign-in limits', () => {
  it('counts failures per e-mail address, so colleagues behind the same IP can still sign in', async () => {
    const limited = await startTestApp(API_TEMPLATE, { AUTH_RATE_LIMIT_MAX: '3', AUTH_RATE_LIMIT_IP_MAX: '20' });
    try {
      await signUp(limited, 'Ada Admin', 'ada@lab.test');
      await signUp(limited, 'Ben Colleague', 'ben@lab.test');
      const statuses: number[] = [];
      for (let i = 0; i < 4; i++) statuses.push((await limited.agent().post('/api/auth/sign-in/email').send({ email: 'ada@lab.test', password: 'guessed-wrong-1' })).status);
      expect(statuses).toEqual([401, 401, 401, 429]);
      const locked = await limited.agent().post('/api/auth/sign-in/email').send({ email: 'ADA@lab.test', password: PASSWORD });
      expect(locked.status).toBe(429);
      expect(locked.body.error).toEqual({ code: 'rate-limited', message: expect.stringMatching(/^Too many attempts for this e-mail address\. Wait \d+ s and try again\.$/) });
      expect(Number(locked.headers['retry-after'])).toBeGreaterThan(0);
      // Same client IP (127.0.0.1), another address: not locked out.
      const colleague = await limited.agent().post('/api/auth/sign-in/email').send({ email: 'ben@lab.test', password: PASSWORD });
      expect(colleague.status).toBe(200);
    } finally {
      await limited.close();
    }
  });

  it('answers an address without an account exactly like one with an account once its limit is reached', async () => {
    const limited = await startTestApp(API_TEMPLATE, { AUTH_RATE_LIMIT_MAX: '2', AUTH_RATE_LIMIT_IP_MAX: '20' });
    try {
      await signUp(limited, 'Ada Admin', 'ada@lab.test');
      const run = async (email: string) => {
        const out: { status: number; body: unknown }[] = [];
        for (let i = 0; i < 3; i++) {
          const r = await limited.agent().post('/api/auth/sign-in/email').send({ email, password: 'guessed-wrong-1' });
          out.push({ status: r.status, body: r.body });
        }
        return out;
      };
      const existing = await run('ada@lab.test');
      const missing = await run('nobody@lab.test');
      expect(existing.map((r) => r.status)).toEqual([401, 401, 429]);
      expect(missing.map((r) => r.status)).toEqual([401, 401, 429]);
      expect(JSON.stringify(missing).replace(/\d+ s/g, 'N s')).toBe(JSON.stringify(existing).replace(/\d+ s/g, 'N s'));
    } finally {
      await limited.close();
    }
  });

  it('still limits one client IP across many addresses, at its own higher limit', async () => {
    const limited = await startTestApp(API_TEMPLATE, { AUTH_RATE_LIMIT_MAX: '2', AUTH_RATE_LIMIT_IP_MAX: '5' });
    try {
      const statuses: number[] = [];
      for (let i = 0; i < 6; i++) statuses.push((await limited.agent().post('/api/auth/sign-in/email').send({ email: `person-${i}@lab.test`, password: 'guessed-wrong-1' })).status);
      expect(statuses).toEqual([401, 401, 401, 401, 401, 429]);
    } finally {
      await limited.close();
    }
  });
});
