// Bootstrap shared by `npm start` and `npm test`: pinned pnpm, dependencies, a PostgreSQL cluster
// on 127.0.0.1 in a git-ignored folder, and (for tests) Debian's chromium. Plain Node, no
// dependencies, because it runs before anything is installed.
import { execFileSync, spawn, spawnSync } from 'node:child_process';
import { createHash } from 'node:crypto';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { fileURLToPath } from 'node:url';

export const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..');
const PNPM_VERSION = '12.4.2';
const isRoot = typeof process.getuid === 'function' && process.getuid() === 0;

export function log(message) {
  console.log(`[resonote] ${message}`);
}

function fail(message) {
  console.error(`[resonote] ${message}`);
  process.exit(1);
}

function run(cmd, args, options = {}) {
  const result = spawnSync(cmd, args, { stdio: 'inherit', cwd: root, ...options });
  if (result.error) fail(`${cmd} ${args.join(' ')} could not start: ${result.error.message}`);
  if (result.status !== 0) fail(`${cmd} ${args.join(' ')} exited with ${result.status}`);
}

function output(cmd, args, options = {}) {
  const result = spawnSync(cmd, args, { encoding: 'utf8', cwd: root, ...options });
  return { ok: !result.error && result.status === 0, stdout: (result.stdout ?? '').trim(), stderr: (result.stderr ?? '').trim() };
}

function aptInstall(packages) {
  if (!isRoot) fail(`${packages.join(', ')} missing: install them with your package manager (apt-get install ${packages.join(' ')}) and run again`);
  log(`installing Debian packages: ${packages.join(' ')} (one time)`);
  run('apt-get', ['update', '-qq']);
  run('apt-get', ['install', '-y', '-qq', ...packages], { env: { ...process.env, DEBIAN_FRONTEND: 'noninteractive' } });
}

/** Makes sure `pnpm` at the pinned version is on PATH; returns the command to call it. */
export function ensurePnpm() {
  const found = output('pnpm', ['--version']);
  if (found.ok && found.stdout === PNPM_VERSION) return 'pnpm';
  log(`installing pnpm ${PNPM_VERSION} (one time)`);
  const global = spawnSync('npm', ['install', '-g', `pnpm@${PNPM_VERSION}`], { stdio: 'inherit' });
  if (global.status === 0 && output('pnpm', ['--version']).stdout === PNPM_VERSION) return 'pnpm';
  // Without write access to the global prefix, install it inside the project.
  const local = path.join(root, '.run', 'pnpm');
  run('npm', ['install', '--prefix', local, '--no-save', `pnpm@${PNPM_VERSION}`]);
  const bin = path.join(local, 'node_modules', '.bin');
  process.env.PATH = `${bin}${path.delimiter}${process.env.PATH}`;
  return 'pnpm';
}

export function installDependencies() {
  ensurePnpm();
  log('installing dependencies (pnpm install --frozen-lockfile)');
  run('pnpm', ['install', '--frozen-lockfile', '--reporter=silent']);
}

function findPgBin() {
  const base = '/usr/lib/postgresql';
  if (!fs.existsSync(base)) return null;
  const versions = fs
    .readdirSync(base)
    .filter((v) => fs.existsSync(path.join(base, v, 'bin', 'initdb')))
    .sort((a, b) => Number(b) - Number(a));
  return versions.length ? path.join(base, versions[0], 'bin') : null;
}

/** Runs a PostgreSQL server binary as the `postgres` user when we are root (initdb refuses root). */
function pgRun(bin, args, { quiet = false } = {}) {
  const cmd = isRoot ? 'runuser' : bin;
  const full = isRoot ? ['-u', 'postgres', '--', bin, ...args] : args;
  const result = spawnSync(cmd, full, { stdio: quiet ? 'pipe' : 'inherit', encoding: 'utf8', cwd: os.tmpdir() });
  return { ok: result.status === 0, stdout: result.stdout ?? '', stderr: result.stderr ?? '' };
}

function accessibleByPostgres(dir) {
  if (!isRoot) return true;
  return spawnSync('runuser', ['-u', 'postgres', '--', 'test', '-w', dir]).status === 0;
}

