// Starts the real API (createApp) on a fresh database for one test file.
import { randomBytes } from 'node:crypto';
import net from 'node:net';
import type { Server } from 'node:http';
import request from 'supertest';
import { createApp, type AppHandle } from '@resonote/api/app';
import { loadConfig, type Config } from '@resonote/api/config';
import { listen } from '@resonote/api/listen';
import { freshDatabase } from './db.ts';
import { startCluster } from './cluster.ts';

export interface TestApp {
  handle: AppHandle;
  config: Config;
  /** The Origin header better-auth expects on cookie-carrying POSTs. */
  origin: string;
  agent(): ReturnType<typeof request.agent>;
  close(): Promise<void>;
}

export async function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const server = net.createServer();
    server.once('error', reject);
    server.listen(0, '127.0.0.1', () => {
      const port = (server.address() as net.AddressInfo).port;
      server.close(() => resolve(port));
    });
  });
}

/**
 * RESONOTE_TEST_CLUSTER=1 (`npm run test:cluster:suites`): the test file's requests go to a cluster
 * instead of the in-process app — nginx in front of two API processes and two workers
 * (scripts/cluster.mjs, JOBS_IN_PROCESS=false) on the file's fresh database. The in-process app
 * still opens the same database (tests read rows, the demo seed writes through it) but serves no
 * test request and works no job. RESONOTE_TEST_CLUSTER_PORT: nginx's port (default 54620; the
 * APIs take the next two).
 */
export const clusterMode = process.env.RESONOTE_TEST_CLUSTER === '1';

export async function startTestApp(
  template: string,
  env: Record<string, string> = {},
  options: { listen?: boolean; /** The URL the app connects with (e.g. through a TCP relay) instead of the database's own. */ databaseUrl?: (direct: string) => string; /** Receives the app's log lines (discarded by default). */ log?: (line: string) => void } = {},
): Promise<TestApp & { server?: Server; baseUrl: string }> {
  const database = await freshDatabase(template);
  if (clusterMode) return startClusterApp(database, env, options);
  const port = options.listen ? await freePort() : 3999;
  const config = loadConfig({
    NODE_ENV: 'test',
    PORT: String(port),
    DATABASE_URL: options.databaseUrl ? options.databaseUrl(database.url) : database.url,
    SMTP_CAPTURE_PORT: '0',
    LOG_REQUESTS: 'false',
    AUTH_RATE_LIMIT_MAX: '1000',
    // Its own secret, so no test writes the generated one into the checkout's .run folder.
    AUTH_SECRET: randomBytes(32).toString('hex'),
    ...env,
  });
  const handle = await createApp({ config, log: options.log ?? (() => undefined) });
  let server: Server | undefined;
  if (options.listen) {
    // The same HTTP server (timeouts included) as apps/api/src/server.ts.
    server = await listen(handle.app, config, port, '127.0.0.1');
  }
  return {
    handle,
    config,
    server,
    baseUrl: config.publicUrl,
    origin: config.publicUrl,
    agent: () => request.agent(handle.app).set('origin', config.publicUrl),
    async close() {
      if (server) {
        server.closeAllConnections();
        await new Promise<void>((resolve) => server!.close(() => resolve()));
      }
      await handle.close();
      await database.drop();
    },
  };
}

async function startClusterApp(
  database: Awaited<ReturnType<typeof freshDatabase>>,
  env: Record<string, string>,
  options: { databaseUrl?: (direct: string) => string; log?: (line: string) => void },
): Promise<TestApp & { server?: Server; baseUrl: string }> {
  if (options.databaseUrl) throw new Error('a test that relays the database connection runs against the in-process app only');
  const port = Number(process.env.RESONOTE_TEST_CLUSTER_PORT ?? 54620) + 10 * Number(process.env.VITEST_POOL_ID ?? 0);
  const shared = { NODE_ENV: 'test', AUTH_RATE_LIMIT_MAX: '1000', AUTH_SECRET: randomBytes(32).toString('hex'), ...env, JOBS_IN_PROCESS: 'false' };
  let cluster: Awaited<ReturnType<typeof startCluster>>;
  try {
    cluster = await startCluster({ databaseUrl: database.url, port, env: { ...shared, RESONOTE_CLUSTER_SKIP_SETUP: '1' } });
  } catch (err) {
    await database.drop();
    throw err;
  }
  // A file whose beforeAll timed out never calls close(): its cluster must not outlive the test process.
  process.once('exit', () => {
    if (cluster.child.exitCode === null && cluster.child.signalCode === null) cluster.child.kill('SIGTERM');
  });
  const config = loadConfig({ ...shared, PORT: String(port), PUBLIC_URL: cluster.url, DATABASE_URL: database.url, SMTP_CAPTURE_PORT: '0', LOG_REQUESTS: 'false' });
  const handle = await createApp({ config, log: options.log ?? (() => undefined) });
  return {
    handle,
    config,
    baseUrl: cluster.url,
    origin: cluster.url,
    agent: () => request.agent(cluster.url).set('origin', cluster.url),
    async close() {
      const code = await cluster.stop();
      await handle.close();
      await database.drop();
      if (code !== 0) throw new Error(`the cluster did not stop cleanly (exit ${code}):\n${cluster.output().slice(-3000)}`);
    },
  };
}
