// An archived campaign is read-only: every route that writes to it refuses with
// 409 `campaign-archived` before its body is read. The guard runs after the role check (so a caller
// without the role still gets 403/404, and an outsider learns nothing), on every campaign route
// whose method is not GET unless the route declares `whileArchived: 'allowed'` (un-archive,
// delete, and the few POSTs that only read: the hand-over mail, report and backup jobs).
import type { RequestHandler } from 'express';
import { eq } from 'drizzle-orm';
import { campaignArchive } from '@resonote/db/schema';
import type { Db } from '@resonote/db/client';
import type { Tx } from './audit.ts';
import { HttpError } from '../errors.ts';

export async function archivedAt(db: Db | Tx, campaignId: string): Promise<Date | null> {
  const [row] = await db.select({ at: campaignArchive.archivedAt }).from(campaignArchive).where(eq(campaignArchive.campaignId, campaignId));
  return row?.at ?? null;
}

export const campaignArchivedError = (at: Date) =>
  new HttpError(409, 'campaign-archived', `This campaign was archived on ${at.toISOString().slice(0, 10)} and is read-only. A lead can un-archive it on the Plan tab to change it again.`, { archivedAt: at.toISOString() });

/** Throws 409 `campaign-archived` when the campaign is archived (for routes that decide by their body). */
export async function assertNotArchived(db: Db | Tx, campaignId: string): Promise<void> {
  const at = await archivedAt(db, campaignId);
  if (at) throw campaignArchivedError(at);
}

/** Middleware: refuses a write to an archived campaign. Needs `req.campaignAccess` (runs after the role guard). */
export function refuseWhenArchived(db: Db): RequestHandler {
  return async (req, _res, next) => {
    try {
      const campaignId = req.campaignAccess?.campaignId;
      if (campaignId) await assertNotArchived(db, campaignId);
      next();
    } catch (err) {
      next(err);
    }
  };
}
