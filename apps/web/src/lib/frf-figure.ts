// Plotly figures of FRFs, for one DOF (Tap, Review) and for overlays of up to 100 (Review):
// magnitude + phase (+ coherence), real + imaginary, or Nyquist (Re against Im). All the complex
// arithmetic goes through frf-math.ts; here only traces, axes and labels.
import { firstPositiveLine, frfUnit, magnitudes, magnitudesDb, phasesDeg, phasesDegUnwrapped, toFloat64, type ComplexArrays, type FrfKind } from './frf-math.ts';
import { axis, baseLayout, baseMargin, monoFont, type PlotColours } from './plot-style.ts';
import { minMaxDecimate } from './decimate.ts';

export type FrfView = 'magphase' | 'reim' | 'nyquist';
export const frfViewLabel: Record<FrfView, string> = { magphase: 'Magnitude and phase', reim: 'Real and imaginary', nyquist: 'Nyquist (Re against Im)' };

export interface FrfCurve {
  name: string;
  f: ArrayLike<number>;
  h: ComplexArrays;
  coherence?: ArrayLike<number>;
  colour: string;
  dash?: 'solid' | 'dot' | 'dash';
  /** Hidden from the legend (e.g. H2 beside H1 of the same channel). */
  legend?: boolean;
}

export interface FrfFigureOptions {
  kind: FrfKind;
  view: FrfView;
  db: boolean;
  logF: boolean;
  colours: PlotColours;
  /** Adds a coherence row under magnitude and phase. */
  coherence: boolean;
  /** WebGL traces: needed for overlays of many long FRFs. */
  gl?: boolean;
  title?: string;
  showLegend?: boolean;
  /** Keeps zoom and pan across data updates while this string stays the same. */
  uirevision?: string;
  /** Min/max buckets per curve and row (magnitude, phase, re, im) when curves are longer; none by default. */
  buckets?: number;
  /**
   * Only the lines from lowHz to highHz (and one either side, so the curve reaches the plot's edges)
   * in the magnitude/phase and re/im views: a zoomed overlay spends its buckets on what is visible.
   */
  bandHz?: readonly [number, number] | null;
  /** Phase unwrapped (continuous through ±180°, frf-math `phasesDegUnwrapped`) instead of wrapped to (−180°, 180°]. */
  unwrap?: boolean;
  /**
   * A short plot (Tap at 1024×768, about 250 px): short row titles ("|H| dB", "Phase °", "γ²") whose
   * full units the caller states beside the plot, smaller tick labels and fewer ticks per row, so the
   * three rows' titles do not run into each other. The x-axis title stays once, under the last row.
   */
  compact?: boolean;
}

function slice(a: ArrayLike<number>, from: number, to = a.length): Float64Array {
  const t = toFloat64(a);
  return from === 0 && to === t.length ? t : t.subarray(from, to);
}

