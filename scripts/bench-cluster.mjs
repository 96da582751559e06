// `npm run test:cluster`, `npm run bench:load`, `npm run bench:reprocess`: a PostgreSQL cluster
// for them (`cluster`, on RESONOTE_CLUSTER_PG_PORT, default 54349) and nginx, then the cluster
// test (tests/cluster/, vitest) or one benchmark script (tests/bench/<name>.ts). Each starts the
// processes it measures itself (tests/support/cluster.ts).
import { spawnSync } from 'node:child_process';
import path from 'node:path';
import { ensureChromium, ensureNginx, ensurePostgres, installDependencies, root } from './bootstrap.mjs';

const name = process.argv[2] ?? 'load';
if (!['load', 'reprocess', 'cluster-check'].includes(name)) {
  console.error(`[resonote] unknown benchmark "${name}"`);
  process.exit(2);
}
installDependencies();
ensureNginx();
ensureChromium();
const pg = ensurePostgres({ name: 'cluster', port: Number(process.env.RESONOTE_CLUSTER_PG_PORT ?? 54349), database: 'postgres' });
const env = { ...process.env, RESONOTE_CLUSTER_ADMIN_URL: pg.url };
const result =
  name === 'cluster-check'
    ? spawnSync(process.execPath, [path.join(root, 'node_modules/vitest/vitest.mjs'), 'run', '--config', 'vitest.cluster.config.ts'], { cwd: path.join(root, 'tests'), stdio: 'inherit', env })
    : spawnSync(process.execPath, ['--import', 'tsx', `bench/${name}.ts`, ...process.argv.slice(3)], { cwd: path.join(root, 'tests'), stdio: 'inherit', env });
pg.stop();
process.exit(result.status ?? 1);
