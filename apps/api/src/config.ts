// The API's whole configuration: one zod schema over the environment, with defaults so a local
// run needs no settings. Nothing else in the API reads process.env.
import { z } from 'zod';

const bool = z
  .enum(['true', 'false', '1', '0'])
  .transform((v) => v === 'true' || v === '1');

const envSchema = z.object({
  NODE_ENV: z.enum(['development', 'production', 'test']).default('development'),
  HOST: z.string().default('127.0.0.1'),
  PORT: z.coerce.number().int().min(0).max(65535).default(3000),
  PUBLIC_URL: z.url().optional(),
  DATABASE_URL: z.string().startsWith('postgres').default('postgres://postgres@127.0.0.1:54329/resonote'),
  AUTH_SECRET: z.string().min(32, 'AUTH_SECRET must be at least 32 characters').optional(),
  REQUIRE_EMAIL_VERIFICATION: bool.default(false),
  AUTH_RATE_LIMIT_MAX: z.coerce.number().int().positive().default(10),
  AUTH_RATE_LIMIT_WINDOW_S: z.coerce.number().int().positive().default(60),
  SMTP_URL: z.string().optional(),
  SMTP_CAPTURE_PORT: z.coerce.number().int().min(0).max(65535).default(2525),
  MAIL_FROM: z.string().default('Resonote <no-reply@resonote.local>'),
  JSON_BODY_LIMIT: z.string().default('1mb'),
  UPLOAD_LIMIT_MB: z.coerce.number().positive().default(64),
  EXPORT_JSON_RAW_MAX_VALUES: z.coerce.number().int().positive().default(8_000_000),
  LOG_REQUESTS: bool.default(true),
  WEB_DIST: z.string().optional(),
  JOBS_IN_PROCESS: bool.default(true),
  JOB_LEASE_S: z.coerce.number().min(1).max(600).default(30),
  JOB_MAX_RUNTIME_S: z.coerce.number().int().min(10).max(86_400).default(3600),
  JOB_POLL_S: z.coerce.number().min(0.5).max(60).default(1),
  JOB_RETRY_LIMIT: z.coerce.number().int().min(0).max(20).default(3),
  REPROCESS_CHUNK: z.coerce.number().int().min(1).max(500).default(10),
});

export interface Config {
  env: 'development' | 'production' | 'test';
  host: string;
  port: number;
  publicUrl: string;
  databaseUrl: string;
  authSecret: string;
  requireEmailVerification: boolean;
  authRateLimit: { max: number; windowS: number };
  smtpUrl?: string;
  smtpCapturePort: number;
  mailFrom: string;
  jsonBodyLimit: string;
  uploadLimitBytes: number;
  /** Most raw sample values the JSON hand-over bundle carries (the zip streams any size). */
  exportJsonRawMaxValues: number;
  logRequests: boolean;
  webDist?: string;
  /**
   * Background jobs (pg-boss): whether the API process also works jobs (true for a single-process
   * run and the tests; false for API replicas with `npm run worker` processes beside them), the
   * lease a worker renews on the job it works (another takes it over once it runs out), the longest
   * one attempt may run, how often idle workers poll, how often a job is retried, and how many
   * DOFs one part of a campaign reprocess holds.
   */
  jobs: { inProcess: boolean; leaseS: number; maxRuntimeS: number; pollS: number; retryLimit: number; reprocessChunk: number };
}

/** A fixed secret for local runs only; production must set AUTH_SECRET (checked below). */
const DEV_SECRET = 'resonote-local-development-secret-not-for-production';

export class ConfigError extends Error {}

export function loadConfig(env: Record<string, string | undefined>): Config {
  const parsed = envSchema.safeParse(env);
  if (!parsed.success) {
    const lines = parsed.error.issues.map((i) => `  ${i.path.join('.')}: ${i.message}`);
    throw new ConfigError(`invalid configuration:\n${lines.join('\n')}`);
  }
  const e = parsed.data;
  if (e.NODE_ENV === 'production' && !e.AUTH_SECRET) throw new ConfigError('invalid configuration:\n  AUTH_SECRET: required in production');
  if (e.NODE_ENV === 'production' && !e.SMTP_URL) throw new ConfigError('invalid configuration:\n  SMTP_URL: required in production (the local SMTP fake is for development and test)');
  return {
    env: e.NODE_ENV,
    host: e.HOST,
    port: e.PORT,
    publicUrl: (e.PUBLIC_URL ?? `http://${e.HOST}:${e.PORT}`).replace(/\/$/, ''),
    databaseUrl: e.DATABASE_URL,
    authSecret: e.AUTH_SECRET ?? DEV_SECRET,
    requireEmailVerification: e.REQUIRE_EMAIL_VERIFICATION,
    authRateLimit: { max: e.AUTH_RATE_LIMIT_MAX, windowS: e.AUTH_RATE_LIMIT_WINDOW_S },
    smtpUrl: e.SMTP_URL,
    smtpCapturePort: e.SMTP_CAPTURE_PORT,
    mailFrom: e.MAIL_FROM,
    jsonBodyLimit: e.JSON_BODY_LIMIT,
    uploadLimitBytes: Math.round(e.UPLOAD_LIMIT_MB * 1024 * 1024),
    exportJsonRawMaxValues: e.EXPORT_JSON_RAW_MAX_VALUES,
    logRequests: e.LOG_REQUESTS,
    webDist: e.WEB_DIST,
    jobs: { inProcess: e.JOBS_IN_PROCESS, leaseS: e.JOB_LEASE_S, maxRuntimeS: e.JOB_MAX_RUNTIME_S, pollS: e.JOB_POLL_S, retryLimit: e.JOB_RETRY_LIMIT, reprocessChunk: e.REPROCESS_CHUNK },
  };
}
