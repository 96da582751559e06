// Modes (design.md step 5): a background fit over the chosen FRFs and band gives the CMIF and the
// stabilization diagram; the lead picks poles (kept on the server as the fit's draft), computes
// shapes, and adds modes of one or several fits to the campaign's mode table; everyone reads that
// table, its MAC matrix, measured against synthesized FRFs and the shapes animated on the geometry.
import { useEffect, useMemo, useRef, useState } from 'react';
import { useParams } from 'react-router';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { canonicalLabel, sameAxis } from '@resonote/contracts';
import { api, ApiError } from '../../lib/api.ts';
import { useSchedule, useSettings, type ScheduleEntry } from '../../lib/campaign-data.ts';
import { useFailure } from '../../lib/mutation.ts';
import { useToast } from '../../lib/toast.tsx';
import { fmtHz, modeKeys, samePole, useCurrentModes, useFit, useFits, useSynthesis, useTableSynthesis, type ChosenModes, type CurrentModes, type FitSummary, type ModalFit, type PoleRef, type QualityWarning, type SuggestedMode, type TableRow } from '../../lib/modes-data.ts';
import { Button, Notice, Panel, Spinner } from '../../components/ui.tsx';
import { FitForm, type FitRequest } from '../../components/modes/fit-form.tsx';
import { StabilizationPlot } from '../../components/modes/stabilization-plot.tsx';
import { ChosenPoles } from '../../components/modes/chosen-poles.tsx';
import { ModeTable } from '../../components/modes/mode-table.tsx';
import { MacMatrix } from '../../components/mac-matrix.tsx';
import { CorrelationPanel } from '../../components/model/correlation-panel.tsx';
import { SynthesisPlot } from '../../components/modes/synthesis-plot.tsx';
import { ModeAnimation } from '../../components/modes/mode-animation.tsx';
import { useCampaignContext } from './campaign-context.ts';
import { formatWhen } from '../../lib/format-date.ts';

