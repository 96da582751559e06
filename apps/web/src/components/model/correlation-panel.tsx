// Test against the model (Modes and Hand-over): modes paired by MAC with the frequency difference
// in %, the MAC matrix, cross-orthogonality where both sides are mass-normalised, and test against
// model frequencies with the line where they are equal.
import { useMemo, useState } from 'react';
import { Plot } from '../plot.tsx';
import { Notice, Panel, Spinner } from '../ui.tsx';
import { axis, baseLayout, plotColours, plotConfig } from '../../lib/plot-style.ts';
import { useThemeName } from '../../lib/theme-name.ts';
import { useCorrelation, useFeModels, type FeCorrelation } from '../../lib/fe-model-data.ts';
import { useCurrentModes } from '../../lib/modes-data.ts';
import { MacMatrix } from '../mac-matrix.tsx';

function FrequencyPlot({ pairs }: { pairs: Extract<FeCorrelation, { ok: true }>['pairs'] }) {
  const dark = useThemeName() === 'dark';
  const c = plotColours(dark);
  // The same range on both axes (so f test = f model is the diagonal), around the paired modes rather than from 0,
  // and a square plot area (scaleanchor with constrain 'domain' keeps the range and shrinks the width instead).
  const all = pairs.flatMap((p) => [p.testHz, p.modelHz]);
  const top = Math.max(1, ...all) * 1.08;
  const bottom = all.length ? Math.min(...all) / 1.08 : 0;
  const span = top - bottom;
  const lo = Math.max(0, bottom - 0.05 * span);
  const data = useMemo(
    () => [
      { type: 'scatter', mode: 'lines', x: [lo, top], y: [lo, top], name: 'f test = f model', line: { color: c.muted, dash: 'dash', width: 1 }, hoverinfo: 'skip' },
      {
        type: 'scatter',
        mode: 'markers+text',
        x: pairs.map((p) => p.modelHz),
        y: pairs.map((p) => p.testHz),
        text: pairs.map((p) => `${p.testMode}`),
        // right of the dot: a test mode below the model's sits under the line, so the number stays clear of it
        textposition: 'middle right',
        textfont: { size: 11 },
        name: 'paired modes',
        marker: { size: 8, color: dark ? '#6fa8e8' : '#1f5fa8' },
        hovertemplate: 'model %{x:.2f} Hz<br>test %{y:.2f} Hz<extra></extra>',
      },
    ],
    [pairs, lo, top, c.muted, dark],
  );
  const layout = useMemo(
    () => baseLayout(c, { hovermode: 'closest', xaxis: axis(c, 'model frequency (Hz)', { range: [lo, top], constrain: 'domain' }), yaxis: axis(c, 'test frequency (Hz)', { range: [lo, top], scaleanchor: 'x', constrain: 'domain' }) }),
    [c, lo, top],
  );
  return <Plot label="Test against model natural frequencies, with the line where they are equal; the numbers are the test modes" data={data} layout={layout} config={plotConfig} height={320} className="frequency-plot" />;
}

