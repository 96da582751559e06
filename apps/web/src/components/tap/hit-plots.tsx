// One hit as the engineer judges it: force and response time traces with the trigger, the force
// window and the exponential window; the force spectrum against the band of interest with the
// −10/−20 dB levels and the measured roll-off frequencies. Used by Tap and (read-only) Review.
import { useMemo } from 'react';
import { Plot } from '../plot.tsx';
import { Notice, Spinner } from '../ui.tsx';
import { useHitDetail, type HitDetail } from '../../lib/hits-data.ts';
import { formatHz } from '../../lib/frf-math.ts';
import { axis, baseLayout, plotColours, plotConfig, responseColour, type PlotColours } from '../../lib/plot-style.ts';
import { useThemeName } from '../../lib/theme-name.ts';

function timeFigure(d: HitDetail, c: PlotColours) {
  const force = d.channels.find((ch) => ch.role === 'force');
  const responses = d.channels.filter((ch) => ch.role === 'response');
  const fw = d.forceWindow;
  const fwEnd = fw.startS + fw.lengthS;
  const recordS = d.samples / d.sampleRateHz;
  // The pulse lasts milliseconds: the force row shows the start of the record, up past the window.
  const forceSpan = Math.min(recordS, Math.max(0.05, (fwEnd + fw.taperS) * 1.6));
  const data: Record<string, unknown>[] = [];
  if (force) {
    data.push({ type: 'scatter', mode: 'lines', name: `Force ${force.dof ?? ''} (N)`, x: d.t, y: force.values, xaxis: 'x', yaxis: 'y', line: { color: c.force, width: 1.2 }, hovertemplate: 'force %{y:.2f} N<extra></extra>' });
  }
  let peak = 0;
  responses.forEach((ch, i) => {
    for (const v of ch.values) peak = Math.max(peak, Math.abs(v));
    data.push({ type: 'scatter', mode: 'lines', name: `Response ${ch.dof ?? ''} (${ch.unit})`, x: d.t, y: ch.values, xaxis: 'x2', yaxis: 'y2', line: { color: responseColour(i, c.dark), width: 1 }, hovertemplate: `${ch.dof ?? 'response'} %{y:.3g} ${ch.unit}<extra></extra>` });
  });
  const exp = d.exponentialWindow;
  if (exp && peak > 0) {
    const xs: number[] = [];
    const up: number[] = [];
    const steps = 200;
    for (let i = 0; i <= steps; i++) {
      const t = (recordS * i) / steps;
      xs.push(t);
      up.push(peak * (t < exp.startS ? 1 : Math.exp(-(t - exp.startS) / exp.tauS)));
    }
    const name = `Exponential window, τ = ${exp.tauS.toFixed(3)} s (${exp.endLevelPercent.toFixed(1)} % at the end), drawn at ± the response peak`;
    data.push({ type: 'scatter', mode: 'lines', name, x: xs, y: up, xaxis: 'x2', yaxis: 'y2', line: { color: c.muted, width: 1, dash: 'dash' }, hoverinfo: 'skip', legendgroup: 'exp' });
    data.push({ type: 'scatter', mode: 'lines', name, x: xs, y: up.map((v) => -v), xaxis: 'x2', yaxis: 'y2', line: { color: c.muted, width: 1, dash: 'dash' }, hoverinfo: 'skip', legendgroup: 'exp', showlegend: false });
  }
  const vline = (x: number, xref: string, yref: string) => ({ type: 'line', x0: x, x1: x, xref, yref, y0: 0, y1: 1, line: { color: c.trigger, width: 1, dash: 'dot' } });
  const shapes = [
    { type: 'rect', xref: 'x', yref: 'y domain', x0: fw.startS, x1: fwEnd, y0: 0, y1: 1, fillcolor: c.window, line: { width: 0 }, layer: 'below' },
    { type: 'rect', xref: 'x', yref: 'y domain', x0: fwEnd, x1: fwEnd + fw.taperS, y0: 0, y1: 1, fillcolor: c.window, opacity: 0.5, line: { width: 0 }, layer: 'below' },
    vline(d.triggerTimeS, 'x', 'y domain'),
    vline(d.triggerTimeS, 'x2', 'y2 domain'),
  ];
  const annotations = [
    { xref: 'x', yref: 'y domain', x: fw.startS + fw.lengthS / 2, y: 1, yanchor: 'bottom', showarrow: false, text: `force window: ${(fw.lengthS * 1000).toFixed(0)} ms at 1, then ${(fw.taperS * 1000).toFixed(0)} ms taper`, font: { size: 11, color: c.muted } },
    { xref: 'x', yref: 'y domain', x: d.triggerTimeS, y: 0.02, xanchor: 'left', yanchor: 'bottom', showarrow: false, text: ` trigger ${(d.triggerTimeS * 1000).toFixed(0)} ms`, font: { size: 11, color: c.muted } },
  ];
  const layout = baseLayout(c, {
    margin: { l: 64, r: 16, t: 40, b: 44 },
    grid: undefined,
    shapes,
    annotations,
    xaxis: axis(c, 'Time (s) — start of the record', { domain: [0, 1], anchor: 'y', range: [0, forceSpan], hoverformat: '.4f' }),
    yaxis: axis(c, 'Force (N)', { domain: [0.6, 1], anchor: 'x' }),
    xaxis2: axis(c, 'Time (s) — whole record', { domain: [0, 1], anchor: 'y2', range: [0, recordS], hoverformat: '.4f' }),
    yaxis2: axis(c, `Response (${responses[0]?.unit ?? 'm/s²'})`, { domain: [0, 0.4], anchor: 'x2', exponentformat: 'power' }),
    legend: { orientation: 'h', x: 0, y: -0.16, yanchor: 'top', font: { size: 11 } },
  });
  return { data, layout };
}

