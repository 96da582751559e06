// The flag reasons of schedule entries (packages/contracts/src/flag-reasons.ts) from their averaged
// results under the current settings, for every answer that carries an entry's status.
import { flagReasons, type FlagReason } from '@resonote/contracts';
import type { Db } from '@resonote/db/client';
import { currentSettings, type CurrentSettings } from './current-settings.ts';
import { entryResult, mainChannel, type EntryResult } from './entry-result.ts';

interface EntryLike {
  id: string;
  status: string;
  requiredHits: number;
  responseDof: string;
}

/** The reasons of one entry from its result (null: no accepted hit can be averaged). */
export function flagReasonsOf(entry: EntryLike, acceptedHits: number, result: EntryResult | null, settings: CurrentSettings): FlagReason[] {
  if (entry.status === 'skipped') return [];
  const main = result ? mainChannel(result.channels, entry.responseDof) : 0;
  return flagReasons({
    f: result?.frf.f ?? [],
    coherence: result ? result.frf.coherence[main]! : null,
    bandHz: settings.settings.bandHz,
    threshold: settings.settings.coherenceThreshold,
    requiredHits: entry.requiredHits,
    acceptedHits,
    averages: result?.averages ?? 0,
  });
}

/** Entries of a schedule list with `flagReasons` added (computed only where the hits are in). */
export async function withFlagReasons<E extends EntryLike & { acceptedHits: number }>(db: Db, campaignId: string, entries: E[]): Promise<(E & { flagReasons: FlagReason[] })[]> {
  const needs = entries.filter((e) => e.status !== 'skipped' && e.status !== 'done' && e.acceptedHits >= e.requiredHits);
  const settings = needs.length ? await currentSettings(db, campaignId) : null;
  const byId = new Map<string, FlagReason[]>();
  for (const e of needs) byId.set(e.id, flagReasonsOf(e, e.acceptedHits, await entryResult(db, campaignId, e.id, settings!), settings!));
  return entries.map((e) => ({ ...e, flagReasons: byId.get(e.id) ?? [] }));
}
