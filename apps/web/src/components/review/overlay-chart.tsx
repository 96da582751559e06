// The overlay plot: its own small plotly wrapper, because it measures how long a new set of FRFs
// takes from arriving in the page to being drawn (plotly_afterplot). The time is shown in the
// caption, kept on the element (data-drawn-ms) and pushed to window.__resonoteOverlayTimings for
// the benchmark (tests/bench/overlay.ts). A zoom or pan of the frequency axis is reported
// (onBandChange) so the panel can decimate the visible band again; a redraw for a zoom is not timed.
import { useEffect, useRef, useState } from 'react';
import type { PlotlyHTMLElement } from 'plotly.js-dist-min';
import { bandFromRelayout } from '../../lib/frf-figure.ts';

declare global {
  interface Window {
    __resonoteOverlayTimings?: { curves: number; points: number; ms: number }[];
  }
}

export function OverlayChart({ data, layout, config, height, receivedAt, curves, points, label, band = null, onBandChange }: { data: unknown[]; layout: Record<string, unknown>; config: Record<string, unknown>; height: number; receivedAt: number; curves: number; points: number; label: string; band?: readonly [number, number] | null; onBandChange?: (band: [number, number] | null) => void }) {
  const ref = useRef<HTMLDivElement>(null);
  const hooked = useRef(false);
  const drawnFor = useRef<{ receivedAt: number; band: readonly [number, number] | null } | null>(null);
  const bandCallback = useRef(onBandChange);
  bandCallback.current = onBandChange;
  const pending = useRef<{ at: number; curves: number; points: number } | null>(null);
  const [drawnMs, setDrawnMs] = useState<number | null>(null);
  const [failed, setFailed] = useState<string>();

  useEffect(() => {
    let cancelled = false;
    const div = ref.current;
    if (!div) return;
    import('plotly.js-dist-min')
      .then(async ({ default: Plotly }) => {
        if (cancelled) return;
        const full = { autosize: true, height, ...layout };
        const cfg = { responsive: true, displaylogo: false, ...config };
        if (!hooked.current) {
          // An empty first draw gives the element its event methods before the real one.
          const gd = (await Plotly.react(div, [], full, cfg)) as PlotlyHTMLElement;
          gd.on('plotly_afterplot', () => {
            const p = pending.current;
            if (!p) return;
            pending.current = null;
            const ms = performance.now() - p.at;
            div.dataset.drawnMs = ms.toFixed(1);
            (window.__resonoteOverlayTimings ??= []).push({ curves: p.curves, points: p.points, ms });
            setDrawnMs(ms);
          });
          gd.on('plotly_relayout', (raw: unknown) => {
            const event = (raw ?? {}) as Record<string, unknown>;
            const logAxis = (gd as unknown as { layout?: { xaxis?: { type?: string } } }).layout?.xaxis?.type === 'log';
            const band = bandFromRelayout(event, logAxis);
            if (band !== undefined) bandCallback.current?.(band);
          });
          hooked.current = true;
          if (cancelled) return;
        }
        // A redraw only for a new band (zoom or pan) is not timed: the time is from the FRFs' arrival.
        const last = drawnFor.current;
        const zoomOnly = last !== null && last.receivedAt === receivedAt && last.band !== band;
        drawnFor.current = { receivedAt, band };
        if (!zoomOnly) pending.current = { at: receivedAt, curves, points };
        await Plotly.react(div, data, full, cfg);
      })
      .catch((err: Error) => !cancelled && setFailed(err.message));
    return () => {
      cancelled = true;
    };
  }, [data, layout, config, height, receivedAt, curves, points, band]);

  useEffect(() => {
    const div = ref.current;
    return () => {
      if (div) void import('plotly.js-dist-min').then(({ default: Plotly }) => Plotly.purge(div));
    };
  }, []);

  if (failed) return <p className="text-sm text-bad">The overlay could not be drawn: {failed}</p>;
  return (
    <div>
      <div ref={ref} role="img" aria-label={label} className="w-full" style={{ height }} data-testid="overlay-plot" data-overlay-count={curves} />
      <p className="num mt-1 text-right text-[11px] text-[var(--muted)]" data-testid="overlay-timing">
        {drawnMs === null ? 'drawing…' : `${curves} FRF${curves === 1 ? '' : 's'} × ${Math.round(points / Math.max(1, curves))} lines drawn in ${Math.round(drawnMs)} ms`}
      </p>
    </div>
  );
}
