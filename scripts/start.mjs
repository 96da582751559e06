// `npm start`: bootstrap, then serve the API and the built web app on http://127.0.0.1:3000.
// Migrations and the demo seed run inside the server process at start. Ctrl-C stops the server,
// then the database.
import { spawn } from 'node:child_process';
import path from 'node:path';
import { buildWeb, ensureChromium, ensurePostgres, installDependencies, log, root } from './bootstrap.mjs';

const started = Date.now();
installDependencies();
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
function stop(signal) {
  if (stopping) return;
  stopping = true;
  log(`${signal}: stopping the server`);
  server.kill('SIGTERM');
}
process.on('SIGINT', () => stop('SIGINT'));
process.on('SIGTERM', () => stop('SIGTERM'));

server.on('exit', (code) => {
  log('stopping PostgreSQL');
  pg.stop();
  process.exit(stopping ? 0 : (code ?? 1));
});
