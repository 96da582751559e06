// Tap: the engineer at the structure, a hammer in one hand. One screen without scrolling at
// 768×1024, 1024×768 and 1366×768: the current DOF in large type with why it is flagged, the
// jump to any DOF, redo and Next DOF; the chosen hit's verdict with large Accept / Reject; and the
// averaged FRF and coherence, sized to end above the message bar. Below: the hits, the time traces
// and force spectrum, the armed DOF; the noise check and the 3D view fold away (remembered per
// user), the safety cautions fold to one line once read. Single keys for a foot pedal: A, R,
// Space/S, N. Leaving a DOF short of its hits asks first.
import { useCallback, useEffect, useMemo, useRef, useState } from 'react';
import { Link, useParams, useSearchParams } from 'react-router';
import type { ScheduleStatus } from '@resonote/contracts';
import { useGeometry, useSchedule, type ScheduleEntry } from '../../lib/campaign-data.ts';
import { useEntryFrf, useEntryHits, useLiveCampaign, useNextEntry, type HitsAnswer } from '../../lib/hits-data.ts';
import { useToast } from '../../lib/toast.tsx';
import { GeometryView } from '../../components/geometry-view.tsx';
import { worstStatus } from '../../components/status.tsx';
import { Button, Notice, Panel, Spinner } from '../../components/ui.tsx';
import { DofHeader } from '../../components/tap/dof-header.tsx';
import { FrfPlot } from '../../components/tap/frf-panel.tsx';
import { HitList } from '../../components/tap/hit-list.tsx';
import { HitPlots } from '../../components/tap/hit-plots.tsx';
import { NoisePanel } from '../../components/tap/noise-panel.tsx';
import { SafetyNote } from '../../components/tap/safety-note.tsx';
import { Kbd, StrikePanel } from '../../components/tap/strike-panel.tsx';
import { useRecordHits } from '../../components/tap/use-record.ts';
import { useHammerTips, type TipOption } from '../../components/tap/use-hammer-tips.ts';
import { FreshVerdictPanel } from '../../components/tap/fresh-verdict-panel.tsx';
import { freshHitAhead } from '../../lib/live/fresh-verdict.ts';
import { ServerBanner } from '../../components/tap/server-banner.tsx';
import { useServerHealth } from '../../lib/server-health.ts';
import { useCampaignContext } from './campaign-context.ts';
import { ArmControl } from '../../components/tap/arm-control.tsx';
import { CalibrationBanner } from '../../components/kit/calibration-banner.tsx';
import { DofNotesButton } from '../../components/notes/dof-notes.tsx';
import { LivePanel } from '../../components/tap/live-panel.tsx';
import { Dialog } from '../../components/dialog.tsx';
import { FlagReasons } from '../../components/flag-reasons.tsx';
import { DofJump } from '../../components/tap/dof-jump.tsx';
import { FoldPanel } from '../../components/tap/fold-panel.tsx';
import { RedoDialog } from '../../components/tap/redo-dialog.tsx';
import { SetAsideNote } from '../../components/tap/set-aside-note.tsx';
import { useFitHeight } from '../../lib/fit-height.ts';
import { formatWhen } from '../../lib/format-date.ts';

const OPEN: ScheduleStatus[] = ['planned', 'in-progress'];
const FRF_DISPLAY = { view: 'magphase', kind: 'accelerance', db: true, logF: false } as const;

/** The next entry still to measure after `current`, in schedule order, wrapping round. */
export function nextOpenEntry(entries: ScheduleEntry[], current: ScheduleEntry | undefined): ScheduleEntry | undefined {
  const sorted = [...entries].sort((a, b) => a.position - b.position);
  const at = current ? sorted.findIndex((e) => e.id === current.id) : -1;
  const after = [...sorted.slice(at + 1), ...sorted.slice(0, Math.max(0, at))];
  return after.find((e) => OPEN.includes(e.status));
}

function isTyping(target: EventTarget | null) {
  const el = target as HTMLElement | null;
  if (!el) return false;
  return el.isContentEditable || ['INPUT', 'TEXTAREA', 'SELECT'].includes(el.tagName);
}