export function ModesPage() {
  const { campaignId = '' } = useParams();
  const { campaign, canLead } = useCampaignContext();
  const client = useQueryClient();
  const toast = useToast();
  const fail = useFailure();

  const current = useCurrentModes(campaignId);
  const fits = useFits(campaignId);
  const schedule = useSchedule(campaignId);
  const settings = useSettings(campaignId);

  const [pickedFitId, setPickedFitId] = useState<string | null>(null);
  const shownFitId = pickedFitId ?? fits.data?.fits[0]?.id ?? null;
  const shown = useFit(campaignId, shownFitId);
  const fit = shown.data?.fit;
  const fitKey = modeKeys.fit(campaignId, shownFitId ?? '');

  // The chosen poles: the fit's draft on the server (or, for an older fit, the poles of its computed modes).
  const [chosen, setChosenState] = useState<PoleRef[]>([]);
  // The latest choice, read by handlers that fire several times before a render (plotly clicks).
  const chosenRef = useRef<PoleRef[]>([]);
  const setChosen = (next: PoleRef[]) => {
    chosenRef.current = next;
    setChosenState(next);
  };
  const [draftState, setDraftState] = useState<'saved' | 'saving' | 'failed'>('saved');
  const draftVersion = useRef(1);
  const saving = useRef<Promise<void>>(Promise.resolve());
  const pendingSaves = useRef(0);
  const initialisedFor = useRef<string | null>(null);
  useEffect(() => {
    if (!fit || initialisedFor.current === fit.id || fit.status !== 'done') return;
    initialisedFor.current = fit.id;
    draftVersion.current = fit.draft.version;
    setChosen(fit.draft.poles ?? (fit.modes?.table ?? []).map((m) => m.pole).filter((p): p is PoleRef => Boolean(p)));
  }, [fit]);

  /** Sets the choice and keeps it on the server, one save after another (each with the version the last one returned). */
  const choose = (next: PoleRef[]) => {
    setChosen(next);
    if (!canLead || !fit) return;
    const fitId = fit.id;
    setDraftState('saving');
    pendingSaves.current += 1;
    saving.current = saving.current.then(async () => {
      try {
        const r = await api<{ draft: ModalFit['draft'] }>(`/campaigns/${campaignId}/modes/fits/${fitId}/draft`, { method: 'PUT', body: { poles: next, baseVersion: draftVersion.current } });
        draftVersion.current = r.draft.version;
        client.setQueryData<{ fit: ModalFit }>(modeKeys.fit(campaignId, fitId), (old) => (old ? { fit: { ...old.fit, draft: r.draft } } : old));
        pendingSaves.current -= 1;
        if (pendingSaves.current === 0) setDraftState('saved');
      } catch (err) {
        pendingSaves.current -= 1;
        setDraftState('failed');
        if (err instanceof ApiError && err.code === 'stale-version') initialisedFor.current = null;
        fail(err, [modeKeys.fit(campaignId, fitId)]);
      }
    });
  };

  const run = useMutation({
    mutationFn: (req: FitRequest) => api<{ fit: { id: string; status: string; reused?: boolean } }>(`/campaigns/${campaignId}/modes/fits`, { body: req }),
    onSuccess: ({ fit: started }) => {
      initialisedFor.current = null;
      setChosen([]);
      setPickedFitId(started.id);
      void client.invalidateQueries({ queryKey: modeKeys.fits(campaignId) });
      toast(started.reused ? 'info' : 'ok', started.reused ? 'The same fit was run before on the same data; showing its results.' : 'Fit started. The diagram appears when it is done.');
    },
    onError: (err) => fail(err),
  });

  const compute = useMutation({
    mutationFn: async (poles: PoleRef[]) => {
      await saving.current;
      return api<{ modes: ChosenModes; draft: ModalFit['draft'] }>(`/campaigns/${campaignId}/modes/fits/${fit!.id}/modes`, { body: { poles } });
    },
    onSuccess: ({ modes: computed, draft }, poles) => {
      draftVersion.current = draft.version;
      client.setQueryData<{ fit: ModalFit }>(fitKey, (old) => (old ? { fit: { ...old.fit, draft, warnings: [...old.fit.warnings.filter((w) => w.code === 'cmif-peak-without-column'), ...(computed.warnings ?? [])], modes: { ...computed, table: computed.table.map((m, i) => ({ ...m, pole: m.pole ?? poles[i] })) } } } : old));
      void client.invalidateQueries({ queryKey: modeKeys.fits(campaignId) });
      toast('ok', `Shapes computed for ${computed.table.length} mode${computed.table.length === 1 ? '' : 's'}. Add them to the campaign's mode table below.`);
    },
    onError: (err) => fail(err, [fitKey]),
  });

  const toggle = (p: PoleRef) => {
    const now = chosenRef.current;
    choose(now.some((x) => samePole(x, p)) ? now.filter((x) => !samePole(x, p)) : [...now, p]);
  };
  const addStable = (order: number) => {
    const o = fit?.result?.diagram.orders.find((x) => x.order === order);
    if (!o) return;
    // The same mode is not chosen twice: a chosen pole within 1 % of a new one is replaced.
    const add = o.poles.map((p, index) => ({ p, ref: { order, index } })).filter(({ p }) => p.stable === 'all');
    const keep = chosenRef.current.filter((x) => {
      const pole = fit?.result?.diagram.orders.find((y) => y.order === x.order)?.poles[x.index];
      return !pole || !add.some(({ p }) => Math.abs(p.fHz - pole.fHz) / p.fHz < 0.01);
    });
    choose([...keep, ...add.map((a) => a.ref)]);
    toast('info', `${add.length} stable pole${add.length === 1 ? '' : 's'} at order ${order} chosen.`);
  };

  const suggest = useMutation({
    mutationFn: () => api<{ modes: SuggestedMode[]; rule: string }>(`/campaigns/${campaignId}/modes/fits/${fit!.id}/suggestion`),
    onSuccess: ({ modes: suggested }) => {
      choose(suggested.map((c) => c.representative));
      toast(
        'info',
        suggested.length
          ? `${suggested.length} mode${suggested.length === 1 ? '' : 's'} suggested: ${suggested.map((c) => `${fmtHz(c.fHz)} Hz`).join(', ')}. Check them on the diagram, then compute shapes.`
          : 'No pole is stable at enough orders to suggest a mode: fit higher orders or a narrower band, or choose poles by hand.',
      );
    },
    onError: (err) => fail(err),
  });

  const entries = schedule.data?.entries ?? [];
  const band = settings.data?.current.settings.bandHz;
  const running = fit && (fit.status === 'queued' || fit.status === 'running');
  const nothingYet = fits.data && !shownFitId;

  return (
    <div className="space-y-4">
      <Notice tone="info">
        Fitted modes describe this test set-up (supports, added masses, temperature). Decisions about the structure belong to licensed practice under local codes.
      </Notice>
      {(current.isError || fits.isError) && <Notice tone="error">The modal results could not be loaded: {(current.error ?? fits.error)?.message}</Notice>}

      <div className="grid gap-4 lg:grid-cols-[320px_minmax(0,1fr)]">
        <div className="grid content-start gap-4 md:grid-cols-2 lg:grid-cols-1">
          {canLead && (
            <Panel title="Fit settings">
              {(schedule.isPending || settings.isPending) && <Spinner label="Loading the schedule and settings…" />}
              {schedule.isError && <Notice tone="error">The schedule could not be loaded: {schedule.error.message}</Notice>}
              {schedule.data && !settings.isPending && <FitForm entries={entries} campaign={campaign} defaultBand={band} busy={run.isPending || Boolean(running)} onRun={(req) => run.mutate(req)} />}
            </Panel>
          )}
          {fit?.status === 'done' && fit.result && (
            <Panel title="Chosen poles" actions={canLead ? <DraftState state={draftState} /> : undefined}>
              <ChosenPoles orders={fit.result.diagram.orders} chosen={chosen} canEdit={canLead} busy={compute.isPending || suggest.isPending} onRemove={toggle} onAddStable={addStable} onSuggest={() => suggest.mutate()} onClear={() => choose([])} onCompute={() => compute.mutate(chosen)} />
            </Panel>
          )}
        </div>

        <Panel title="Stabilization diagram over the CMIF" actions={fit ? <FitCaption fit={fit} /> : undefined}>
          {fits.data && fits.data.fits.length > 1 && <FitPicker fits={fits.data.fits} value={shownFitId} onChange={(id) => { initialisedFor.current = null; setPickedFitId(id); }} />}
          {(current.isPending || fits.isPending || (shownFitId && shown.isPending)) && <Spinner label="Loading the modal fit…" />}
          {shown.isError && <Notice tone="error">The fit could not be loaded: {shown.error.message}</Notice>}
          {nothingYet && (
            <div className="py-10 text-center text-sm text-[var(--muted)]" data-testid="modes-empty">
              <p className="font-medium text-[var(--ink)]">No modal fit yet.</p>
              <p>{canLead ? 'Choose the FRFs, the band and the model order, then run a fit.' : 'The lead runs the fit once the FRFs are measured; the results show here.'}</p>
            </div>
          )}
          {running && <FitProgress fit={fit} />}
          {fit?.status === 'failed' && <Notice tone="error">The fit failed: {fit.message ?? 'no reason given'}. Check the band and the FRFs and run it again.</Notice>}
          {fit?.status === 'done' && fit.result && (
            <div className="space-y-2" data-testid="stabilization">
              <StabilizationPlot cmif={fit.result.cmif} orders={fit.result.diagram.orders} bandHz={fit.request.bandHz} chosen={chosen} onTogglePole={canLead ? toggle : undefined} height={470} />
              {canLead && <p className="text-xs text-[var(--muted)]">Click a pole to choose it, click it again to un-choose it. Zoom with a drag; double-click to zoom out.</p>}
              <Warnings warnings={fit.warnings} />
            </div>
          )}
        </Panel>
      </div>

      {fit?.status === 'done' && fit.modes && fit.modes.table.length > 0 && current.data && <FitModes campaignId={campaignId} fit={fit} modes={fit.modes} table={current.data} canLead={canLead} />}
      {fit?.status === 'done' && !fit.modes && !canLead && <p className="text-sm text-[var(--muted)]">No shapes computed in this fit yet.</p>}
      {current.isPending && <Spinner label="Loading the mode table…" />}
      {current.data && <TableResults campaignId={campaignId} table={current.data} entries={entries} canLead={canLead} />}
      <CorrelationPanel campaignId={campaignId} />
    </div>
  );
}

