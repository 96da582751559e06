// The report's inline SVG plots: one FRF's magnitude above its coherence, and test against model
// frequencies (drawing kit: svg-frame.ts).
import { FONT, type Frame, axes, esc, minMaxDecimate, niceTicks, polyline, sx, sy } from './svg-frame.ts';

/**
 * |H1| in dB re 1 (m/s²)/N over the band, above the ordinary coherence on 0–1, for one FRF.
 * `f` in Hz; `re`/`im` the accelerance H1 in (m/s²)/N.
 */
export function frfThumbSvg(title: string, f: ArrayLike<number>, re: ArrayLike<number>, im: ArrayLike<number>, coherence: ArrayLike<number>, band: { low: number; high: number }, width = 330): string {
  const xs: number[] = [];
  const db: number[] = [];
  const coh: number[] = [];
  for (let k = 0; k < f.length; k++) {
    if (f[k]! < band.low || f[k]! > band.high || f[k]! <= 0) continue;
    xs.push(f[k]!);
    db.push(20 * Math.log10(Math.max(Math.hypot(re[k]!, im[k]!), 1e-12)));
    coh.push(coherence[k]!);
  }
  if (xs.length < 2) return `<p class="muted">${esc(title)}: no lines in the band.</p>`;
  const plotW = width - 60;
  const mag = minMaxDecimate(xs, db, plotW);
  const co = minMaxDecimate(xs, coh, plotW);
  let dMax = Math.max(...db);
  let dMin = Math.max(Math.min(...db), dMax - 100);
  const yt = niceTicks(dMin, dMax, 4);
  dMin = Math.min(dMin, yt[0]!);
  dMax = Math.max(dMax, yt.at(-1)!);
  const xt = niceTicks(band.low, band.high, 5);
  const top: Frame = { x0: 46, y0: 14, w: plotW, h: 92, xMin: band.low, xMax: band.high, yMin: dMin, yMax: dMax };
  const bottom: Frame = { x0: 46, y0: top.y0 + top.h + 30, w: plotW, h: 40, xMin: band.low, xMax: band.high, yMin: 0, yMax: 1 };
  const parts = [
    `<text x="${top.x0}" y="9" font-size="8.5" ${FONT} fill="#111" font-weight="600">${esc(title)}</text>`,
    axes(top, xt, yt, 'frequency (Hz)', '|H1| dB re 1 (m/s²)/N', 8),
    polyline(top, mag.x, mag.y, '#0b4f8a', 0.7),
    axes(bottom, xt, [0, 0.5, 1], 'frequency (Hz)', 'γ² (–)', 8),
    polyline(bottom, co.x, co.y, '#8a3b0b', 0.7),
  ];
  const height = bottom.y0 + bottom.h + 30;
  return `<svg xmlns="http://www.w3.org/2000/svg" viewBox="0 0 ${width} ${height}" width="100%" role="img" aria-label="${esc(title)}">${parts.join('')}</svg>`;
}

/** Test against model natural frequencies (Hz), one dot per pair, with the 45° line f_test = f_model. */
export function frequencyPairSvg(pairs: { testHz: number; modelHz: number; label: string }[], width = 300): string {
  const height = width;
  const all = pairs.flatMap((p) => [p.testHz, p.modelHz]);
  const ticks = niceTicks(0, Math.max(1, ...all) * 1.05, 5);
  const top = ticks.at(-1) ?? 1;
  const f: Frame = { x0: 46, y0: 10, w: width - 58, h: height - 50, xMin: 0, xMax: top, yMin: 0, yMax: top };
  const parts = [axes(f, ticks, ticks, 'model frequency (Hz)', 'test frequency (Hz)')];
  parts.push(`<line x1="${sx(f, 0)}" y1="${sy(f, 0)}" x2="${sx(f, top)}" y2="${sy(f, top)}" stroke="#8a918e" stroke-width="0.7" stroke-dasharray="4 3"/>`);
  for (const p of pairs) {
    parts.push(`<circle cx="${sx(f, p.modelHz).toFixed(1)}" cy="${sy(f, p.testHz).toFixed(1)}" r="2.6" fill="#1f5f8b"><title>${esc(p.label)}</title></circle>`);
  }
  return `<svg xmlns="http://www.w3.org/2000/svg" viewBox="0 0 ${width} ${height}" width="${width}" height="${height}" role="img" aria-label="Test against model frequencies, with the line where they are equal">${parts.join('')}</svg>`;
}
