// Health, the signed-in user, the public settings the browser may see, and the admin's mail box.
import { Router } from 'express';
import { count, desc, eq, sql } from 'drizzle-orm';
import { capturedMail, campaignMember } from '@resonote/db/schema';
import type { Db } from '@resonote/db/client';
import type { Config } from '../config.ts';
import { requireAdmin, requireUser } from '../context.ts';
import { MIN_PASSWORD_LENGTH } from '../auth.ts';

export function systemRoutes(db: Db, config: Config): Router {
  const router = Router();

  router.get('/health', async (_req, res) => {
    const started = Date.now();
    try {
      await db.execute(sql`SELECT 1`);
      res.json({ status: 'ok', database: { status: 'up', latencyMs: Date.now() - started } });
    } catch (err) {
      res.status(503).json({ status: 'degraded', database: { status: 'down', message: (err as Error).message } });
    }
  });

  // What the browser may know of the configuration: an explicit allow-list.
  router.get('/public-settings', (_req, res) => {
    res.json({
      appName: 'Resonote',
      requireEmailVerification: config.requireEmailVerification,
      minPasswordLength: MIN_PASSWORD_LENGTH,
      mailCapture: !config.smtpUrl,
    });
  });

  router.get('/me', requireUser, async (req, res) => {
    const user = req.user!;
    const [row] = await db.select({ n: count() }).from(campaignMember).where(eq(campaignMember.userId, user.id));
    res.json({ user, campaignCount: row?.n ?? 0 });
  });

  router.get('/admin/mail', requireAdmin, async (_req, res) => {
    const rows = await db.select().from(capturedMail).orderBy(desc(capturedMail.receivedAt)).limit(200);
    res.json({ mail: rows, capturing: !config.smtpUrl });
  });

  return router;
}
