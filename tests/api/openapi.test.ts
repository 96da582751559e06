// The OpenAPI document is generated from the zod schemas that validate the requests.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { startTestApp, type TestApp } from '../support/app.ts';
import { API_TEMPLATE } from '../support/global-setup-api.ts';

let app: TestApp;
beforeAll(async () => {
  app = await startTestApp(API_TEMPLATE);
});
afterAll(async () => {
  await app?.close();
});

describe('OpenAPI document', () => {
  it('lists every registered route with its method', async () => {
    const doc = (await request(app.handle.app).get('/api/openapi.json')).body;
    expect(doc.openapi).toBe('3.1.0');
    expect(app.handle.routes.length).toBeGreaterThan(0);
    for (const route of app.handle.routes) {
      const path = '/api' + route.path.replace(/:([A-Za-z]+)/g, '{$1}');
      expect(doc.paths[path]?.[route.method], `${route.method} ${path}`).toBeDefined();
    }
  });

  it('describes a request body from the same zod schema that validates it, unknown fields refused', async () => {
    const doc = (await request(app.handle.app).get('/api/openapi.json')).body;
    const schema = doc.paths['/api/campaigns/{campaignId}/points'].post.requestBody.content['application/json'].schema;
    expect(schema.required).toEqual(expect.arrayContaining(['label', 'x', 'y', 'z']));
    expect(schema.additionalProperties).toBe(false);
    const settings = doc.paths['/api/campaigns/{campaignId}/settings'].put.requestBody.content['application/json'].schema;
    expect(Object.keys(settings.properties.settings.properties)).toEqual(expect.arrayContaining(['sampleRateHz', 'recordLengthS', 'exponentialWindow', 'estimator']));
  });

  it('describes answers from the response schemas the routes declare (packages/contracts), errors in the one shape', async () => {
    const doc = (await request(app.handle.app).get('/api/openapi.json')).body;
    const upload = doc.paths['/api/campaigns/{campaignId}/schedule/{entryId}/hits'].post.responses['201'].content['application/json'].schema;
    expect(Object.keys(upload.properties)).toEqual(expect.arrayContaining(['replayed', 'hits', 'skipped', 'entry', 'frf', 'next']));
    expect(upload.properties.hits.items.properties.verdict.enum).toEqual(['accept', 'reject']);
    const frf = doc.paths['/api/campaigns/{campaignId}/schedule/{entryId}/frf'].get.responses['200'].content['application/json'].schema;
    expect(frf.oneOf ?? frf.anyOf).toHaveLength(2);
    const table = doc.paths['/api/campaigns/{campaignId}/modes/table'].post.responses['201'].content['application/json'].schema;
    expect(table.properties.modes.items.required).toEqual(expect.arrayContaining(['fHz', 'zetaPercent', 'mpc', 'shape', 'source']));
    expect(doc.components.schemas.Error.properties.error.required).toEqual(['code', 'message']);
  });

  it('serves a readable reference page', async () => {
    const page = await request(app.handle.app).get('/api/docs');
    expect(page.status).toBe(200);
    expect(page.headers['content-type']).toMatch(/html/);
    expect(page.text).toContain('Resonote API reference');
    expect(page.text).toContain('/api/campaigns/:campaignId/geometry/import');
  });
});
