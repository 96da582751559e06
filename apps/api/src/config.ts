// The API's whole configuration: one zod schema over the environment, with defaults so a local
// run needs no settings. Nothing else in the API reads process.env.
import { randomBytes } from 'node:crypto';
import fs from 'node:fs';
import net from 'node:net';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { z } from 'zod';

/** The git-ignored folder of local state (`<repo>/.run`); DATA_DIR moves it. */
const defaultDataDir = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '../../../.run');

const bool = z
  .enum(['true', 'false', '1', '0'])
  .transform((v) => v === 'true' || v === '1');

const envSchema = z.object({
  NODE_ENV: z.enum(['development', 'production', 'test']).default('development'),
  HOST: z.string().default('127.0.0.1'),
  PORT: z.coerce.number().int().min(0).max(65535).default(3000),
  PUBLIC_URL: z.url().optional(),
  /** More origins whose cookie-carrying writes are accepted (comma-separated), e.g. the Vite dev server. */
  TRUSTED_ORIGINS: z.string().optional(),
  DATABASE_URL: z.string().startsWith('postgres').default('postgres://postgres@127.0.0.1:54329/resonote'),
  AUTH_SECRET: z.string().min(32, 'AUTH_SECRET must be at least 32 characters').optional(),
  DATA_DIR: z.string().min(1).optional(),
  REQUIRE_EMAIL_VERIFICATION: bool.default(false),
  AUTH_RATE_LIMIT_MAX: z.coerce.number().int().positive().default(10),
  AUTH_RATE_LIMIT_WINDOW_S: z.coerce.number().int().positive().default(60),
  /** Per client IP (several people may share one address behind a NAT); default 5 × AUTH_RATE_LIMIT_MAX. */
  AUTH_RATE_LIMIT_IP_MAX: z.coerce.number().int().positive().optional(),
  SMTP_URL: z.string().optional(),
  SMTP_CAPTURE_PORT: z.coerce.number().int().min(0).max(65535).default(2525),
  MAIL_FROM: z.string().default('Resonote <no-reply@resonote.local>'),
  JSON_BODY_LIMIT: z.string().default('1mb'),
  UPLOAD_LIMIT_MB: z.coerce.number().positive().default(64),
  EXPORT_JSON_RAW_MAX_VALUES: z.coerce.number().int().positive().default(8_000_000),
  LOG_REQUESTS: bool.default(true),
  // Slow clients (issue 13): the whole header block within HTTP_HEADERS_TIMEOUT_S, the whole request
  // (a 64 MB upload included) within HTTP_REQUEST_TIMEOUT_S, an idle keep-alive connection closed
  // after HTTP_KEEP_ALIVE_TIMEOUT_S, a socket with no traffic either way during a request after HTTP_IDLE_TIMEOUT_S.
  HTTP_HEADERS_TIMEOUT_S: z.coerce.number().positive().max(600).default(10),
  HTTP_REQUEST_TIMEOUT_S: z.coerce.number().positive().max(3600).default(120),
  HTTP_KEEP_ALIVE_TIMEOUT_S: z.coerce.number().positive().max(600).default(65),
  HTTP_IDLE_TIMEOUT_S: z.coerce.number().positive().max(3600).default(60),
  WEB_DIST: z.string().optional(),
  JOBS_IN_PROCESS: bool.default(true),
  JOB_LEASE_S: z.coerce.number().min(1).max(600).default(30),
  JOB_MAX_RUNTIME_S: z.coerce.number().int().min(10).max(86_400).default(3600),
  JOB_POLL_S: z.coerce.number().min(0.5).max(60).default(1),
  JOB_RETRY_LIMIT: z.coerce.number().int().min(0).max(20).default(3),
  REPROCESS_CHUNK: z.coerce.number().int().min(1).max(500).default(10),
  /**
   * Which peers may say who the client is (X-Forwarded-For): `false` (default: nobody, the socket
   * address is the client), a hop count, or a comma-separated list of addresses, CIDR ranges or
   * Express's names loopback / linklocal / uniquelocal — e.g. `loopback` for nginx on the same host.
   */
  TRUST_PROXY: z.string().default('false'),
});

