// The verdict of the hit the live input stored last, held outside React Query so the verdict words
// can be painted in the frame after the POST answer arrives, before (and independent of) the Tap
// page's re-render, the refetches and the FRF plot's redraw (docs/decisions/live-capture.md).
// Listeners are told synchronously, so a flushSync around showFreshHit commits only the
// components that read it.
import { useSyncExternalStore } from 'react';
import type { HitSummary } from '../hits-data.ts';

let latest: { entryId: string; hit: HitSummary } | null = null;
const listeners = new Set<() => void>();

export function showFreshHit(entryId: string, hit: HitSummary) {
  latest = { entryId, hit };
  for (const l of listeners) l();
}

function subscribe(listener: () => void) {
  listeners.add(listener);
  return () => void listeners.delete(listener);
}

/** The last live hit at this entry while the page's own list of hits does not hold it yet; else null. */
export function freshHitAhead(entryId: string, known: readonly { id: string }[], fresh = latest): HitSummary | null {
  if (!fresh || fresh.entryId !== entryId) return null;
  return known.some((h) => h.id === fresh.hit.id) ? null : fresh.hit;
}

export function useFreshHitAhead(entryId: string, known: readonly { id: string }[]): HitSummary | null {
  const fresh = useSyncExternalStore(subscribe, () => latest);
  return freshHitAhead(entryId, known, fresh);
}
