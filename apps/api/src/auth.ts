// Sign-in for Resonote: better-auth with its Drizzle adapter, e-mail and password, cookie
// sessions. The first account on an empty instance becomes admin.
import { betterAuth } from 'better-auth';
import { drizzleAdapter } from 'better-auth/adapters/drizzle';
import { sql } from 'drizzle-orm';
import type { Db } from '@resonote/db/client';
import * as schema from '@resonote/db/schema';
import type { Config } from './config.ts';
import type { Mailer } from './mail.ts';
import { isDatabaseUnavailable, type DatabaseStatus } from './db-health.ts';
import { postgresRateLimitStore } from './rate-limit-store.ts';

export const MIN_PASSWORD_LENGTH = 10;
/** Header the API sets from the socket address (never from the client) for rate limiting. */
export const CLIENT_IP_HEADER = 'x-resonote-client-ip';

export function createAuth(db: Db, config: Config, mailer: Mailer, database: DatabaseStatus) {
  return betterAuth({
    appName: 'Resonote',
    baseURL: config.publicUrl,
    basePath: '/api/auth',
    secret: config.authSecret,
    trustedOrigins: config.allowedOrigins,
    telemetry: { enabled: false },
    // An error that is not one of better-auth's own answers (a failed query) leaves its handler
    // and reaches the API's error handler: 503 for a lost database, a logged 500 otherwise.
    onAPIError: { throw: true },
    logger: {
      // A query that failed because the database is unreachable is an outage (noted once and
      // answered 503), not an error to print with its stack for every request.
      log(level, message, ...args) {
        const lost = args.find((a) => isDatabaseUnavailable(a));
        if (lost) return database.noteFailure(lost);
        const line = `[better-auth] ${message}`;
        if (level === 'error') console.error(line, ...args);
        else if (level === 'warn') console.warn(line, ...args);
        else console.log(line, ...args);
      },
    },
    database: drizzleAdapter(db, {
      provider: 'pg',
      schema: { user: schema.user, session: schema.session, account: schema.account, verification: schema.verification },
    }),
    user: {
      additionalFields: {
        role: { type: 'string', required: false, defaultValue: 'member', input: false },
      },
    },
    emailAndPassword: {
      enabled: true,
      minPasswordLength: MIN_PASSWORD_LENGTH,
      maxPasswordLength: 128,
      requireEmailVerification: config.requireEmailVerification,
      revokeSessionsOnPasswordReset: true,
      resetPasswordTokenExpiresIn: 60 * 60,
      async sendResetPassword({ user, url }) {
        await mailer.send({
          to: user.email,
          subject: 'Reset your Resonote password',
          text: `Hello ${user.name},\n\nSomeone asked to reset the password of your Resonote account. To choose a new password, open this link within one hour:\n\n${url}\n\nIf it was not you, ignore this mail; your password stays as it is.\n`,
        });
      },
    },
    emailVerification: {
      sendOnSignUp: true,
      autoSignInAfterVerification: true,
      async sendVerificationEmail({ user, url }) {
        await mailer.send({
          to: user.email,
          subject: 'Confirm your e-mail address for Resonote',
          text: `Hello ${user.name},\n\nConfirm that this is your address by opening:\n\n${url}\n`,
        });
      },
    },
    databaseHooks: {
      user: {
        create: {
          // The first account on an empty instance becomes its admin; everyone else is a member.
          async before(data) {
            const [row] = await db.select({ n: sql<number>`count(*)::int` }).from(schema.user);
            return { data: { ...data, role: (row?.n ?? 0) === 0 ? 'admin' : 'member' } };
          },
        },
      },
    },
    rateLimit: {
      enabled: true,
      customStorage: postgresRateLimitStore(db),
      window: config.authRateLimit.windowS,
      max: config.authRateLimit.ipMax * 2,
      // Per client IP; the stricter count per e-mail address is kept in auth-handler.ts.
      customRules: {
        '/sign-in/email': { window: config.authRateLimit.windowS, max: config.authRateLimit.ipMax },
        '/sign-up/email': { window: config.authRateLimit.windowS, max: config.authRateLimit.ipMax },
        '/request-password-reset': { window: config.authRateLimit.windowS, max: config.authRateLimit.ipMax },
        '/reset-password': { window: config.authRateLimit.windowS, max: config.authRateLimit.ipMax },
        '/get-session': false,
      },
    },
    advanced: {
      ipAddress: { ipAddressHeaders: [CLIENT_IP_HEADER] },
      disableOriginCheck: false,
      useSecureCookies: config.publicUrl.startsWith('https://'),
    },
  });
}

export type Auth = ReturnType<typeof createAuth>;
