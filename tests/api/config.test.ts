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
});
