// The FRFs a fit takes when the lead picks none: contracts' defaultFitSelection over the campaign's
// schedule (the current plan's entries with accepted hits, flagged ones left out).
import { eq } from 'drizzle-orm';
import { defaultFitSelection, type FitSelection } from '@resonote/contracts';
import { campaign } from '@resonote/db/schema';
import type { Db } from '@resonote/db/client';
import { listScheduleEntries } from '../plan/schedule-list.ts';

export async function defaultFitEntries(db: Db, campaignId: string): Promise<FitSelection> {
  const [c] = await db.select({ testType: campaign.testType, referenceDofs: campaign.referenceDofs }).from(campaign).where(eq(campaign.id, campaignId));
  const entries = await listScheduleEntries(db, campaignId);
  return defaultFitSelection(entries, { testType: c!.testType, referenceDofs: c!.referenceDofs });
}
