// Review: any DOF's FRF with its coherence and hits; overlays of up to 100 FRFs across points and
// across campaigns; the reciprocity and linearity checks. Read-only for everyone.
import { useEffect, useMemo, useState } from 'react';
import { useParams, useSearchParams } from 'react-router';
import { useSchedule } from '../../lib/campaign-data.ts';
import { useChecks, useLiveCampaign } from '../../lib/hits-data.ts';
import { Notice, Panel, Spinner } from '../../components/ui.tsx';
import type { FrfDisplay } from '../../components/tap/frf-panel.tsx';
import { ChecksTables } from '../../components/review/checks-table.tsx';
import { DisplayControls } from '../../components/review/display-controls.tsx';
import { DofDetail } from '../../components/review/dof-detail.tsx';
import { useCampaignContext } from './campaign-context.ts';
import { EntryList, OVERLAY_LIMIT } from '../../components/review/entry-list.tsx';
import { OverlayPanel } from '../../components/review/overlay-panel.tsx';
import { preloadPlotly } from '../../lib/preload-plotly.ts';
import { webglUsable } from '../../lib/decimate.ts';

type Tab = 'dof' | 'overlay' | 'checks';
const tabLabel: Record<Tab, string> = { dof: 'One DOF', overlay: 'Overlay', checks: 'Reciprocity and linearity' };

export function ReviewPage() {
  const { campaignId = '' } = useParams();
  const { myRole, archived } = useCampaignContext();
  // As on Tap: an archived campaign is read-only; engineers and leads change their notes here.
  const canAct = !archived && (myRole === 'engineer' || myRole === 'lead' || myRole === 'admin');
  const [params, setParams] = useSearchParams();
  const schedule = useSchedule(campaignId);
  useLiveCampaign(campaignId);
  // Every Review view plots: load plotly while the schedule loads, not after the data arrives.
  useEffect(() => {
    void preloadPlotly();
    webglUsable(); // probing WebGL takes a moment; do it before the data arrives
  }, []);
  const entries = useMemo(() => schedule.data?.entries ?? [], [schedule.data]);
  const tab = (params.get('view') as Tab | null) ?? 'dof';
  // Read (and kept current by the live link) only while their tab is open.
  const checks = useChecks(campaignId, tab === 'checks');
  const entryId = params.get('entry') ?? entries.find((e) => e.acceptedHits > 0)?.id ?? null;
  const entry = entries.find((e) => e.id === entryId);
  const [picked, setPicked] = useState<string[]>([]);
  const [display, setDisplay] = useState<FrfDisplay>({ view: 'magphase', kind: 'accelerance', db: true, logF: false });

  const setTab = (t: Tab) => setParams((p) => ({ ...Object.fromEntries(p), view: t }), { replace: true });
  const open = (id: string) => setParams((p) => ({ ...Object.fromEntries(p), entry: id, view: 'dof' }), { replace: true });
  const pickMany = (ids: string[]) => {
    setPicked(ids.slice(0, OVERLAY_LIMIT));
    if (ids.length) setTab('overlay');
  };

  if (schedule.isPending) return <Spinner label="Loading the schedule…" />;
  if (schedule.isError) return <Notice tone="error">The schedule could not be loaded: {schedule.error.message}</Notice>;
  if (entries.length === 0) {
    return (
      <Panel title="Review">
        <p className="text-sm text-[var(--muted)]" data-testid="review-empty">
          No schedule yet, so there are no FRFs to review. Once the lead has built the schedule on Plan and hits come in on Tap, every DOF's FRF, coherence and hits show here.
        </p>
      </Panel>
    );
  }

  return (
    <div className="grid gap-4 lg:grid-cols-[minmax(300px,340px)_minmax(0,1fr)]" data-testid="review-page">
      <Panel title={<>Schedule <span className="num font-normal text-[var(--muted)]">({entries.length} entries, {picked.length} in the overlay)</span></>}>
        <EntryList
          entries={entries}
          current={tab === 'dof' ? (entry?.id ?? null) : null}
          onOpen={open}
          picked={picked}
          onPick={(id, on) => {
            setPicked((list) => (on ? [...list, id].slice(0, OVERLAY_LIMIT) : list.filter((x) => x !== id)));
            if (on) setTab('overlay');
          }}
          onPickMany={pickMany}
          room={OVERLAY_LIMIT - picked.length + 0}
        />
      </Panel>
      <div className="min-w-0 space-y-3">
        <div role="tablist" aria-label="What to review" className="flex gap-1 overflow-x-auto border-b border-[var(--line)]">
          {(Object.keys(tabLabel) as Tab[]).map((t) => (
            <button
              key={t}
              type="button"
              role="tab"
              aria-selected={tab === t}
              onClick={() => setTab(t)}
              className={`min-h-11 border-b-2 px-3 text-sm font-medium whitespace-nowrap ${tab === t ? 'border-accent text-accent-strong' : 'border-transparent text-[var(--muted)] hover:text-[var(--ink)]'}`}
            >
              {tabLabel[t]}
              {t === 'overlay' && picked.length > 0 && <span className="num ml-1 text-xs">({picked.length})</span>}
            </button>
          ))}
        </div>
        {tab !== 'checks' && <DisplayControls value={display} onChange={setDisplay} />}
        <section className="rounded-lg border border-[var(--line)] bg-[var(--panel)] p-3 sm:p-4">
          {tab === 'dof' &&
            (entry ? (
              <DofDetail campaignId={campaignId} entry={entry} display={display} canAct={canAct} isLead={myRole === 'lead' || myRole === 'admin'} />
            ) : (
              <p className="text-sm text-[var(--muted)]">No DOF has an accepted hit yet. Pick an entry from the schedule list once hits are in.</p>
            ))}
          {tab === 'overlay' && <OverlayPanel campaignId={campaignId} picked={picked} display={display} />}
          {tab === 'checks' && (
            <>
              {checks.isPending && <Spinner label="Running the reciprocity and linearity checks…" />}
              {checks.isError && <Notice tone="error">The checks could not be computed: {checks.error.message}</Notice>}
              {checks.data && <ChecksTables checks={checks.data} />}
            </>
          )}
        </section>
      </div>
    </div>
  );
}
