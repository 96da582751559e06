// One DOF on Review: its averaged FRF and coherence in the chosen view, its notes (their author or a
// lead edits them here), its hits (read-only) and the chosen hit's time traces and force spectrum.
import { useEffect, useState } from 'react';
import type { ScheduleEntry } from '../../lib/campaign-data.ts';
import { useEntryFrf, useEntryHits } from '../../lib/hits-data.ts';
import { Notice, Spinner } from '../ui.tsx';
import { FrfPlot, type FrfDisplay } from '../tap/frf-panel.tsx';
import { HitList } from '../tap/hit-list.tsx';
import { HitPlots } from '../tap/hit-plots.tsx';
import { ReasonList, VerdictBadge } from '../tap/verdict.tsx';
import { DofNotesSection } from '../notes/dof-notes.tsx';
import { formatWhen } from '../../lib/format-date.ts';
import { FlagReasons } from '../flag-reasons.tsx';
import { SetAsideNote } from '../tap/set-aside-note.tsx';

/** `canAct`: the caller may change this campaign (an engineer or lead of a campaign that is not archived); `isLead`: leads it. */
export function DofDetail({ campaignId, entry, display, canAct = false, isLead = false }: { campaignId: string; entry: ScheduleEntry; display: FrfDisplay; canAct?: boolean; isLead?: boolean }) {
  const frf = useEntryFrf(campaignId, entry.id, display.kind);
  const hits = useEntryHits(campaignId, entry.id);
  const [hitId, setHitId] = useState<string | null>(null);
  useEffect(() => setHitId(null), [entry.id]);
  const list = (hits.data?.hits ?? []).filter((h) => !h.setAside);
  const chosen = list.find((h) => h.id === hitId) ?? null;

  return (
    <div className="space-y-4" data-testid="dof-detail" data-entry={entry.id}>
      <div>
        <h3 className="text-lg font-semibold">
          <span className="num">{entry.responseDof}</span> / <span className="num">{entry.excitationDof}</span>
          {entry.drivingPoint && <span className="ml-2 text-sm font-normal text-accent-strong">◎ driving point</span>}
        </h3>
        <p className="text-xs text-[var(--muted)]">Response / excitation. {frf.data ? <span className="num">H1 from {frf.data.averages} averages, Δf = {frf.data.df.toFixed(3)} Hz</span> : null}</p>
      </div>
      <FlagReasons reasons={hits.data?.entry.flagReasons ?? entry.flagReasons} />
      <SetAsideNote hits={hits.data?.hits ?? []} />
      {frf.isPending && <Spinner label="Loading the FRF…" />}
      {frf.isError && <Notice tone="error">The FRF could not be loaded: {frf.error.message}</Notice>}
      {frf.isSuccess && !frf.data && <p className="text-sm text-[var(--muted)]">This DOF has no accepted hit yet, so there is no FRF to show.</p>}
      {frf.data && <FrfPlot frf={frf.data} display={display} height={display.view === 'nyquist' ? 480 : 520} showH2 uirevision={entry.id + display.view} />}
      {frf.data && <p className="text-xs text-[var(--muted)]">Solid: H1; dotted: H2 of the same channel (H1/H2 = γ²). Coherence on a linear 0–1 scale.</p>}
      <DofNotesSection campaignId={campaignId} entryId={entry.id} canAct={canAct} isLead={isLead} />
      <section className="space-y-2">
        <h4 className="text-sm font-semibold">Hits</h4>
        {hits.isPending && <Spinner label="Loading the hits…" />}
        {hits.isError && <Notice tone="error">The hits could not be loaded: {hits.error.message}</Notice>}
        {hits.data && <HitList hits={list} selectedId={hitId} onSelect={setHitId} />}
        {hits.data && list.length > 0 && !chosen && <p className="text-xs text-[var(--muted)]">Choose a hit to see its time traces and force spectrum.</p>}
      </section>
      {chosen && (
        <section className="space-y-2">
          <div className="flex flex-wrap items-center gap-2">
            <h4 className="num text-sm font-semibold">Hit {chosen.sequence}</h4>
            <VerdictBadge verdict={chosen.verdict} overridden={chosen.overridden} />
            <span className="text-xs text-[var(--muted)]">{chosen.recordedBy ? `by ${chosen.recordedBy}, ` : ''}{formatWhen(chosen.recordedAt)}</span>
          </div>
          <ReasonList hit={chosen} compact />
          <HitPlots campaignId={campaignId} hitId={chosen.id} compact />
        </section>
      )}
    </div>
  );
}
