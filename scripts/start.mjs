// `npm start`: bootstrap, then serve the API and the built web app on http://127.0.0.1:3000.
// Migrations and the demo seed run inside the server process at start. While it serves, this
// script supervises the PostgreSQL dev cluster: if the postmaster stops (a crash, an OOM kill,
// someone's `pg_ctl stop`), it says so and starts it again with backoff; the API keeps running
// meanwhile (it answers 503 and reconnects by itself). Ctrl-C stops the server, then the database.
import { spawn } from 'node:child_process';
import path from 'node:path';
import { buildWeb, ensureChromium, ensurePostgres, installDependencies, log, root } from './bootstrap.mjs';

const started = Date.now();
installDependencies();
// RESONOTE_PG_PORT moves the dev cluster (e.g. when 54329 is taken by another checkout).
const pg = ensurePostgres({ name: 'dev', port: Number(process.env.RESONOTE_PG_PORT ?? 54329), database: 'resonote' });
// The PDF report is Chromium's print of the report page.
ensureChromium();
buildWeb();

const server = spawn(process.execPath, ['--import', 'tsx', 'src/server.ts', '--seed'], {
  cwd: path.join(root, 'apps/api'),
  stdio: 'inherit',
  env: { ...process.env, DATABASE_URL: process.env.DATABASE_URL ?? pg.url, RESONOTE_BOOT_STARTED: String(started) },
});

let stopping = false;

// --- PostgreSQL supervision -------------------------------------------------------------------
const CHECK_MS = 1000;
const BACKOFF_S = [1, 2, 4, 8, 16, 30];
/** The postmaster counts as stable again after this long up; the backoff then starts over. */
const STABLE_MS = 60_000;
let restarts = 0;
let failures = 0;
let upSince = Date.now();
let supervising = true;
let timer;

async function superviseOnce() {
  if (!supervising || stopping) return;
  if (pg.cluster.postmasterPid() !== null) {
    if (failures > 0 && Date.now() - upSince > STABLE_MS) failures = 0;
    return schedule(CHECK_MS);
  }
  // Dying again soon after a restart counts like a failed start: the wait grows.
  if (restarts > 0 && Date.now() - upSince < STABLE_MS) failures += 1;
  const wait = BACKOFF_S[Math.min(failures, BACKOFF_S.length - 1)];
  log(`PostgreSQL (cluster ${pg.cluster.name}, port ${pg.cluster.port}) is not running; starting it again in ${wait} s (the server keeps running and answers 503 meanwhile)`);
  await new Promise((r) => setTimeout(r, wait * 1000));
  if (!supervising || stopping) return;
  if (pg.cluster.postmasterPid() !== null) {
    log('PostgreSQL was started by someone else meanwhile');
    return schedule(CHECK_MS);
  }
  const result = await pg.cluster.startAsync();
  if (result.ok) {
    restarts += 1;
    upSince = Date.now();
    log(`PostgreSQL is running again on port ${pg.cluster.port} (restart ${restarts}); the server reconnects by itself`);
  } else {
    failures += 1;
    log(`starting PostgreSQL failed (attempt ${failures}); see ${pg.cluster.logFile}:\n${result.message.trim().split('\n').slice(-6).join('\n')}`);
  }
  schedule(CHECK_MS);
}
function schedule(ms) {
  if (!supervising || stopping) return;
  timer = setTimeout(() => void superviseOnce(), ms);
}
schedule(CHECK_MS);

// --- Shutdown ----------------------------------------------------------------------------------
function stop(signal) {
  if (stopping) return;
  stopping = true;
  supervising = false;
  clearTimeout(timer);
  log(`${signal}: stopping the server`);
  server.kill('SIGTERM');
}
process.on('SIGINT', () => stop('SIGINT'));
process.on('SIGTERM', () => stop('SIGTERM'));

server.on('exit', (code, signal) => {
  supervising = false;
  clearTimeout(timer);
  if (!stopping) log(`the server exited on its own (${signal ?? `code ${code}`}); stopping PostgreSQL too`);
  log('stopping PostgreSQL');
  pg.stop();
  process.exit(stopping ? 0 : (code ?? 1));
});
