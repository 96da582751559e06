// `npm run bench:upload` / `npm run bench:export`: the test cluster, then one benchmark that needs
// the database (tests/bench/<name>.ts; upload by default).
import { spawnSync } from 'node:child_process';
import path from 'node:path';
import { ensurePostgres, installDependencies, root } from './bootstrap.mjs';

const name = process.argv[2] ?? 'upload';
if (!/^[a-z-]+$/.test(name)) {
  console.error(`[resonote] unknown benchmark "${name}"`);
  process.exit(2);
}
installDependencies();
const pg = ensurePostgres({ name: 'test', port: Number(process.env.RESONOTE_TEST_PG_PORT ?? 54339), database: 'postgres' });
const result = spawnSync(process.execPath, ['--import', 'tsx', `bench/${name}.ts`], { cwd: path.join(root, 'tests'), stdio: 'inherit', env: { ...process.env, RESONOTE_TEST_DATABASE_URL: pg.url } });
pg.stop();
process.exit(result.status ?? 1);
