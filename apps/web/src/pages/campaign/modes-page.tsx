// Modes (design.md step 5): a background fit over the chosen FRFs and band gives the CMIF and the
// stabilization diagram; the lead picks poles, computes shapes, and everyone reads the mode
// table, the MAC matrix, measured against synthesized FRFs and the shapes animated on the geometry.
import { useEffect, useMemo, useRef, useState } from 'react';
import { useParams } from 'react-router';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { clusterStablePoles } from '@resonote/dsp';
import { api } from '../../lib/api.ts';
import { useSchedule, useSettings } from '../../lib/campaign-data.ts';
import { useFailure } from '../../lib/mutation.ts';
import { useToast } from '../../lib/toast.tsx';
import { fmtHz, modeKeys, samePole, useCurrentModes, useFit, useFits, useSynthesis, type ChosenModes, type ModalFit, type PoleRef } from '../../lib/modes-data.ts';
import { Button, Notice, Panel, Spinner } from '../../components/ui.tsx';
import { FitForm, type FitRequest } from '../../components/modes/fit-form.tsx';
import { StabilizationPlot } from '../../components/modes/stabilization-plot.tsx';
import { ChosenPoles } from '../../components/modes/chosen-poles.tsx';
import { ModeTable } from '../../components/modes/mode-table.tsx';
import { MacHeatmap } from '../../components/modes/mac-heatmap.tsx';
import { CorrelationPanel } from '../../components/model/correlation-panel.tsx';
import { SynthesisPlot } from '../../components/modes/synthesis-plot.tsx';
import { ModeAnimation } from '../../components/modes/mode-animation.tsx';
import { useCampaignContext } from './campaign-context.ts';

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

  const [startedFitId, setStartedFitId] = useState<string | null>(null);
  const shownFitId = startedFitId ?? current.data?.fitId ?? fits.data?.fits[0]?.id ?? null;
  const shown = useFit(campaignId, shownFitId);
  const fit = shown.data?.fit;
  // The modes on show: those of the shown fit, or else the campaign's current ones (an earlier fit).
  const modesFitId = fit?.modes ? fit.id : (current.data?.fitId ?? null);
  const modesFit = useFit(campaignId, modesFitId);
  const modes = modesFit.data?.fit.modes ?? null;

  const [chosen, setChosen] = useState<PoleRef[]>([]);
  const initialisedFor = useRef<string | null>(null);
  useEffect(() => {
    if (!fit || initialisedFor.current === fit.id || fit.status !== 'done') return;
    initialisedFor.current = fit.id;
    setChosen((fit.modes?.table ?? []).map((m) => m.pole).filter((p): p is PoleRef => Boolean(p)));
  }, [fit]);

  const run = useMutation({
    mutationFn: (req: FitRequest) => api<{ fit: { id: string; status: string; reused?: boolean } }>(`/campaigns/${campaignId}/modes/fits`, { body: req }),
    onSuccess: ({ fit: started }) => {
      initialisedFor.current = null;
      setChosen([]);
      setStartedFitId(started.id);
      void client.invalidateQueries({ queryKey: modeKeys.fits(campaignId) });
      toast(started.reused ? 'info' : 'ok', started.reused ? 'The same fit was run before on the same data; showing its results.' : 'Fit started. The diagram appears when it is done.');
    },
    onError: (err) => fail(err),
  });

  const compute = useMutation({
    mutationFn: (poles: PoleRef[]) => api<{ modes: ChosenModes }>(`/campaigns/${campaignId}/modes/fits/${fit!.id}/modes`, { body: { poles } }),
    onSuccess: ({ modes: computed }, poles) => {
      client.setQueryData<{ fit: ModalFit }>(modeKeys.fit(campaignId, fit!.id), (old) => (old ? { fit: { ...old.fit, modes: { ...computed, table: computed.table.map((m, i) => ({ ...m, pole: m.pole ?? poles[i] })) } } } : old));
      void client.invalidateQueries({ queryKey: modeKeys.current(campaignId), exact: true });
      void client.invalidateQueries({ queryKey: modeKeys.fits(campaignId) });
      toast('ok', `Shapes computed for ${computed.table.length} mode${computed.table.length === 1 ? '' : 's'}.`);
    },
    onError: (err) => fail(err),
  });

  const toggle = (p: PoleRef) => setChosen((list) => (list.some((x) => samePole(x, p)) ? list.filter((x) => !samePole(x, p)) : [...list, p]));
  const addStable = (order: number) => {
    const o = fit?.result?.diagram.orders.find((x) => x.order === order);
    if (!o) return;
    // The same mode is not chosen twice: a chosen pole within 1 % of a new one is replaced.
    const add = o.poles.map((p, index) => ({ p, ref: { order, index } })).filter(({ p }) => p.stable === 'all');
    setChosen((list) => {
      const keep = list.filter((x) => {
        const pole = fit?.result?.diagram.orders.find((y) => y.order === x.order)?.poles[x.index];
        return !pole || !add.some(({ p }) => Math.abs(p.fHz - pole.fHz) / p.fHz < 0.01);
      });
      return [...keep, ...add.map((a) => a.ref)];
    });
    toast('info', `${add.length} stable pole${add.length === 1 ? '' : 's'} at order ${order} chosen.`);
  };

  const suggest = () => {
    const diagram = fit?.result?.diagram;
    if (!diagram) return;
    const clusters = clusterStablePoles(diagram);
    setChosen(clusters.map((c) => c.representative));
    toast(
      'info',
      clusters.length
        ? `${clusters.length} mode${clusters.length === 1 ? '' : 's'} suggested: ${clusters.map((c) => `${fmtHz(c.fHz)} Hz`).join(', ')}. Check them on the diagram, then compute shapes.`
        : 'No pole is stable at enough orders to suggest a mode: fit higher orders or a narrower band, or choose poles by hand.',
    );
  };

  const entries = schedule.data?.entries ?? [];
  const band = settings.data?.current.settings.bandHz;
  const running = fit && (fit.status === 'queued' || fit.status === 'running');
  const nothingYet = current.data && fits.data && !shownFitId;

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
              {schedule.data && !settings.isPending && <FitForm entries={entries} rovingSide={campaign.testType === 'roving-response' ? 'response' : 'excitation'} defaultBand={band} busy={run.isPending || Boolean(running)} onRun={(req) => run.mutate(req)} />}
            </Panel>
          )}
          {fit?.status === 'done' && fit.result && (
            <Panel title="Chosen poles">
              <ChosenPoles orders={fit.result.diagram.orders} chosen={chosen} canEdit={canLead} busy={compute.isPending} onRemove={toggle} onAddStable={addStable} onSuggest={suggest} onClear={() => setChosen([])} onCompute={() => compute.mutate(chosen)} />
            </Panel>
          )}
        </div>

        <Panel title="Stabilization diagram over the CMIF" actions={fit ? <FitCaption fit={fit} /> : undefined}>
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
            </div>
          )}
        </Panel>
      </div>

      {modesFit.isPending && modesFitId && <Spinner label="Loading the chosen modes…" />}
      {fit && !fit.modes && modes && (
        <Notice tone="info">The modes below were chosen from an earlier fit. Choose poles in this fit and compute shapes to replace them.</Notice>
      )}
      {modes && modes.table.length > 0 && <ModeResults campaignId={campaignId} fitId={modesFitId!} modes={modes} points={current.data?.points ?? []} lines={current.data?.lines ?? []} />}
      {fit?.status === 'done' && !modes && !canLead && <p className="text-sm text-[var(--muted)]">No modes chosen from this fit yet.</p>}
      <CorrelationPanel campaignId={campaignId} />
    </div>
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

