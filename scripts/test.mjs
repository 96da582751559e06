// `npm test`: the same bootstrap as `npm start` with its own cluster, then every vitest project
// (unit, API, browser). Prints a one-line summary last and exits non-zero on any failure.
import { spawnSync } from 'node:child_process';
import fs from 'node:fs';
import path from 'node:path';
import { buildWeb, ensureChromium, ensurePostgres, installDependencies, log, root } from './bootstrap.mjs';

installDependencies();
const pg = ensurePostgres({ name: 'test', port: Number(process.env.RESONOTE_TEST_PG_PORT ?? 54339), database: 'postgres' });
const chromium = ensureChromium();
buildWeb();

const outDir = path.join(root, 'test-output');
fs.mkdirSync(outDir, { recursive: true });
const report = path.join(outDir, 'vitest.json');
fs.rmSync(report, { force: true });

log('running the tests');
const args = ['vitest', 'run', '--reporter=default', '--reporter=json', `--outputFile.json=${report}`, ...process.argv.slice(2)];
const result = spawnSync('pnpm', ['exec', ...args], {
  cwd: root,
  stdio: 'inherit',
  env: { ...process.env, RESONOTE_TEST_DATABASE_URL: pg.url, RESONOTE_CHROMIUM: chromium, NODE_ENV: 'test' },
});

pg.stop();

let passed = 0;
let failed = 0;
let skipped = 0;
if (fs.existsSync(report)) {
  const json = JSON.parse(fs.readFileSync(report, 'utf8'));
  passed = json.numPassedTests ?? 0;
  // A failed test counts once; a file that failed outside its tests (set-up, import, hooks) counts
  // as one more failure, named below. (numFailedTestSuites would count each failed test's describe
  // blocks again.)
  const brokenFiles = (json.testResults ?? []).filter((f) => f.status === 'failed' && !(f.assertionResults ?? []).some((a) => a.status === 'failed'));
  for (const f of brokenFiles) console.log(`failed outside its tests: ${path.relative(root, f.name)}${f.message ? ` (${String(f.message).split('\n')[0]})` : ''}`);
  failed = (json.numFailedTests ?? 0) + brokenFiles.length;
  skipped = (json.numPendingTests ?? 0) + (json.numTodoTests ?? 0);
}
const code = result.status === 0 && failed === 0 && passed > 0 ? 0 : 1;
console.log(`tests: ${passed} passed, ${failed} failed, ${skipped} skipped`);
process.exit(code);