function DraftState({ state }: { state: 'saved' | 'saving' | 'failed' }) {
  return (
    <span className="text-xs text-[var(--muted)]" data-testid="draft-state" data-state={state} aria-live="polite">
      {state === 'saving' ? 'Saving the choice…' : state === 'failed' ? 'The choice was not saved' : 'Choice saved for the team'}
    </span>
  );
}

function FitPicker({ fits, value, onChange }: { fits: FitSummary[]; value: string | null; onChange: (id: string) => void }) {
  return (
    <label className="mb-2 flex flex-wrap items-center gap-2 text-sm" htmlFor="fit-picker">
      Fit
      <select id="fit-picker" className="num min-h-9 rounded-md border border-[var(--line)] bg-[var(--panel)] px-2 text-sm" value={value ?? ''} onChange={(e) => onChange(e.target.value)}>
        {fits.map((f) => (
          <option key={f.id} value={f.id}>
            {f.bandHz[0]}–{f.bandHz[1]} Hz · order ≤ {f.maxOrder} · {f.frfCount} FRFs · {formatWhen(f.createdAt)} · {f.status}
            {f.modeCount ? ` · ${f.modeCount} shapes` : ''}
          </option>
        ))}
      </select>
    </label>
  );
}

/** The fit's quality in words, with the number beside each (limits are common practice). */
function Warnings({ warnings }: { warnings: QualityWarning[] }) {
  if (warnings.length === 0) return null;
  return (
    <div className="rounded-md border border-warn/40 bg-[var(--panel)] p-2 text-sm" data-testid="fit-warnings" role="status">
      <p className="font-medium text-warn">
        <span aria-hidden>⚠ </span>
        {warnings.length} point{warnings.length === 1 ? '' : 's'} to check in this fit
      </p>
      <ul className="mt-1 list-disc space-y-0.5 pl-5 text-xs">
        {warnings.map((w, i) => (
          <li key={i} data-code={w.code}>
            {w.message}
          </li>
        ))}
      </ul>
    </div>
  );
}

