// The authorization matrix: every route registered on the API, called by six kinds of caller
// (signed out, viewer, engineer, lead, a member of another campaign, admin). It fails when a
// route exists without an entry here, so a new route cannot skip this review.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { startTestApp, type TestApp } from '../support/app.ts';
import { signUp } from '../support/accounts.ts';
import { invite, type Person } from '../support/campaign.ts';
import { API_TEMPLATE } from '../support/global-setup-api.ts';

type Access = 'public' | 'user' | 'admin' | 'kit-keeper' | 'viewer' | 'engineer' | 'lead';

/** Who may call each route. Adding a route means adding a line here. */
const matrix: Record<string, Access> = {
  'GET /health': 'public',
  'GET /public-settings': 'public',
  'GET /openapi.json': 'public',
  'GET /docs': 'public',
  'GET /me': 'user',
  'GET /admin/mail': 'admin',
  'GET /campaigns': 'user',
  'POST /campaigns': 'user',
  'GET /campaigns/:campaignId': 'viewer',
  'PATCH /campaigns/:campaignId': 'lead',
  'GET /campaigns/:campaignId/members': 'viewer',
  'PATCH /campaigns/:campaignId/members/:userId': 'lead',
  'DELETE /campaigns/:campaignId/members/:userId': 'lead',
  'GET /campaigns/:campaignId/invitations': 'lead',
  'POST /campaigns/:campaignId/invitations': 'lead',
  'DELETE /campaigns/:campaignId/invitations/:invitationId': 'lead',
  'GET /invitations/:token': 'public',
  'POST /invitations/:token/accept': 'user',
  'GET /campaigns/:campaignId/audit': 'lead',
  'GET /campaigns/:campaignId/points': 'viewer',
  'POST /campaigns/:campaignId/points': 'lead',
  'PATCH /campaigns/:campaignId/points/:pointId': 'lead',
  'DELETE /campaigns/:campaignId/points/:pointId': 'lead',
  'POST /campaigns/:campaignId/lines': 'lead',
  'DELETE /campaigns/:campaignId/lines/:lineId': 'lead',
  'POST /campaigns/:campaignId/geometry/import': 'lead',
  'GET /campaigns/:campaignId/geometry/export.csv': 'viewer',
  'GET /campaigns/:campaignId/schedule': 'viewer',
  'GET /campaigns/:campaignId/schedule/next': 'viewer',
  'POST /campaigns/:campaignId/schedule/generate': 'lead',
  'PATCH /campaigns/:campaignId/schedule/:entryId': 'engineer',
  'POST /campaigns/:campaignId/schedule/:entryId/redo': 'engineer',
  'POST /campaigns/:campaignId/schedule/reorder': 'lead',
  'GET /campaigns/:campaignId/kit': 'viewer',
  'POST /campaigns/:campaignId/kit': 'lead',
  'PATCH /campaigns/:campaignId/kit/:itemId': 'lead',
  'POST /campaigns/:campaignId/kit/:itemId/calibrations': 'lead',
  'GET /campaigns/:campaignId/channels': 'viewer',
  'POST /campaigns/:campaignId/channels': 'lead',
  'PATCH /campaigns/:campaignId/channels/:channelId': 'lead',
  'DELETE /campaigns/:campaignId/channels/:channelId': 'lead',
  'GET /campaigns/:campaignId/settings': 'viewer',
  'PUT /campaigns/:campaignId/settings': 'lead',
  'POST /campaigns/:campaignId/schedule/:entryId/hits': 'engineer',
  'POST /campaigns/:campaignId/schedule/:entryId/simulate': 'engineer',
  'GET /campaigns/:campaignId/schedule/:entryId/hits': 'viewer',
  'GET /campaigns/:campaignId/hits/:hitId': 'viewer',
  'POST /campaigns/:campaignId/noise-checks': 'engineer',
  'POST /campaigns/:campaignId/noise-checks/simulate': 'engineer',
  'GET /campaigns/:campaignId/noise-checks': 'viewer',
  'GET /campaigns/:campaignId/noise-checks/:checkId': 'viewer',
  'POST /campaigns/:campaignId/hits/:hitId/verdict': 'engineer',
  'GET /campaigns/:campaignId/schedule/:entryId/frf': 'viewer',
  'GET /campaigns/:campaignId/progress': 'viewer',
  'GET /campaigns/:campaignId/events': 'viewer',
  'GET /campaigns/:campaignId/checks': 'viewer',
  'GET /campaigns/:campaignId/frfs': 'viewer',
  'POST /campaigns/:campaignId/modes/fits': 'lead',
  'GET /campaigns/:campaignId/modes/fits': 'viewer',
  'GET /campaigns/:campaignId/modes/fits/:fitId': 'viewer',
  'POST /campaigns/:campaignId/modes/fits/:fitId/modes': 'lead',
  'GET /campaigns/:campaignId/modes/fits/:fitId/synthesis': 'viewer',
  'GET /campaigns/:campaignId/modes': 'viewer',
  'GET /campaigns/:campaignId/modes/fits/:fitId/suggestion': 'viewer',
  'PUT /campaigns/:campaignId/modes/fits/:fitId/draft': 'lead',
  'POST /campaigns/:campaignId/modes/table': 'lead',
  'DELETE /campaigns/:campaignId/modes/table/:rowId': 'lead',
  'GET /campaigns/:campaignId/modes/synthesis': 'viewer',
  'POST /campaigns/:campaignId/fe-models': 'lead',
  'GET /campaigns/:campaignId/fe-models': 'viewer',
  'GET /campaigns/:campaignId/fe-models/:modelId': 'viewer',
  'GET /campaigns/:campaignId/fe-models/:modelId/source': 'viewer',
  'DELETE /campaigns/:campaignId/fe-models/:modelId': 'lead',
  'POST /campaigns/:campaignId/fe-models/:modelId/map/auto': 'lead',
  'PATCH /campaigns/:campaignId/fe-models/:modelId/map': 'lead',
  'POST /campaigns/:campaignId/fe-models/:modelId/proposal': 'viewer',
  'POST /campaigns/:campaignId/fe-models/:modelId/proposal/accept': 'lead',
  'GET /campaigns/:campaignId/fe-models/:modelId/correlation': 'viewer',
  'GET /campaigns/:campaignId/report.html': 'viewer',
  'GET /campaigns/:campaignId/report.pdf': 'lead',
  'GET /campaigns/:campaignId/export/bundle.zip': 'lead',
  'GET /campaigns/:campaignId/export/bundle.json': 'lead',
  'POST /campaigns/:campaignId/share': 'lead',
  'GET /shared/reports/:token': 'public',
  'GET /campaigns/:campaignId/backup': 'lead',
  'POST /campaigns/restore': 'user',
  'GET /account/tokens': 'user',
  'POST /account/tokens': 'user',
  'DELETE /account/tokens/:tokenId': 'user',
  'GET /tokens/current': 'user',
  'GET /campaigns/:campaignId/arming': 'viewer',
  'PUT /campaigns/:campaignId/arming': 'engineer',
  'DELETE /campaigns/:campaignId/arming': 'engineer',
  'GET /campaigns/:campaignId/input-scaling': 'viewer',
  'PUT /campaigns/:campaignId/channels/:channelId/input-scaling': 'lead',
  'GET /campaigns/:campaignId/sensitivity-checks': 'viewer',
  'POST /campaigns/:campaignId/sensitivity-checks': 'engineer',
  'POST /campaigns/:campaignId/jobs': 'lead',
  'GET /campaigns/:campaignId/jobs/:jobId': 'lead',
  'GET /campaigns/:campaignId/jobs/:jobId/file': 'lead',
  'GET /campaigns/:campaignId/kit-policy': 'viewer',
  'PUT /campaigns/:campaignId/kit-policy': 'lead',
  'GET /campaigns/:campaignId/kit-readiness': 'viewer',
  'GET /lab/items': 'user',
  'POST /lab/items': 'kit-keeper',
  'PATCH /lab/items/:itemId': 'kit-keeper',
  'POST /lab/items/:itemId/calibrations': 'kit-keeper',
  'GET /campaigns/:campaignId/bookings': 'viewer',
  'POST /campaigns/:campaignId/bookings': 'lead',
  'DELETE /campaigns/:campaignId/bookings/:bookingId': 'lead',
  'GET /campaigns/:campaignId/notes': 'viewer',
  'POST /campaigns/:campaignId/schedule/:entryId/notes': 'engineer',
  'GET /campaigns/:campaignId/notes/:noteId/photo': 'viewer',
  'GET /campaigns/:campaignId/notes/:noteId/thumbnail': 'viewer',
  'PATCH /campaigns/:campaignId/notes/:noteId': 'engineer',
  'DELETE /campaigns/:campaignId/notes/:noteId': 'engineer',
  'POST /campaigns/:campaignId/members': 'lead',
  'GET /account/invitations': 'user',
  'POST /account/invitations/:invitationId/accept': 'user',
  'POST /account/invitations/:invitationId/decline': 'user',
  'POST /campaigns/:campaignId/archive': 'lead',
  'POST /campaigns/:campaignId/unarchive': 'lead',
  'DELETE /campaigns/:campaignId': 'lead',
  'PATCH /campaigns/:campaignId/settings': 'lead',
  'POST /campaigns/:campaignId/geometry/import/check': 'lead',
  'POST /campaigns/:campaignId/schedule/:entryId/reciprocal': 'lead',
};

