// A person's verdict over a hit's automatic one, either way, with a note: audited, and refused
// with 409 (and the current state) when the hit changed since the caller read it.
import { and, eq } from 'drizzle-orm';
import { uuidSchema } from '@resonote/contracts';
import { hit } from '@resonote/db/schema';
import type { Db } from '@resonote/db/client';
import { audit } from '../http/audit.ts';
import { staleWrite } from '../http/concurrency.ts';
import { notFound } from '../errors.ts';
import { hitColumns, type HitRow } from './intake.ts';

export async function overrideVerdict(db: Db, args: { campaignId: string; hitId: string; userId: string; verdict: 'accept' | 'reject'; note: string; version: number }): Promise<HitRow> {
  if (!uuidSchema.safeParse(args.hitId).success) throw notFound('That hit');
  return db.transaction(async (tx) => {
    const [before] = await tx.select(hitColumns).from(hit).where(and(eq(hit.id, args.hitId), eq(hit.campaignId, args.campaignId))).for('update');
    if (!before) throw notFound('That hit');
    if (before.version !== args.version) throw staleWrite('The hit', before);
    const [after] = await tx
      .update(hit)
      .set({ verdict: args.verdict, overrideNote: args.note, overriddenBy: args.userId, version: before.version + 1 })
      .where(eq(hit.id, before.id))
      .returning(hitColumns);
    await audit(tx, { campaignId: args.campaignId, actorId: args.userId, entity: 'hit', entityId: before.id, action: 'override', before: { verdict: before.verdict, reasons: before.reasons }, after: { verdict: args.verdict, note: args.note } });
    return after!;
  });
}