export function CorrelationPanel({ campaignId }: { campaignId: string }) {
  const models = useFeModels(campaignId);
  const [picked, setPicked] = useState<string>();
  const modelId = picked ?? models.data?.models[0]?.id;
  const table = useCurrentModes(campaignId);
  const corr = useCorrelation(campaignId, modelId, table.data?.version);
  const title = 'Test against the model';
  if (models.isPending) return <Panel title={title}><Spinner label="Loading the model versions…" /></Panel>;
  if (models.isError) return <Panel title={title}><Notice tone="error">The model versions could not be loaded: {models.error.message}</Notice></Panel>;
  if (!models.data.models.length) return <Panel title={title}><p className="text-sm text-[var(--muted)]">No finite-element model yet. A lead uploads one under Plan → Model; the correlation then appears here.</p></Panel>;
  const k = corr.data?.correlation;
  return (
    <Panel
      title={title}
      actions={
        <label className="flex items-center gap-2 text-sm">
          Model version
          <select className="min-h-9 rounded-md border border-[var(--line)] bg-[var(--panel)] px-2" value={modelId} onChange={(e) => setPicked(e.target.value)} data-testid="correlation-model">
            {models.data.models.map((m) => (
              <option key={m.id} value={m.id}>
                {m.versionLabel} — {m.name}
              </option>
            ))}
          </select>
        </label>
      }
    >
      {table.isError && <Notice tone="error">The mode table could not be loaded: {table.error.message}</Notice>}
      {corr.isPending && !table.isError && <Spinner label="Correlating…" />}
      {corr.isError && <Notice tone="error">The correlation could not be computed: {corr.error.message}</Notice>}
      {k && !k.ok && <Notice tone="info">{k.why}</Notice>}
      {k && k.ok && (
        <div className="space-y-4" data-testid="correlation">
          <p className="text-sm">{k.words}</p>
          <div className="overflow-x-auto">
            <table className="text-sm" data-testid="correlation-table">
              <thead>
                <tr className="text-left text-[var(--muted)]">
                  <th className="pr-4 font-medium">Test mode</th>
                  <th className="pr-4 text-right font-medium">f test (Hz)</th>
                  <th className="pr-4 font-medium">Model mode</th>
                  <th className="pr-4 text-right font-medium">f model (Hz)</th>
                  <th className="pr-4 text-right font-medium">Δf (%)</th>
                  <th className="pr-4 text-right font-medium">MAC</th>
                </tr>
              </thead>
              <tbody className="num">
                {k.pairs.map((p) => (
                  <tr key={`${p.testMode}-${p.modelMode}`} className="border-t border-[var(--line)]">
                    <td className="pr-4 py-1">{p.testMode}</td>
                    <td className="pr-4 text-right">{p.testHz.toFixed(2)}</td>
                    <td className="pr-4">{p.modelMode}</td>
                    <td className="pr-4 text-right">{p.modelHz.toFixed(2)}</td>
                    <td className="pr-4 text-right">{p.frequencyDifferencePercent === null ? '—' : `${p.frequencyDifferencePercent >= 0 ? '+' : '−'}${Math.abs(p.frequencyDifferencePercent).toFixed(2)}`}</td>
                    <td className={`pr-4 text-right ${p.mac < 0.9 ? 'text-warn' : ''}`}>{p.mac.toFixed(3)}</td>
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
          <p className="text-xs text-[var(--muted)]">
            Δf = (f test − f model) / f model × 100. Pairs need MAC ≥ {k.minMac}; a MAC of 0.9 or more is commonly read as good agreement (common practice).
            {k.unpairedTest.length > 0 && ` Test modes without a partner: ${k.unpairedTest.join(', ')}.`} Compared over {k.dofs.length} DOFs. {k.method}
          </p>
          <div className="grid gap-4 lg:grid-cols-2">
            <div className="min-w-0">
              <h3 className="mb-1 text-sm font-medium">MAC, test (rows) against model (columns)</h3>
              <MacMatrix
                matrix={k.mac}
                rows={k.testModes.map((t) => ({ name: `test ${t.mode} (${t.fHz.toFixed(1)} Hz)`, short: `T${t.mode}` }))}
                columns={k.modelModes.map((m) => ({ name: `FE ${m.number} (${m.frequencyHz.toFixed(1)} Hz)`, short: `FE${m.number}` }))}
                rowTitle="test mode (number in the mode table)"
                columnTitle="model mode (number)"
                label={`MAC matrix of ${k.testModes.length} test modes against ${k.modelModes.length} model modes`}
                className="matrix-heatmap"
              />
            </div>
            <div className="min-w-0">
              <h3 className="mb-1 text-sm font-medium">Test against model frequencies</h3>
              <FrequencyPlot pairs={k.pairs} />
            </div>
          </div>
          <div>
            <h3 className="mb-1 text-sm font-medium">Cross-orthogonality</h3>
            {k.crossOrthogonality.ok ? (
              <>
                <p className="text-sm">{k.crossOrthogonality.words}</p>
                <p className="num text-xs text-[var(--muted)]">Diagonal: {k.crossOrthogonality.diagonal.map((v) => v.toFixed(3)).join(', ')} ({k.crossOrthogonality.method}).</p>
              </>
            ) : (
              <p className="text-sm text-[var(--muted)]">{k.crossOrthogonality.why}</p>
            )}
          </div>
        </div>
      )}
    </Panel>
  );
}
