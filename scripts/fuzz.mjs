// `npm run fuzz [-- --cases N --seed S --timeout-ms T --max-s M]`: the test cluster, then the fuzz
// run of tests/fuzz/run.ts (mutated recordings, geometry CSVs and backup zips against the real API).
import { spawnSync } from 'node:child_process';
import path from 'node:path';
import { ensurePostgres, installDependencies, root } from './bootstrap.mjs';

installDependencies();
const pg = ensurePostgres({ name: 'test', port: Number(process.env.RESONOTE_TEST_PG_PORT ?? 54339), database: 'postgres' });
const result = spawnSync(process.execPath, ['--import', 'tsx', 'fuzz/run.ts', ...process.argv.slice(2)], { cwd: path.join(root, 'tests'), stdio: 'inherit', env: { ...process.env, NODE_ENV: 'test', RESONOTE_TEST_DATABASE_URL: pg.url } });
pg.stop();
process.exit(result.status ?? 1);
