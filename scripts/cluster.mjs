// `npm run start:cluster`: Resonote as several processes on one machine, the way a deployment
// spreads them over several — nginx (Debian's package) on 127.0.0.1 in front of two API processes,
// two worker processes (`npm run worker`), one PostgreSQL. Ctrl-C or SIGTERM stops all of it.
//
// Settings (environment): RESONOTE_CLUSTER_PORT (nginx, default 40080; the APIs take the next
// two ports), RESONOTE_CLUSTER_PG_PORT (default 54349), RESONOTE_CLUSTER_APIS / _WORKERS (default
// 2 / 2), RESONOTE_CLUSTER_SEED=0 to skip the demo seed, DATABASE_URL to use another database.
// An API or worker process that dies is started again after RESONOTE_CLUSTER_RESTART_S seconds
// (default 1; as a process supervisor such as systemd's Restart=on-failure would); nginx dying
// stops the cluster. nginx is the edge: it sets
// X-Forwarded-For / X-Real-IP to the address it was connected from (a client's own header is
// dropped), and the APIs believe it from loopback only (TRUST_PROXY=loopback).
import { spawn } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { buildWeb, ensureChromium, ensureNginx, ensurePostgres, installDependencies, log, root } from './bootstrap.mjs';

const started = Date.now();
const port = Number(process.env.RESONOTE_CLUSTER_PORT ?? 40080);
const apiCount = Number(process.env.RESONOTE_CLUSTER_APIS ?? 2);
const workerCount = Number(process.env.RESONOTE_CLUSTER_WORKERS ?? 2);
const seed = process.env.RESONOTE_CLUSTER_SEED !== '0';
const restartMs = 1000 * Number(process.env.RESONOTE_CLUSTER_RESTART_S ?? 1);
const publicUrl = `http://127.0.0.1:${port}`;

// RESONOTE_CLUSTER_SKIP_SETUP=1: the caller (scripts/bench-cluster.mjs) has already installed, built and checked.
const setup = process.env.RESONOTE_CLUSTER_SKIP_SETUP !== '1';
if (setup) installDependencies();
const nginxBin = ensureNginx();
const pg = process.env.DATABASE_URL ? null : ensurePostgres({ name: 'cluster', port: Number(process.env.RESONOTE_CLUSTER_PG_PORT ?? 54349), database: 'resonote' });
const databaseUrl = process.env.DATABASE_URL ?? pg.url;
if (setup) {
  ensureChromium();
  buildWeb();
}

const runDir = path.join(root, '.run', `cluster-${port}`);
fs.mkdirSync(path.join(runDir, 'tmp'), { recursive: true });

/** @type {{ name: string, child: import('node:child_process').ChildProcess, stopSignal: NodeJS.Signals }[]} */
const children = [];
let stopping = false;

function startChild(name, cmd, args, options, readyText, restart = false) {
  const child = spawn(cmd, args, { ...options, stdio: ['ignore', 'pipe', 'pipe'] });
  const entry = { name, child, stopSignal: options.stopSignal ?? 'SIGTERM' };
  children.push(entry);
  log(`${name} started (pid ${child.pid})`);
  const prefix = (line) => `[${name}] ${line}`;
  let ready;
  const readyPromise = new Promise((resolve) => (ready = resolve));
  const relay = (stream, out) => {
    let rest = '';
    stream.on('data', (d) => {
      rest += d.toString();
      const lines = rest.split('\n');
      rest = lines.pop();
      for (const line of lines) {
        if (line.trim()) out.write(prefix(line) + '\n');
        if (readyText && line.includes(readyText)) ready();
      }
    });
  };
  relay(child.stdout, process.stdout);
  relay(child.stderr, process.stderr);
  if (!readyText) ready();
  child.on('exit', (code, signal) => {
    if (stopping) return;
    if (restart) {
      console.error(`[resonote] ${name} (pid ${child.pid}) exited (${signal ?? code}); starting it again in ${restartMs / 1000} s`);
      children.splice(children.indexOf(entry), 1);
      setTimeout(() => {
        if (!stopping) void startChild(name, cmd, args.filter((a) => a !== '--seed'), options, readyText, restart);
      }, restartMs).unref();
      return;
    }
    console.error(`[resonote] ${name} exited (${signal ?? code}); stopping the cluster`);
    void stopAll(1);
  });
  return readyPromise;
}

const apiDir = path.join(root, 'apps/api');
const baseEnv = { ...process.env, NODE_ENV: process.env.NODE_ENV ?? 'development', DATABASE_URL: databaseUrl, PUBLIC_URL: publicUrl, SMTP_CAPTURE_PORT: '0' };
const apiPorts = Array.from({ length: apiCount }, (_, i) => port + 1 + i);

// The first API migrates (and seeds); the others start once it serves, so migrations never race.
// The APIs listen on loopback only, behind nginx: X-Forwarded-For is believed from loopback peers.
for (const [i, apiPort] of apiPorts.entries()) {
  const args = ['--import', 'tsx', 'src/server.ts', ...(i === 0 && seed ? ['--seed'] : [])];
  await startChild(`api-${i + 1}`, process.execPath, args, { cwd: apiDir, env: { TRUST_PROXY: 'loopback', ...baseEnv, HOST: '127.0.0.1', PORT: String(apiPort), JOBS_IN_PROCESS: 'false', RESONOTE_BOOT_STARTED: String(started) } }, 'serving on', true);
}
await Promise.all(
  Array.from({ length: workerCount }, (_, i) => startChild(`worker-${i + 1}`, process.execPath, ['--import', 'tsx', 'src/worker.ts'], { cwd: apiDir, env: baseEnv }, 'working jobs', true)),
);

