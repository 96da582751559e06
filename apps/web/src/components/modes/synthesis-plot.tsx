// A measured FRF against the one synthesized from the chosen modes: magnitude in dB re
// 1 (m/s²)/N over phase in degrees, sharing the frequency axis. Solid measured, dashed synthesized.
import { useMemo } from 'react';
import { Plot } from '../plot.tsx';
import { axis, baseLayout, baseMargin, plotColours, plotConfig } from '../../lib/plot-style.ts';
import { useThemeName } from '../../lib/theme-name.ts';
import type { Synthesis } from '../../lib/modes-data.ts';

const db = (re: number, im: number) => 20 * Math.log10(Math.max(Math.hypot(re, im), 1e-30));
const deg = (re: number, im: number) => (Math.atan2(im, re) * 180) / Math.PI;

export function SynthesisPlot({ synthesis, title, height = 420 }: { synthesis: Synthesis; title: string; height?: number }) {
  const dark = useThemeName() === 'dark';
  const c = plotColours(dark);
  const unit = synthesis.unit;

  const data = useMemo(() => {
    const { f, measured: m, synthesized: s } = synthesis;
    const measuredColour = c.ink;
    const synthColour = dark ? '#63c7c1' : '#0e6b67';
    return [
      { type: 'scatter', mode: 'lines', name: 'measured (H1)', legendgroup: 'm', x: f, y: f.map((_, k) => db(m.re[k]!, m.im[k]!)), line: { color: measuredColour, width: 1.2 }, hovertemplate: '%{y:.1f} dB<extra>measured</extra>' },
      { type: 'scatter', mode: 'lines', name: 'synthesized from the chosen modes', legendgroup: 's', x: f, y: f.map((_, k) => db(s.re[k]!, s.im[k]!)), line: { color: synthColour, width: 1.6, dash: 'dash' }, hovertemplate: '%{y:.1f} dB<extra>synthesized</extra>' },
      { type: 'scatter', mode: 'lines', name: 'measured (H1)', legendgroup: 'm', showlegend: false, x: f, y: f.map((_, k) => deg(m.re[k]!, m.im[k]!)), yaxis: 'y2', line: { color: measuredColour, width: 1.2 }, hovertemplate: '%{y:.0f}°<extra>measured</extra>' },
      { type: 'scatter', mode: 'lines', name: 'synthesized from the chosen modes', legendgroup: 's', showlegend: false, x: f, y: f.map((_, k) => deg(s.re[k]!, s.im[k]!)), yaxis: 'y2', line: { color: synthColour, width: 1.6, dash: 'dash' }, hovertemplate: '%{y:.0f}°<extra>synthesized</extra>' },
    ];
  }, [synthesis, c.ink, dark]);

  const layout = useMemo(
    () =>
      baseLayout(c, {
        margin: { ...baseMargin, t: 40 },
        hovermode: 'x unified',
        xaxis: axis(c, 'Frequency (Hz)', { anchor: 'y2' }),
        yaxis: axis(c, `Magnitude (dB re 1 ${unit})`, { domain: [0.42, 1] }),
        yaxis2: axis(c, 'Phase (°)', { domain: [0, 0.32], anchor: 'x', range: [-185, 185], dtick: 90 }),
        annotations: [{ text: title, xref: 'paper', yref: 'paper', x: 1, y: 1.02, xanchor: 'right', yanchor: 'bottom', showarrow: false, font: { size: 11, color: c.muted } }],
      }),
    [c, unit, title],
  );
  return <Plot label={`Measured against synthesized FRF ${title}: magnitude in dB re 1 ${unit} and phase in degrees`} data={data} layout={layout} config={plotConfig} height={height} className="synthesis-plot" />;
}
