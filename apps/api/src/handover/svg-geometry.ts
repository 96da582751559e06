// The geometry and mode shapes as inline SVG for the printed report (drawing kit: svg-frame.ts).
import { FONT, type Frame, SANS, axes, esc, niceTicks, sx, sy } from './svg-frame.ts';

export interface GeometryPoint {
  id: string;
  label: string;
  x: number;
  y: number;
  z: number;
}

const AXES = ['x', 'y', 'z'] as const;
type Axis = (typeof AXES)[number];

function extents(points: GeometryPoint[]) {
  const ext = AXES.map((a) => {
    const v = points.map((p) => p[a]);
    return { axis: a, min: Math.min(...v), max: Math.max(...v), span: Math.max(...v) - Math.min(...v) };
  });
  return ext;
}

/** The two coordinate axes with the largest spread (x before y before z on a tie): the view plane. */
export function viewAxes(points: GeometryPoint[]): [Axis, Axis] {
  const ext = extents(points);
  const order = [...ext].sort((a, b) => b.span - a.span || AXES.indexOf(a.axis) - AXES.indexOf(b.axis));
  const pair = [order[0]!.axis, order[1]!.axis].sort((a, b) => AXES.indexOf(a) - AXES.indexOf(b)) as [Axis, Axis];
  return pair;
}

/**
 * The geometry projected orthographically onto the plane of its two largest extents, with mm
 * axes. Reference DOF points are drawn as squares (shape, not only colour, marks them).
 */
export function geometrySvg(points: GeometryPoint[], lines: { pointA: string; pointB: string }[], referencePoints: Set<string>, width = 640): string {
  if (points.length === 0) return '<p class="muted">No points defined.</p>';
  const [a, b] = viewAxes(points);
  const ext = extents(points);
  // Pad the data so points and their labels sit inside the frame, clear of the tick labels.
  const pad = Math.max(10, 0.06 * Math.max(...ext.map((e) => e.span)));
  const padded = (e: (typeof ext)[number]) => ({ ...e, min: e.min - pad, max: e.max + pad });
  const ea = padded(ext.find((e) => e.axis === a)!);
  const eb = padded(ext.find((e) => e.axis === b)!);
  const xt = niceTicks(ea.min, ea.max, 8);
  let yt = niceTicks(eb.min, eb.max, 5);
  // Equal scale on both axes so the picture is not distorted.
  const plotW = width - 70;
  const xMin = Math.min(xt[0]!, ea.min);
  const xMax = Math.max(xt.at(-1)!, ea.max);
  let yMin = Math.min(yt[0]!, eb.min);
  let yMax = Math.max(yt.at(-1)!, eb.max);
  const scale = Math.min(plotW / (xMax - xMin || 1), 420 / (yMax - yMin || 1));
  let plotH = (yMax - yMin) * scale;
  if (plotH < 60) {
    // A slender structure: widen the vertical range so labels have room, still at equal scale.
    const mid = (eb.min + eb.max) / 2;
    const half = 60 / scale / 2;
    yMin = mid - half;
    yMax = mid + half;
    plotH = 60;
    yt = niceTicks(yMin, yMax, 2);
  }
  const f: Frame = { x0: 52, y0: 6, w: (xMax - xMin) * scale, h: plotH, xMin, xMax, yMin, yMax };
  const byId = new Map(points.map((p) => [p.id, p]));
  const parts: string[] = [axes(f, xt, yt, `${a} (mm)`, `${b} (mm)`)];
  for (const l of lines) {
    const p = byId.get(l.pointA);
    const q = byId.get(l.pointB);
    if (!p || !q) continue;
    parts.push(`<line x1="${sx(f, p[a]).toFixed(1)}" y1="${sy(f, p[b]).toFixed(1)}" x2="${sx(f, q[a]).toFixed(1)}" y2="${sy(f, q[b]).toFixed(1)}" stroke="#4a5552" stroke-width="0.9"/>`);
  }
  const every = points.length > 60 ? Math.ceil(points.length / 40) : 1;
  points.forEach((p, i) => {
    const x = sx(f, p[a]);
    const y = sy(f, p[b]);
    if (referencePoints.has(p.label)) parts.push(`<rect x="${(x - 3.5).toFixed(1)}" y="${(y - 3.5).toFixed(1)}" width="7" height="7" fill="#0b6e69" stroke="#fff" stroke-width="0.6"/>`);
    else parts.push(`<circle cx="${x.toFixed(1)}" cy="${y.toFixed(1)}" r="2.4" fill="#1b1f1e"/>`);
    if (i % every === 0 || referencePoints.has(p.label)) {
      parts.push(`<text x="${(x + 3).toFixed(1)}" y="${(y - 3.5).toFixed(1)}" font-size="7.5" ${FONT} fill="#222">${esc(p.label)}</text>`);
    }
  });
  const height = f.y0 + f.h + 32;
  return `<svg xmlns="http://www.w3.org/2000/svg" viewBox="0 0 ${width} ${height}" width="100%" role="img" aria-label="Geometry, ${esc(a)}–${esc(b)} view in mm">${parts.join('')}</svg>`;
}


const DIR: Record<string, [number, number, number]> = { X: [1, 0, 0], Y: [0, 1, 0], Z: [0, 0, 1] };

/**
 * A mode shape drawn on the geometry: the undeformed structure dashed grey, the deformed one
 * solid, the real shape vector added along each DOF's signed direction, scaled so the largest
 * displacement is 12 % of the structure's size. A slender (one-dimensional) structure is drawn in
 * the elevation that shows the displacement; anything else in an axonometric view from above.
 */