/** The modes computed in the shown fit: how well they explain its FRFs, and adding them to the campaign's table. */
function FitModes({ campaignId, fit, modes, table, canLead }: { campaignId: string; fit: ModalFit; modes: ChosenModes; table: CurrentModes; canLead: boolean }) {
  const client = useQueryClient();
  const toast = useToast();
  const fail = useFailure();
  const inTable = useMemo(() => new Set(table.modes.filter((r) => r.source.fitId === fit.id).map((r) => `${r.pole?.order}-${r.pole?.index}`)), [table.modes, fit.id]);
  const addable = modes.table.filter((m) => !inTable.has(`${m.pole?.order}-${m.pole?.index}`));
  const [unticked, setUnticked] = useState<Set<number>>(new Set());
  const picked = addable.filter((m) => !unticked.has(m.mode));
  const pairs = modes.synthesisFrac;
  const drivingIndex = Math.max(0, pairs.findIndex((p) => sameAxis(p.response, p.reference)));
  const [pairIndex, setPairIndex] = useState<number | null>(null);
  const pair = pairs[pairIndex ?? drivingIndex] ?? null;
  const synthesis = useSynthesis(campaignId, fit.id, modes.chosenAt ?? null, pair);

  const add = useMutation({
    mutationFn: () => api<{ version: number; modes: TableRow[] }>(`/campaigns/${campaignId}/modes/table`, { body: { fitId: fit.id, modes: picked.map((m) => m.mode), baseVersion: table.version } }),
    onSuccess: (r) => {
      client.setQueryData<CurrentModes>(modeKeys.current(campaignId), (old) => (old ? { ...old, version: r.version, modes: r.modes } : old));
      void client.invalidateQueries({ queryKey: modeKeys.current(campaignId), exact: true });
      const twice = r.modes.filter((m) => m.duplicate).length;
      toast(twice ? 'info' : 'ok', `${picked.length} mode${picked.length === 1 ? '' : 's'} added to the mode table.${twice ? ` ${twice} row${twice === 1 ? ' holds a mode' : 's hold modes'} found twice; see the flags.` : ''}`);
      setUnticked(new Set());
    },
    onError: (err) => fail(err, [modeKeys.current(campaignId)]),
  });

  return (
    <div className="grid gap-4 lg:grid-cols-2" data-testid="fit-modes">
      <Panel title="Modes computed in this fit">
        <table className="w-full text-sm">
          <thead className="text-left text-xs text-[var(--muted)]">
            <tr className="border-b border-[var(--line)]">
              {canLead && <th scope="col" className="py-1 pr-2 font-medium">Add</th>}
              <th scope="col" className="py-1 pr-2 font-medium">#</th>
              <th scope="col" className="pr-2 text-right font-medium">f (Hz)</th>
              <th scope="col" className="pr-2 text-right font-medium">ζ (%)</th>
              <th scope="col" className="pr-2 text-right font-medium">MPC</th>
              <th scope="col" className="font-medium">In the table</th>
            </tr>
          </thead>
          <tbody>
            {modes.table.map((m) => {
              const already = inTable.has(`${m.pole?.order}-${m.pole?.index}`);
              return (
                <tr key={m.mode} className="border-b border-[var(--line)] last:border-0" data-fit-mode={m.mode}>
                  {canLead && (
                    <td className="py-1 pr-2">
                      <input
                        type="checkbox"
                        aria-label={`Add the mode at ${fmtHz(m.fHz)} Hz`}
                        disabled={already}
                        checked={!already && !unticked.has(m.mode)}
                        onChange={() => setUnticked((s) => { const n = new Set(s); if (n.has(m.mode)) n.delete(m.mode); else n.add(m.mode); return n; })}
                        className="size-4 accent-[var(--color-accent)]"
                      />
                    </td>
                  )}
                  <td className="num py-1 pr-2">{m.mode}</td>
                  <td className="num pr-2 text-right">{fmtHz(m.fHz)} Hz</td>
                  <td className="num pr-2 text-right">{m.zetaPercent.toFixed(3)} %</td>
                  <td className="num pr-2 text-right">{m.mpc.toFixed(3)}</td>
                  <td className="text-xs text-[var(--muted)]">{already ? 'yes' : '–'}</td>
                </tr>
              );
            })}
          </tbody>
        </table>
        {modes.massNote && <p className="mt-2 text-xs text-[var(--muted)]" data-testid="mass-note">Unit modal mass: {modes.massNote}</p>}
        <p className="mt-1 text-xs text-[var(--muted)]">Damping correction: {modes.correction}</p>
        {canLead && (
          <Button type="button" className="mt-3 w-full" disabled={picked.length === 0 || add.isPending} onClick={() => add.mutate()} data-testid="add-to-table">
            {add.isPending ? 'Adding…' : addable.length === 0 ? 'Every mode of this fit is in the table' : `Add ${picked.length} mode${picked.length === 1 ? '' : 's'} to the campaign's mode table`}
          </Button>
        )}
      </Panel>
      <Panel title="This fit: synthesized against measured FRF">
        {pairs.length > 0 && (
          <div className="space-y-2" data-testid="fit-synthesis" data-chosen-at={modes.chosenAt} data-modes={modes.table.length}>
            <PairSelect id="fit-synthesis-pair" pairs={pairs} value={pairIndex ?? drivingIndex} onChange={setPairIndex} />
            {synthesis.isPending && <Spinner label="Synthesizing the FRF…" />}
            {synthesis.isError && <Notice tone="error">The synthesized FRF could not be loaded: {synthesis.error.message}</Notice>}
            {synthesis.data && pair && <SynthesisPlot synthesis={synthesis.data} title={`${pair.response} / ${pair.reference}`} height={360} />}
            <p className="text-xs text-[var(--muted)]">Accelerance, H1, from the {modes.table.length} modes computed in this fit, over the fit's band, with its residual terms. Synthesis error = ‖measured − synthesized‖ / ‖measured‖.</p>
          </div>
        )}
      </Panel>
    </div>
  );
}