/** The routes a personal API token may call (the watched-folder bridge's); every other route refuses one with 403. */
const tokenRoutes = new Set([
  'GET /tokens/current',
  'GET /campaigns/:campaignId/schedule',
  'GET /campaigns/:campaignId/settings',
  'GET /campaigns/:campaignId/arming',
  'POST /campaigns/:campaignId/schedule/:entryId/hits',
]);

const rank = { viewer: 1, engineer: 2, lead: 3 } as const;
type Caller = 'signed-out' | 'viewer' | 'engineer' | 'lead' | 'outsider' | 'admin';

let app: TestApp;
let people: Record<Exclude<Caller, 'signed-out'>, Person>;
let campaignId: string;
let engineerToken: string;

beforeAll(async () => {
  app = await startTestApp(API_TEMPLATE);
  const admin = await signUp(app, 'Ada Admin', 'admin@lab.test');
  const lead = await signUp(app, 'Lena Lead', 'lead@lab.test');
  const engineer = await signUp(app, 'Eric Engineer', 'eng@lab.test');
  const viewer = await signUp(app, 'Vera Viewer', 'view@lab.test');
  const outsider = await signUp(app, 'Otto Outsider', 'otto@lab.test');
  campaignId = (await admin.agent.post('/api/campaigns').send({ name: 'Matrix campaign' })).body.campaign.id;
  const other = (await admin.agent.post('/api/campaigns').send({ name: 'Other campaign' })).body.campaign.id;
  await invite(app, admin, campaignId, lead, 'lead');
  await invite(app, admin, campaignId, engineer, 'engineer');
  await invite(app, admin, campaignId, viewer, 'viewer');
  await invite(app, admin, other, outsider, 'lead');
  // The admin steps down to viewer in the matrix campaign, so only their instance role counts.
  const members = (await admin.agent.get(`/api/campaigns/${campaignId}/members`)).body.members as { userId: string; version: number; email: string }[];
  const adminRow = members.find((m) => m.email === 'admin@lab.test')!;
  await lead.agent.delete(`/api/campaigns/${campaignId}/members/${adminRow.userId}`).expect(204);
  people = { admin, lead, engineer, viewer, outsider };
  engineerToken = (await engineer.agent.post('/api/account/tokens').send({ name: 'matrix', campaignId })).body.secret;
});
afterAll(async () => {
  await app?.close();
});

