// Overlay of up to 100 averaged FRFs: the picked entries of this campaign, optionally all FRFs of
// another campaign the user belongs to. Curves are min/max-decimated to the plot's resolution (again
// over the visible band after a zoom) and drawn as WebGL traces (scattergl) where a GPU draws them, else as SVG (docs/decisions/overlay-rendering.md).
import { useMemo, useState } from 'react';
import { keepPreviousData, useQuery } from '@tanstack/react-query';
import { frfFigure, type FrfCurve } from '../../lib/frf-figure.ts';
import { frfUnit } from '../../lib/frf-math.ts';
import { fetchOverlay, hitKeys, useMyCampaigns, type OverlayAnswer } from '../../lib/hits-data.ts';
import { overlayColour, plotColours, plotConfig } from '../../lib/plot-style.ts';
import { useThemeName } from '../../lib/theme-name.ts';
import { Button, Notice, Spinner } from '../ui.tsx';
import type { FrfDisplay } from '../tap/frf-panel.tsx';
import { OVERLAY_LIMIT } from './entry-list.tsx';
import { OverlayChart } from './overlay-chart.tsx';
import { webglUsable } from '../../lib/decimate.ts';

/** What the frequency axis is: a zoomed band belongs to one of these and is dropped when it changes. */
const axisKey = (display: FrfDisplay) => `overlay-${display.view === 'nyquist' ? 'nyquist' : display.logF ? 'log-f' : 'linear-f'}`;

/** Above this many curves they are drawn in a few colour groups (one WebGL trace each), not one trace per curve. */
const GROUP_ABOVE = 24;
const GROUPS = 10;

/**
 * Overlay figure. Plotly pays a large fixed cost per trace, so beyond GROUP_ABOVE curves each row
 * holds GROUPS traces of concatenated curves (NaN between them) and the hover names the curve
 * under the cursor; curves longer than the plot is wide are min/max-decimated (peaks kept).
 */
export function buildOverlay(sets: { prefix: string; answer: OverlayAnswer }[], display: FrfDisplay, dark: boolean, gl = true, bandHz: readonly [number, number] | null = null) {
  const curves: FrfCurve[] = [];
  let points = 0;
  for (const set of sets) {
    for (const frf of set.answer.frfs) {
      if (curves.length >= OVERLAY_LIMIT) break;
      points += frf.f.length;
      curves.push({ name: `${set.prefix}${frf.responseDof} / ${frf.excitationDof}`, f: frf.f, h: frf.h1, colour: overlayColour(curves.length, dark) });
    }
  }
  const grouped = curves.length > GROUP_ABOVE;
  const long = curves.some((c) => c.f.length > 2400);
  const fig = frfFigure(grouped ? curves.map((c, i) => ({ ...c, colour: overlayColour(i % GROUPS, dark) })) : curves, {
    ...display,
    colours: plotColours(dark),
    coherence: false,
    gl,
    showLegend: curves.length <= GROUP_ABOVE,
    // Zoom survives new data and a change of kind or view, but not a change of frequency axis.
    uirevision: axisKey(display),
    buckets: long && display.view !== 'nyquist' ? 300 : undefined,
    bandHz,
  });
  if (!grouped) return { ...fig, curves: curves.length, points };

  const unit = frfUnit[display.kind];
  const rowUnit: Record<string, string> = display.view === 'magphase' ? { y: display.db ? `dB re 1 ${unit}` : unit, y2: '°' } : { y: unit, y2: unit };
  const groups = new Map<string, { traces: Record<string, unknown>[]; colour: string; yaxis: string }>();
  fig.data.forEach((t, k) => {
    const curveIndex = display.view === 'nyquist' ? k : Math.floor(k / 2);
    const yaxis = (t.yaxis as string | undefined) ?? 'y';
    const key = `${yaxis}|${curveIndex % GROUPS}`;
    if (!groups.has(key)) groups.set(key, { traces: [], colour: overlayColour(curveIndex % GROUPS, dark), yaxis });
    groups.get(key)!.traces.push(t);
  });
  const data = [...groups.values()].map((g) => {
    const total = g.traces.reduce((n, t) => n + (t.x as ArrayLike<number>).length + 1, 0);
    const x = new Float64Array(total);
    const y = new Float64Array(total);
    const text: string[] = new Array(total);
    let m = 0;
    for (const t of g.traces) {
      const tx = t.x as ArrayLike<number>;
      const ty = t.y as ArrayLike<number>;
      const name = t.name as string;
      for (let i = 0; i < tx.length; i++, m++) {
        x[m] = tx[i]!;
        y[m] = ty[i]!;
        text[m] = name;
      }
      x[m] = NaN;
      y[m] = NaN;
      text[m++] = '';
    }
    const hovertemplate =
      display.view === 'nyquist'
        ? `%{text}<br>Re %{x:.4g} ${unit}<br>Im %{y:.4g} ${unit}<extra></extra>`
        : `%{text}<br>%{x:.2f} Hz · %{y:.4g} ${rowUnit[g.yaxis] ?? ''}<extra></extra>`;
    return { type: gl ? 'scattergl' : 'scatter', mode: 'lines', x, y, text, yaxis: g.yaxis, connectgaps: false, line: { color: g.colour, width: 1 }, hovertemplate, showlegend: false, name: `${g.traces.length} curves` };
  });
  return { data, layout: { ...fig.layout, hovermode: 'closest' }, curves: curves.length, points };
}

