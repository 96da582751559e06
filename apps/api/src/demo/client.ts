// An ApiClient for one person, talking to the app over loopback HTTP (used by the demo seed).
import type { Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import type { Express } from 'express';
import type { ApiClient } from './factory.ts';

export async function withLoopback<T>(app: Express, fn: (baseUrl: string) => Promise<T>): Promise<T> {
  const server: Server = await new Promise((resolve) => {
    const s = app.listen(0, '127.0.0.1', () => resolve(s));
  });
  try {
    return await fn(`http://127.0.0.1:${(server.address() as AddressInfo).port}`);
  } finally {
    server.closeAllConnections();
    await new Promise<void>((resolve) => server.close(() => resolve()));
  }
}

export async function signedInClient(baseUrl: string, origin: string, email: string, password: string): Promise<ApiClient & { cookie: string; upload(path: string, file: Buffer, name: string, fields: Record<string, string>, key: string): Promise<{ status: number; body: any }> }> {
  const res = await fetch(`${baseUrl}/api/auth/sign-in/email`, { method: 'POST', headers: { 'content-type': 'application/json', origin }, body: JSON.stringify({ email, password }) });
  if (!res.ok) throw new Error(`demo sign-in of ${email} failed: ${res.status} ${await res.text()}`);
  const cookie = res.headers.getSetCookie().map((c) => c.split(';')[0]).join('; ');
  const parse = async (r: Response) => {
    const text = await r.text();
    return { status: r.status, body: text ? JSON.parse(text) : undefined };
  };
  return {
    cookie,
    async request(method, path, body) {
      return parse(await fetch(`${baseUrl}${path}`, { method, headers: { cookie, origin, ...(body === undefined ? {} : { 'content-type': 'application/json' }) }, body: body === undefined ? undefined : JSON.stringify(body) }));
    },
    async upload(path, file, name, fields, key) {
      const form = new FormData();
      for (const [k, v] of Object.entries(fields)) form.append(k, v);
      form.append('file', new Blob([new Uint8Array(file)]), name);
      return parse(await fetch(`${baseUrl}${path}`, { method: 'POST', headers: { cookie, origin, 'idempotency-key': key }, body: form }));
    },
  };
}