export interface Config {
  env: 'development' | 'production' | 'test';
  host: string;
  port: number;
  publicUrl: string;
  /**
   * Origins whose cookie-carrying writes are accepted (apps/api/src/http/same-origin.ts and
   * better-auth's trusted origins): the public URL's origin; outside production its
   * 127.0.0.1/localhost twin too; then TRUSTED_ORIGINS.
   */
  allowedOrigins: string[];
  databaseUrl: string;
  authSecret: string;
  /** Where the signing secret came from: the environment, or the file generated at first start. */
  authSecretSource: 'environment' | { file: string; created: boolean };
  /** Local state kept between restarts (the generated signing secret). */
  dataDir: string;
  requireEmailVerification: boolean;
  /** Sign-in, sign-up and reset attempts per window: `max` per e-mail address, `ipMax` per client IP. */
  authRateLimit: { max: number; windowS: number; ipMax: number };
  smtpUrl?: string;
  smtpCapturePort: number;
  mailFrom: string;
  jsonBodyLimit: string;
  uploadLimitBytes: number;
  /** Most raw sample values the JSON hand-over bundle carries (the zip streams any size). */
  exportJsonRawMaxValues: number;
  logRequests: boolean;
  webDist?: string;
  /** Timeouts of the HTTP server, ms (apps/api/src/http/listen.ts). */
  http: { headersTimeoutMs: number; requestTimeoutMs: number; keepAliveTimeoutMs: number; idleTimeoutMs: number };
  /**
   * Background jobs (pg-boss): whether the API process also works jobs (true for a single-process
   * run and the tests; false for API replicas with `npm run worker` processes beside them), the
   * lease a worker renews on the job it works (another takes it over once it runs out), the longest
   * one attempt may run, how often idle workers poll, how often a job is retried, and how many
   * DOFs one part of a campaign reprocess holds.
   */
  jobs: { inProcess: boolean; leaseS: number; maxRuntimeS: number; pollS: number; retryLimit: number; reprocessChunk: number };
  /**
   * Express's `trust proxy`: false (the socket address is the client), a number of proxy hops, or
   * the addresses / ranges / names of the proxies whose X-Forwarded-For is believed. Rate limits per
   * client IP, session rows and request log lines use the address it yields (req.ip).
   */
  trustProxy: false | number | string[];
}

export class ConfigError extends Error {}

const SECRET_FILE = 'auth-secret';

/**
 * The signing secret of a run without AUTH_SECRET: read from `<dataDir>/auth-secret`, or made at
 * first start (32 random bytes, hex) and written there with mode 0600, so a restart keeps
 * sessions and report links valid and no two installations share a secret. The file appears
 * whole or not at all (written aside, then hard-linked into place), so two processes starting
 * at once agree on one secret.
 */
function storedSecret(dataDir: string): { secret: string; file: string; created: boolean } {
  const file = path.join(dataDir, SECRET_FILE);
  const read = () => {
    const secret = fs.readFileSync(file, 'utf8').trim();
    if (secret.length < 32) throw new ConfigError(`invalid configuration:\n  AUTH_SECRET: not set, and ${file} holds no usable secret (fewer than 32 characters); delete the file to make a new one, or set AUTH_SECRET`);
    // Keep it private even when someone widened the mode.
    if ((fs.statSync(file).mode & 0o077) !== 0) fs.chmodSync(file, 0o600);
    return secret;
  };
  if (fs.existsSync(file)) return { secret: read(), file, created: false };
  try {
    fs.mkdirSync(dataDir, { recursive: true, mode: 0o700 });
    const aside = `${file}.${process.pid}.${randomBytes(4).toString('hex')}`;
    fs.writeFileSync(aside, `${randomBytes(32).toString('hex')}\n`, { mode: 0o600, flag: 'wx' });
    try {
      fs.linkSync(aside, file);
    } catch (err) {
      if ((err as NodeJS.ErrnoException).code !== 'EEXIST') throw err;
      return { secret: read(), file, created: false };
    } finally {
      fs.rmSync(aside, { force: true });
    }
    return { secret: read(), file, created: true };
  } catch (err) {
    if (err instanceof ConfigError) throw err;
    throw new ConfigError(`invalid configuration:\n  AUTH_SECRET: not set, and the generated secret cannot be kept in ${file} (${(err as Error).message}); set AUTH_SECRET or DATA_DIR`);
  }
}

/**
 * The public origin, and outside production its loopback twin: `npm start` serves
 * http://127.0.0.1:PORT, and a browser pointed at http://localhost:PORT sends that Origin instead.
 * Both names reach the same loopback listener only on this machine, so the twin opens nothing to
 * other sites.
 */
function originsFor(publicUrl: string, env: string, extra: string | undefined): string[] {
  const url = new URL(publicUrl);
  const origins = [url.origin];
  if (env !== 'production' && (url.hostname === '127.0.0.1' || url.hostname === 'localhost')) {
    const twin = new URL(url.origin);
    twin.hostname = url.hostname === 'localhost' ? '127.0.0.1' : 'localhost';
    origins.push(twin.origin);
  }
  for (const raw of (extra ?? '').split(',').map((o) => o.trim()).filter(Boolean)) {
    let origin: string;
    try {
      origin = new URL(raw).origin;
    } catch {
      throw new ConfigError(`invalid configuration:\n  TRUSTED_ORIGINS: "${raw}" is not an origin such as http://127.0.0.1:5173`);
    }
    if (origin === 'null') throw new ConfigError(`invalid configuration:\n  TRUSTED_ORIGINS: "${raw}" is not an http(s) origin`);
    if (!origins.includes(origin)) origins.push(origin);
  }
  return origins;
}

const PROXY_NAMES = new Set(['loopback', 'linklocal', 'uniquelocal']);

