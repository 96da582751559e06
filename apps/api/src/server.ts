// The server process: validate the configuration, migrate, optionally seed the demo, serve, and
// shut down cleanly on SIGINT/SIGTERM.
import { migrateDatabase } from '@resonote/db/migrate';
import { ConfigError, loadConfig, type Config } from './config.ts';
import { useFastFft } from '@resonote/dsp/fast-fft';
import { createApp } from './app.ts';
import { createHttpServer } from './http/listen.ts';
import { seedDemo } from './seed.ts';
import { isDatabaseUnavailable } from './db-health.ts';

// A database outage must never end the process: requests answer 503 meanwhile and the pool
// reconnects. Every pg client has an 'error' listener (packages/db/src/client.ts); this catches a
// promise about a lost connection that nobody awaited. Any other unhandled rejection still ends
// the process, as Node does by default.
process.on('unhandledRejection', (reason) => {
  if (isDatabaseUnavailable(reason)) {
    console.log(`[resonote] a database operation was cut off by the outage: ${(reason as Error)?.message ?? reason}`);
    return;
  }
  console.error('[resonote] unhandled rejection:', reason);
  process.exit(1);
});

let config: Config;
try {
  config = loadConfig(process.env);
} catch (err) {
  console.error(err instanceof ConfigError ? err.message : err);
  process.exit(1);
}
if (config.authSecretSource !== 'environment') {
  const { file, created } = config.authSecretSource;
  console.log(created ? `[resonote] AUTH_SECRET is not set: generated a signing secret and kept it in ${file} (mode 0600); later starts reuse it` : `[resonote] AUTH_SECRET is not set: signing with the secret kept in ${file}`);
}

try {
  await migrateDatabase(config.databaseUrl);
} catch (err) {
  console.error(`[resonote] database migration failed against ${config.databaseUrl.replace(/:[^:@/]*@/, ':***@')}: ${(err as Error).message}`);
  process.exit(1);
}

// Power-of-two FFTs on the server use PFFFT's WebAssembly SIMD build when this Node can run it;
// otherwise fft.js (docs/decisions/fast-fft.md).
const fastFft = await useFastFft();
console.log(`[resonote] FFT: ${fastFft ? 'PFFFT WebAssembly SIMD (float32)' : 'fft.js (float64)'}`);

const handle = await createApp({ config });
let demo: Awaited<ReturnType<typeof seedDemo>> | undefined;
if (process.argv.includes('--seed')) demo = await seedDemo(handle);

// The configured header, request, keep-alive and idle timeouts end slow clients (apps/api/src/http/listen.ts).
const server = createHttpServer(handle.app, config);
server.on('error', (err) => {
  console.error(`[resonote] cannot listen on ${config.host}:${config.port}: ${err.message}`);
  process.exit(1);
});
server.listen(config.port, config.host, () => {
  console.log(`\n[resonote] serving on ${config.publicUrl}`);
  if (demo) {
    console.log('[resonote] demo sign-ins (password for all: ' + demo.password + '):');
    for (const account of demo.accounts) console.log(`  ${account.role.padEnd(9)} ${account.email}`);
  }
  if (handle.mailer.capturePort) console.log(`[resonote] outgoing mail is captured on 127.0.0.1:${handle.mailer.capturePort}; admins read it under Admin → Mail`);
  const bootStarted = Number(process.env.RESONOTE_BOOT_STARTED ?? 0);
  if (bootStarted) console.log(`[resonote] ready in ${((Date.now() - bootStarted) / 1000).toFixed(1)} s`);
});

let closing = false;
async function shutdown(signal: string) {
  if (closing) return;
  closing = true;
  console.log(`[resonote] ${signal}: finishing open requests`);
  server.close();
  server.closeIdleConnections();
  const force = setTimeout(() => server.closeAllConnections(), 5000);
  await new Promise<void>((resolve) => server.once('close', () => resolve()));
  clearTimeout(force);
  await handle.close();
  console.log('[resonote] stopped');
  process.exit(0);
}
process.on('SIGINT', () => void shutdown('SIGINT'));
process.on('SIGTERM', () => void shutdown('SIGTERM'));
