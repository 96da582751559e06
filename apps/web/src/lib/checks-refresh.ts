// Which campaign notices can change the reciprocity and linearity checks (GET …/checks), so an open
// Review asks for them again only then, not after every hit. The checks of an entry are its
// linearity line (at least 4 accepted hits; apps/api/src/hits/checks.ts `entryLinearity`) and its
// reciprocity line with its reciprocal entry (both with a result; hits/campaign-checks.ts). A hit
// or a verdict at an entry changes them only when the entry's accepted hits changed and the entry
// has, or had, one of those lines. Anything else (a schedule change, a finished job, a resync after
// a lost connection) may change them all.
import type { QueryClient } from '@tanstack/react-query';
import { isReciprocal } from '@resonote/contracts';
import type { ScheduleEntry } from './campaign-data.ts';

/** A change notice as GET …/events sends it (apps/api/src/hits/events.ts `CampaignEvent`). */
export interface CampaignNotice {
  type: 'hit' | 'verdict' | 'schedule' | 'arming' | 'job';
  entryId?: string;
  hits?: string[];
  resync?: true;
}

export function readNotice(data: string): CampaignNotice | null {
  try {
    const e = JSON.parse(data) as CampaignNotice;
    return e && typeof e.type === 'string' ? e : null;
  } catch {
    return null;
  }
}

type Counts = ReadonlyMap<string, number>;

/** True when the entry has, in this schedule, a line in the checks (or could have, for linearity). */
function inChecks(entries: readonly ScheduleEntry[], accepted: Counts, entryId: string): boolean {
  const entry = entries.find((e) => e.id === entryId);
  if (!entry) return true; // not in the schedule we know: assume it counts
  const own = accepted.get(entryId) ?? 0;
  if (own >= 4) return true;
  return own > 0 && entries.some((e) => e.id !== entryId && (accepted.get(e.id) ?? 0) > 0 && isReciprocal(entry, e));
}

/**
 * Whether these notices (one debounce window's) can have changed the checks, given the schedule
 * before and after they were applied (the schedule's accepted-hit counts). `after` undefined: the
 * schedule was not read again, so nothing can be ruled out.
 */
export function checksAffected(notices: readonly CampaignNotice[], before: readonly ScheduleEntry[] | undefined, after: readonly ScheduleEntry[] | undefined): boolean {
  if (!before || !after) return true;
  const countsBefore: Counts = new Map(before.map((e) => [e.id, e.acceptedHits]));
  const countsAfter: Counts = new Map(after.map((e) => [e.id, e.acceptedHits]));
  for (const n of notices) {
    if (n.type === 'arming') continue; // who holds the hammer changes no result
    if (n.resync || !n.entryId || (n.type !== 'hit' && n.type !== 'verdict')) return true;
    if (!countsAfter.has(n.entryId)) return true; // an entry this schedule does not know
    // A hit that was rejected leaves the accepted hits, and so the FRF and the checks, as they were.
    // (A verdict always changes them: in one window a reject and an accept could cancel in the count.)
    if (n.type === 'hit' && countsBefore.get(n.entryId) === countsAfter.get(n.entryId)) continue;
    if (inChecks(before, countsBefore, n.entryId) || inChecks(after, countsAfter, n.entryId)) return true;
  }
  return false;
}

/**
 * Applies one debounce window's notices: `refreshOthers` refreshes everything but the checks (and
 * reads the schedule again when a screen shows it), then the checks are marked stale only when
 * `checksAffected` says they can have changed.
 */
export async function refreshChecksAfter(
  client: QueryClient,
  keys: { schedule: readonly unknown[]; checks: readonly unknown[] },
  notices: readonly CampaignNotice[],
  refreshOthers: () => Promise<void>,
): Promise<void> {
  const before = client.getQueryData<{ entries: ScheduleEntry[] }>(keys.schedule)?.entries;
  await refreshOthers();
  // A schedule nobody watches is only marked stale, not read again: then nothing is known.
  const fresh = client.getQueryState(keys.schedule);
  const after = fresh && !fresh.isInvalidated && fresh.status === 'success' ? client.getQueryData<{ entries: ScheduleEntry[] }>(keys.schedule)?.entries : undefined;
  if (checksAffected(notices, before, after)) await client.invalidateQueries({ queryKey: keys.checks, exact: true });
}
