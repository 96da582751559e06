// A matrix from 0 to 1 (auto-MAC, test-against-model MAC) as a heat map, the value printed in every
// cell so the colour is never the only carrier.
import { useMemo } from 'react';
import { Plot } from '../plot.tsx';
import { baseLayout, monoFont, plotColours, plotConfig } from '../../lib/plot-style.ts';
import { useThemeName } from '../../lib/theme-name.ts';

export function MatrixHeatmap({ matrix, rows, columns, label, xTitle = '', yTitle = '', height = 320 }: { matrix: number[][]; rows: string[]; columns: string[]; label: string; xTitle?: string; yTitle?: string; height?: number }) {
  const dark = useThemeName() === 'dark';
  const c = plotColours(dark);
  const data = useMemo(
    () => [
      {
        type: 'heatmap',
        z: matrix,
        x: columns,
        y: rows,
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
        text: matrix.map((row) => row.map((v) => v.toFixed(2))),
        texttemplate: '%{text}',
        textfont: { family: monoFont, size: 12 },
        hovertemplate: '%{y} against %{x}<br>MAC %{z:.3f}<extra></extra>',
        colorbar: { title: { text: 'MAC', side: 'right' }, thickness: 12, tickvals: [0, 0.5, 1], tickfont: { family: monoFont, size: 11 } },
        xgap: 1,
        ygap: 1,
      },
    ],
    [matrix, rows, columns, dark],
  );
  const layout = useMemo(
    () =>
      baseLayout(c, {
        hovermode: 'closest',
        showlegend: false,
        margin: { l: 8, r: 8, t: 8, b: 8 },
        xaxis: { automargin: true, tickfont: { family: monoFont, size: 11 }, color: c.ink, tickangle: -30, title: { text: xTitle } },
        yaxis: { automargin: true, autorange: 'reversed', tickfont: { family: monoFont, size: 11 }, color: c.ink, title: { text: yTitle } },
      }),
    [c, xTitle, yTitle],
  );
  return <Plot label={label} data={data} layout={layout} config={plotConfig} height={height} className="matrix-heatmap" />;
}
