// The auto-MAC matrix of the chosen shapes as a heat map from 0 to 1, the value printed in
// every cell so the colour is never the only carrier.
import { useMemo } from 'react';
import { Plot } from '../plot.tsx';
import { baseLayout, monoFont, plotColours, plotConfig } from '../../lib/plot-style.ts';
import { useThemeName } from '../../lib/theme-name.ts';
import type { ModeRow } from '../../lib/modes-data.ts';

export function MacHeatmap({ mac, modes, height = 320 }: { mac: number[][]; modes: ModeRow[]; height?: number }) {
  const dark = useThemeName() === 'dark';
  const c = plotColours(dark);
  const labels = useMemo(() => modes.map((m) => `mode ${m.mode} (${m.fHz.toFixed(1)} Hz)`), [modes]);

  const data = useMemo(
    () => [
      {
        type: 'heatmap',
        z: mac,
        x: labels,
        y: labels,
        zmin: 0,
        zmax: 1,
        colorscale: dark
          ? [
              [0, '#111514'],
              [1, '#3fb3ac'],
            ]
          : [
              [0, '#ffffff'],
              [1, '#0a5552'],
            ],
        text: mac.map((row) => row.map((v) => v.toFixed(2))),
        texttemplate: '%{text}',
        textfont: { family: monoFont, size: 12 },
        hovertemplate: '%{y} against %{x}<br>MAC %{z:.3f}<extra></extra>',
        colorbar: { title: { text: 'MAC', side: 'right' }, thickness: 12, tickvals: [0, 0.5, 1], tickfont: { family: monoFont, size: 11 } },
        xgap: 1,
        ygap: 1,
      },
    ],
    [mac, labels, dark],
  );
  const layout = useMemo(
    () =>
      baseLayout(c, {
        hovermode: 'closest',
        showlegend: false,
        margin: { l: 8, r: 8, t: 8, b: 8 },
        xaxis: { automargin: true, tickfont: { family: monoFont, size: 11 }, color: c.ink, tickangle: -30, title: { text: '' } },
        yaxis: { automargin: true, autorange: 'reversed', tickfont: { family: monoFont, size: 11 }, color: c.ink },
      }),
    [c],
  );
  return <Plot label={`MAC matrix of ${modes.length} modes, from 0 to 1`} data={data} layout={layout} config={plotConfig} height={height} className="mac-heatmap" />;
}