function PairSelect({ id, pairs, value, onChange }: { id: string; pairs: { response: string; reference: string; frac?: number; errorPercent?: number | null }[]; value: number; onChange: (i: number) => void }) {
  return (
    <label className="flex flex-col gap-1 text-sm font-medium" htmlFor={id}>
      FRF (response / excitation)
      <select id={id} className="num min-h-10 rounded-md border border-[var(--line)] bg-[var(--panel)] px-2 text-sm font-normal" value={value} onChange={(e) => onChange(Number(e.target.value))}>
        {pairs.map((p, i) => (
          <option key={`${p.response}|${p.reference}`} value={i}>
            {p.response} / {p.reference}
            {sameAxis(p.response, p.reference) ? ' (driving point)' : ''}
            {p.frac !== undefined ? ` · FRAC ${p.frac.toFixed(3)}` : ''}
            {p.errorPercent !== undefined && p.errorPercent !== null ? ` · error ${p.errorPercent.toFixed(1)} %` : ''}
          </option>
        ))}
      </select>
    </label>
  );
}

function FitCaption({ fit }: { fit: ModalFit }) {
  const orders = fit.request.orders;
  return (
    <p className="num text-right text-xs text-[var(--muted)]" data-testid="fit-caption">
      {fit.request.frfCount} FRFs · {fit.request.bandHz[0]}–{fit.request.bandHz[1]} Hz · orders {orders[0]}–{orders.at(-1)}
      {fit.elapsedMs ? ` · ${(fit.elapsedMs / 1000).toFixed(1)} s` : ''}
    </p>
  );
}

