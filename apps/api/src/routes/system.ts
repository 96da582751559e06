// Health, the signed-in user, the public settings the browser may see, the admin's mail box, and
// the API reference.
import { count, desc, eq, sql } from 'drizzle-orm';
import { capturedMail, campaignMember } from '@resonote/db/schema';
import type { Deps } from './deps.ts';
import { MIN_PASSWORD_LENGTH } from '../auth.ts';
import { apiReferenceHtml, openApiDocument } from '../http/openapi.ts';
import { isDatabaseUnavailable, RETRY_AFTER_S } from '../db-health.ts';

export function registerSystemRoutes({ routes, db, config, databaseStatus }: Deps): void {
  routes.add({
    method: 'get',
    path: '/health',
    tag: 'System',
    access: 'public',
    summary: 'Health of the server and its database',
    returns: "{ status: 'ok', database: { status: 'up', latencyMs } }; while the database is unreachable 503 with Retry-After and { status: 'degraded', database: { status: 'unreachable', since } }",
    handler: async ({ res }) => {
      const started = Date.now();
      try {
        await db.execute(sql`SELECT 1`);
        databaseStatus.noteSuccess();
        return { status: 'ok', database: { status: 'up', latencyMs: Date.now() - started } };
      } catch (err) {
        if (!isDatabaseUnavailable(err)) throw err;
        databaseStatus.noteFailure(err);
        const state = databaseStatus.state();
        res.setHeader('retry-after', String(RETRY_AFTER_S));
        // The cause stays in the server's log: this route is public and need not name hosts or ports.
        res.status(503).json({ status: 'degraded', database: { status: 'unreachable', since: state.since } });
      }
    },
  });

  // What the browser may know of the configuration: an explicit allow-list.
  routes.add({
    method: 'get',
    path: '/public-settings',
    tag: 'System',
    access: 'public',
    summary: 'Settings the sign-up page needs',
    handler: () => ({ appName: 'Resonote', requireEmailVerification: config.requireEmailVerification, minPasswordLength: MIN_PASSWORD_LENGTH, mailCapture: !config.smtpUrl }),
  });

  routes.add({
    method: 'get',
    path: '/me',
    tag: 'System',
    access: 'user',
    summary: 'The signed-in person, their instance role and how many campaigns they belong to',
    handler: async ({ user }) => {
      const [row] = await db.select({ n: count() }).from(campaignMember).where(eq(campaignMember.userId, user.id));
      return { user, campaignCount: row?.n ?? 0 };
    },
  });

  routes.add({
    method: 'get',
    path: '/admin/mail',
    tag: 'System',
    access: 'admin',
    summary: 'Mail captured by the local SMTP fake, newest first (200 at most)',
    handler: async () => {
      const rows = await db.select().from(capturedMail).orderBy(desc(capturedMail.receivedAt)).limit(200);
      return { mail: rows, capturing: !config.smtpUrl };
    },
  });

  routes.add({
    method: 'get',
    path: '/openapi.json',
    tag: 'System',
    access: 'public',
    summary: 'This API as an OpenAPI 3.1 document',
    handler: () => openApiDocument(routes.registry, config.publicUrl),
  });

  routes.add({
    method: 'get',
    path: '/docs',
    tag: 'System',
    access: 'public',
    summary: 'Readable API reference',
    produces: 'text/html',
    handler: ({ res }) => {
      res.type('html').send(apiReferenceHtml(routes.registry));
    },
  });
}
