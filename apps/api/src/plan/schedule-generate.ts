// Builds or updates a campaign's schedule inside a transaction: used by "generate" on the schedule
// and by accepting a model-based plan (routes/fe-models.ts).
import { and, eq, inArray, isNull, sql } from 'drizzle-orm';
import type { Direction } from '@resonote/contracts';
import { acquisitionSettings, campaign, hit, point, scheduleEntry, scheduleExtra } from '@resonote/db/schema';
import { audit, type Tx } from '../http/audit.ts';
import { HttpError, notFound } from '../errors.ts';
import { pairKey, planSchedule } from './schedule-plan.ts';

export interface GenerateSummary {
  added: number;
  removed: number;
  kept: number;
}

/**
 * Plans the schedule from the test type, the reference DOFs and the points' directions. Keeps existing
 * entries, adds the missing ones at the end, removes planned entries that no longer apply and have no
 * hits; audits the change. Locks the campaign row.
 */
export async function generateSchedule(tx: Tx, campaignId: string, actorId: string, requiredHitsWanted?: number): Promise<GenerateSummary> {
  const [c] = await tx.select().from(campaign).where(eq(campaign.id, campaignId)).for('update');
  if (!c) throw notFound('That campaign');
  const points = await tx.select({ id: point.id, label: point.label, directions: point.directions }).from(point).where(and(eq(point.campaignId, c.id), isNull(point.retiredAt)));
  const plan = planSchedule(c.testType, c.referenceDofs, points.map((p) => ({ ...p, directions: p.directions as Direction[] })));
  if (!plan.ok) throw new HttpError(400, 'cannot-plan', plan.message);
  const [settings] = await tx.select({ settings: acquisitionSettings.settings }).from(acquisitionSettings).where(eq(acquisitionSettings.campaignId, c.id)).orderBy(sql`${acquisitionSettings.version} DESC`).limit(1);
  const requiredHits = requiredHitsWanted ?? (settings?.settings as { hitsToAverage?: number } | undefined)?.hitsToAverage ?? 5;
  const existing = await tx.select().from(scheduleEntry).where(eq(scheduleEntry.campaignId, c.id));
  const wanted = new Set(plan.pairs.map(pairKey));
  const have = new Map(existing.map((e) => [pairKey(e), e]));
  // Entries a lead added beside the plan (a reciprocal pair) are kept while their points exist.
  const extras = new Set((await tx.select({ id: scheduleExtra.entryId }).from(scheduleExtra).innerJoin(scheduleEntry, eq(scheduleEntry.id, scheduleExtra.entryId)).where(eq(scheduleEntry.campaignId, c.id))).map((r) => r.id));
  const stale = existing.filter((e) => !wanted.has(pairKey(e)) && !extras.has(e.id));
  let removed = 0;
  if (stale.length) {
    const withHits = new Set(
      (await tx.selectDistinct({ id: hit.scheduleEntryId }).from(hit).where(inArray(hit.scheduleEntryId, stale.map((s) => s.id)))).map((r) => r.id),
    );
    const removable = stale.filter((s) => s.status === 'planned' && !withHits.has(s.id)).map((s) => s.id);
    if (removable.length) {
      await tx.delete(scheduleEntry).where(inArray(scheduleEntry.id, removable));
      removed = removable.length;
    }
  }
  let position = existing.reduce((m, e) => Math.max(m, e.position), 0);
  const toAdd = plan.pairs.filter((p) => !have.has(pairKey(p))).map((p) => ({ ...p, campaignId: c.id, position: ++position, requiredHits }));
  for (let i = 0; i < toAdd.length; i += 1000) await tx.insert(scheduleEntry).values(toAdd.slice(i, i + 1000));
  const result = { added: toAdd.length, removed, kept: existing.length - removed };
  await audit(tx, { campaignId: c.id, actorId, entity: 'schedule', entityId: c.id, action: 'generate', after: { ...result, testType: c.testType, referenceDofs: c.referenceDofs, requiredHits } });
  return result;
}