export function OverlayPanel({ campaignId, picked, display }: { campaignId: string; picked: string[]; display: FrfDisplay }) {
  const theme = useThemeName();
  const [otherId, setOtherId] = useState('');
  const [addedOther, setAddedOther] = useState<string | null>(null);
  // The frequency band the user zoomed to: curves are decimated again over it, so a zoomed peak
  // shows every line (up to the bucket count) rather than the whole-axis envelope.
  const [zoom, setZoom] = useState<{ axis: string; band: [number, number] } | null>(null);
  const band = zoom && zoom.axis === axisKey(display) ? zoom.band : null;
  const mine = useMyCampaigns();
  const others = (mine.data?.campaigns ?? []).filter((c) => c.id !== campaignId && c.myRole);

  const local = useQuery({
    queryKey: hitKeys.frfs(campaignId, picked, display.kind),
    queryFn: () => fetchOverlay(`/campaigns/${campaignId}/frfs?entries=${picked.join(',')}&kind=${display.kind}`),
    enabled: picked.length > 0,
    placeholderData: keepPreviousData,
  });
  const other = useQuery({
    queryKey: hitKeys.frfs(addedOther ?? '', ['all'], display.kind),
    queryFn: () => fetchOverlay(`/campaigns/${addedOther}/frfs?kind=${display.kind}`),
    enabled: Boolean(addedOther),
    placeholderData: keepPreviousData,
  });
  const otherName = others.find((c) => c.id === addedOther)?.name ?? (mine.data?.campaigns ?? []).find((c) => c.id === addedOther)?.name ?? 'other campaign';

  const figure = useMemo(() => {
    const sets: { prefix: string; answer: OverlayAnswer }[] = [];
    if (picked.length && local.data) sets.push({ prefix: '', answer: local.data });
    if (addedOther && other.data) sets.push({ prefix: `${otherName.slice(0, 18)}: `, answer: other.data });
    if (!sets.length) return null;
    const receivedAt = Math.max(picked.length ? (local.data?.receivedAt ?? 0) : 0, addedOther ? (other.data?.receivedAt ?? 0) : 0);
    const total = sets.reduce((n, s) => n + s.answer.frfs.length, 0);
    return { ...buildOverlay(sets, display, theme === 'dark', webglUsable(), band), receivedAt, total };
  }, [picked.length, local.data, addedOther, other.data, otherName, display, theme, band]);

  const unit = frfUnit[display.kind];
  const caption =
    display.view === 'magphase'
      ? `H1 magnitude ${display.db ? `in dB re 1 ${unit}` : `in ${unit}`} and phase in degrees wrapped to (−180°, 180°]`
      : display.view === 'reim'
        ? `Real and imaginary parts of H1 in ${unit}`
        : `Nyquist plot of H1: Im against Re, both in ${unit}, equal scales; hover shows the frequency`;

  return (
    <div className="space-y-3">
      <div className="flex flex-wrap items-end gap-2 text-sm">
        <div className="flex flex-col gap-1">
          <label htmlFor="other-campaign" className="text-xs font-medium text-[var(--muted)]">
            Add the FRFs of another campaign
          </label>
          <select id="other-campaign" value={otherId} onChange={(e) => setOtherId(e.target.value)} className="min-h-10 max-w-72 rounded-md border border-[var(--line)] bg-[var(--panel)] px-2 text-sm" disabled={!others.length}>
            <option value="">{mine.isPending ? 'Loading your campaigns…' : others.length ? 'Choose a campaign…' : 'No other campaign of yours'}</option>
            {others.map((c) => (
              <option key={c.id} value={c.id}>
                {c.name}
              </option>
            ))}
          </select>
        </div>
        <Button variant="secondary" disabled={!otherId || otherId === addedOther} onClick={() => setAddedOther(otherId)}>
          Add to the overlay
        </Button>
        {addedOther && (
          <Button variant="ghost" onClick={() => setAddedOther(null)}>
            Remove {otherName.slice(0, 24)}
          </Button>
        )}
      </div>
      {local.isError && <Notice tone="error">The FRFs could not be loaded: {local.error.message}</Notice>}
      {other.isError && <Notice tone="error">The other campaign's FRFs could not be loaded: {other.error.message}</Notice>}
      {(local.isFetching || other.isFetching) && <Spinner label="Loading the FRFs…" />}
      {!figure && !local.isFetching && !other.isFetching && (
        <p className="rounded-md border border-dashed border-[var(--line)] p-6 text-center text-sm text-[var(--muted)]" data-testid="overlay-empty">
          Nothing to overlay yet. Tick DOFs in the schedule list, or press “All done”, to compare up to 100 FRFs.
        </p>
      )}
      {figure && (
        <>
          {figure.total > OVERLAY_LIMIT && <Notice tone="info">Only the first {OVERLAY_LIMIT} of {figure.total} FRFs are drawn.</Notice>}
          <OverlayChart
            data={figure.data}
            layout={figure.layout}
            config={plotConfig}
            height={display.view === 'nyquist' ? 560 : 600}
            receivedAt={figure.receivedAt}
            curves={figure.curves}
            points={figure.points}
            label={`Overlay of ${figure.curves} FRFs`}
            band={band}
            onBandChange={(next) =>
              setZoom((prev) => {
                const axis = axisKey(display);
                if (!next) return prev === null ? prev : null;
                const same = prev !== null && prev.axis === axis && prev.band[0] === next[0] && prev.band[1] === next[1];
                return same ? prev : { axis, band: next };
              })
            }
          />
          <p className="text-xs text-[var(--muted)]">
            {caption}. Each colour is one DOF pair (response / excitation); hover a curve for its name and values.{figure.curves > GROUP_ABOVE ? ` Above ${GROUP_ABOVE} curves the legend is hidden and colours repeat every ${GROUPS} curves: hover a curve to name it.` : ''}
          </p>
        </>
      )}
    </div>
  );
}
