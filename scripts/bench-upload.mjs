// `npm run bench:upload`: the test cluster, then the hit-upload benchmark (tests/bench/upload.ts).
import { spawnSync } from 'node:child_process';
import path from 'node:path';
import { ensurePostgres, installDependencies, root } from './bootstrap.mjs';

installDependencies();
const pg = ensurePostgres({ name: 'test', port: Number(process.env.RESONOTE_TEST_PG_PORT ?? 54339), database: 'postgres' });
const result = spawnSync(process.execPath, ['--import', 'tsx', 'bench/upload.ts'], { cwd: path.join(root, 'tests'), stdio: 'inherit', env: { ...process.env, RESONOTE_TEST_DATABASE_URL: pg.url } });
pg.stop();
process.exit(result.status ?? 1);