function key(route: { method: string; path: string }) {
  return `${route.method.toUpperCase()} ${route.path}`;
}

function concretePath(path: string): string {
  return path
    .replace(':campaignId', campaignId)
    .replace(':token', 'no-such-invitation-token')
    .replace(/:[A-Za-z]+/g, '00000000-0000-4000-8000-000000000000');
}

async function call(caller: Caller, method: string, path: string) {
  const url = `/api${concretePath(path)}`;
  const agent = caller === 'signed-out' ? request(app.handle.app) : people[caller].agent;
  const req = (agent as unknown as Record<string, (u: string) => request.Test>)[method]!(url);
  if (path.endsWith('/events')) {
    // A Server-Sent-Events stream never ends by itself: read the status, then hang up.
    return req.buffer(false).parse((res, done) => {
      if (res.statusCode === 200) {
        res.once('data', () => {
          (res as unknown as { destroy(): void }).destroy();
          done(null, {});
        });
        return;
      }
      let text = '';
      res.on('data', (c: Buffer) => (text += c.toString()));
      res.on('end', () => done(null, JSON.parse(text)));
    });
  }
  return method === 'get' || method === 'delete' ? req : req.send({});
}

function expected(access: Access, caller: Caller): 'allowed' | 401 | 403 | 404 {
  if (access === 'public') return 'allowed';
  if (caller === 'signed-out') return 401;
  if (access === 'user') return 'allowed';
  if (access === 'admin') return caller === 'admin' ? 'allowed' : 403;
  // The lab inventory: admins and whoever leads a campaign (the outsider leads the other one).
  if (access === 'kit-keeper') return caller === 'admin' || caller === 'lead' || caller === 'outsider' ? 'allowed' : 403;
  if (caller === 'admin') return 'allowed';
  if (caller === 'outsider') return 404;
  return rank[caller] >= rank[access] ? 'allowed' : 403;
}

