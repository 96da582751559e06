// Starts `npm run start:cluster` (scripts/cluster.mjs: nginx → API processes, workers) as a child
// process on a fresh database of an already running PostgreSQL, for the cluster test and the
// load and reprocess benchmarks. Stops it with SIGTERM, as Ctrl-C would.
import { spawn, type ChildProcess } from 'node:child_process';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import pg from 'pg';

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '../..');

/** The PostgreSQL the benchmark wrapper started (scripts/bench-cluster.mjs). */
export const clusterAdminUrl = process.env.RESONOTE_CLUSTER_ADMIN_URL ?? 'postgres://postgres@127.0.0.1:54349/postgres';

export async function freshClusterDatabase(name: string): Promise<string> {
  const admin = new pg.Client({ connectionString: clusterAdminUrl });
  await admin.connect();
  try {
    await admin.query(`DROP DATABASE IF EXISTS "${name}" WITH (FORCE)`);
    await admin.query(`CREATE DATABASE "${name}"`);
  } finally {
    await admin.end();
  }
  const url = new URL(clusterAdminUrl);
  url.pathname = `/${name}`;
  return url.toString();
}

export interface RunningCluster {
  url: string;
  apiUrls: string[];
  databaseUrl: string;
  child: ChildProcess;
  output(): string;
  stop(): Promise<number | null>;
}

export async function startCluster(options: { databaseUrl: string; port: number; apis?: number; workers?: number; env?: Record<string, string> }): Promise<RunningCluster> {
  const apis = options.apis ?? 2;
  const child = spawn(process.execPath, ['scripts/cluster.mjs'], {
    cwd: root,
    env: { ...process.env, DATABASE_URL: options.databaseUrl, RESONOTE_CLUSTER_PORT: String(options.port), RESONOTE_CLUSTER_APIS: String(apis), RESONOTE_CLUSTER_WORKERS: String(options.workers ?? 2), RESONOTE_CLUSTER_SEED: '0', LOG_REQUESTS: 'false', ...options.env },
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  let out = '';
  const exited = new Promise<number | null>((resolve) => child.once('exit', (code) => resolve(code)));
  await new Promise<void>((resolve, reject) => {
    const onData = (d: Buffer) => {
      out += d.toString();
      if (out.includes('cluster ready on')) resolve();
    };
    child.stdout!.on('data', onData);
    child.stderr!.on('data', (d: Buffer) => (out += d.toString()));
    child.once('exit', (code) => reject(new Error(`the cluster exited (${code}) before it was ready:\n${out.slice(-3000)}`)));
  });
  return {
    url: `http://127.0.0.1:${options.port}`,
    apiUrls: Array.from({ length: apis }, (_, i) => `http://127.0.0.1:${options.port + 1 + i}`),
    databaseUrl: options.databaseUrl,
    child,
    output: () => out,
    async stop() {
      if (child.exitCode === null && child.signalCode === null) child.kill('SIGTERM');
      return exited;
    },
  };
}
