// The stabilization diagram (model order against frequency, one marker shape and colour per
// stability class) over the CMIF curves on a log axis at the right. Clicking a pole chooses or
// un-chooses it; chosen poles are ringed.
import { useMemo } from 'react';
import { Plot } from '../plot.tsx';
import { axis, baseLayout, plotColours, plotConfig } from '../../lib/plot-style.ts';
import { useThemeName } from '../../lib/theme-name.ts';
import { stabilityLook, stabilityOrder, type DiagramOrder, type PoleRef } from '../../lib/modes-data.ts';

export interface StabilizationPlotProps {
  cmif: { f: number[]; values: number[][] };
  orders: DiagramOrder[];
  bandHz: [number, number];
  chosen: PoleRef[];
  onTogglePole?: (pole: PoleRef) => void;
  height?: number;
}

export function StabilizationPlot({ cmif, orders, bandHz, chosen, onTogglePole, height = 440 }: StabilizationPlotProps) {
  const dark = useThemeName() === 'dark';
  const c = plotColours(dark);

  const data = useMemo(() => {
    const traces: Record<string, unknown>[] = [];
    cmif.values.forEach((values, i) =>
      traces.push({
        type: 'scatter',
        mode: 'lines',
        name: cmif.values.length > 1 ? `CMIF ${i + 1}` : 'CMIF',
        x: cmif.f,
        y: values,
        yaxis: 'y2',
        line: { color: i === 0 ? c.ink : c.muted, width: 1 },
        opacity: i === 0 ? 0.75 : 0.55,
        hovertemplate: '%{x:.2f} Hz<br>%{y:.3e} (m/s²)/N<extra>CMIF ' + (i + 1) + '</extra>',
      }),
    );
    for (const cls of stabilityOrder) {
      const look = stabilityLook[cls];
      const x: number[] = [];
      const y: number[] = [];
      const custom: [number, number, number][] = [];
      for (const o of orders)
        o.poles.forEach((p, index) => {
          if (p.stable !== cls) return;
          x.push(p.fHz);
          y.push(o.order);
          custom.push([o.order, index, p.zeta * 100]);
        });
      traces.push({
        type: 'scatter',
        mode: 'markers',
        name: look.label,
        x,
        y,
        customdata: custom,
        marker: { symbol: look.symbol, size: look.size, color: dark ? look.dark : look.light, line: { width: 1.2, color: dark ? look.dark : look.light } },
        hovertemplate: '%{x:.2f} Hz · ζ %{customdata[2]:.3f} % of critical<br>order %{y}<extra>' + look.label + '</extra>',
      });
    }
    const cx: number[] = [];
    const cy: number[] = [];
    const cc: [number, number, number][] = [];
    for (const p of chosen) {
      const pole = orders.find((o) => o.order === p.order)?.poles[p.index];
      if (!pole) continue;
      cx.push(pole.fHz);
      cy.push(p.order);
      cc.push([p.order, p.index, pole.zeta * 100]);
    }
    traces.push({
      type: 'scatter',
      mode: 'markers',
      name: 'chosen (ringed)',
      x: cx,
      y: cy,
      customdata: cc,
      marker: { symbol: 'circle-open', size: 17, color: dark ? '#63c7c1' : '#0a5552', line: { width: 2.5 } },
      hovertemplate: 'chosen: %{x:.2f} Hz · ζ %{customdata[2]:.3f} %<br>order %{y}<extra></extra>',
    });
    return traces;
  }, [cmif, orders, chosen, dark, c.ink, c.muted]);

  const layout = useMemo(() => {
    const maxOrder = Math.max(2, ...orders.map((o) => o.order));
    return baseLayout(c, {
      hovermode: 'closest',
      // automargin on both y axes: the right (CMIF) axis' power-format ticks and its title need more room than a fixed margin gave.
      margin: { l: 56, r: 16, t: 8, b: 44 },
      legend: { orientation: 'h', x: 0, y: -0.16, yanchor: 'top', font: { size: 11 } },
      xaxis: axis(c, 'Frequency (Hz)', { range: bandHz }),
      yaxis: axis(c, 'Model order', { range: [0, maxOrder + 2], dtick: maxOrder > 40 ? 10 : maxOrder > 16 ? 4 : 2, mirror: false, automargin: true }),
      yaxis2: axis(c, 'CMIF (singular values of the FRF matrix), (m/s²)/N', { overlaying: 'y', side: 'right', type: 'log', dtick: 1, showgrid: false, exponentformat: 'power', mirror: false, automargin: true, title: { text: 'CMIF (singular values of the FRF matrix), (m/s²)/N', font: { size: 11 }, standoff: 6 } }),
      uirevision: 'stabilization',
    });
  }, [c, orders, bandHz]);

  return (
    <Plot
      label={`Stabilization diagram: poles at model orders up to ${Math.max(0, ...orders.map((o) => o.order))} from ${bandHz[0]} to ${bandHz[1]} Hz over the CMIF curves`}
      data={data}
      layout={layout}
      config={plotConfig}
      height={height}
      className="stabilization-plot"
      onClick={
        onTogglePole
          ? (event) => {
              const cd = event.points[0]?.customdata;
              if (Array.isArray(cd) && typeof cd[0] === 'number' && typeof cd[1] === 'number') onTogglePole({ order: cd[0], index: cd[1] });
            }
          : undefined
      }
    />
  );
}

/** The legend in words with the same glyphs, for reading without the plot. */
export function StabilityKey() {
  const dark = useThemeName() === 'dark';
  return (
    <ul className="flex flex-wrap gap-x-4 gap-y-1 text-xs text-[var(--muted)]" aria-label="Stability classes">
      {stabilityOrder.map((cls) => (
        <li key={cls} className="inline-flex items-center gap-1">
          <span aria-hidden className="num" style={{ color: dark ? stabilityLook[cls].dark : stabilityLook[cls].light }}>
            {stabilityLook[cls].glyph}
          </span>
          {stabilityLook[cls].label}
        </li>
      ))}
      <li className="inline-flex items-center gap-1">
        <span aria-hidden className="text-accent">
          ◯
        </span>
        chosen
      </li>
    </ul>
  );
}