function FitProgress({ fit }: { fit: ModalFit }) {
  const pct = Math.round(Math.max(0, Math.min(1, fit.progress ?? 0)) * 100);
  return (
    <div className="space-y-2 py-6" data-testid="fit-progress">
      <div className="flex items-center justify-between text-sm">
        <span>{fit.status === 'queued' ? 'Waiting for the fit to start…' : (fit.message ?? 'Fitting…')}</span>
        <span className="num text-[var(--muted)]">{pct} %</span>
      </div>
      <div className="h-2 overflow-hidden rounded-full bg-[var(--line)]" role="progressbar" aria-label="Fit progress" aria-valuemin={0} aria-valuemax={100} aria-valuenow={pct}>
        <div className="h-full rounded-full bg-accent transition-[width]" style={{ width: `${pct}%` }} />
      </div>
    </div>
  );
}

/** The FRF pairs measured in the campaign, on the positive axis of each point (as the fits and the table use them). */
function measuredPairs(entries: ScheduleEntry[]) {
  const seen = new Set<string>();
  const out: { response: string; reference: string }[] = [];
  for (const e of entries) {
    if (e.acceptedHits === 0) continue;
    const p = { response: canonicalLabel(e.responseDof), reference: canonicalLabel(e.excitationDof) };
    const key = `${p.response}|${p.reference}`;
    if (seen.has(key)) continue;
    seen.add(key);
    out.push(p);
  }
  return out;
}

