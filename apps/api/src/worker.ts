// A worker process (`npm run worker`; run any number, on any machine that reaches the database):
// claims background jobs from the PostgreSQL queue — modal fits, campaign reprocess parts, report
// PDFs, backups — and works them one per queue at a time. SIGINT/SIGTERM stop claiming, let the
// jobs in hand finish (up to 30 s), then exit; a job still unfinished is taken over by another
// worker when its lease runs out.
import { migrateDatabase } from '@resonote/db/migrate';
import { openDb } from '@resonote/db/client';
import { useFastFft } from '@resonote/dsp/fast-fft';
import { ConfigError, loadConfig, type Config } from './config.ts';
import { CampaignEvents } from './hits/events.ts';
import { Jobs } from './jobs/queue.ts';
import { registerJobHandlers } from './jobs/handlers.ts';
import { flushResultWrites } from './hits/result-cache.ts';
import { stopFitThread } from './modes/jobs.ts';

let config: Config;
try {
  config = loadConfig(process.env);
} catch (err) {
  console.error(err instanceof ConfigError ? err.message : err);
  process.exit(1);
}

try {
  await migrateDatabase(config.databaseUrl);
} catch (err) {
  console.error(`[resonote worker] database migration failed: ${(err as Error).message}`);
  process.exit(1);
}

// The same FFT as the API processes (PFFFT when this Node runs WebAssembly SIMD, docs/decisions/fast-fft.md):
// the FFT in use is part of a stored result's input hash, so results a worker writes serve the APIs.
const fastFft = await useFastFft();
console.log(`[resonote worker] FFT: ${fastFft ? 'PFFFT WebAssembly SIMD (float32)' : 'fft.js (float64)'}`);

const database = openDb(config.databaseUrl, { max: 4 });
// Workers only publish notices; the API processes listen.
const events = new CampaignEvents(database.pool);
const jobs = new Jobs(database.db, config);
registerJobHandlers(jobs, database.db, config, events);
await jobs.start({ work: true });
console.log(`[resonote worker] ${jobs.worker} working jobs (lease ${config.jobs.leaseS} s renewed every third of it, poll ${config.jobs.pollS} s)`);

let closing = false;
async function shutdown(signal: string) {
  if (closing) return;
  closing = true;
  console.log(`[resonote worker] ${signal}: finishing the jobs in hand`);
  await jobs.stop(30_000);
  await stopFitThread();
  await flushResultWrites(database.db);
  await database.close();
  console.log('[resonote worker] stopped');
  process.exit(0);
}
process.on('SIGINT', () => void shutdown('SIGINT'));
process.on('SIGTERM', () => void shutdown('SIGTERM'));
