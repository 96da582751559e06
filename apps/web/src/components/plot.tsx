// Thin plotly wrapper: Plotly.react on every change, Plotly.purge on unmount. plotly is loaded on
// first use so the sign-in pages stay light.
import { useEffect, useRef, useState } from 'react';
import type { PlotlyHTMLElement } from 'plotly.js-dist-min';

export interface PlotProps {
  data: unknown[];
  layout: Record<string, unknown>;
  config?: Record<string, unknown>;
  height: number;
  onClick?: (event: { points: { customdata?: unknown; pointNumber?: number; curveNumber?: number }[] }) => void;
  className?: string;
  label: string;
}

export function Plot({ data, layout, config, height, onClick, className = '', label }: PlotProps) {
  const ref = useRef<HTMLDivElement>(null);
  const clickRef = useRef(onClick);
  clickRef.current = onClick;
  const [failed, setFailed] = useState<string>();

  useEffect(() => {
    let cancelled = false;
    const div = ref.current;
    if (!div) return;
    import('plotly.js-dist-min')
      .then(async ({ default: Plotly }) => {
        if (cancelled) return;
        const el = (await Plotly.react(div, data, { autosize: true, height, ...layout }, { responsive: true, displaylogo: false, ...config })) as PlotlyHTMLElement;
        if (cancelled) return;
        el.removeAllListeners?.('plotly_click');
        el.on('plotly_click', (event) => clickRef.current?.(event as Parameters<NonNullable<PlotProps['onClick']>>[0]));
      })
      .catch((err: Error) => !cancelled && setFailed(err.message));
    return () => {
      cancelled = true;
    };
  }, [data, layout, config, height]);

  useEffect(() => {
    const div = ref.current;
    return () => {
      if (div) void import('plotly.js-dist-min').then(({ default: Plotly }) => Plotly.purge(div));
    };
  }, []);

  if (failed) return <p className="text-sm text-bad">The plot could not be drawn: {failed}</p>;
  return <div ref={ref} role="img" aria-label={label} className={`w-full ${className}`} style={{ height }} />;
}
