// One mode shape animated on the geometry: every point moves by amplitude · real shape · sin(ωt)
// along the axis of each of its DOFs (`B05:+Z` → point B05, axis z; a negative direction flips
// the sign), over the undeformed wireframe drawn ghosted. A requestAnimationFrame loop restyles
// only the deformed traces, so the camera the user turned to stays where it is.
import { useEffect, useMemo, useRef, useState } from 'react';
import { parseDof, type ModeRow } from '../../lib/modes-data.ts';
import { useThemeName } from '../../lib/theme-name.ts';
import { webglAvailable } from '../../lib/webgl.ts';

interface Pt {
  id: string;
  label: string;
  x: number;
  y: number;
  z: number;
}

type PlotlyLike = {
  react(div: HTMLDivElement, data: unknown[], layout?: Record<string, unknown>, config?: Record<string, unknown>): Promise<unknown>;
  restyle(div: HTMLDivElement, update: Record<string, unknown>, traces: number[]): Promise<unknown>;
  purge(div: HTMLDivElement): void;
};


/** Unit displacement of each point (largest |d| = 1) from the real shape of one mode. */
export function pointDisplacements(points: Pt[], shape: ModeRow['shape']): { dx: number[]; dy: number[]; dz: number[]; unmatched: string[] } {
  const index = new Map(points.map((p, i) => [p.label, i]));
  const dx = new Array<number>(points.length).fill(0);
  const dy = new Array<number>(points.length).fill(0);
  const dz = new Array<number>(points.length).fill(0);
  const unmatched: string[] = [];
  for (const s of shape) {
    const dof = parseDof(s.dof);
    const i = dof ? index.get(dof.label) : undefined;
    if (!dof || i === undefined) {
      unmatched.push(s.dof);
      continue;
    }
    const v = dof.sign * s.real;
    (dof.axis === 'x' ? dx : dof.axis === 'y' ? dy : dz)[i]! += v;
  }
  let max = 0;
  for (let i = 0; i < points.length; i++) max = Math.max(max, Math.hypot(dx[i]!, dy[i]!, dz[i]!));
  if (max > 0) for (let i = 0; i < points.length; i++) {
    dx[i]! /= max;
    dy[i]! /= max;
    dz[i]! /= max;
  }
  return { dx, dy, dz, unmatched };
}

export interface ModeAnimationProps {
  points: Pt[];
  lines: { pointA: string; pointB: string }[];
  mode: ModeRow;
  /** Largest displacement as a fraction of the structure's largest dimension. */
  amplitude: number;
  /** Display cycles per second (not the mode's frequency). */
  speed: number;
  playing: boolean;
  height: number;
}

