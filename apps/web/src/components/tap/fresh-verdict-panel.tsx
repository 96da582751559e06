// Tap's verdict panel, showing a live hit's verdict as soon as its POST answer is in
// (lib/live/fresh-verdict.ts) while the rest of the page catches up a frame later. Accept / Reject
// wait for that catch-up, so they always act on the hit the page holds.
import type { HitSummary } from '../../lib/hits-data.ts';
import { useFreshHitAhead } from '../../lib/live/fresh-verdict.ts';
import { VerdictPanel } from './verdict-panel.tsx';

export function FreshVerdictPanel({ entryId, hits, selected, canAct, busy, onOverride }: { entryId: string; hits: HitSummary[]; selected: HitSummary | null; canAct: boolean; busy: boolean; onOverride: (verdict: 'accept' | 'reject', note: string) => void }) {
  const ahead = useFreshHitAhead(entryId, hits);
  return <VerdictPanel hit={ahead ?? selected} canAct={canAct} busy={busy || ahead !== null} onOverride={onOverride} />;
}
