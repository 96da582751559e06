// One heat map for every MAC-like matrix from 0 to 1: the auto-MAC of a proposal (Plan → Model), the
// MAC of the mode table (Modes) and test against model (Modes, Hand-over). The value is printed in every
// cell so the colour is never the only carrier. With many modes the ticks shorten to the mode number
// (the full name, with its frequency, is in the hover and the axis title says so) and the cell text
// drops the leading zero and gets smaller, so 17 × 17 cells stay readable at 1366 px and on a tablet.
import { useMemo } from 'react';
import { Plot } from './plot.tsx';
import { baseLayout, monoFont, plotColours, plotConfig } from '../lib/plot-style.ts';
import { useThemeName } from '../lib/theme-name.ts';

export interface MatrixAxisItem {
  /** Full name, e.g. "mode 3 (412.3 Hz)"; on the ticks while the matrix is small. */
  name: string;
  /** Short tick, e.g. "3"; used once the matrix has more than FULL_TICKS rows or columns. */
  short: string;
}

/** Up to this many rows/columns the ticks carry the full names. */
const FULL_TICKS = 6;

/** "0.93" for few cells, ".93" (and "1" for 1.00) for many, so the text fits the cell. */
export function cellText(v: number, compact: boolean): string {
  const s = v.toFixed(2);
  if (!compact) return s;
  return s === '1.00' ? '1' : s.replace(/^0(?=\.)/, '');
}

export function MacMatrix({
  matrix,
  rows,
  columns,
  rowTitle,
  columnTitle,
  label,
  className = 'mac-matrix',
  height,
}: {
  matrix: number[][];
  rows: MatrixAxisItem[];
  columns: MatrixAxisItem[];
  /** Axis titles used when the ticks are short, e.g. "test mode (number)". */
  rowTitle: string;
  columnTitle: string;
  label: string;
  className?: string;
  height?: number;
}) {
  const dark = useThemeName() === 'dark';
  const c = plotColours(dark);
  // Callers build the axis lists inline; keyed by their content, so a re-render of the page does not hand
  // plotly a "new" figure and redraw it each time.
  const rowKey = rows.map((r) => `${r.name}\u0000${r.short}`).join('\u0001');
  const colKey = columns.map((r) => `${r.name}\u0000${r.short}`).join('\u0001');
  const rowList = useMemo(() => rows, [rowKey]);
  const colList = useMemo(() => columns, [colKey]);
  const shortRows = rowList.length > FULL_TICKS;
  const shortCols = colList.length > FULL_TICKS;
  const compact = Math.max(rowList.length, colList.length) > 8;
  const data = useMemo(
    () => [
      {
        type: 'heatmap',
        z: matrix,
        x: colList.map((m) => (shortCols ? m.short : m.name)),
        y: rowList.map((m) => (shortRows ? m.short : m.name)),
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
        text: matrix.map((row) => row.map((v) => cellText(v, compact))),
        // The matrix and the names can be a render apart (the page updates the table's rows before its MAC arrives).
        customdata: matrix.map((row, i) => row.map((_, j) => [rowList[i]?.name ?? '', colList[j]?.name ?? ''])),
        texttemplate: '%{text}',
        textfont: { family: monoFont, size: compact ? 10 : 12 },
        hovertemplate: '%{customdata[0]} against %{customdata[1]}<br>MAC %{z:.3f}<extra></extra>',
        colorbar: { title: { text: 'MAC', side: 'right' }, thickness: 12, tickvals: [0, 0.5, 1], tickfont: { family: monoFont, size: 11 } },
        xgap: 1,
        ygap: 1,
      },
    ],
    [matrix, rowList, colList, dark, shortRows, shortCols, compact],
  );
  const layout = useMemo(
    () =>
      baseLayout(c, {
        hovermode: 'closest',
        showlegend: false,
        margin: { l: 8, r: 8, t: 8, b: 8 },
        xaxis: { automargin: true, type: 'category', tickfont: { family: monoFont, size: 11 }, color: c.ink, tickangle: shortCols ? 0 : -30, title: { text: shortCols ? columnTitle : '', font: { size: 11 } } },
        yaxis: { automargin: true, type: 'category', autorange: 'reversed', tickfont: { family: monoFont, size: 11 }, color: c.ink, title: { text: shortRows ? rowTitle : '', font: { size: 11 } } },
      }),
    [c, shortRows, shortCols, rowTitle, columnTitle],
  );
  const h = height ?? Math.max(240, 110 + (compact ? 30 : 40) * rowList.length);
  return <Plot label={label} data={data} layout={layout} config={plotConfig} height={h} className={className} />;
}