/**
 * Where the cluster lives: `<repo>/.pgdata/<name>` (git-ignored), or, when the `postgres` user
 * cannot reach the checkout (a clone under root's home), a folder under /var/tmp keyed by the
 * checkout's path so two clones never share a cluster.
 */
function clusterDir(name) {
  const inRepo = path.join(root, '.pgdata');
  fs.mkdirSync(inRepo, { recursive: true });
  if (isRoot) spawnSync('chown', ['postgres:postgres', inRepo]);
  if (accessibleByPostgres(inRepo)) return path.join(inRepo, name);
  const key = createHash('sha256').update(root).digest('hex').slice(0, 12);
  const outside = path.join('/var/tmp', `resonote-pg-${key}`);
  fs.mkdirSync(outside, { recursive: true });
  spawnSync('chown', ['postgres:postgres', outside]);
  return path.join(outside, name);
}

/**
 * A PostgreSQL cluster named `name` on 127.0.0.1:`port` (created with initdb when missing), and the
 * controls `npm start`'s supervisor and the fault test use: `running()` (is the postmaster alive?),
 * `start()`, `stop(mode)`, `remove()`.
 */
export function postgresCluster({ name, port }) {
  let pgBin = findPgBin();
  if (!pgBin) {
    aptInstall(['postgresql']);
    pgBin = findPgBin();
    if (!pgBin) fail('PostgreSQL server binaries not found under /usr/lib/postgresql after installing');
  }
  const dir = clusterDir(name);
  const data = path.join(dir, 'data');
  const sock = path.join(dir, 'run');
  const logFile = path.join(sock, 'postgres.log');
  fs.mkdirSync(sock, { recursive: true });
  if (isRoot) spawnSync('chown', ['-R', 'postgres:postgres', dir]);
  if (!fs.existsSync(path.join(data, 'PG_VERSION'))) {
    log(`creating PostgreSQL cluster ${name} in ${data}`);
    fs.mkdirSync(data, { recursive: true });
    if (isRoot) spawnSync('chown', ['postgres:postgres', data]);
    const init = pgRun(path.join(pgBin, 'initdb'), ['-D', data, '-U', 'postgres', '--auth=trust', '-E', 'UTF8', '--locale=C.UTF-8'], { quiet: true });
    if (!init.ok) fail(`initdb failed:\n${init.stderr || init.stdout}`);
  }
  const pgCtl = path.join(pgBin, 'pg_ctl');
  const startArgs = ['-D', data, '-l', logFile, '-o', `-h 127.0.0.1 -p ${port} -k ${sock} -c fsync=${name.includes('test') ? 'off' : 'on'}`, '-w', '-t', '60', 'start'];
  const logTail = () => (fs.existsSync(logFile) ? fs.readFileSync(logFile, 'utf8').slice(-2000) : '');
  return {
    name,
    port,
    data,
    logFile,
    url: (database) => `postgres://postgres@127.0.0.1:${port}/${database}`,
    /** The postmaster's pid from postmaster.pid when that process is alive, else null. */
    postmasterPid() {
      try {
        const pid = Number(fs.readFileSync(path.join(data, 'postmaster.pid'), 'utf8').split('\n')[0]);
        if (!Number.isInteger(pid) || pid <= 0) return null;
        process.kill(pid, 0);
        return pid;
      } catch {
        return null;
      }
    },
    running() {
      return pgRun(pgCtl, ['-D', data, 'status'], { quiet: true }).ok;
    },
    /** Starts the postmaster and waits until it accepts connections; { ok, message }. */
    start() {
      const started = pgRun(pgCtl, startArgs, { quiet: true });
      return { ok: started.ok, message: started.ok ? '' : `${started.stderr}\n${logTail()}` };
    },
    /** The same as start() without blocking the event loop (the supervisor of `npm start`). */
    startAsync() {
      return new Promise((resolve) => {
        const cmd = isRoot ? 'runuser' : pgCtl;
        const args = isRoot ? ['-u', 'postgres', '--', pgCtl, ...startArgs] : startArgs;
        const child = spawn(cmd, args, { stdio: 'pipe', cwd: os.tmpdir() });
        let stderr = '';
        child.stderr.on('data', (d) => (stderr += String(d)));
        child.on('error', (err) => resolve({ ok: false, message: err.message }));
        child.on('exit', (code) => resolve({ ok: code === 0, message: code === 0 ? '' : `${stderr}\n${logTail()}` }));
      });
    },
    stop(mode = 'fast') {
      return pgRun(pgCtl, ['-D', data, '-m', mode, '-w', 'stop'], { quiet: true });
    },
    /** Stops the cluster and deletes its folder (test clusters). */
    remove() {
      if (this.running()) this.stop('immediate');
      fs.rmSync(dir, { recursive: true, force: true });
    },
  };
}