/** TRUST_PROXY → Express's `trust proxy` value; `true` (believe any peer) is refused, it lets every client pick its own address. */
function trustProxyOf(raw: string): Config['trustProxy'] {
  const value = raw.trim();
  if (value === 'false' || value === '0' || value === '') return false;
  if (/^\d+$/.test(value)) {
    const hops = Number(value);
    if (hops > 10) throw new ConfigError(`invalid configuration:\n  TRUST_PROXY: ${hops} hops is more proxies than any deployment has (at most 10)`);
    return hops;
  }
  if (value === 'true') throw new ConfigError('invalid configuration:\n  TRUST_PROXY: "true" would believe an X-Forwarded-For from any client; name the proxies instead (e.g. loopback, or 10.0.0.0/8)');
  const entries = value.split(',').map((v) => v.trim()).filter(Boolean);
  for (const entry of entries) {
    const [address, bits, extra] = entry.split('/');
    const ok =
      extra === undefined &&
      (PROXY_NAMES.has(entry) ||
        (net.isIP(address!) !== 0 && (bits === undefined || (/^\d+$/.test(bits) && Number(bits) <= (net.isIP(address!) === 4 ? 32 : 128)))));
    if (!ok) throw new ConfigError(`invalid configuration:\n  TRUST_PROXY: "${entry}" is not an address, a CIDR range (10.0.0.0/8) or one of loopback, linklocal, uniquelocal`);
  }
  return entries;
}

export function loadConfig(env: Record<string, string | undefined>): Config {
  const parsed = envSchema.safeParse(env);
  if (!parsed.success) {
    const lines = parsed.error.issues.map((i) => `  ${i.path.join('.')}: ${i.message}`);
    throw new ConfigError(`invalid configuration:\n${lines.join('\n')}`);
  }
  const e = parsed.data;
  if (e.NODE_ENV === 'production' && !e.AUTH_SECRET) throw new ConfigError('invalid configuration:\n  AUTH_SECRET: required in production (32+ random characters, e.g. `openssl rand -hex 32`)');
  if (e.HTTP_HEADERS_TIMEOUT_S > e.HTTP_REQUEST_TIMEOUT_S) throw new ConfigError(`invalid configuration:\n  HTTP_HEADERS_TIMEOUT_S: ${e.HTTP_HEADERS_TIMEOUT_S} s is longer than HTTP_REQUEST_TIMEOUT_S (${e.HTTP_REQUEST_TIMEOUT_S} s); the headers are part of the request`);
  if (e.NODE_ENV === 'production' && !e.SMTP_URL) throw new ConfigError('invalid configuration:\n  SMTP_URL: required in production (the local SMTP fake is for development and test)');
  const dataDir = path.resolve(e.DATA_DIR ?? defaultDataDir);
  const stored = e.AUTH_SECRET ? null : storedSecret(dataDir);
  const publicUrl = (e.PUBLIC_URL ?? `http://${e.HOST}:${e.PORT}`).replace(/\/$/, '');
  return {
    env: e.NODE_ENV,
    host: e.HOST,
    port: e.PORT,
    publicUrl,
    allowedOrigins: originsFor(publicUrl, e.NODE_ENV, e.TRUSTED_ORIGINS),
    databaseUrl: e.DATABASE_URL,
    authSecret: e.AUTH_SECRET ?? stored!.secret,
    authSecretSource: stored ? { file: stored.file, created: stored.created } : 'environment',
    dataDir,
    requireEmailVerification: e.REQUIRE_EMAIL_VERIFICATION,
    authRateLimit: { max: e.AUTH_RATE_LIMIT_MAX, windowS: e.AUTH_RATE_LIMIT_WINDOW_S, ipMax: e.AUTH_RATE_LIMIT_IP_MAX ?? 5 * e.AUTH_RATE_LIMIT_MAX },
    smtpUrl: e.SMTP_URL,
    smtpCapturePort: e.SMTP_CAPTURE_PORT,
    mailFrom: e.MAIL_FROM,
    jsonBodyLimit: e.JSON_BODY_LIMIT,
    uploadLimitBytes: Math.round(e.UPLOAD_LIMIT_MB * 1024 * 1024),
    exportJsonRawMaxValues: e.EXPORT_JSON_RAW_MAX_VALUES,
    logRequests: e.LOG_REQUESTS,
    webDist: e.WEB_DIST,
    http: {
      headersTimeoutMs: Math.round(e.HTTP_HEADERS_TIMEOUT_S * 1000),
      requestTimeoutMs: Math.round(e.HTTP_REQUEST_TIMEOUT_S * 1000),
      keepAliveTimeoutMs: Math.round(e.HTTP_KEEP_ALIVE_TIMEOUT_S * 1000),
      idleTimeoutMs: Math.round(e.HTTP_IDLE_TIMEOUT_S * 1000),
    },
    jobs: { inProcess: e.JOBS_IN_PROCESS, leaseS: e.JOB_LEASE_S, maxRuntimeS: e.JOB_MAX_RUNTIME_S, pollS: e.JOB_POLL_S, retryLimit: e.JOB_RETRY_LIMIT, reprocessChunk: e.REPROCESS_CHUNK },
    trustProxy: trustProxyOf(e.TRUST_PROXY),
  };
}
