// The OpenAPI 3.1 document, generated from the same zod schemas that validate the requests, and
// a plain HTML reference page rendered from it.
import { z } from 'zod';
import { errorBodySchema } from '@resonote/contracts';
import type { RegisteredRoute } from './route.ts';

const accessText: Record<string, string> = {
  public: 'anyone',
  user: 'any signed-in person',
  admin: 'instance admins',
  'kit-keeper': 'instance admins and leads of any campaign',
  viewer: 'campaign members (viewer and up)',
  engineer: 'engineers and leads of the campaign (and admins)',
  lead: 'leads of the campaign (and admins)',
};

function jsonSchema(schema: z.ZodType, io: 'input' | 'output' = 'input') {
  return z.toJSONSchema(schema, { io, unrepresentable: 'any' });
}

export function openApiDocument(routes: RegisteredRoute[], serverUrl: string) {
  const paths: Record<string, Record<string, unknown>> = {};
  for (const r of routes) {
    const path = '/api' + r.path.replace(/:([A-Za-z]+)/g, '{$1}');
    const parameters: unknown[] = [...r.path.matchAll(/:([A-Za-z]+)/g)].map((m) => ({ name: m[1], in: 'path', required: true, schema: { type: 'string' } }));
    if (r.query) {
      const q = jsonSchema(r.query) as { properties?: Record<string, unknown>; required?: string[] };
      for (const [name, schema] of Object.entries(q.properties ?? {})) parameters.push({ name, in: 'query', required: q.required?.includes(name) ?? false, schema });
    }
    const operation: Record<string, unknown> = {
      summary: r.summary,
      tags: [r.tag],
      description: `Who may call it: ${accessText[r.access]}.${r.returns ? ` Returns ${r.returns}.` : ''}`,
      parameters,
      responses: {
        [String(r.status)]: { description: r.returns ?? 'Success', content: r.status === 204 ? undefined : { [r.produces ?? 'application/json']: r.response ? { schema: jsonSchema(r.response, 'output') } : {} } },
        '400': { description: 'Invalid input; the message names the field', content: { 'application/json': { schema: { $ref: '#/components/schemas/Error' } } } },
        ...(r.access !== 'public' ? { '401': { description: 'Not signed in' } } : {}),
        ...(r.access !== 'public' && r.access !== 'user' ? { '403': { description: 'Role too low' } } : {}),
        ...(r.path.includes(':') ? { '404': { description: 'Not found, or not a member of the campaign' } } : {}),
      },
      security: r.access === 'public' ? [] : [{ session: [] }],
    };
    if (r.body) operation.requestBody = { required: true, content: { 'application/json': { schema: jsonSchema(r.body) } } };
    (paths[path] ??= {})[r.method] = operation;
  }
  return {
    openapi: '3.1.0',
    info: { title: 'Resonote API', version: '0.1.0', description: 'Impact-hammer FRF campaigns: plan, kit, settings, hits, results. Errors always have the shape { error: { code, message, details? } }.' },
    servers: [{ url: serverUrl }],
    components: {
      securitySchemes: { session: { type: 'apiKey', in: 'cookie', name: 'better-auth.session_token' } },
      schemas: {
        Error: jsonSchema(errorBodySchema, 'output'),
      },
    },
    paths,
  };
}

function escapeHtml(s: string): string {
  return s.replace(/[&<>"]/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;' })[c]!);
}

export function apiReferenceHtml(routes: RegisteredRoute[]): string {
  const byTag = new Map<string, RegisteredRoute[]>();
  for (const r of routes) byTag.set(r.tag, [...(byTag.get(r.tag) ?? []), r]);
  const sections = [...byTag.entries()]
    .map(([tag, list]) => {
      const rows = list
        .map((r) => {
          const body = r.body ? `<details><summary>Body schema</summary><pre>${escapeHtml(JSON.stringify(jsonSchema(r.body), null, 2))}</pre></details>` : '';
          const query = r.query ? `<details><summary>Query schema</summary><pre>${escapeHtml(JSON.stringify(jsonSchema(r.query), null, 2))}</pre></details>` : '';
          return `<tr><td class="m">${r.method.toUpperCase()}</td><td class="p">/api${escapeHtml(r.path)}</td><td>${escapeHtml(r.summary)}${r.returns ? `<div class="r">Returns ${escapeHtml(r.returns)}.</div>` : ''}${body}${query}</td><td>${accessText[r.access]}</td></tr>`;
        })
        .join('');
      return `<h2>${escapeHtml(tag)}</h2><table><thead><tr><th>Method</th><th>Path</th><th>What it does</th><th>Who may call it</th></tr></thead><tbody>${rows}</tbody></table>`;
    })
    .join('');
  return `<!doctype html><html lang="en"><head><meta charset="utf-8"><title>Resonote API reference</title><style>
body{font:14px/1.5 system-ui,sans-serif;margin:2rem auto;max-width:1100px;color:#1b1f1e;padding:0 1rem}
h1{font-size:1.5rem}h2{font-size:1.1rem;margin-top:2rem;border-bottom:1px solid #dde2e0}
table{border-collapse:collapse;width:100%}td,th{border-bottom:1px solid #eee;padding:.4rem;text-align:left;vertical-align:top}
.m{font-family:monospace;font-weight:700;color:#0e6b67}.p{font-family:monospace;white-space:nowrap}.r{color:#5b6664}
pre{background:#f7f8f7;padding:.5rem;overflow:auto;font-size:12px}</style></head><body>
<h1>Resonote API reference</h1><p>Generated from the zod schemas that validate every request. Machine-readable: <a href="/api/openapi.json">/api/openapi.json</a>. Every error answer has the shape <code>{ "error": { "code", "message", "details"? } }</code>; sign in through <code>/api/auth/sign-in/email</code> to get the session cookie.</p>${sections}</body></html>`;
}