function spectrumFigure(d: HitDetail, c: PlotColours) {
  const s = d.forceSpectrum;
  const fMax = s.f[s.f.length - 1] ?? 1;
  const data = [{ type: 'scatter', mode: 'lines', name: 'Force ESD', x: s.f, y: s.levelDb, line: { color: c.force, width: 1.2 }, hovertemplate: 'force ESD %{y:.1f} dB re |F(0)|²<extra></extra>' }];
  const shapes: Record<string, unknown>[] = [
    { type: 'rect', xref: 'x', yref: 'y domain', x0: s.bandHz.low, x1: s.bandHz.high, y0: 0, y1: 1, fillcolor: c.band, line: { width: 0 }, layer: 'below' },
    { type: 'line', xref: 'x domain', yref: 'y', x0: 0, x1: 1, y0: -10, y1: -10, line: { color: c.muted, width: 1, dash: 'dash' } },
    { type: 'line', xref: 'x domain', yref: 'y', x0: 0, x1: 1, y0: -20, y1: -20, line: { color: c.muted, width: 1, dash: 'dash' } },
  ];
  const annotations: Record<string, unknown>[] = [
    { xref: 'x', yref: 'y domain', x: (s.bandHz.low + s.bandHz.high) / 2, y: 0.02, yanchor: 'bottom', showarrow: false, text: `band of interest ${s.bandHz.low}–${s.bandHz.high} Hz`, font: { size: 11, color: c.muted } },
    { xref: 'x domain', yref: 'y', x: 1, y: -10, xanchor: 'right', yanchor: 'bottom', showarrow: false, text: '−10 dB', font: { size: 11, color: c.muted } },
    { xref: 'x domain', yref: 'y', x: 1, y: -20, xanchor: 'right', yanchor: 'bottom', showarrow: false, text: '−20 dB', font: { size: 11, color: c.muted } },
  ];
  // The marks read from the plotted curve itself (the server's roll-off check under the current settings).
  for (const [level, f] of [
    [10, s.rollOff10dBHz],
    [20, s.rollOff20dBHz],
  ] as const) {
    if (f === null || f === undefined || f > fMax) continue;
    const inside = f < s.bandHz.high;
    shapes.push({ type: 'line', xref: 'x', yref: 'y domain', x0: f, x1: f, y0: 0, y1: 1, line: { color: inside && level >= s.rollOffDb ? '#b3261e' : c.ink, width: 1, dash: 'dot' } });
    annotations.push({ xref: 'x', yref: 'y', x: f, y: -level, xanchor: 'left', yanchor: 'top', showarrow: false, text: ` −${level} dB at ${formatHz(f)}${inside && level >= s.rollOffDb ? ' ✕ inside the band' : ''}`, font: { size: 11, color: c.ink } });
  }
  const minDb = Math.max(-60, Math.min(-25, ...s.levelDb.filter(Number.isFinite)));
  const layout = baseLayout(c, {
    title: { text: 'Force ESD, dB re |F(0)|² (single hit)', font: { size: 13 }, x: 0, xanchor: 'left' },
    showlegend: false,
    shapes,
    annotations,
    xaxis: axis(c, 'Frequency (Hz)', { range: [0, fMax], hoverformat: '.1f' }),
    yaxis: axis(c, 'Level (dB re |F(0)|²)', { range: [minDb - 2, 3] }),
  });
  return { data, layout };
}

export function HitTimePlot({ detail, height = 360 }: { detail: HitDetail; height?: number }) {
  const theme = useThemeName();
  const fig = useMemo(() => timeFigure(detail, plotColours(theme === 'dark')), [detail, theme]);
  return <Plot label={`Time traces of hit ${detail.hit.sequence}: force in N and response in m/s², with trigger and windows`} data={fig.data} layout={fig.layout} config={plotConfig} height={height} />;
}

export function ForceSpectrumPlot({ detail, height = 260 }: { detail: HitDetail; height?: number }) {
  const theme = useThemeName();
  const fig = useMemo(() => spectrumFigure(detail, plotColours(theme === 'dark')), [detail, theme]);
  return <Plot label={`Force spectrum of hit ${detail.hit.sequence} in dB re |F(0)|², with the band of interest`} data={fig.data} layout={fig.layout} config={plotConfig} height={height} />;
}

/** Loads one hit and shows both plots, with loading and error states in plain words. */
export function HitPlots({ campaignId, hitId, compact = false }: { campaignId: string; hitId: string | null; compact?: boolean }) {
  const detail = useHitDetail(campaignId, hitId);
  if (!hitId) return <p className="text-sm text-[var(--muted)]">No hit yet. Strike the structure (or upload a recording) and its time traces and force spectrum appear here.</p>;
  if (detail.isPending) return <Spinner label="Loading the hit's time traces…" />;
  if (detail.isError) return <Notice tone="error">The hit could not be loaded: {detail.error.message}</Notice>;
  return (
    <div className="space-y-2" data-testid="hit-plots" data-hit-sequence={detail.data.hit.sequence}>
      <HitTimePlot detail={detail.data} height={compact ? 320 : 360} />
      <ForceSpectrumPlot detail={detail.data} height={compact ? 240 : 260} />
    </div>
  );
}
