// The answer after a hit or a verdict: the hits, the entry's new status, the FRF of its main
// channel and the entry to measure next; the campaign hears about the change.
import type { Db } from '@resonote/db/client';
import type { CampaignEvents } from './events.ts';
import type { CurrentSettings } from './current-settings.ts';
import { flagReasonsOf } from './entry-flags.ts';
import { mainChannel } from './entry-result.ts';
import { frfJson, type FrfKind } from './frf-json.ts';
import { hitSummary } from './hit-view.ts';
import type { HitRow, Skipped } from './intake.ts';
import type { ScheduleEntry } from './schedule-entry.ts';
import { nextEntry, refreshEntryStatus } from './schedule-status.ts';

export interface HitChange {
  campaignId: string;
  entry: ScheduleEntry;
  stored: HitRow[];
  replayed: boolean;
  skipped: Skipped[];
  settings: CurrentSettings;
  kind: FrfKind;
  type: 'hit' | 'verdict';
}

export async function answerHitChange(db: Db, events: CampaignEvents, c: HitChange) {
  const after = await refreshEntryStatus(db, c.campaignId, c.entry, c.settings);
  events.publish(c.campaignId, { type: c.type, entryId: c.entry.id, hits: c.stored.map((h) => `${h.id}:${h.version}`) });
  return {
    replayed: c.replayed,
    hits: c.stored.map((h) => hitSummary(h)),
    skipped: c.skipped,
    entry: { id: c.entry.id, status: after.status, acceptedHits: after.accepted, totalHits: after.total, flagReasons: flagReasonsOf({ ...c.entry, status: after.status }, after.accepted, after.result, c.settings) },
    // The channel that measures this entry's own DOF; GET …/frf has every channel.
    frf: after.result ? frfJson(after.result, c.kind, c.settings.settings.bandHz, mainChannel(after.result.channels, c.entry.responseDof)) : null,
    next: await nextEntry(db, c.campaignId),
  };
}
