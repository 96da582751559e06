// apps/api/src/server.ts as a real child process (as `npm start` runs it), for tests that need
// the process itself: a kill, or a database outage it must survive.
import { spawn, type ChildProcess } from 'node:child_process';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { freePort } from './app.ts';

const apiDir = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '../../apps/api');

export interface ServerProcess {
  child: ChildProcess;
  url: string;
  output: () => string;
  /** Resolves with how the process ended (at once when it already has). */
  exited: () => Promise<{ code: number | null; signal: NodeJS.Signals | null }>;
}

/** Starts the server with `env` on a free port; resolves when it serves. */
export async function startServerProcess(env: Record<string, string>): Promise<ServerProcess> {
  const port = await freePort();
  let output = '';
  const child = spawn(process.execPath, ['--import', 'tsx', 'src/server.ts'], {
    cwd: apiDir,
    env: { ...process.env, NODE_ENV: 'test', PORT: String(port), SMTP_CAPTURE_PORT: '0', LOG_REQUESTS: 'false', AUTH_RATE_LIMIT_MAX: '1000', ...env },
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  child.stdout!.on('data', (d) => (output += String(d)));
  child.stderr!.on('data', (d) => (output += String(d)));
  const exited = () =>
    child.exitCode !== null || child.signalCode !== null
      ? Promise.resolve({ code: child.exitCode, signal: child.signalCode })
      : new Promise<{ code: number | null; signal: NodeJS.Signals | null }>((resolve) => child.once('exit', (code, signal) => resolve({ code, signal })));
  const url = `http://127.0.0.1:${port}`;
  for (let i = 0; i < 300; i++) {
    if (child.exitCode !== null) throw new Error(`the server exited with ${child.exitCode}:\n${output}`);
    if (/serving on/.test(output)) return { child, url, output: () => output, exited };
    await new Promise((r) => setTimeout(r, 100));
  }
  child.kill('SIGKILL');
  throw new Error(`the server did not start in 30 s:\n${output}`);
}
