// `npm run fuzz` (scripts/fuzz.mjs starts the test cluster and runs this): the fuzz run of
// tests/fuzz/harness.ts against its own app and database. Not a test: it prints the status
// histogram and the time, lists the first failures, and exits non-zero on any 5xx, hang,
// network error or 4xx outside the one error shape.
//   --cases N (default 10000)  --seed S (default 20261203)  --timeout-ms T (default 30000)  --max-s M (default 3600)
import { parseArgs } from 'node:util';
import { createTemplate } from '../support/db.ts';
import { startTestApp } from '../support/app.ts';
import { histogramLines, prepareFuzzTarget, runFuzz } from './harness.ts';

const { values } = parseArgs({ options: { cases: { type: 'string', default: '10000' }, seed: { type: 'string', default: '20261203' }, 'timeout-ms': { type: 'string', default: '30000' }, 'max-s': { type: 'string', default: '3600' } } });
const options = { cases: Number(values.cases), seed: Number(values.seed), timeoutMs: Number(values['timeout-ms']), maxMs: Number(values['max-s']) * 1000 };
for (const [k, v] of Object.entries(options)) {
  if (!Number.isFinite(v) || v <= 0) {
    console.error(`[fuzz] --${k} must be a positive number`);
    process.exit(2);
  }
}

const TEMPLATE = 'resonote_tpl_fuzz';
await createTemplate(TEMPLATE);
// Unexpected errors of the app reach the console; the run prints them and they count through the 5xx they answer.
const app = await startTestApp(TEMPLATE, { UPLOAD_LIMIT_MB: '8' }, { listen: true });
let code = 1;
try {
  const target = await prepareFuzzTarget(app);
  console.log(`[fuzz] seed ${options.seed}, ${options.cases} cases, ${options.timeoutMs} ms per request, at most ${options.maxMs / 1000} s`);
  const result = await runFuzz(target, { ...options, onProgress: (done, ms) => console.log(`[fuzz] ${done} cases, ${(ms / 1000).toFixed(0)} s`) });
  for (const line of histogramLines(result)) console.log(line);
  const counts = { '5xx': 0, hang: 0, 'network error': 0, 'bad shape': 0 };
  for (const f of result.failures) {
    if (f.problem === 'hang') counts.hang++;
    else if (f.problem.startsWith('network error')) counts['network error']++;
    else if (f.problem.includes('not in the one error shape')) counts['bad shape']++;
    else counts['5xx']++;
  }
  console.log(`failures: ${Object.entries(counts).map(([k, v]) => `${v} ${k}`).join(', ')}`);
  for (const f of result.failures.slice(0, 20)) console.log(`  case ${f.index} ${f.target} (${f.how}): ${f.problem}`);
  code = result.failures.length === 0 && result.cases === options.cases ? 0 : 1;
  if (result.cases < options.cases) console.log(`[fuzz] stopped after ${result.cases} of ${options.cases} cases (--max-s ${options.maxMs / 1000})`);
} finally {
  await app.close();
}
process.exit(code);
