// The drawing kit of the report's inline SVG figures: escaping, round tick values, a plot frame
// with its axes and grid, and a polyline thinned to the pixel columns. The figures themselves are
// svg-geometry.ts (geometry, mode shapes) and svg-plots.ts (FRF thumbnails, frequency pairs).
// No scripts and no external assets, so the page prints the same in any browser and in the PDF.
// Lines are thin, grids light, every axis has its unit.

export const esc = (s: unknown) =>
  String(s ?? '')
    .replace(/&/g, '&amp;')
    .replace(/</g, '&lt;')
    .replace(/>/g, '&gt;')
    .replace(/"/g, '&quot;');

/** Round, readable tick values covering [lo, hi] (about `count` of them). */
export function niceTicks(lo: number, hi: number, count = 5): number[] {
  if (!Number.isFinite(lo) || !Number.isFinite(hi)) return [];
  if (hi - lo < 1e-12) {
    const pad = Math.abs(lo) > 0 ? Math.abs(lo) * 0.1 : 1;
    lo -= pad;
    hi += pad;
  }
  const raw = (hi - lo) / Math.max(1, count);
  const mag = 10 ** Math.floor(Math.log10(raw));
  const step = [1, 2, 2.5, 5, 10].map((m) => m * mag).find((s) => s >= raw) ?? 10 * mag;
  const out: number[] = [];
  for (let v = Math.ceil(lo / step - 1e-9) * step; v <= hi + step * 1e-9; v += step) out.push(Math.abs(v) < step * 1e-9 ? 0 : v);
  return out;
}

export const fmtTick = (v: number) => {
  const a = Math.abs(v);
  if (a === 0) return '0';
  if (a >= 1000 || Number.isInteger(v)) return String(Math.round(v));
  if (a >= 1) return v.toFixed(1).replace(/\.0$/, '');
  return String(Number(v.toPrecision(2)));
};

export const FONT = `font-family="ui-monospace, 'DejaVu Sans Mono', Menlo, Consolas, monospace"`;
export const SANS = `font-family="system-ui, 'Segoe UI', 'DejaVu Sans', Helvetica, Arial, sans-serif"`;

export interface Frame {
  x0: number;
  y0: number;
  w: number;
  h: number;
  xMin: number;
  xMax: number;
  yMin: number;
  yMax: number;
}
export const sx = (f: Frame, v: number) => f.x0 + ((v - f.xMin) / (f.xMax - f.xMin || 1)) * f.w;
export const sy = (f: Frame, v: number) => f.y0 + f.h - ((v - f.yMin) / (f.yMax - f.yMin || 1)) * f.h;

export function axes(f: Frame, xTicks: number[], yTicks: number[], xTitle: string, yTitle: string, fontPx = 9): string {
  const parts: string[] = [];
  parts.push(`<rect x="${f.x0}" y="${f.y0}" width="${f.w}" height="${f.h}" fill="#fff" stroke="#8a918e" stroke-width="0.6"/>`);
  for (const t of xTicks) {
    if (t < f.xMin - 1e-9 || t > f.xMax + 1e-9) continue;
    const x = sx(f, t).toFixed(1);
    parts.push(`<line x1="${x}" y1="${f.y0}" x2="${x}" y2="${f.y0 + f.h}" stroke="#e4e7e5" stroke-width="0.5"/>`);
    parts.push(`<text x="${x}" y="${f.y0 + f.h + fontPx + 2}" font-size="${fontPx}" text-anchor="middle" ${FONT} fill="#333">${esc(fmtTick(t))}</text>`);
  }
  for (const t of yTicks) {
    if (t < f.yMin - 1e-9 || t > f.yMax + 1e-9) continue;
    const y = sy(f, t).toFixed(1);
    parts.push(`<line x1="${f.x0}" y1="${y}" x2="${f.x0 + f.w}" y2="${y}" stroke="#e4e7e5" stroke-width="0.5"/>`);
    parts.push(`<text x="${f.x0 - 3}" y="${Number(y) + fontPx / 3}" font-size="${fontPx}" text-anchor="end" ${FONT} fill="#333">${esc(fmtTick(t))}</text>`);
  }
  parts.push(`<rect x="${f.x0}" y="${f.y0}" width="${f.w}" height="${f.h}" fill="none" stroke="#8a918e" stroke-width="0.6"/>`);
  parts.push(`<text x="${f.x0 + f.w / 2}" y="${f.y0 + f.h + 2 * fontPx + 5}" font-size="${fontPx}" text-anchor="middle" ${SANS} fill="#222">${esc(xTitle)}</text>`);
  parts.push(`<text transform="translate(${f.x0 - 3 * fontPx - 4},${f.y0 + f.h / 2}) rotate(-90)" font-size="${fontPx}" text-anchor="middle" ${SANS} fill="#222">${esc(yTitle)}</text>`);
  return parts.join('');
}

/** Keeps the extremes of each pixel column so peaks survive the thinning. */
export function minMaxDecimate(x: number[], y: number[], buckets: number): { x: number[]; y: number[] } {
  if (x.length <= buckets * 2) return { x, y };
  const ox: number[] = [];
  const oy: number[] = [];
  const per = x.length / buckets;
  for (let b = 0; b < buckets; b++) {
    const from = Math.floor(b * per);
    const to = Math.min(x.length, Math.floor((b + 1) * per));
    let lo = from;
    let hi = from;
    for (let k = from; k < to; k++) {
      if (y[k]! < y[lo]!) lo = k;
      if (y[k]! > y[hi]!) hi = k;
    }
    for (const k of lo < hi ? [lo, hi] : hi < lo ? [hi, lo] : [lo]) {
      ox.push(x[k]!);
      oy.push(y[k]!);
    }
  }
  return { x: ox, y: oy };
}

export function polyline(f: Frame, x: number[], y: number[], stroke: string, width = 0.8, dash = ''): string {
  const pts = x.map((v, i) => `${sx(f, v).toFixed(1)},${sy(f, Math.min(f.yMax, Math.max(f.yMin, y[i]!))).toFixed(1)}`).join(' ');
  return `<polyline points="${pts}" fill="none" stroke="${stroke}" stroke-width="${width}"${dash ? ` stroke-dasharray="${dash}"` : ''} stroke-linejoin="round"/>`;
}
