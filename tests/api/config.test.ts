// The API's configuration: defaults for a local run, and a message naming the bad variable.
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { loadConfig } from '@resonote/api/config';

const dataDirs: string[] = [];
/** A data folder of its own, so no test writes into the checkout's .run folder. */
function tempDataDir(): string {
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'resonote-config-'));
  dataDirs.push(dir);
  return dir;
}
afterAll(() => dataDirs.forEach((d) => fs.rmSync(d, { recursive: true, force: true })));

// The fixed development secret the code carried before the secret was generated per installation.
const OLD_FIXED_SECRET = 'resonote-local-development-secret-not-for-production';

/** Any 32+ characters: these cases are about other settings, so no secret file is written. */
const SECRET = 's'.repeat(40);

describe('configuration', () => {
  it('needs no settings for a local run', () => {
    const config = loadConfig({ DATA_DIR: tempDataDir() });
    expect(config.port).toBe(3000);
    expect(config.publicUrl).toBe('http://127.0.0.1:3000');
    expect(config.databaseUrl).toMatch(/^postgres:\/\/.*:54329\/resonote$/);
  });

  it('names the variable that is wrong', () => {
    expect(() => loadConfig({ PORT: 'eighty' })).toThrow(/PORT/);
    expect(() => loadConfig({ AUTH_SECRET: 'short' })).toThrow(/AUTH_SECRET must be at least 32 characters/);
  });

  it('refuses production without a secret or a real mail server', () => {
    const dataDir = tempDataDir();
    expect(() => loadConfig({ NODE_ENV: 'production', DATA_DIR: dataDir })).toThrow(/AUTH_SECRET: required in production/);
    // Production never falls back to a generated secret: nothing was written.
    expect(fs.readdirSync(dataDir)).toEqual([]);
    expect(() => loadConfig({ NODE_ENV: 'production', AUTH_SECRET: 'x'.repeat(40) })).toThrow(/SMTP_URL/);
  });

  it('generates a signing secret at the first start without AUTH_SECRET, keeps it private in the data folder and reuses it at the next start', () => {
    const dataDir = tempDataDir();
    const first = loadConfig({ DATA_DIR: dataDir });
    const file = path.join(dataDir, 'auth-secret');
    expect(first.authSecretSource).toEqual({ file, created: true });
    // 32 random bytes as hex: 64 characters (node:crypto randomBytes), never the old fixed one.
    expect(first.authSecret).toMatch(/^[0-9a-f]{64}$/);
    expect(first.authSecret).not.toBe(OLD_FIXED_SECRET);
    // Readable and writable by the owner only (mode 0600).
    expect(fs.statSync(file).mode & 0o777).toBe(0o600);
    expect(fs.readdirSync(dataDir)).toEqual(['auth-secret']);

    const second = loadConfig({ DATA_DIR: dataDir });
    expect(second.authSecret).toBe(first.authSecret);
    expect(second.authSecretSource).toEqual({ file, created: false });

    // Another installation (another data folder) gets another secret.
    expect(loadConfig({ DATA_DIR: tempDataDir() }).authSecret).not.toBe(first.authSecret);
  });

  it('prefers a configured AUTH_SECRET and then writes no file', () => {
    const dataDir = tempDataDir();
    const config = loadConfig({ DATA_DIR: dataDir, AUTH_SECRET: 'k'.repeat(48) });
    expect(config.authSecret).toBe('k'.repeat(48));
    expect(config.authSecretSource).toBe('environment');
    expect(fs.readdirSync(dataDir)).toEqual([]);
  });

  it('narrows a secret file someone made world-readable back to 0600, and refuses a file too short to be a secret', () => {
    const dataDir = tempDataDir();
    const file = path.join(dataDir, 'auth-secret');
    fs.writeFileSync(file, `${'a'.repeat(64)}\n`, { mode: 0o644 });
    fs.chmodSync(file, 0o644);
    expect(loadConfig({ DATA_DIR: dataDir }).authSecret).toBe('a'.repeat(64));
    expect(fs.statSync(file).mode & 0o777).toBe(0o600);

    fs.writeFileSync(file, 'short\n');
    expect(() => loadConfig({ DATA_DIR: dataDir })).toThrow(/AUTH_SECRET: not set, and .*auth-secret holds no usable secret/);
  });

  it('has timeouts that end slow clients, and refuses a header timeout longer than the request timeout', () => {
    // Defaults: apps/api/src/config.ts (headers 10 s, whole request 120 s, idle keep-alive 65 s, no traffic 60 s).
    expect(loadConfig({ AUTH_SECRET: SECRET }).http).toEqual({ headersTimeoutMs: 10_000, requestTimeoutMs: 120_000, keepAliveTimeoutMs: 65_000, idleTimeoutMs: 60_000 });
    expect(loadConfig({ AUTH_SECRET: SECRET, HTTP_REQUEST_TIMEOUT_S: '300', HTTP_HEADERS_TIMEOUT_S: '2.5' }).http).toMatchObject({ headersTimeoutMs: 2500, requestTimeoutMs: 300_000 });
    expect(() => loadConfig({ AUTH_SECRET: SECRET, HTTP_HEADERS_TIMEOUT_S: '30', HTTP_REQUEST_TIMEOUT_S: '20' })).toThrow(/HTTP_HEADERS_TIMEOUT_S: 30 s is longer than HTTP_REQUEST_TIMEOUT_S \(20 s\)/);
    expect(() => loadConfig({ AUTH_SECRET: SECRET, HTTP_IDLE_TIMEOUT_S: '0' })).toThrow(/HTTP_IDLE_TIMEOUT_S/);
  });
});