export function modeShapeSvg(title: string, points: GeometryPoint[], lines: { pointA: string; pointB: string }[], shape: { dof: string; real: number }[], width = 250): string {
  if (points.length === 0 || shape.length === 0) return '';
  const byLabel = new Map(points.map((p) => [p.label, p]));
  const disp = new Map<string, [number, number, number]>();
  const dirTotals: Record<string, number> = { X: 0, Y: 0, Z: 0 };
  for (const s of shape) {
    const [label, dir] = s.dof.split(':');
    const p = label ? byLabel.get(label) : undefined;
    if (!p || !dir) continue;
    const sign = dir.startsWith('-') ? -1 : 1;
    const axis = dir.slice(-1);
    const u = DIR[axis];
    if (!u) continue;
    const v = disp.get(p.id) ?? [0, 0, 0];
    disp.set(p.id, [v[0] + sign * u[0] * s.real, v[1] + sign * u[1] * s.real, v[2] + sign * u[2] * s.real]);
    dirTotals[axis]! += Math.abs(s.real);
  }
  const maxD = Math.max(1e-30, ...[...disp.values()].map((v) => Math.hypot(...v)));
  const ext = extents(points);
  const size = Math.max(...ext.map((e) => e.span), 1);
  const k = (0.12 * size) / maxD;
  const slender = ext.filter((e) => e.span > 0.02 * size).length <= 1;
  let project: (v: [number, number, number]) => [number, number];
  let caption: string;
  if (slender) {
    const along = ext.reduce((m, e) => (e.span > m.span ? e : m)).axis;
    const dispAxis = (Object.entries(dirTotals).sort((p, q) => q[1] - p[1])[0]![0].toLowerCase() as Axis);
    const up = dispAxis === along ? (AXES.find((x) => x !== along) as Axis) : dispAxis;
    const ia = AXES.indexOf(along);
    const iu = AXES.indexOf(up);
    project = (v) => [v[ia]!, v[iu]!];
    caption = `elevation: ${along} right, ${up} up`;
  } else {
    // Axonometric: turned 25° about z, seen from 35° above the x–y plane.
    const az = (25 * Math.PI) / 180;
    const el = (35 * Math.PI) / 180;
    project = (v) => [v[0] * Math.cos(az) - v[1] * Math.sin(az), v[2] * Math.cos(el) + (v[0] * Math.sin(az) + v[1] * Math.cos(az)) * Math.sin(el)];
    caption = 'from above: x right, y back, z up';
  }
  const base = points.map((p) => project([p.x, p.y, p.z]));
  const moved = points.map((p) => {
    const d = disp.get(p.id) ?? [0, 0, 0];
    return project([p.x + k * d[0], p.y + k * d[1], p.z + k * d[2]]);
  });
  const all = [...base, ...moved];
  const xMin = Math.min(...all.map((q) => q[0]));
  const xMax = Math.max(...all.map((q) => q[0]));
  const yMin = Math.min(...all.map((q) => q[1]));
  const yMax = Math.max(...all.map((q) => q[1]));
  const plotW = width - 16;
  const sc = plotW / Math.max(xMax - xMin, 1e-9);
  const plotH = Math.min(150, Math.max(50, (yMax - yMin) * sc));
  const scale = Math.min(sc, plotH / Math.max(yMax - yMin, 1e-9));
  const ox = 8 + (plotW - (xMax - xMin) * scale) / 2;
  const oy = 16 + (plotH - (yMax - yMin) * scale) / 2;
  const X = (q: [number, number]) => (ox + (q[0] - xMin) * scale).toFixed(1);
  const Y = (q: [number, number]) => (oy + (yMax - q[1]) * scale).toFixed(1);
  const index = new Map(points.map((p, i) => [p.id, i]));
  const parts: string[] = [`<text x="8" y="10" font-size="8.5" ${FONT} fill="#111" font-weight="600">${esc(title)}</text>`];
  for (const [set, stroke, w, dash] of [
    [base, '#9aa29f', 0.7, '3 2'],
    [moved, '#0b4f8a', 1.2, ''],
  ] as const) {
    for (const l of lines) {
      const i = index.get(l.pointA);
      const j = index.get(l.pointB);
      if (i === undefined || j === undefined) continue;
      parts.push(`<line x1="${X(set[i]!)}" y1="${Y(set[i]!)}" x2="${X(set[j]!)}" y2="${Y(set[j]!)}" stroke="${stroke}" stroke-width="${w}"${dash ? ` stroke-dasharray="${dash}"` : ''}/>`);
    }
    if (lines.length === 0) for (const q of set) parts.push(`<circle cx="${X(q)}" cy="${Y(q)}" r="1.2" fill="${stroke}"/>`);
  }
  points.forEach((p, i) => {
    const q = moved[i]!;
    if (disp.has(p.id)) parts.push(`<circle cx="${X(q)}" cy="${Y(q)}" r="1.3" fill="#0b4f8a"/>`);
    else parts.push(`<circle cx="${X(q)}" cy="${Y(q)}" r="1.6" fill="#fff" stroke="#0b4f8a" stroke-width="0.6"/>`);
  });
  const unmeasured = points.some((p) => !disp.has(p.id));
  const height = 16 + plotH + 14;
  parts.push(`<text x="8" y="${height - 3}" font-size="7" ${SANS} fill="#555">${esc(caption)} · dashed: at rest${unmeasured ? ' · hollow: not fitted' : ''}</text>`);
  return `<svg xmlns="http://www.w3.org/2000/svg" viewBox="0 0 ${width} ${height}" width="100%" role="img" aria-label="${esc(title)}">${parts.join('')}</svg>`;
}
