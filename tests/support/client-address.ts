// HTTP requests sent from a chosen loopback source address (Linux answers on all of 127.0.0.0/8),
// so a test can tell the address a server saw from the one a header claims.
import http from 'node:http';

export interface AddressedAnswer {
  status: number;
  body: unknown;
  cookie: string;
}

export function requestFrom(localAddress: string, url: string, options: { method?: string; headers?: Record<string, string>; body?: unknown } = {}): Promise<AddressedAnswer> {
  const target = new URL(url);
  const payload = options.body === undefined ? undefined : JSON.stringify(options.body);
  return new Promise((resolve, reject) => {
    const req = http.request(
      {
        host: target.hostname,
        port: target.port,
        path: target.pathname + target.search,
        method: options.method ?? (payload ? 'POST' : 'GET'),
        localAddress,
        agent: false,
        headers: { ...(payload ? { 'content-type': 'application/json', 'content-length': String(Buffer.byteLength(payload)) } : {}), ...options.headers },
      },
      (res) => {
        const chunks: Buffer[] = [];
        res.on('data', (c: Buffer) => chunks.push(c));
        res.on('end', () => {
          const text = Buffer.concat(chunks).toString();
          let body: unknown = text;
          try {
            body = JSON.parse(text);
          } catch {
            // not JSON
          }
          const cookie = (res.headers['set-cookie'] ?? []).map((c) => c.split(';')[0]).join('; ');
          resolve({ status: res.statusCode ?? 0, body, cookie });
        });
      },
    );
    req.on('error', reject);
    req.end(payload);
  });
}