function ModeResults({ campaignId, fitId, modes, points, lines }: { campaignId: string; fitId: string; modes: ChosenModes; points: { id: string; label: string; x: number; y: number; z: number }[]; lines: { pointA: string; pointB: string }[] }) {
  const [selected, setSelected] = useState(1);
  const mode = modes.table.find((m) => m.mode === selected) ?? modes.table[0]!;
  const pairs = modes.synthesisFrac;
  const drivingIndex = Math.max(0, pairs.findIndex((p) => p.response === p.reference));
  const [pairIndex, setPairIndex] = useState<number | null>(null);
  const pair = pairs[pairIndex ?? drivingIndex] ?? null;
  const synthesis = useSynthesis(campaignId, fitId, pair);
  const reducedMotion = useMemo(() => typeof window !== 'undefined' && window.matchMedia?.('(prefers-reduced-motion: reduce)').matches, []);
  const [playing, setPlaying] = useState(!reducedMotion);
  const [amplitude, setAmplitude] = useState(0.1);
  const [speed, setSpeed] = useState(0.6);

  return (
    <div className="space-y-4" data-testid="mode-results">
      <div className="grid gap-4 lg:grid-cols-2">
        <Panel title="Mode table">
          <ModeTable modes={modes.table} correction={modes.correction} selected={mode.mode} onSelect={setSelected} />
          {modes.chosenBy && (
            <p className="mt-2 text-xs text-[var(--muted)]">
              Chosen by {modes.chosenBy}
              {modes.chosenAt ? ` on ${new Date(modes.chosenAt).toLocaleString()}` : ''}.
            </p>
          )}
        </Panel>
        <Panel title="MAC matrix (auto-MAC of the shapes)">
          <MacHeatmap mac={modes.mac} modes={modes.table} height={Math.max(260, 120 + 48 * modes.table.length)} />
          <p className="mt-1 text-xs text-[var(--muted)]">1 on the diagonal; small values off it mean the shapes are distinct. MAC has no mass weighting, so it is not an orthogonality check.</p>
        </Panel>
      </div>
      <div className="grid gap-4 lg:grid-cols-2">
        <Panel title="Shape on the geometry">
          <div className="mb-3 flex flex-wrap items-end gap-x-4 gap-y-2">
            <div role="group" aria-label="Mode to animate" className="flex flex-wrap gap-1">
              {modes.table.map((m) => (
                <button
                  key={m.mode}
                  type="button"
                  aria-pressed={m.mode === mode.mode}
                  onClick={() => setSelected(m.mode)}
                  className={`num min-h-9 rounded-md border px-2 text-xs ${m.mode === mode.mode ? 'border-accent bg-accent-soft font-semibold text-accent-strong' : 'border-[var(--line)] text-[var(--muted)] hover:border-accent'}`}
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
          {points.length === 0 ? (
            <p className="text-sm text-[var(--muted)]">The campaign has no geometry to draw the shapes on.</p>
          ) : (
            <ModeAnimation points={points} lines={lines} mode={mode} amplitude={amplitude} speed={speed} playing={playing} height={380} />
          )}
          <p className="mt-1 text-xs text-[var(--muted)]">
            {reducedMotion && !playing && 'Still, because this device asks for reduced motion; press Play to animate. '}
            Mode <span className="num">{mode.mode}</span> at <span className="num">{fmtHz(mode.fHz)} Hz</span>, ζ <span className="num">{mode.zetaPercent.toFixed(3)} %</span>. Exaggerated, slowed-down real part of the shape; the dashed wireframe is at rest. Drag to turn the view.
          </p>
        </Panel>
        <Panel title="Synthesized against measured FRF">
          {pairs.length === 0 && <p className="text-sm text-[var(--muted)]">No FRFs to compare.</p>}
          {pairs.length > 0 && (
            <div className="space-y-2">
              <label className="flex flex-col gap-1 text-sm font-medium" htmlFor="synthesis-pair">
                FRF (response / excitation)
                <select id="synthesis-pair" className="num min-h-10 rounded-md border border-[var(--line)] bg-[var(--panel)] px-2 text-sm font-normal" value={pairIndex ?? drivingIndex} onChange={(e) => setPairIndex(Number(e.target.value))}>
                  {pairs.map((p, i) => (
                    <option key={`${p.response}|${p.reference}`} value={i}>
                      {p.response} / {p.reference}
                      {p.response === p.reference ? ' (driving point)' : ''} · FRAC {p.frac.toFixed(3)}
                    </option>
                  ))}
                </select>
              </label>
              {synthesis.isPending && <Spinner label="Synthesizing the FRF…" />}
              {synthesis.isError && <Notice tone="error">The synthesized FRF could not be loaded: {synthesis.error.message}</Notice>}
              {synthesis.data && pair && <SynthesisPlot synthesis={synthesis.data} title={`${pair.response} / ${pair.reference}`} height={400} />}
              <p className="text-xs text-[var(--muted)]">Accelerance, H1. FRAC compares the shapes of the two curves over the band (1 = identical); it cannot see a constant scale error.</p>
            </div>
          )}
        </Panel>
      </div>
    </div>
  );
}