// nginx started by root runs its worker processes as \`nobody\` unless told otherwise; they could then
// not write their temporary files (the buffers of large answers, client bodies) under the checkout's
// .run folder, which the API keeps owner-only for its secret (apps/api/src/config.ts) — nginx logs
// "open() … failed (13: Permission denied)" and cuts the answer, which a browser reports as
// ERR_CONTENT_LENGTH_MISMATCH. Every process of the cluster runs as the one user who started it.
// (Started by anyone else, nginx cannot change user and its workers are that user already.)
const workerUser = process.getuid?.() === 0 ? `user ${os.userInfo().username};\n` : '';
const conf = `# Written by scripts/cluster.mjs; see docs/decisions/nginx-load-balancer.md.
${workerUser}worker_processes 1;
pid ${runDir}/nginx.pid;
error_log ${runDir}/error.log warn;
events { worker_connections 4096; }
http {
  access_log off;
  client_body_temp_path ${runDir}/tmp/body;
  proxy_temp_path ${runDir}/tmp/proxy;
  fastcgi_temp_path ${runDir}/tmp/fastcgi;
  uwsgi_temp_path ${runDir}/tmp/uwsgi;
  scgi_temp_path ${runDir}/tmp/scgi;
  # Uploads up to the API's own limit (UPLOAD_LIMIT_MB × 4 for a backup restore); the API refuses beyond.
  client_max_body_size 512m;
  # Cache affinity, not truth: the requests of one schedule entry (its hits, its FRF) go to the same
  # API process while it is up, so that process's running sums already hold the DOF's earlier hits
  # and a new hit costs one transform, not a read of the others' samples (hits/result-cache.ts). Any
  # other request is spread at random ($request_id). A process that fails hands its entries to the
  # others; every read still checks its input hash in PostgreSQL (docs/decisions/hit-cost.md).
  map $request_uri $resonote_affinity {
    ~^/api/campaigns/[^/]+/schedule/(?<entry>[^/?]+) $entry;
    default $request_id;
  }
  upstream resonote_api {
    # Any API process serves any request: sessions, events and jobs live in PostgreSQL.
    hash $resonote_affinity consistent;
${apiPorts.map((p) => `    server 127.0.0.1:${p} max_fails=3 fail_timeout=5s;`).join('\n')}
    keepalive 64;
  }
  server {
    listen 127.0.0.1:${port};
    proxy_http_version 1.1;
    proxy_set_header Connection "";
    proxy_set_header Host $http_host;
    # nginx is the edge: the client is whoever connected to it. A client's own X-Forwarded-For is
    # replaced, never appended to, so no one can choose the address rate limits and logs see.
    # (Behind another balancer, use ngx_http_realip_module's set_real_ip_from for it first.)
    proxy_set_header X-Forwarded-For $remote_addr;
    proxy_set_header X-Real-IP $remote_addr;
    proxy_set_header X-Forwarded-Proto $scheme;
    proxy_read_timeout 180s;
    # A request that failed on one upstream before any answer (a process restarting) goes to the next.
    proxy_next_upstream error timeout http_502 http_503;
    location ~ ^/api/campaigns/[^/]+/events$ {
      # Server-Sent Events: passed through as they are written, held open for an hour.
      proxy_pass http://resonote_api;
      proxy_buffering off;
      proxy_cache off;
      proxy_read_timeout 3600s;
      proxy_next_upstream off;
    }
    location / {
      proxy_pass http://resonote_api;
      proxy_request_buffering off;
    }
  }
}
`;
const confPath = path.join(runDir, 'nginx.conf');
fs.writeFileSync(confPath, conf);
// SIGQUIT is nginx's graceful stop.
await startChild('nginx', nginxBin, ['-p', runDir, '-c', confPath, '-e', path.join(runDir, 'error.log'), '-g', 'daemon off;'], { stopSignal: 'SIGQUIT' }, null);

// Ready once nginx answers the health check through an upstream.
for (let i = 0; ; i++) {
  try {
    const res = await fetch(`${publicUrl}/api/health`);
    if (res.ok) break;
  } catch {
    // not listening yet
  }
  if (i > 100) {
    console.error('[resonote] nginx did not answer /api/health within 10 s');
    await stopAll(1);
  }
  await new Promise((r) => setTimeout(r, 100));
}
log(`cluster ready on ${publicUrl}: nginx → ${apiPorts.map((p) => `127.0.0.1:${p}`).join(', ')}; ${workerCount} workers; PostgreSQL ${databaseUrl.replace(/:[^:@/]*@/, ':***@')} (${((Date.now() - started) / 1000).toFixed(1)} s)`);

async function stopAll(code) {
  if (stopping) return;
  stopping = true;
  log('stopping the cluster: nginx, then the API processes and workers');
  const exited = (c) => (c.child.exitCode !== null || c.child.signalCode !== null ? Promise.resolve() : new Promise((r) => c.child.once('exit', r)));
  const byName = (prefix) => children.filter((c) => c.name.startsWith(prefix));
  for (const group of [byName('nginx'), [...byName('api-'), ...byName('worker-')]]) {
    for (const c of group) if (c.child.exitCode === null && c.child.signalCode === null) c.child.kill(c.stopSignal);
    const timer = setTimeout(() => group.forEach((c) => c.child.exitCode === null && c.child.kill('SIGKILL')), 40_000);
    await Promise.all(group.map(exited));
    clearTimeout(timer);
  }
  if (pg) {
    log('stopping PostgreSQL');
    pg.stop();
  }
  log('cluster stopped');
  process.exit(code);
}
process.on('SIGINT', () => void stopAll(0));
process.on('SIGTERM', () => void stopAll(0));
