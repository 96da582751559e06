// The look every measurement plot shares (design.md "Look"): white or near-black paper, thin
// lines, a light grid, axis titles with units, a readable unified cursor. Channels keep one colour
// on every plot: the force its own, each response channel its own.
export interface PlotColours {
  dark: boolean;
  paper: string;
  ink: string;
  muted: string;
  grid: string;
  zero: string;
  force: string;
  band: string;
  window: string;
  trigger: string;
}

const RESPONSE_LIGHT = ['#1f5fa8', '#b0417a', '#5b6b16', '#7a4d1c'];
const RESPONSE_DARK = ['#6fa8e8', '#e58bbf', '#b4c85a', '#d9a66b'];

export function plotColours(dark: boolean): PlotColours {
  return dark
    ? { dark, paper: '#111514', ink: '#e6ebea', muted: '#9aa6a4', grid: '#262e2d', zero: '#3b4645', force: '#b59cf0', band: 'rgba(99,199,193,0.10)', window: 'rgba(181,156,240,0.16)', trigger: '#e6ebea' }
    : { dark, paper: '#ffffff', ink: '#1b1f1e', muted: '#5b6664', grid: '#e8eceb', zero: '#c9d0ce', force: '#6a3fb0', band: 'rgba(14,107,103,0.08)', window: 'rgba(106,63,176,0.10)', trigger: '#1b1f1e' };
}

/** Colour of response channel i (0-based, in the channel map's order). */
export function responseColour(i: number, dark: boolean): string {
  const list = dark ? RESPONSE_DARK : RESPONSE_LIGHT;
  return list[i % list.length]!;
}

/**
 * Distinct colours for an overlay of many FRFs: hues spread by the golden angle, lightness fitted to
 * the paper so thin lines stay readable. Colour here only tells curves apart; the hover names them.
 */
export function overlayColour(i: number, dark: boolean): string {
  const hue = (i * 137.508 + 210) % 360;
  return dark ? `hsl(${hue.toFixed(1)}, 65%, 64%)` : `hsl(${hue.toFixed(1)}, 70%, 38%)`;
}

export const monoFont = 'JetBrains Mono Variable, ui-monospace, monospace';

export function axis(c: PlotColours, title: string, extra: Record<string, unknown> = {}): Record<string, unknown> {
  return {
    title: { text: title, font: { size: 12 }, standoff: 6 },
    gridcolor: c.grid,
    zerolinecolor: c.zero,
    linecolor: c.zero,
    color: c.ink,
    tickfont: { family: monoFont, size: 11 },
    automargin: true,
    showline: true,
    mirror: true,
    ...extra,
  };
}

/**
 * The right margin that holds the plot buttons as a column (plotly's vertical modebar: 24 px wide
 * buttons, 2 px from the figure's edge). Plotly wraps a legend row above the plot within the plot
 * area's width, so with the buttons in this strip the legend never runs under them, however many
 * rows it takes and however narrow the window (768 px: the tablet).
 */
export const MODEBAR_STRIP = 30;

/** Plot margins in px; a titled plot with a legend row takes a taller top margin. */
export const baseMargin = { l: 64, r: MODEBAR_STRIP, t: 36, b: 44 };

/** Base layout: themed paper, unified cursor with values and units (the traces carry the units). */
export function baseLayout(c: PlotColours, extra: Record<string, unknown> = {}): Record<string, unknown> {
  // A layout that keeps the right strip free gets the buttons there; one with a narrower right
  // margin (a heatmap, a second y axis on the right) keeps plotly's row at the top right.
  const right = (extra.margin as { r?: number } | undefined)?.r ?? baseMargin.r;
  return {
    modebar: { orientation: right >= MODEBAR_STRIP ? 'v' : 'h', color: c.muted, activecolor: c.ink, bgcolor: 'rgba(0,0,0,0)' },
    paper_bgcolor: c.paper,
    plot_bgcolor: c.paper,
    font: { color: c.ink, family: 'Inter Variable, ui-sans-serif, sans-serif', size: 12 },
    margin: baseMargin,
    hovermode: 'x unified',
    hoverlabel: { font: { family: monoFont, size: 12 }, bgcolor: c.paper, bordercolor: c.zero },
    legend: { orientation: 'h', x: 0, y: 1.02, yanchor: 'bottom', font: { size: 11 } },
    showlegend: true,
    ...extra,
  };
}

/** Plot buttons kept to what helps reading: zoom, pan, reset, save a picture. */
export const plotConfig = {
  displaylogo: false,
  modeBarButtonsToRemove: ['select2d', 'lasso2d', 'autoScale2d', 'toggleSpikelines', 'hoverClosestCartesian', 'hoverCompareCartesian'],
  toImageButtonOptions: { format: 'png', scale: 2 },
};
