// The averaged FRFs of several entries at once for overlays: the main channel of each.
import type { Db } from '@resonote/db/client';
import { badRequest } from '../errors.ts';
import { currentSettings } from './current-settings.ts';
import { entryResult, mainChannel } from './entry-result.ts';
import { frfJson, frfUnits, type FrfKind } from './frf-json.ts';
import { loadScheduleEntry } from './schedule-entry.ts';
import { entriesWithAcceptedHits } from './schedule-status.ts';

/** At most this many FRFs in one answer. */
export const MAX_OVERLAY_FRFS = 100;

/** `entryIds` null: every entry with an accepted hit. An unknown entry is 404; an entry without a result is left out. */
export async function frfOverlays(db: Db, campaignId: string, entryIds: string[] | null, kind: FrfKind, wholeBand: boolean) {
  const settings = await currentSettings(db, campaignId);
  const ids = entryIds ?? (await entriesWithAcceptedHits(db, campaignId));
  if (ids.length > MAX_OVERLAY_FRFS) throw badRequest(`At most ${MAX_OVERLAY_FRFS} FRFs at once; ${ids.length} were asked for.`);
  const out = [];
  for (const id of ids) {
    const entry = await loadScheduleEntry(db, campaignId, id);
    const result = await entryResult(db, campaignId, id, settings);
    if (!result) continue;
    const json = frfJson(result, kind, wholeBand ? null : settings.settings.bandHz);
    const main = json.channels[mainChannel(result.channels, entry.responseDof)]!;
    out.push({ entryId: id, responseDof: entry.responseDof, excitationDof: entry.excitationDof, averages: json.averages, f: json.f, h1: main.h1, coherence: main.coherence, meanCoherence: main.meanCoherence });
  }
  return { kind, unit: frfUnits[kind], frfs: out };
}
