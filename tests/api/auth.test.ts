// Sign-up, sign-in, sign-out, password reset, roles and the API's refusals, against the real
// Express app and a real PostgreSQL database.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { eq } from 'drizzle-orm';
import { startTestApp, type TestApp } from '../support/app.ts';
import { PASSWORD, signUp } from '../support/accounts.ts';
import { waitForMail } from '../support/campaign.ts';
import { API_TEMPLATE } from '../support/global-setup-api.ts';

let app: TestApp;

beforeAll(async () => {
  app = await startTestApp(API_TEMPLATE);
});
afterAll(async () => {
  await app?.close();
});

describe('sign-in and roles', () => {
  it('makes the first account on an empty instance its admin and later accounts members', async () => {
    const first = await signUp(app, 'Ada First', 'ada@lab.test');
    const second = await signUp(app, 'Ben Second', 'ben@lab.test');
    expect((await first.agent.get('/api/me')).body.user.role).toBe('admin');
    expect((await second.agent.get('/api/me')).body.user.role).toBe('member');
  });

  it('signs in with the right password and answers 401 with a readable message for a wrong one', async () => {
    const agent = app.agent();
    const wrong = await agent.post('/api/auth/sign-in/email').send({ email: 'ben@lab.test', password: 'not-the-password' });
    expect(wrong.status).toBe(401);
    expect(wrong.body).toEqual({ error: { code: 'invalid-email-or-password', message: 'The e-mail address or the password is wrong.' } });
    const right = await agent.post('/api/auth/sign-in/email').send({ email: 'ben@lab.test', password: PASSWORD });
    expect(right.status).toBe(200);
    const me = await agent.get('/api/me');
    expect(me.status).toBe(200);
    expect(me.body.user.email).toBe('ben@lab.test');
  });

  it('signs out so that the session no longer opens the API', async () => {
    const { agent } = await signUp(app, 'Cleo Out', 'cleo@lab.test');
    expect((await agent.get('/api/me')).status).toBe(200);
    expect((await agent.post('/api/auth/sign-out').send({})).status).toBe(200);
    const after = await agent.get('/api/me');
    expect(after.status).toBe(401);
    expect(after.body.error.code).toBe('unauthorized');
  });

  it('refuses a password shorter than 10 characters and stores no account', async () => {
    const res = await app.agent().post('/api/auth/sign-up/email').send({ name: 'Weak', email: 'weak@lab.test', password: 'short' });
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('password-too-short');
    expect(res.body.error.message).toMatch(/at least 10 characters/);
    const signIn = await app.agent().post('/api/auth/sign-in/email').send({ email: 'weak@lab.test', password: 'short' });
    expect(signIn.status).toBe(401);
  });

  it('refuses a second account with the same e-mail address', async () => {
    await signUp(app, 'Dora', 'dora@lab.test');
    const res = await app.agent().post('/api/auth/sign-up/email').send({ name: 'Dora Again', email: 'dora@lab.test', password: PASSWORD });
    expect(res.status).toBeGreaterThanOrEqual(400);
    expect(res.status).toBeLessThan(500);
    expect(res.body.error.message).toMatch(/already exists/);
  });

  it('resets a forgotten password through the mailed link, and the old password stops working', async () => {
    await signUp(app, 'Finn Forgetful', 'finn@lab.test');
    const ask = await app.agent().post('/api/auth/request-password-reset').send({ email: 'finn@lab.test', redirectTo: `${app.origin}/reset-password` });
    expect(ask.status).toBe(200);
    const mail = await waitForMail(app, 'finn@lab.test', /Reset your Resonote password/);
    const link = mail.text.match(/https?:\/\/\S+/)?.[0];
    expect(link).toBeDefined();
    // The mailed link goes through the API, which redirects to the page with the token.
    const follow = await request(app.handle.app).get(new URL(link!).pathname + new URL(link!).search);
    expect(follow.status).toBe(302);
    const token = new URL(follow.headers.location, app.origin).searchParams.get('token');
    expect(token).toBeTruthy();
    const reset = await app.agent().post('/api/auth/reset-password').send({ token, newPassword: 'a-brand-new-password' });
    expect(reset.status).toBe(200);
    expect((await app.agent().post('/api/auth/sign-in/email').send({ email: 'finn@lab.test', password: PASSWORD })).status).toBe(401);
    expect((await app.agent().post('/api/auth/sign-in/email').send({ email: 'finn@lab.test', password: 'a-brand-new-password' })).status).toBe(200);
  });

  it('refuses a reset with an invalid token', async () => {
    const res = await app.agent().post('/api/auth/reset-password').send({ token: 'made-up', newPassword: 'another-long-password' });
    expect(res.status).toBe(400);
    expect(res.body.error.message).toMatch(/invalid or has expired/);
  });

  it('sends a confirmation mail on sign-up', async () => {
    await signUp(app, 'Gil Verified', 'gil@lab.test');
    const mail = await waitForMail(app, 'gil@lab.test', /Confirm your e-mail address/);
    expect(mail.text).toMatch(/verify-email\?token=/);
  });

  it('lets only an admin read captured mail', async () => {
    const admin = app.agent();
    await admin.post('/api/auth/sign-in/email').send({ email: 'ada@lab.test', password: PASSWORD }).expect(200);
    const list = await admin.get('/api/admin/mail');
    expect(list.status).toBe(200);
    expect(list.body.capturing).toBe(true);
    expect(list.body.mail.length).toBeGreaterThan(0);
    const member = app.agent();
    await member.post('/api/auth/sign-in/email').send({ email: 'ben@lab.test', password: PASSWORD }).expect(200);
    const refused = await member.get('/api/admin/mail');
    expect(refused.status).toBe(403);
    expect(refused.body.error.code).toBe('forbidden');
  });
});

