// The structure in 3D: points as labelled markers, lines as segments, optionally coloured and
// shaped by schedule status. Reused by Overview, Plan, Tap and Modes.
import { useMemo, useState } from 'react';
import type { ScheduleStatus } from '@resonote/contracts';
import { Plot } from './plot.tsx';
import { scheduleLook, statusRank } from './status.tsx';
import { useThemeName } from '../lib/theme-name.ts';
import { webglAvailable } from '../lib/webgl.ts';

export interface ViewPoint {
  id: string;
  label: string;
  x: number;
  y: number;
  z: number;
}
export interface ViewLine {
  id: string;
  pointA: string;
  pointB: string;
}

export interface GeometryViewProps {
  points: ViewPoint[];
  lines: ViewLine[];
  statusByPointId?: Record<string, ScheduleStatus | undefined>;
  highlightPointId?: string | null;
  onPointClick?: (pointId: string) => void;
  height: number;
}


export function GeometryView({ points, lines, statusByPointId, highlightPointId, onPointClick, height }: GeometryViewProps) {
  const theme = useThemeName();
  const [webgl] = useState(webglAvailable);
  const dark = theme === 'dark';
  const ink = dark ? '#e6ebea' : '#1b1f1e';
  const grid = dark ? '#2b3332' : '#e3e7e6';

  const data = useMemo(() => {
    const byId = new Map(points.map((p) => [p.id, p]));
    const lx: (number | null)[] = [];
    const ly: (number | null)[] = [];
    const lz: (number | null)[] = [];
    for (const l of lines) {
      const a = byId.get(l.pointA);
      const b = byId.get(l.pointB);
      if (!a || !b) continue;
      lx.push(a.x, b.x, null);
      ly.push(a.y, b.y, null);
      lz.push(a.z, b.z, null);
    }
    const traces: Record<string, unknown>[] = [];
    if (lx.length) traces.push({ type: 'scatter3d', mode: 'lines', name: 'Lines', x: lx, y: ly, z: lz, hoverinfo: 'skip', line: { color: dark ? '#6f7b79' : '#98a3a1', width: 3 }, showlegend: false });

    const marker = (list: ViewPoint[], name: string, symbol: string, color: string, size = 7): Record<string, unknown>[] => {
      const at = { x: list.map((p) => p.x), y: list.map((p) => p.y), z: list.map((p) => p.z), customdata: list.map((p) => p.id) };
      const hovertemplate = '%{text}<br>x %{x} mm<br>y %{y} mm<br>z %{z} mm<extra>' + name + '</extra>';
      const labels = { textposition: 'top center', textfont: { family: 'JetBrains Mono Variable, monospace', size: 11, color: ink } };
      if (symbol !== 'x') {
        return [{ type: 'scatter3d', mode: 'markers+text', name, ...at, text: list.map((p) => p.label), ...labels, hovertemplate, marker: { symbol, color, size, line: { color, width: 1 } } }];
      }
      // plotly draws the 3D 'x' symbol as the emoji ❌ (its gl3d marker table), red whatever the colour and
      // unlike the heavy ✖ its legend shows. So the legend gets an empty 'x' trace, and the points are the ✖
      // glyph itself in the status colour, with their labels above; all three toggle together.
      const group = `status-${name}`;
      return [
        { type: 'scatter3d', mode: 'markers', name, legendgroup: group, x: [null], y: [null], z: [null], hoverinfo: 'skip', marker: { symbol: 'x', color, size, line: { color, width: 1 } } },
        { type: 'scatter3d', mode: 'text', name, legendgroup: group, showlegend: false, ...at, text: list.map(() => '✖'), textposition: 'middle center', textfont: { family: 'DejaVu Sans, sans-serif', size: 16, color }, hovertext: list.map((p) => p.label), hovertemplate: '%{hovertext}<br>x %{x} mm<br>y %{y} mm<br>z %{z} mm<extra>' + name + '</extra>' },
        { type: 'scatter3d', mode: 'text', name, legendgroup: group, showlegend: false, ...at, text: list.map((p) => p.label), ...labels, hoverinfo: 'skip' },
      ];
    };

    if (statusByPointId) {
      for (const status of statusRank) {
        const list = points.filter((p) => statusByPointId[p.id] === status);
        if (list.length) {
          const look = scheduleLook[status];
          traces.push(...marker(list, look.label, look.symbol, dark ? look.dark : look.light));
        }
      }
      const unscheduled = points.filter((p) => !statusByPointId[p.id]);
      if (unscheduled.length) traces.push(...marker(unscheduled, 'Not in schedule', 'square', dark ? '#56615f' : '#b5bebc', 4));
    } else if (points.length) {
      traces.push(...marker(points, 'Points', 'circle', dark ? '#3fb3ac' : '#0e6b67'));
    }
    const hi = highlightPointId ? byId.get(highlightPointId) : undefined;
    if (hi) {
      traces.push({
        type: 'scatter3d',
        mode: 'markers',
        name: `Selected: ${hi.label}`,
        x: [hi.x],
        y: [hi.y],
        z: [hi.z],
        customdata: [hi.id],
        hoverinfo: 'skip',
        marker: { symbol: 'circle-open', size: 14, color: dark ? '#63c7c1' : '#0a5552', line: { width: 3 } },
      });
    }
    return traces;
  }, [points, lines, statusByPointId, highlightPointId, dark, ink]);

  // Equal scale on all three axes, as aspectmode 'data' would give, but with a floor on each
  // axis's span: a flat plate (all z = 0) would otherwise collapse one axis and zoom the view in.
  const frame = useMemo(() => {
    const span = (vals: number[]) => (vals.length ? [Math.min(...vals), Math.max(...vals)] : [0, 1]) as [number, number];
    const spans = [span(points.map((p) => p.x)), span(points.map((p) => p.y)), span(points.map((p) => p.z))];
    const largest = Math.max(1, ...spans.map(([a, b]) => b - a));
    const ranges = spans.map(([a, b]) => {
      const half = Math.max((b - a) / 2, largest * 0.08) + largest * 0.06;
      const mid = (a + b) / 2;
      return [mid - half, mid + half] as [number, number];
    });
    const widest = Math.max(...ranges.map(([a, b]) => b - a));
    return { ranges, ratio: ranges.map(([a, b]) => (b - a) / widest) };
  }, [points]);

  const layout = useMemo(() => {
    const axis = (title: string, i: number) => ({ title: { text: title, font: { size: 12 } }, range: frame.ranges[i], gridcolor: grid, zerolinecolor: grid, color: ink, backgroundcolor: dark ? '#121615' : '#ffffff', showbackground: true });
    return {
      uirevision: 'geometry',
      paper_bgcolor: dark ? '#121615' : '#ffffff',
      font: { color: ink, family: 'Inter Variable, sans-serif', size: 12 },
      margin: { l: 0, r: 0, t: 0, b: 0 },
      showlegend: true,
      legend: { orientation: 'h', x: 0, y: 0, yanchor: 'bottom', bgcolor: dark ? 'rgba(18,22,21,0.85)' : 'rgba(255,255,255,0.85)', font: { size: 12 } },
      scene: {
        aspectmode: 'manual',
        aspectratio: { x: frame.ratio[0], y: frame.ratio[1], z: frame.ratio[2] },
        camera: { eye: { x: 0.75, y: -1.05, z: 0.7 }, up: { x: 0, y: 0, z: 1 } },
        xaxis: axis('x (mm)', 0),
        yaxis: axis('y (mm)', 1),
        zaxis: axis('z (mm)', 2),
        bgcolor: dark ? '#121615' : '#ffffff',
      },
    };
  }, [dark, grid, ink, frame]);

  if (!webgl) {
    return (
      <div className="flex items-center justify-center rounded-md border border-dashed border-[var(--line)] p-4 text-center text-sm text-[var(--muted)]" style={{ height: Math.min(height, 160) }}>
        This browser cannot draw the 3D view (WebGL is switched off). The points are listed in the Plan table.
      </div>
    );
  }
  if (points.length === 0) {
    return (
      <div className="flex items-center justify-center rounded-md border border-dashed border-[var(--line)] p-4 text-center text-sm text-[var(--muted)]" style={{ height: Math.min(height, 200) }} data-testid="geometry-empty">
        No points yet. The lead adds them on the Plan tab, typed in or imported from a CSV.
      </div>
    );
  }
  return (
    <Plot
      label={`3D view of ${points.length} points and ${lines.length} lines, coordinates in mm`}
      data={data}
      layout={layout}
      height={height}
      onClick={
        onPointClick
          ? (event) => {
              const id = event.points[0]?.customdata;
              if (typeof id === 'string') onPointClick(id);
            }
          : undefined
      }
    />
  );
}
