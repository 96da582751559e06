// Global set-up of `npm run test:cluster:suites` (tests/vitest.cluster-suites.config.ts), after the
// e2e and API templates exist: the demo (apps/api/src/seed.ts) is seeded once into the e2e template
// by an in-process app with no job worker, and copied as SEEDED_API_TEMPLATE. Each file then clones a database that already holds the demo, and its own seedDemo call
// finds the accounts and campaigns there and adds nothing (the seed skips what exists). Seeding per
// file took most of a file's set-up (past 240 s on a loaded machine, with a cluster running beside it).
import { randomBytes } from 'node:crypto';
import pg from 'pg';
import { createApp } from '@resonote/api/app';
import { loadConfig } from '@resonote/api/config';
import { seedDemo } from '@resonote/api/seed';
import { useFastFft } from '@resonote/dsp/fast-fft';
import { adminUrl } from '../support/db.ts';

export const SEEDED_API_TEMPLATE = 'resonote_tpl_api_demo';
const E2E_TEMPLATE = 'resonote_tpl_e2e';

function urlFor(database: string): string {
  const url = new URL(adminUrl);
  url.pathname = `/${database}`;
  return url.toString();
}

async function admin(sql: string): Promise<void> {
  const client = new pg.Client({ connectionString: adminUrl });
  await client.connect();
  try {
    await client.query(sql);
  } finally {
    await client.end();
  }
}

async function seedInto(database: string): Promise<void> {
  const config = loadConfig({ NODE_ENV: 'test', PORT: '3999', DATABASE_URL: urlFor(database), SMTP_CAPTURE_PORT: '0', LOG_REQUESTS: 'false', AUTH_RATE_LIMIT_MAX: '1000', AUTH_SECRET: randomBytes(32).toString('hex'), JOBS_IN_PROCESS: 'false' });
  const handle = await createApp({ config, log: () => undefined });
  try {
    await seedDemo(handle, { log: () => undefined });
  } finally {
    // Writes the delayed FRF rows and closes every connection, so the template can be cloned.
    await handle.close();
  }
}

export default async function setup() {
  const started = Date.now();
  // The FFT of the cluster's processes, as every file's own set-up uses (setup/same-fft-as-cluster.ts).
  await useFastFft();
  await seedInto(E2E_TEMPLATE);
  // Both templates are the same migrated schema (createTemplate); the API one gets a copy of the seeded e2e one.
  await admin(`DROP DATABASE IF EXISTS "${SEEDED_API_TEMPLATE}" WITH (FORCE)`);
  await admin(`CREATE DATABASE "${SEEDED_API_TEMPLATE}" TEMPLATE "${E2E_TEMPLATE}"`);
  console.log(`[resonote] demo seeded once for every file, in ${((Date.now() - started) / 1000).toFixed(1)} s`);
}
