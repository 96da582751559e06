// The API's configuration: defaults for a local run, and a message naming the bad variable.
import { describe, expect, it } from 'vitest';
import { loadConfig } from '@resonote/api/config';

describe('configuration', () => {
  it('needs no settings for a local run', () => {
    const config = loadConfig({});
    expect(config.port).toBe(3000);
    expect(config.publicUrl).toBe('http://127.0.0.1:3000');
    expect(config.databaseUrl).toMatch(/^postgres:\/\/.*:54329\/resonote$/);
  });

  it('names the variable that is wrong', () => {
    expect(() => loadConfig({ PORT: 'eighty' })).toThrow(/PORT/);
    expect(() => loadConfig({ AUTH_SECRET: 'short' })).toThrow(/AUTH_SECRET must be at least 32 characters/);
  });

  it('refuses production without a secret or a real mail server', () => {
    expect(() => loadConfig({ NODE_ENV: 'production' })).toThrow(/AUTH_SECRET: required in production/);
    expect(() => loadConfig({ NODE_ENV: 'production', AUTH_SECRET: 'x'.repeat(40) })).toThrow(/SMTP_URL/);
  });

  it('has timeouts that end slow clients, and refuses a header timeout longer than the request timeout', () => {
    // Defaults: apps/api/src/config.ts (headers 10 s, whole request 120 s, idle keep-alive 65 s, no traffic 60 s).
    expect(loadConfig({}).http).toEqual({ headersTimeoutMs: 10_000, requestTimeoutMs: 120_000, keepAliveTimeoutMs: 65_000, idleTimeoutMs: 60_000 });
    expect(loadConfig({ HTTP_REQUEST_TIMEOUT_S: '300', HTTP_HEADERS_TIMEOUT_S: '2.5' }).http).toMatchObject({ headersTimeoutMs: 2500, requestTimeoutMs: 300_000 });
    expect(() => loadConfig({ HTTP_HEADERS_TIMEOUT_S: '30', HTTP_REQUEST_TIMEOUT_S: '20' })).toThrow(/HTTP_HEADERS_TIMEOUT_S: 30 s is longer than HTTP_REQUEST_TIMEOUT_S \(20 s\)/);
    expect(() => loadConfig({ HTTP_IDLE_TIMEOUT_S: '0' })).toThrow(/HTTP_IDLE_TIMEOUT_S/);
  });
});
