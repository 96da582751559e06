// `npm run test:cluster`, `npm run test:cluster:suites`, `npm run bench:load`, `npm run bench:reprocess`:
// a PostgreSQL cluster for them (`cluster`, on RESONOTE_CLUSTER_PG_PORT, default 54349) and nginx,
// then the cluster test (tests/cluster/, vitest), the Tap/Review/Modes/Hand-over API and browser
// test files against clusters (tests/vitest.cluster-suites.config.ts; extra arguments go to vitest),
// or one benchmark script (tests/bench/<name>.ts). Each starts the processes it measures itself
// (tests/support/cluster.ts).
import { spawnSync } from 'node:child_process';
import path from 'node:path';
import { buildWeb, ensureChromium, ensureNginx, ensurePostgres, installDependencies, root } from './bootstrap.mjs';

const name = process.argv[2] ?? 'load';
if (!['load', 'reprocess', 'cluster-check', 'suites'].includes(name)) {
  console.error(`[resonote] unknown benchmark "${name}"`);
  process.exit(2);
}
installDependencies();
ensureNginx();
const chromium = ensureChromium();
buildWeb();
const pg = ensurePostgres({ name: 'cluster', port: Number(process.env.RESONOTE_CLUSTER_PG_PORT ?? 54349), database: 'postgres' });
// The test support's fresh databases (RESONOTE_TEST_DATABASE_URL) come from the same PostgreSQL.
const env = { ...process.env, RESONOTE_CLUSTER_ADMIN_URL: pg.url, RESONOTE_TEST_DATABASE_URL: pg.url, RESONOTE_CHROMIUM: chromium };
const vitest = (config) => spawnSync(process.execPath, [path.join(root, 'node_modules/vitest/vitest.mjs'), 'run', '--config', config, ...process.argv.slice(3)], { cwd: path.join(root, 'tests'), stdio: 'inherit', env });
const result =
  name === 'cluster-check'
    ? vitest('vitest.cluster.config.ts')
    : name === 'suites'
      ? vitest('vitest.cluster-suites.config.ts')
      : spawnSync(process.execPath, ['--import', 'tsx', `bench/${name}.ts`, ...process.argv.slice(3)], { cwd: path.join(root, 'tests'), stdio: 'inherit', env });
pg.stop();
process.exit(result.status ?? 1);