function TableResults({ campaignId, table, entries, canLead }: { campaignId: string; table: CurrentModes; entries: ScheduleEntry[]; canLead: boolean }) {
  const client = useQueryClient();
  const toast = useToast();
  const fail = useFailure();
  const rows = table.modes;
  const [selected, setSelected] = useState(1);
  const mode = rows.find((m) => m.mode === selected) ?? rows[0];
  const pairs = useMemo(() => measuredPairs(entries), [entries]);
  // The first pick is a driving point the table's fits measured (a reference of one of its rows), so that after the
  // reference moved the plot does not open on an FRF of the former reference, which no row of the table can synthesize.
  const drivingIndex = useMemo(() => {
    const refs = new Set(rows.flatMap((r) => r.source.references.map(canonicalLabel)));
    const driving = (p: { response: string; reference: string }) => sameAxis(p.response, p.reference);
    const fitted = (p: { response: string; reference: string }) => refs.has(p.response) || refs.has(p.reference);
    const best = [pairs.findIndex((p) => driving(p) && fitted(p)), pairs.findIndex(fitted), pairs.findIndex(driving)].find((i) => i >= 0);
    return best ?? 0;
  }, [pairs, rows]);
  const [pairIndex, setPairIndex] = useState<number | null>(null);
  const pair = pairs[pairIndex ?? drivingIndex] ?? null;
  const synthesis = useTableSynthesis(campaignId, rows.length ? table.version : 0, pair);
  const reducedMotion = useMemo(() => typeof window !== 'undefined' && window.matchMedia?.('(prefers-reduced-motion: reduce)').matches, []);
  const [playing, setPlaying] = useState(!reducedMotion);
  const [amplitude, setAmplitude] = useState(0.1);
  const [speed, setSpeed] = useState(0.6);

  const remove = useMutation({
    mutationFn: (row: TableRow) => api<{ version: number; modes: TableRow[] }>(`/campaigns/${campaignId}/modes/table/${row.id}?baseVersion=${table.version}`, { method: 'DELETE' }),
    onSuccess: (r, row) => {
      client.setQueryData<CurrentModes>(modeKeys.current(campaignId), (old) => (old ? { ...old, version: r.version, modes: r.modes } : old));
      void client.invalidateQueries({ queryKey: modeKeys.current(campaignId), exact: true });
      toast('ok', `The mode at ${fmtHz(row.fHz)} Hz was removed from the table (its fit keeps it).`);
    },
    onError: (err) => fail(err, [modeKeys.current(campaignId)]),
  });

  if (rows.length === 0) {
    return (
      <Panel title="The campaign's mode table">
        <div className="py-6 text-center text-sm text-[var(--muted)]" data-testid="mode-table-empty">
          <p className="font-medium text-[var(--ink)]">The mode table is empty.</p>
          <p>{canLead ? 'Compute shapes in a fit, then add its modes here. Modes from several fits (other bands, references or orders) go into the same table.' : 'The lead adds modes from the fits; the table, the MAC matrix and the shapes show here.'}</p>
        </div>
      </Panel>
    );
  }
  const fitsUsed = new Set(rows.map((r) => r.source.fitId)).size;
  return (
    <div className="space-y-4" data-testid="mode-results">
      <div className="grid gap-4 xl:grid-cols-[minmax(0,3fr)_minmax(0,2fr)]">
        <Panel title="The campaign's mode table" actions={<span className="num text-xs text-[var(--muted)]">{rows.length} modes from {fitsUsed} fit{fitsUsed === 1 ? '' : 's'}</span>}>
          <ModeTable modes={rows} selected={mode?.mode} onSelect={setSelected} onRemove={canLead ? (r) => remove.mutate(r) : undefined} busy={remove.isPending} />
          <div className="mt-2 space-y-1 text-xs text-[var(--muted)]">
            {rows.some((r) => r.duplicate) && (
              <ul className="space-y-0.5 text-warn" data-testid="duplicate-notes">
                {rows.filter((r) => r.duplicate).map((r) => (
                  <li key={r.id}>
                    Mode {r.mode}: {r.duplicate!.note}
                  </li>
                ))}
              </ul>
            )}
            <p>{table.duplicateRule}</p>
            <p data-testid="axis-convention">{table.axisConvention}</p>
            {rows.some((r) => !r.massShape) && <p>Not scaled to unit modal mass: {[...new Set(rows.filter((r) => !r.massShape).map((r) => r.massNote))].join(' ')}</p>}
          </div>
          <Warnings warnings={table.warnings} />
        </Panel>
        <Panel title="MAC matrix of the table's shapes">
          <MacMatrix
            matrix={table.mac}
            rows={rows.map((m) => ({ name: `mode ${m.mode} (${m.fHz.toFixed(1)} Hz)`, short: String(m.mode) }))}
            columns={rows.map((m) => ({ name: `mode ${m.mode} (${m.fHz.toFixed(1)} Hz)`, short: String(m.mode) }))}
            rowTitle="mode (number in the table)"
            columnTitle="mode (number in the table)"
            label={`MAC matrix of ${rows.length} modes, from 0 to 1`}
            className="mac-heatmap"
          />
          <p className="mt-1 text-xs text-[var(--muted)]">Over the DOFs each pair of shapes shares. 1 on the diagonal; small values off it mean the shapes are distinct. MAC has no mass weighting, so it is not an orthogonality check.</p>
        </Panel>
      </div>
      <div className="grid gap-4 lg:grid-cols-2">
        <Panel title="Shape on the geometry">
          <div className="mb-3 flex flex-wrap items-end gap-x-4 gap-y-2">
            <div role="group" aria-label="Mode to animate" className="flex flex-wrap gap-1">
              {rows.map((m) => (
                <button
                  key={m.id}
                  type="button"
                  aria-pressed={m.mode === mode?.mode}
                  onClick={() => setSelected(m.mode)}
                  className={`num min-h-9 rounded-md border px-2 text-xs ${m.mode === mode?.mode ? 'border-accent bg-accent-soft font-semibold text-accent-strong' : 'border-[var(--line)] text-[var(--muted)] hover:border-accent'}`}
                >
                  {m.mode} · {fmtHz(m.fHz)} Hz
                </button>
              ))}
            </div>
          </div>
          <div className="mb-3 flex flex-wrap items-center gap-x-5 gap-y-2 text-sm">
            <Button type="button" variant="secondary" onClick={() => setPlaying((p) => !p)} aria-pressed={playing} className="min-w-24">
              <span aria-hidden>{playing ? '❚❚' : '▶'}</span>
              {playing ? 'Pause' : 'Play'}
            </Button>
            <label className="flex items-center gap-2">
              Amplitude
              <input type="range" min={0.02} max={0.25} step={0.01} value={amplitude} onChange={(e) => setAmplitude(Number(e.target.value))} className="w-28 accent-[var(--color-accent)]" />
              <span className="num w-24 text-xs text-[var(--muted)]">{Math.round(amplitude * 100)} % of size</span>
            </label>
            <label className="flex items-center gap-2">
              Speed
              <input type="range" min={0.2} max={2} step={0.1} value={speed} onChange={(e) => setSpeed(Number(e.target.value))} className="w-24 accent-[var(--color-accent)]" />
              <span className="num w-20 text-xs text-[var(--muted)]">{speed.toFixed(1)} cycle/s</span>
            </label>
          </div>
          {table.points.length === 0 || !mode ? (
            <p className="text-sm text-[var(--muted)]">The campaign has no geometry to draw the shapes on.</p>
          ) : (
            <ModeAnimation points={table.points} lines={table.lines} mode={mode} amplitude={amplitude} speed={speed} playing={playing} height={380} />
          )}
          {mode && (
            <p className="mt-1 text-xs text-[var(--muted)]">
              {reducedMotion && !playing && 'Still, because this device asks for reduced motion; press Play to animate. '}
              Mode <span className="num">{mode.mode}</span> at <span className="num">{fmtHz(mode.fHz)} Hz</span>, ζ <span className="num">{mode.zetaPercent.toFixed(3)} %</span>. Exaggerated, slowed-down real part of the shape; the dashed wireframe is at rest. Drag to turn the view.
            </p>
          )}
        </Panel>
        <Panel title="Synthesized from the mode table against measured FRF">
          {pairs.length === 0 && <p className="text-sm text-[var(--muted)]">No measured FRFs to compare.</p>}
          {pairs.length > 0 && (
            <div className="space-y-2" data-testid="table-synthesis" data-version={table.version} data-modes-used={synthesis.data?.modesUsed?.length ?? ''}>
              <PairSelect id="synthesis-pair" pairs={pairs} value={pairIndex ?? drivingIndex} onChange={setPairIndex} />
              {synthesis.isPending && <Spinner label="Synthesizing the FRF…" />}
              {synthesis.isError && <Notice tone="error">The synthesized FRF could not be loaded: {synthesis.error.message}</Notice>}
              {synthesis.data && pair && <SynthesisPlot synthesis={synthesis.data} title={`${pair.response} / ${pair.reference}`} height={400} />}
              {synthesis.data && (
                <p className="text-xs text-[var(--muted)]">
                  Accelerance, H1, from {synthesis.data.modesUsed?.length ?? 0} modes of the table, {synthesis.data.f[0]?.toFixed(1)}–{synthesis.data.f.at(-1)?.toFixed(1)} Hz: the whole band of the table's fits. {synthesis.data.note}
                  {synthesis.data.modesWithoutThisFrf?.length ? ` Mode${synthesis.data.modesWithoutThisFrf.length === 1 ? '' : 's'} ${synthesis.data.modesWithoutThisFrf.join(', ')} came from fits without this FRF and are not in the sum.` : ''}
                </p>
              )}
            </div>
          )}
        </Panel>
      </div>
    </div>
  );
}