describe('authorization matrix', () => {
  it('marks exactly the bridge’s routes as open to API tokens', () => {
    expect(app.handle.routes.filter((r) => r.tokenAccess).map(key).sort()).toEqual([...tokenRoutes].sort());
  });

  it.each(Object.entries(matrix))('%s with an engineer’s API token', async (route, access) => {
    const [method, path] = route.split(' ') as [string, string];
    if (path.endsWith('/events')) return; // not a token route; the stream is covered below as a session caller
    const url = `/api${concretePath(path)}`;
    const req = (request(app.handle.app) as unknown as Record<string, (u: string) => request.Test>)[method.toLowerCase()]!(url).set('authorization', `Bearer ${engineerToken}`);
    const res = await (method === 'GET' || method === 'DELETE' ? req : req.send({}));
    const label = `${route} with a token → ${res.status} ${JSON.stringify(res.body?.error ?? '')}`;
    expect(res.status, label).toBeLessThan(500);
    if (!tokenRoutes.has(route)) {
      expect(res.status, label).toBe(403);
      expect(res.body.error.code, label).toBe('token-not-allowed');
    } else if (access === 'public' || access === 'user' || rank[access as keyof typeof rank] <= rank.engineer) {
      expect([401, 403], label).not.toContain(res.status);
    } else {
      expect(res.status, label).toBe(403);
    }
  });

  it('has an entry for every route the API registers, and none for routes that do not exist', () => {
    const registered = app.handle.routes.map(key).sort();
    expect(registered).toEqual(Object.keys(matrix).sort());
    for (const route of app.handle.routes) expect(route.access, key(route)).toBe(matrix[key(route)]);
  });

  const callers: Caller[] = ['signed-out', 'viewer', 'engineer', 'lead', 'outsider', 'admin'];
  it.each(Object.entries(matrix))('%s is open to %s only', async (route, access) => {
    const [method, path] = route.split(' ') as [string, string];
    for (const caller of callers) {
      const res = await call(caller, method.toLowerCase(), path);
      const want = expected(access, caller);
      const label = `${route} as ${caller} → ${res.status} ${JSON.stringify(res.body?.error ?? '')}`;
      expect(res.status, label).toBeLessThan(500);
      if (want === 'allowed') {
        expect([401, 403], label).not.toContain(res.status);
        expect(res.body?.error?.message ?? '', label).not.toBe('That campaign was not found.');
      } else if (want === 404) {
        expect(res.status, label).toBe(404);
        expect(res.body.error.message, label).toBe('That campaign was not found.');
      } else {
        expect(res.status, label).toBe(want);
      }
    }
  });
});