export function TapPage() {
  const { campaignId = '' } = useParams();
  const { campaign, myRole, archived } = useCampaignContext();
  // An archived campaign is read-only for everyone: no recording, verdicts, redo, arming or notes.
  const canAct = !archived && (myRole === 'engineer' || myRole === 'lead' || myRole === 'admin');
  const [params, setParams] = useSearchParams();
  const entryParam = params.get('entry');
  const toast = useToast();
  const live = useLiveCampaign(campaignId);
  const health = useServerHealth();

  const schedule = useSchedule(campaignId);
  const geometry = useGeometry(campaignId);
  const next = useNextEntry(campaignId, !entryParam);
  const entries = useMemo(() => schedule.data?.entries ?? [], [schedule.data]);
  const entry = entries.find((e) => e.id === entryParam);

  // Without ?entry, start at the entry the schedule offers next, and keep it in the address so
  // the DOF does not jump away when it is done.
  useEffect(() => {
    if (!entryParam && next.data?.next) setParams({ entry: next.data.next.id }, { replace: true });
  }, [entryParam, next.data, setParams]);

  const hits = useEntryHits(campaignId, entry?.id);
  const frf = useEntryFrf(campaignId, entry?.id, 'accelerance');
  const hitList = useMemo(() => hits.data?.hits ?? [], [hits.data]);
  // Hits set aside by a redo stay listed apart; only the others count.
  const activeHits = useMemo(() => hitList.filter((h) => !h.setAside), [hitList]);
  const [selectedId, setSelectedId] = useState<string | null>(null);
  const selected = activeHits.find((h) => h.id === selectedId) ?? activeHits[activeHits.length - 1] ?? null;
  const accepted = activeHits.filter((h) => h.verdict === 'accept').length;
  const required = hits.data?.entry.requiredHits ?? entry?.requiredHits ?? 5;
  const hammerTips = useHammerTips(campaignId);
  const [chosenTip, setTip] = useState<TipOption | null>(null);
  // The chosen tip while the hammer still lists it; else the hammer's first (or the rig's soft).
  const tip = hammerTips.options.find((o) => o.value === chosenTip?.value) ?? hammerTips.options[0] ?? null;

  useEffect(() => setSelectedId(null), [entry?.id]);

  const onRecorded = useCallback(
    (answer: HitsAnswer) => {
      const last = answer.hits[answer.hits.length - 1];
      if (last) setSelectedId(last.id);
      if (answer.entry.status === 'done') toast('ok', `This DOF is done: ${answer.entry.acceptedHits} good hits. Press N (or Next DOF) to move on.`);
      else if (answer.entry.status === 'flagged') toast('error', `This DOF is flagged: ${answer.entry.flagReasons[0]?.message ?? 'see why under the DOF'}. What to try is under the DOF.`);
    },
    [toast],
  );
  const record = useRecordHits(campaignId, entry?.id ?? null, onRecorded);
  const upcoming = nextOpenEntry(entries, entry);

  const [dialog, setDialog] = useState<{ kind: 'redo' } | { kind: 'leave'; target: string } | null>(null);
  const closeDialog = useCallback(() => setDialog(null), []);
  // At 1024×768 the one screen leaves about 250 px for the plot below the DOF bar and the caution line.
  const [plotBox, plotHeight] = useFitHeight(240, 560, 20);

  // Moving to another DOF: a question first when this one was started and is short of its hits.
  const requestMove = useCallback(
    (target: string) => {
      if (!entry || target === entry.id) return;
      if (canAct && activeHits.length > 0 && accepted < required) setDialog({ kind: 'leave', target });
      else setParams({ entry: target });
    },
    [entry, canAct, activeHits.length, accepted, required, setParams],
  );
  const goNext = useCallback(() => {
    if (!upcoming) {
      toast('info', 'No other DOF is waiting: every entry of the schedule is done, flagged or skipped.');
      return;
    }
    requestMove(upcoming.id);
  }, [upcoming, requestMove, toast]);

  // Single-key shortcuts (a foot pedal sends keys). Not while typing in a field.
  const actions = useRef({ strike: () => {}, accept: () => {}, reject: () => {}, next: () => {} });
  actions.current = {
    strike: () => tip && void record.strike(tip),
    // Not while a live hit's verdict is on screen ahead of the page's list (a frame): A / R act on the hit shown.
    accept: () => selected && entry && !freshHitAhead(entry.id, hitList) && void record.override(selected, 'accept', 'accepted by hand at the structure'),
    reject: () => selected && entry && !freshHitAhead(entry.id, hitList) && void record.override(selected, 'reject', 'rejected by hand at the structure'),
    next: goNext,
  };
  useEffect(() => {
    if (!canAct || !entry || dialog) return;
    const onKey = (e: KeyboardEvent) => {
      if (e.ctrlKey || e.metaKey || e.altKey || e.repeat || isTyping(e.target)) return;
      const key = e.key.toLowerCase();
      const map: Record<string, keyof typeof actions.current> = { a: 'accept', r: 'reject', s: 'strike', ' ': 'strike', n: 'next' };
      const action = map[key];
      if (!action) return;
      // Space would also press a focused button: the shortcut is the only action.
      e.preventDefault();
      actions.current[action]();
    };
    window.addEventListener('keydown', onKey);
    return () => window.removeEventListener('keydown', onKey);
  }, [canAct, entry, dialog]);

  const points = useMemo(() => (geometry.data?.points ?? []).filter((p) => !p.retired), [geometry.data]);
  const statusByPointId = useMemo(() => {
    const lists: Record<string, ScheduleStatus[]> = {};
    for (const e of entries) (lists[campaign.testType === 'roving-response' ? e.responsePointId : e.excitationPointId] ??= []).push(e.status);
    return Object.fromEntries(Object.entries(lists).map(([id, list]) => [id, worstStatus(list)]));
  }, [entries, campaign.testType]);
  const rovingPoint = entry ? (campaign.testType === 'roving-response' ? entry.responsePointId : entry.excitationPointId) : null;

  if (schedule.isPending || (!entryParam && next.isPending)) return <Spinner label="Loading the schedule…" />;
  if (schedule.isError) return <Notice tone="error">The schedule could not be loaded: {schedule.error.message}</Notice>;
  if (next.isError) return <Notice tone="error">The next DOF could not be found: {next.error.message}</Notice>;
  if (entries.length === 0) {
    return (
      <Panel title="Tap">
        <p className="text-sm text-[var(--muted)]" data-testid="tap-empty">
          No schedule yet, so there is no DOF to measure. The lead builds it on the{' '}
          <Link to="../plan" className="text-accent hover:underline">
            Plan
          </Link>{' '}
          tab from the geometry, the test type and the reference DOFs.
        </p>
      </Panel>
    );
  }
  if (!entryParam && !next.data?.next) {
    return (
      <Panel title="Tap">
        <div className="space-y-2 text-sm" data-testid="tap-all-done">
          <p>Every entry of the schedule is done, flagged or skipped: nothing is waiting to be measured.</p>
          <p className="text-[var(--muted)]">
            Look at the results on{' '}
            <Link to="../review" className="text-accent hover:underline">
              Review
            </Link>
            , or open any entry again from there.
          </p>
        </div>
      </Panel>
    );
  }
  if (!entry) {
    return (
      <Notice tone="error">
        That schedule entry does not exist in this campaign (it may have been removed from the plan).{' '}
        <button type="button" className="underline" onClick={() => setParams({})}>
          Go to the next DOF on the schedule
        </button>
      </Notice>
    );
  }

  const index = [...entries].sort((a, b) => a.position - b.position).findIndex((e) => e.id === entry.id) + 1;
  const label = `${entry.excitationDof} → ${entry.responseDof}`;
  const reasons = hits.data?.entry.flagReasons ?? entry.flagReasons;
  const otherFlagged = entries.filter((e) => e.status === 'flagged' && e.id !== entry.id);

  return (
    <div className="space-y-3" data-testid="tap-page" data-entry={entry.id} data-fit-root>
      <ServerBanner waiting={record.waiting} health={health} onTryNow={record.tryNow} />
      <CalibrationBanner campaignId={campaignId} />
      <section className="space-y-2 rounded-lg border border-accent/40 bg-[var(--panel)] px-4 py-3" data-testid="dof-bar">
        <div className="grid grid-cols-[minmax(0,1fr)_auto] items-start gap-x-4 gap-y-2">
          <DofHeader entry={entry} accepted={accepted} required={required} index={index} total={entries.length} aside={<DofJump entries={entries} currentId={entry.id} onJump={requestMove} />} />
          <div className="flex flex-col items-end gap-1">
            <div className="flex flex-wrap items-center justify-end gap-2">
              <DofNotesButton campaignId={campaignId} entryId={entry.id} canAct={canAct} isLead={myRole === 'lead' || myRole === 'admin'} />
              {canAct && activeHits.length > 0 && (
                <Button variant="secondary" onClick={() => setDialog({ kind: 'redo' })} className="min-h-11" data-testid="redo-dof" title="Set this DOF's hits aside (kept) and take a new set">
                  Redo
                </Button>
              )}
              {(canAct || upcoming) && (
                <Button variant={canAct && accepted >= required ? 'primary' : 'secondary'} onClick={goNext} disabled={!upcoming} className={canAct ? 'min-h-12 px-5 text-base' : 'min-h-11'} data-testid="next-dof">
                  Next DOF {canAct && <Kbd>N</Kbd>}
                </Button>
              )}
            </div>
            <p className="num text-right text-xs text-[var(--muted)]">
              {upcoming ? `then ${upcoming.excitationDof} → ${upcoming.responseDof}` : 'no other DOF waiting'}
              <span className="mx-1">·</span>
              <span data-testid="live-state" title="Others’ hits appear within seconds while live">{live === 'live' ? '● Live' : live === 'polling' ? '○ Refreshing every 5 s' : '○ Connecting…'}</span>
            </p>
            {/* The live input's state and level meters while it captures (components/tap/live-panel.tsx),
                in the room beside the DOF's progress, so they add no height to Tap's one screen. */}
            <div id="tap-live-strip" className="w-full min-w-64 empty:hidden" />
          </div>
        </div>
        <FlagReasons reasons={reasons} compact />
        {otherFlagged.length > 0 && (
          <p className="truncate text-xs text-[var(--muted)]" data-testid="other-flagged">
            <span className="font-semibold text-bad">⚑ Flagged elsewhere:</span>{' '}
            {otherFlagged.slice(0, 4).map((e, i) => (
              <span key={e.id}>
                {i > 0 && ', '}
                <button type="button" className="num text-accent hover:underline" onClick={() => requestMove(e.id)} title={e.flagReasons.map((r) => r.message).join('; ')}>
                  {e.excitationDof} → {e.responseDof}
                </button>
              </span>
            ))}
            {otherFlagged.length > 4 && ` and ${otherFlagged.length - 4} more (see Overview)`}
          </p>
        )}
      </section>
      {/* Nobody strikes on an archived campaign: no cautions before striking. */}
      {!archived && <SafetyNote />}

      <div className="grid gap-3 md:grid-cols-[minmax(280px,340px)_minmax(0,1fr)]">
        <div className="space-y-3">
          <Panel title="Verdict" dense>
            {hits.isPending ? <Spinner label="Loading the hits…" /> : hits.isError ? <Notice tone="error">The hits could not be loaded: {hits.error.message}</Notice> : <FreshVerdictPanel entryId={entry.id} hits={hitList} selected={selected} canAct={canAct} busy={record.busy !== null} onOverride={(v, note) => selected && void record.override(selected, v, note)} />}
          </Panel>
          {canAct ? (
            <Panel title="Record a hit" dense>
              <StrikePanel tips={hammerTips} tip={tip} onTip={setTip} onStrike={() => tip && void record.strike(tip)} onUpload={(f) => void record.upload(f)} busy={record.busy} progress={record.progress} failedUpload={record.failedUpload} live={<LivePanel campaignId={campaignId} entryId={entry.id} entryLabel={`${entry.excitationDof} → ${entry.responseDof}`} isLead={myRole === 'lead' || myRole === 'admin'} onStored={onRecorded} />} />
            </Panel>
          ) : archived ? (
            <Notice tone="info">
              <span data-testid="tap-archived">
                Archived on <span className="num">{formatWhen(campaign.archivedAt, 'date')}</span>: read-only. Its hits and FRFs can be read; nothing is recorded or judged here. A lead can un-archive it on the Plan tab.
              </span>
            </Notice>
          ) : (
            <Notice tone="info">You are a viewer on this campaign: you see the hits and results as they come in, but you do not record or judge hits.</Notice>
          )}
        </div>

        <div className="min-w-0">
          <Panel
            dense
            title={
              <>
                Averaged FRF and coherence <span className="num font-normal text-[var(--muted)]" data-testid="frf-averages">{frf.data ? `${frf.data.averages} average${frf.data.averages === 1 ? '' : 's'}` : 'no average yet'}</span>
                {frf.data && <span className="num ml-2 text-xs font-normal text-[var(--muted)]">· {frf.data.kind} H1, |H| in dB re 1 {frf.data.unit}</span>}
              </>
            }
          >
            <div ref={plotBox}>
              {frf.isPending && <Spinner label="Loading the averaged FRF…" />}
              {frf.isError && <Notice tone="error">The averaged FRF could not be loaded: {frf.error.message}</Notice>}
              {frf.isSuccess && !frf.data && <p className="text-sm text-[var(--muted)]">No accepted hit yet, so no FRF. It appears after the first good hit and updates after every one.</p>}
              {frf.data && (
                <div data-testid="frf-plot">
                  <FrfPlot frf={frf.data} display={FRF_DISPLAY} height={plotHeight} uirevision={entry.id} untitled />
                </div>
              )}
            </div>
          </Panel>
          {frf.data && (
            <p className="mt-1 text-xs text-[var(--muted)]">
              H1 = G<sub>fx</sub>/G<sub>ff</sub> over the accepted hits; magnitude in dB re 1 (m/s²)/N, phase in degrees wrapped to (−180°, 180°], coherence γ² on 0–1. With one hit γ² = 1 everywhere and means nothing.
            </p>
          )}
        </div>
      </div>

      <div className="grid gap-3 lg:grid-cols-[minmax(320px,420px)_minmax(0,1fr)]">
        <div className="space-y-3">
          <Panel title={<>Hits at this DOF <span className="num font-normal text-[var(--muted)]">({activeHits.length} recorded, {accepted} accepted)</span></>}>
            <HitList hits={activeHits} selectedId={selected?.id ?? null} onSelect={setSelectedId} />
            <div className="mt-2">
              <SetAsideNote hits={hitList} />
            </div>
          </Panel>
          <Panel title="Armed DOF (watched-folder bridge)">
            <ArmControl campaignId={campaignId} entryId={entry.id} label={label} canAct={canAct} />
          </Panel>
        </div>
        <Panel title={selected ? <>Hit <span className="num">{selected.sequence}</span>: time traces and force spectrum</> : 'Time traces and force spectrum'}>
          <HitPlots campaignId={campaignId} hitId={selected?.id ?? null} />
        </Panel>
      </div>
      <FoldPanel name="noise" title="Background noise" summary="the quiet recording before or between hits">
        <NoisePanel campaignId={campaignId} canAct={canAct} />
      </FoldPanel>
      <FoldPanel name="geometry" title="Where on the structure" summary={`the 3D view with ${label} marked`}>
        {geometry.isPending && <Spinner label="Loading the geometry…" />}
        {geometry.isError && <Notice tone="error">The geometry could not be loaded: {geometry.error.message}</Notice>}
        {geometry.data && <GeometryView points={points} lines={geometry.data.lines} statusByPointId={statusByPointId} highlightPointId={rovingPoint} height={300} />}
      </FoldPanel>

      {dialog?.kind === 'redo' && (
        <RedoDialog
          campaignId={campaignId}
          entryId={entry.id}
          version={hits.data?.entry.version ?? entry.version}
          label={label}
          hitCount={activeHits.length}
          onCancel={closeDialog}
          onDone={(message) => {
            closeDialog();
            setSelectedId(null);
            toast('ok', message);
          }}
        />
      )}
      {dialog?.kind === 'leave' && (
        <Dialog
          title={`Leave ${label} short of its hits?`}
          onCancel={closeDialog}
          testId="leave-short-dialog"
          actions={
            <>
              <Button variant="secondary" onClick={closeDialog} className="min-h-11" data-testid="leave-stay">
                Stay and finish it
              </Button>
              <Button
                onClick={() => {
                  const target = dialog.target;
                  closeDialog();
                  setParams({ entry: target });
                }}
                className="min-h-11"
                data-testid="leave-confirm"
              >
                Leave it short
              </Button>
            </>
          }
        >
          <p>
            This DOF has <span className="num">{accepted} of {required}</span> good hits. Its FRF averages only what is in, and it stays “in progress” on the schedule until the rest are taken.
          </p>
          <p className="text-[var(--muted)]">
            Going to <span className="num">{entries.find((e) => e.id === dialog.target)?.excitationDof} → {entries.find((e) => e.id === dialog.target)?.responseDof}</span>.
          </p>
        </Dialog>
      )}
    </div>
  );
}