/**
 * Makes sure a PostgreSQL cluster named `name` runs on 127.0.0.1:`port` with database `database`.
 * Returns { url, stop, cluster }.
 */
export function ensurePostgres({ name, port, database }) {
  const cluster = postgresCluster({ name, port });
  if (!cluster.running()) {
    log(`starting PostgreSQL on 127.0.0.1:${port}`);
    const start = cluster.start();
    if (!start.ok) fail(`PostgreSQL did not start on port ${port}:\n${start.message}`);
  }
  ensureDatabase(port, database);
  return {
    url: cluster.url(database),
    stop: () => cluster.stop('fast'),
    cluster,
  };
}

/** Creates `database` on the cluster at `port` unless it exists. */
export function ensureDatabase(port, database) {
  const psql = path.join(findPgBin(), 'psql');
  const base = ['-h', '127.0.0.1', '-p', String(port), '-U', 'postgres', '-v', 'ON_ERROR_STOP=1', '-tAc'];
  const exists = output(psql, [...base, `SELECT 1 FROM pg_database WHERE datname = '${database}'`]);
  if (!exists.ok) fail(`cannot reach PostgreSQL on port ${port}: ${exists.stderr}`);
  if (exists.stdout !== '1') {
    const created = output(psql, [...base, `CREATE DATABASE "${database}"`]);
    if (!created.ok) fail(`CREATE DATABASE ${database} failed: ${created.stderr}`);
  }
}

/** Debian's nginx (the load balancer of `npm run start:cluster`); installed with apt-get when missing. */
export function ensureNginx() {
  const found = ['/usr/sbin/nginx', '/usr/bin/nginx'].find((p) => fs.existsSync(p));
  if (found) return found;
  log('installing nginx (Debian package)');
  aptInstall(['nginx']);
  const installed = ['/usr/sbin/nginx', '/usr/bin/nginx'].find((p) => fs.existsSync(p));
  if (!installed) fail('nginx not found after installing the Debian package');
  return installed;
}

export function ensureChromium() {
  if (fs.existsSync('/usr/bin/chromium')) return '/usr/bin/chromium';
  aptInstall(['chromium']);
  if (!fs.existsSync('/usr/bin/chromium')) fail('chromium was installed but /usr/bin/chromium is missing');
  return '/usr/bin/chromium';
}

function newestMtime(target) {
  if (!fs.existsSync(target)) return 0;
  const stat = fs.statSync(target);
  if (!stat.isDirectory()) return stat.mtimeMs;
  let newest = stat.mtimeMs;
  for (const entry of fs.readdirSync(target)) {
    if (entry === 'node_modules' || entry === 'dist') continue;
    newest = Math.max(newest, newestMtime(path.join(target, entry)));
  }
  return newest;
}

/** Builds the web app unless its output is newer than every source it is built from. */
export function buildWeb() {
  const built = path.join(root, 'apps/web/dist/index.html');
  const sources = ['apps/web/src', 'apps/web/index.html', 'apps/web/vite.config.ts', 'apps/web/public', 'packages/contracts/src', 'packages/dsp/src', 'pnpm-lock.yaml'];
  const newestSource = Math.max(...sources.map((s) => newestMtime(path.join(root, s))));
  if (fs.existsSync(built) && fs.statSync(built).mtimeMs > newestSource) {
    log('web app is up to date');
    return;
  }
  log('building the web app');
  run('pnpm', ['--filter', '@resonote/web', 'build']);
}

if (process.argv[1] === fileURLToPath(import.meta.url) && process.argv.includes('--install-only')) {
  installDependencies();
}