export function ModeAnimation({ points, lines, mode, amplitude, speed, playing, height }: ModeAnimationProps) {
  const ref = useRef<HTMLDivElement>(null);
  const [webgl] = useState(webglAvailable);
  const [failed, setFailed] = useState<string>();
  const [ready, setReady] = useState(0);
  const plotlyRef = useRef<PlotlyLike | null>(null);
  const dark = useThemeName() === 'dark';

  const geometry = useMemo(() => {
    const byId = new Map(points.map((p, i) => [p.id, i]));
    const segments: [number, number][] = [];
    for (const l of lines) {
      const a = byId.get(l.pointA);
      const b = byId.get(l.pointB);
      if (a !== undefined && b !== undefined) segments.push([a, b]);
    }
    const spans = (['x', 'y', 'z'] as const).map((k) => {
      const v = points.map((p) => p[k]);
      return v.length ? [Math.min(...v), Math.max(...v)] : [0, 1];
    }) as [number, number][];
    const largest = Math.max(1, ...spans.map(([a, b]) => b - a));
    return { segments, spans, largest };
  }, [points, lines]);

  const disp = useMemo(() => pointDisplacements(points, mode.shape), [points, mode.shape]);
  const scale = amplitude * geometry.largest;

  /** Positions of the points and the line segments at phase factor s (−1…1). */
  const frameAt = useRef<(s: number) => { px: number[]; py: number[]; pz: number[]; lx: (number | null)[]; ly: (number | null)[]; lz: (number | null)[] }>(null!);
  frameAt.current = (s: number) => {
    const px = points.map((p, i) => p.x + scale * s * disp.dx[i]!);
    const py = points.map((p, i) => p.y + scale * s * disp.dy[i]!);
    const pz = points.map((p, i) => p.z + scale * s * disp.dz[i]!);
    const lx: (number | null)[] = [];
    const ly: (number | null)[] = [];
    const lz: (number | null)[] = [];
    for (const [a, b] of geometry.segments) {
      lx.push(px[a]!, px[b]!, null);
      ly.push(py[a]!, py[b]!, null);
      lz.push(pz[a]!, pz[b]!, null);
    }
    return { px, py, pz, lx, ly, lz };
  };

  // Draw the figure (ghost + deformed) whenever the geometry, the mode, the amplitude or the theme change.
  useEffect(() => {
    const div = ref.current;
    if (!div || !webgl || points.length === 0) return;
    let cancelled = false;
    const ink = dark ? '#e6ebea' : '#1b1f1e';
    const grid = dark ? '#2b3332' : '#e3e7e6';
    const paper = dark ? '#121615' : '#ffffff';
    const deformed = dark ? '#3fb3ac' : '#0e6b67';
    const ghost = frameAt.current(0);
    const now = frameAt.current(1);
    // Fixed axis ranges with room for the largest excursion, equal scale on every axis.
    const half = geometry.spans.map(([a, b]) => Math.max((b - a) / 2, geometry.largest * 0.08) + scale + geometry.largest * 0.05);
    const widest = Math.max(...half);
    const ranges = geometry.spans.map(([a, b], i) => [(a + b) / 2 - half[i]!, (a + b) / 2 + half[i]!]);
    const axis = (title: string, i: number) => ({ title: { text: title, font: { size: 12 } }, range: ranges[i], gridcolor: grid, zerolinecolor: grid, color: ink, backgroundcolor: paper, showbackground: true });
    const data = [
      { type: 'scatter3d', mode: 'lines', name: 'undeformed', x: ghost.lx, y: ghost.ly, z: ghost.lz, hoverinfo: 'skip', line: { color: dark ? '#56615f' : '#b5bebc', width: 2, dash: 'dash' } },
      { type: 'scatter3d', mode: 'markers', name: 'undeformed points', showlegend: false, x: ghost.px, y: ghost.py, z: ghost.pz, hoverinfo: 'skip', marker: { size: 2, color: dark ? '#56615f' : '#b5bebc' } },
      { type: 'scatter3d', mode: 'lines', name: `mode ${mode.mode} shape`, x: now.lx, y: now.ly, z: now.lz, hoverinfo: 'skip', line: { color: deformed, width: 5 } },
      {
        type: 'scatter3d',
        mode: 'markers',
        name: 'points',
        showlegend: false,
        x: now.px,
        y: now.py,
        z: now.pz,
        text: points.map((p) => p.label),
        hovertemplate: '%{text}<extra></extra>',
        marker: { size: 3.5, color: deformed },
      },
    ];
    const layout = {
      autosize: true,
      height,
      uirevision: 'mode-animation',
      paper_bgcolor: paper,
      font: { color: ink, family: 'Inter Variable, sans-serif', size: 12 },
      margin: { l: 0, r: 0, t: 0, b: 0 },
      showlegend: true,
      legend: { orientation: 'h', x: 0, y: 0, yanchor: 'bottom', bgcolor: dark ? 'rgba(18,22,21,0.85)' : 'rgba(255,255,255,0.85)' },
      scene: {
        aspectmode: 'manual',
        aspectratio: { x: (2 * half[0]!) / (2 * widest), y: (2 * half[1]!) / (2 * widest), z: (2 * half[2]!) / (2 * widest) },
        camera: { eye: { x: 0.35, y: -1.0, z: 0.5 }, up: { x: 0, y: 0, z: 1 } },
        xaxis: axis('x (mm)', 0),
        yaxis: axis('y (mm)', 1),
        zaxis: axis('z (mm)', 2),
        bgcolor: paper,
      },
    };
    import('plotly.js-dist-min')
      .then(async ({ default: Plotly }) => {
        if (cancelled) return;
        plotlyRef.current = Plotly as unknown as PlotlyLike;
        await Plotly.react(div, data, layout, { responsive: true, displaylogo: false, modeBarButtonsToRemove: ['resetCameraLastSave3d'] });
        if (!cancelled) setReady((n) => n + 1);
      })
      .catch((err: Error) => !cancelled && setFailed(err.message));
    return () => {
      cancelled = true;
    };
  }, [points, geometry, mode.mode, disp, scale, dark, height, webgl]);

  // Only animate while the view is on screen: a software-rendered 3D scene is costly.
  const [onScreen, setOnScreen] = useState(true);
  useEffect(() => {
    const div = ref.current;
    if (!div || typeof IntersectionObserver === 'undefined') return;
    const io = new IntersectionObserver((list) => setOnScreen(list.some((e) => e.isIntersecting)));
    io.observe(div);
    return () => io.disconnect();
  }, [webgl]);

  // The animation loop: about 25 frames a second, restyling the deformed traces only.
  useEffect(() => {
    const div = ref.current;
    const Plotly = plotlyRef.current;
    if (!div || !Plotly || !ready) return;
    if (!playing || !onScreen) {
      const f = frameAt.current(1);
      void Plotly.restyle(div, { x: [f.lx, f.px], y: [f.ly, f.py], z: [f.lz, f.pz] }, [2, 3]);
      return;
    }
    let raf = 0;
    let last = 0;
    let busy = false;
    const start = performance.now();
    const tick = (t: number) => {
      raf = requestAnimationFrame(tick);
      if (busy || document.hidden || t - last < 40) return;
      last = t;
      busy = true;
      const f = frameAt.current(Math.sin(2 * Math.PI * speed * ((t - start) / 1000)));
      void Plotly.restyle(div, { x: [f.lx, f.px], y: [f.ly, f.py], z: [f.lz, f.pz] }, [2, 3]).finally(() => (busy = false));
    };
    raf = requestAnimationFrame(tick);
    return () => cancelAnimationFrame(raf);
  }, [playing, onScreen, speed, ready]);

  useEffect(() => {
    const div = ref.current;
    return () => {
      if (div) void import('plotly.js-dist-min').then(({ default: Plotly }) => Plotly.purge(div));
    };
  }, []);

  if (!webgl) {
    return (
      <div className="flex items-center justify-center rounded-md border border-dashed border-[var(--line)] p-4 text-center text-sm text-[var(--muted)]" style={{ height: 160 }}>
        This browser cannot draw the 3D view (WebGL is switched off). The shape values are in the mode table's export on the Hand-over tab.
      </div>
    );
  }
  if (failed) return <p className="text-sm text-bad">The animation could not be drawn: {failed}</p>;
  return (
    <div>
      <div ref={ref} role="img" aria-label={`Mode ${mode.mode} at ${mode.fHz.toFixed(1)} Hz animated on the geometry; the undeformed wireframe is dashed`} className="w-full" style={{ height }} data-testid="mode-animation" data-drawn={ready > 0 ? "yes" : "no"} />
      {disp.unmatched.length > 0 && (
        <p className="mt-1 text-xs text-warn">
          <span aria-hidden>! </span>
          Not drawn (no matching point): <span className="num">{disp.unmatched.join(', ')}</span>
        </p>
      )}
    </div>
  );
}