describe('refusals and bad input', () => {
  it('answers 401 as JSON to a signed-out caller on every protected route', async () => {
    for (const path of ['/api/me', '/api/campaigns', '/api/admin/mail']) {
      const res = await request(app.handle.app).get(path);
      expect(res.status, path).toBe(401);
      expect(res.headers['content-type']).toMatch(/json/);
      expect(res.body).toEqual({ error: { code: 'unauthorized', message: 'Sign in to continue.' } });
    }
  });

  it('answers 404 in the error shape for an unknown API route', async () => {
    const res = await request(app.handle.app).get('/api/no-such-thing');
    expect(res.status).toBe(404);
    expect(res.body.error).toEqual({ code: 'not-found', message: 'No API route GET /api/no-such-thing.' });
  });

  it('answers 400 to malformed JSON without a stack trace', async () => {
    const admin = app.agent();
    await admin.post('/api/auth/sign-in/email').send({ email: 'ada@lab.test', password: PASSWORD }).expect(200);
    const res = await admin.post('/api/campaigns').set('content-type', 'application/json').send('{"name": ');
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('malformed-json');
    expect(JSON.stringify(res.body)).not.toMatch(/at .*\.ts/);
  });

  it('answers 413 to a body over the limit', async () => {
    const big = JSON.stringify({ notes: 'x'.repeat(2 * 1024 * 1024) });
    const admin = app.agent();
    await admin.post('/api/auth/sign-in/email').send({ email: 'ada@lab.test', password: PASSWORD }).expect(200);
    const res = await admin.post('/api/campaigns').set('content-type', 'application/json').send(big);
    expect(res.status).toBe(413);
    expect(res.body.error.code).toBe('too-large');
    const auth = await request(app.handle.app).post('/api/auth/sign-in/email').set('content-type', 'application/json').send(big);
    expect(auth.status).toBe(413);
  });

  it('sets security headers on API answers', async () => {
    const res = await request(app.handle.app).get('/api/health');
    expect(res.headers['x-content-type-options']).toBe('nosniff');
    expect(res.headers['content-security-policy']).toMatch(/default-src 'self'/);
    expect(res.headers['x-powered-by']).toBeUndefined();
  });

  it('reports the database state on /api/health', async () => {
    const res = await request(app.handle.app).get('/api/health');
    expect(res.status).toBe(200);
    expect(res.body.status).toBe('ok');
    expect(res.body.database.status).toBe('up');
  });
});

describe('rate limit on sign-in', () => {
  it('answers 429 after too many sign-in attempts from one address', async () => {
    const limited = await startTestApp(API_TEMPLATE, { AUTH_RATE_LIMIT_MAX: '3' });
    try {
      const statuses: number[] = [];
      for (let i = 0; i < 5; i++) {
        const res = await limited.agent().post('/api/auth/sign-in/email').send({ email: 'nobody@lab.test', password: 'whatever-password' });
        statuses.push(res.status);
        if (res.status === 429) expect(res.body.error.code).toBe('rate-limited');
      }
      expect(statuses.slice(0, 3)).toEqual([401, 401, 401]);
      expect(statuses.at(-1)).toBe(429);
    } finally {
      await limited.close();
    }
  });
});

describe('instance roles in the database', () => {
  it('stores the admin role on the first user row', async () => {
    const { user } = await import('@resonote/db/schema');
    const [row] = await app.handle.database.db.select().from(user).where(eq(user.email, 'ada@lab.test'));
    expect(row.role).toBe('admin');
  });
});