/** First index i with f[i] ≥ value (or > value when `above`) in an ascending axis; f.length when none. */
function firstIndex(f: ArrayLike<number>, value: number, above = false): number {
  let lo = 0;
  let hi = f.length;
  while (lo < hi) {
    const mid = (lo + hi) >> 1;
    if (f[mid]! < value || (above && f[mid]! === value)) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}

/** Index range [from, to) of the lines to draw: positive lines on a log axis, the band when given. */
export function linesToDraw(f: ArrayLike<number>, logF: boolean, bandHz?: readonly [number, number] | null): [number, number] {
  let from = logF ? firstPositiveLine(f) : 0;
  let to = f.length;
  if (bandHz && bandHz[1] > bandHz[0]) {
    from = Math.max(from, firstIndex(f, bandHz[0]) - 1);
    to = Math.min(to, firstIndex(f, bandHz[1], true) + 1);
    if (to <= from) to = Math.min(f.length, from + 1);
  }
  return [from, to];
}

/** Builds plotly data and layout for the chosen view. */
export function frfFigure(curves: FrfCurve[], o: FrfFigureOptions): { data: Record<string, unknown>[]; layout: Record<string, unknown> } {
  const unit = frfUnit[o.kind];
  const c = o.colours;
  const type = o.gl ? 'scattergl' : 'scatter';
  const data: Record<string, unknown>[] = [];
  const magTitle = o.db ? `|H| (dB re 1 ${unit})` : `|H| (${unit})`;
  const magSuffix = o.db ? ` dB re 1 ${unit}` : ` ${unit}`;
  const showLegend = o.showLegend ?? curves.length <= 12;

  const thin = (x: Float64Array, y: Float64Array) => (o.buckets ? minMaxDecimate(x, y, o.buckets) : { x, y });
  const xy = (x: Float64Array, y: Float64Array) => {
    const d = thin(x, y);
    return { x: d.x, y: d.y };
  };
  for (const curve of curves) {
    const [from, to] = linesToDraw(curve.f, o.logF, o.view === 'nyquist' ? null : o.bandHz);
    const f = slice(curve.f, from, to);
    const h = { re: slice(curve.h.re, from, to), im: slice(curve.h.im, from, to) };
    const line = { color: curve.colour, width: 1.2, dash: curve.dash ?? 'solid' };
    const common = { type, mode: 'lines', name: curve.name, legendgroup: curve.name, line, showlegend: false };
    if (o.view === 'magphase') {
      const mag = o.db ? magnitudesDb(h) : magnitudes(h);
      data.push({ ...common, ...xy(f, mag), yaxis: 'y', showlegend: showLegend && curve.legend !== false, hovertemplate: `${curve.name}: %{y:.${o.db ? 2 : 4}${o.db ? 'f' : 'g'}}${magSuffix}<extra></extra>` });
      data.push({ ...common, ...xy(f, o.unwrap ? phasesDegUnwrapped(h) : phasesDeg(h)), yaxis: 'y2', hovertemplate: `${curve.name}: %{y:.1f}°<extra></extra>` });
      if (o.coherence && curve.coherence) data.push({ ...common, x: f, y: slice(curve.coherence, from, to), yaxis: 'y3', hovertemplate: `${curve.name} γ²: %{y:.3f}<extra></extra>` });
    } else if (o.view === 'reim') {
      data.push({ ...common, ...xy(f, h.re), yaxis: 'y', showlegend: showLegend && curve.legend !== false, hovertemplate: `${curve.name} Re: %{y:.4g} ${unit}<extra></extra>` });
      data.push({ ...common, ...xy(f, h.im), yaxis: 'y2', hovertemplate: `${curve.name} Im: %{y:.4g} ${unit}<extra></extra>` });
      if (o.coherence && curve.coherence) data.push({ ...common, x: f, y: slice(curve.coherence, from, to), yaxis: 'y3', hovertemplate: `${curve.name} γ²: %{y:.3f}<extra></extra>` });
    } else {
      data.push({
        ...common,
        x: h.re,
        y: h.im,
        customdata: f,
        showlegend: showLegend && curve.legend !== false,
        hovertemplate: `${curve.name}<br>%{customdata:.2f} Hz<br>Re %{x:.4g} ${unit}<br>Im %{y:.4g} ${unit}<extra></extra>`,
      });
    }
  }

  // On a log axis plotly formats the decade labels with hoverformat unless tickformat is set ("10.00");
  // '~g' with dtick D2 labels 10, 20, 50, 100, 200 … (every 1-2-5; all digits crowd a narrow plot).
  const fAxis = axis(c, 'Frequency (Hz)', o.logF ? { type: 'log', hoverformat: '.2f', tickformat: '~g', dtick: 'D2' } : { type: 'linear', hoverformat: '.2f' });
  const withCoh = o.coherence && o.view !== 'nyquist' && curves.some((x) => x.coherence);
  if (o.view === 'nyquist') {
    return {
      data,
      layout: baseLayout(c, {
        ...titled(o.title, showLegend),
        hovermode: 'closest',
        showlegend: showLegend,
        uirevision: o.uirevision,
        xaxis: axis(c, `Re(H) (${unit})`, { exponentformat: 'power', zeroline: true }),
        yaxis: axis(c, `Im(H) (${unit})`, { exponentformat: 'power', zeroline: true, scaleanchor: 'x', scaleratio: 1 }),
      }),
    };
  }
  const domains = withCoh ? [[0.5, 1], [0.26, 0.46], [0, 0.2]] : [[0.42, 1], [0, 0.36]];
  // Compact: smaller tick labels and a short title per row (the caller states the full units).
  const tick = o.compact ? { tickfont: { family: monoFont, size: 9 } } : {};
  const row = (full: string, short: string, extra: Record<string, unknown>) => ({ ...axis(c, full, extra), ...tick, ...(o.compact ? { title: { text: short, font: { size: 11 }, standoff: 4 } } : {}) });
  const top = o.view === 'magphase' ? row(magTitle, o.db ? '|H| dB' : '|H|', { domain: domains[0], exponentformat: 'power', nticks: o.compact ? 5 : 10 }) : row(`Re(H) (${unit})`, 'Re(H)', { domain: domains[0], exponentformat: 'power', nticks: o.compact ? 5 : 10 });
  const midExtra = o.view !== 'magphase' ? { domain: domains[1], exponentformat: 'power', ...(o.compact ? { nticks: 3 } : {}) } : o.unwrap ? { domain: domains[1], nticks: o.compact ? 3 : 6 } : { domain: domains[1], range: [-185, 185], tickvals: o.compact ? [-180, 0, 180] : [-180, -90, 0, 90, 180] };
  const mid = o.view === 'magphase' ? row('Phase (°)', 'Phase °', midExtra) : row(`Im(H) (${unit})`, 'Im(H)', midExtra);
  const layout = baseLayout(c, {
    ...titled(o.title, showLegend),
    showlegend: showLegend,
    uirevision: o.uirevision,
    xaxis: { ...fAxis, ...tick, anchor: withCoh ? 'y3' : 'y2' },
    // nticks: plotly's default allows one label per 40 px, too few on a short magnitude row of an overlay.
    yaxis: top,
    yaxis2: mid,
    ...(withCoh ? { yaxis3: row('Coherence γ²', 'γ²', { domain: domains[2], range: [0, 1.05], tickvals: o.compact ? [0, 1] : [0, 0.5, 1] }) } : {}),
  });
  return { data, layout };
}

/** The plot's title at the top left of the figure, with room under it for the legend row. */
function titled(title: string | undefined, legend: boolean): Record<string, unknown> {
  if (!title) return {};
  return {
    title: { text: title, font: { size: 13 }, x: 0, xref: 'paper', xanchor: 'left', y: 1, yref: 'container', yanchor: 'top', pad: { t: 8 } },
    margin: { ...baseMargin, t: legend ? 62 : baseMargin.t },
  };
}

/** The frequency band (Hz) a plotly_relayout event sets on the x axis; null when it returns to the whole axis; undefined when it leaves the x axis alone. */
export function bandFromRelayout(event: Record<string, unknown>, logAxis: boolean): [number, number] | null | undefined {
  if (event['xaxis.autorange'] === true) return null;
  const pair = Array.isArray(event['xaxis.range']) ? (event['xaxis.range'] as unknown[]) : [event['xaxis.range[0]'], event['xaxis.range[1]']];
  const [a, b] = pair.map((v) => (typeof v === 'number' ? v : typeof v === 'string' && v.trim() !== '' ? Number(v) : NaN));
  if (!Number.isFinite(a) || !Number.isFinite(b)) return undefined;
  // On a log axis plotly gives log10 of the frequency ("the range … is [0, 5] in log units": plotly.com log-plot docs).
  const lo = logAxis ? 10 ** Math.min(a!, b!) : Math.min(a!, b!);
  const hi = logAxis ? 10 ** Math.max(a!, b!) : Math.max(a!, b!);
  return [lo, hi];
}
