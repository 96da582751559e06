// Several Resonote processes on one database, as a cluster runs them: a second API instance
// beside the test app, worker child processes, and a reader of Server-Sent-Events streams.
import { spawn, type ChildProcess } from 'node:child_process';
import type { Server } from 'node:http';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { createApp, type AppHandle } from '@resonote/api/app';
import { loadConfig } from '@resonote/api/config';
import { freePort } from './app.ts';

const apiDir = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '../../apps/api');

/** Another API instance (its own pool, listener and job queue) on an existing database, listening on loopback. */
export async function startPeerApp(databaseUrl: string, env: Record<string, string> = {}): Promise<{ handle: AppHandle; baseUrl: string; close: () => Promise<void> }> {
  const port = await freePort();
  const config = loadConfig({ NODE_ENV: 'test', PORT: String(port), DATABASE_URL: databaseUrl, SMTP_CAPTURE_PORT: '0', LOG_REQUESTS: 'false', AUTH_RATE_LIMIT_MAX: '1000', ...env });
  const handle = await createApp({ config, log: () => undefined });
  const server = await new Promise<Server>((resolve) => {
    const s = handle.app.listen(port, '127.0.0.1', () => resolve(s));
  });
  return {
    handle,
    baseUrl: config.publicUrl,
    async close() {
      server.closeAllConnections();
      await new Promise<void>((resolve) => server.close(() => resolve()));
      await handle.close();
    },
  };
}

/** Signs in over HTTP and returns the session cookie. */
export async function signInCookie(baseUrl: string, email: string, password: string): Promise<string> {
  const res = await fetch(`${baseUrl}/api/auth/sign-in/email`, { method: 'POST', headers: { 'content-type': 'application/json', origin: baseUrl }, body: JSON.stringify({ email, password }) });
  if (res.status !== 200) throw new Error(`sign-in of ${email} at ${baseUrl}: ${res.status} ${await res.text()}`);
  return res.headers.getSetCookie().map((c) => c.split(';')[0]).join('; ');
}

export interface SseReader {
  /** Every `change` event received so far, with the time it arrived (performance.now() and wall clock). */
  events: { data: Record<string, unknown>; at: number; wallMs: number }[];
  /** Resolves with the first event (already received or coming) that matches, or rejects after `timeoutMs`. */
  waitFor(match: (data: Record<string, unknown>) => boolean, timeoutMs?: number): Promise<SseReader['events'][number]>;
  close(): void;
}

/** Opens GET …/events and parses the stream as it comes. */
export async function openEvents(url: string, headers: Record<string, string>): Promise<SseReader> {
  const abort = new AbortController();
  const res = await fetch(url, { headers: { accept: 'text/event-stream', ...headers }, signal: abort.signal });
  if (res.status !== 200 || !res.body) throw new Error(`events stream: ${res.status} ${await res.text()}`);
  const events: SseReader['events'] = [];
  const waiters: { match: (d: Record<string, unknown>) => boolean; resolve: (e: SseReader['events'][number]) => void }[] = [];
  let buffer = '';
  let connected!: () => void;
  const ready = new Promise<void>((r) => (connected = r));
  void (async () => {
    const decoder = new TextDecoder();
    try {
      for await (const chunk of res.body as unknown as AsyncIterable<Uint8Array>) {
        buffer += decoder.decode(chunk, { stream: true });
        let cut;
        while ((cut = buffer.indexOf('\n\n')) >= 0) {
          const block = buffer.slice(0, cut);
          buffer = buffer.slice(cut + 2);
          if (block.startsWith(': connected')) connected();
          const line = block.split('\n').find((l) => l.startsWith('data: '));
          if (!block.includes('event: change') || !line) continue;
          const e = { data: JSON.parse(line.slice(6)) as Record<string, unknown>, at: performance.now(), wallMs: Date.now() };
          events.push(e);
          for (const w of [...waiters]) if (w.match(e.data)) {
            waiters.splice(waiters.indexOf(w), 1);
            w.resolve(e);
          }
        }
      }
    } catch {
      // aborted by close()
    }
  })();
  await ready;
  return {
    events,
    waitFor(match, timeoutMs = 5000) {
      const seen = events.find((e) => match(e.data));
      if (seen) return Promise.resolve(seen);
      return new Promise((resolve, reject) => {
        const w = { match, resolve: (e: SseReader['events'][number]) => (clearTimeout(timer), resolve(e)) };
        const timer = setTimeout(() => {
          waiters.splice(waiters.indexOf(w), 1);
          reject(new Error(`no matching event within ${timeoutMs} ms; got ${JSON.stringify(events.map((x) => x.data))}`));
        }, timeoutMs);
        waiters.push(w);
      });
    },
    close: () => abort.abort(),
  };
}

export interface WorkerProcess {
  child: ChildProcess;
  /** Everything it printed. */
  output(): string;
  /** SIGTERM, then waits for the exit. */
  stop(): Promise<void>;
  kill(): Promise<void>;
}

/** `npm run worker` as a child process on the given database; resolves once it claims jobs. */
export async function startWorker(databaseUrl: string, env: Record<string, string> = {}): Promise<WorkerProcess> {
  const child = spawn(process.execPath, ['--import', 'tsx', 'src/worker.ts'], {
    cwd: apiDir,
    env: { ...process.env, NODE_ENV: 'test', DATABASE_URL: databaseUrl, SMTP_CAPTURE_PORT: '0', ...env },
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  let out = '';
  const exited = new Promise<void>((resolve) => child.once('exit', () => resolve()));
  await new Promise<void>((resolve, reject) => {
    const onData = (d: Buffer) => {
      out += d.toString();
      if (out.includes('working jobs')) resolve();
    };
    child.stdout!.on('data', onData);
    child.stderr!.on('data', (d: Buffer) => (out += d.toString()));
    child.once('exit', (code) => reject(new Error(`the worker exited with ${code} before it started:\n${out}`)));
  });
  return {
    child,
    output: () => out,
    async stop() {
      if (child.exitCode === null && child.signalCode === null) child.kill('SIGTERM');
      await exited;
    },
    async kill() {
      if (child.exitCode === null && child.signalCode === null) child.kill('SIGKILL');
      await exited;
    },
  };
}
