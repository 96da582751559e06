// Background noise on Tap: before the first hit (and whenever something changes — a cable moved,
// a machine started nearby) the engineer records some seconds with nobody touching the structure.
// The newest check shows each channel's floor in words and numbers; its PSD opens on request.
import { useMemo, useRef, useState } from 'react';
import { useQueryClient } from '@tanstack/react-query';
import { api, ApiError } from '../../lib/api.ts';
import { newIdempotencyKey, uploadRecording } from '../../lib/hits-data.ts';
import { noiseKeys, useNoiseCheck, useNoiseChecks, type NoiseCheck } from '../../lib/noise-data.ts';
import { axis, baseLayout, plotColours, plotConfig, responseColour } from '../../lib/plot-style.ts';
import { useThemeName } from '../../lib/theme-name.ts';
import { useToast } from '../../lib/toast.tsx';
import { Plot } from '../plot.tsx';
import { Button, Notice, Spinner } from '../ui.tsx';

function StatusWord({ status }: { status: 'ok' | 'caution' }) {
  return status === 'ok' ? (
    <span className="inline-flex items-center gap-1 rounded-full border border-ok/40 px-2 py-0.5 text-xs font-medium text-ok" data-noise-status="ok">
      <span aria-hidden>✓</span> Quiet
    </span>
  ) : (
    <span className="inline-flex items-center gap-1 rounded-full border border-warn/50 px-2 py-0.5 text-xs font-medium text-warn" data-noise-status="caution">
      <span aria-hidden>▲</span> Caution
    </span>
  );
}

/** PSD of every channel: the hammer in the top row (N²/Hz), accelerometers below ((m/s²)²/Hz), the band shaded. */
function NoiseSpectrum({ check }: { check: NoiseCheck }) {
  const theme = useThemeName();
  const fig = useMemo(() => {
    const c = plotColours(theme === 'dark');
    let response = 0;
    const data = (check.spectra ?? []).map((s) => {
      const reading = check.channels.find((ch) => ch.channel === s.channel);
      const force = reading?.role === 'force';
      const name = `ch${s.channel} ${force ? 'hammer' : (reading?.dof ?? '')}`;
      const colour = force ? c.force : responseColour(response++, c.dark);
      return { type: 'scatter', mode: 'lines', x: s.f, y: s.levelDb, name, yaxis: force ? 'y' : 'y2', line: { color: colour, width: 1 }, hovertemplate: `${name}: %{y:.1f} ${s.unit}<extra></extra>` };
    });
    // A 40 dB span above each row's highest line: a flat floor reads flat and a tone stands out.
    const span = (row: 'y' | 'y2') => {
      const top = Math.max(...data.filter((t) => t.yaxis === row).flatMap((t) => t.y.filter(Number.isFinite)));
      return Number.isFinite(top) ? { range: [Math.floor(top - 40), Math.ceil(top + 3)] } : {};
    };
    const band = { type: 'rect', xref: 'x', yref: 'paper', x0: check.bandHz.low, x1: check.bandHz.high, y0: 0, y1: 1, fillcolor: c.band, line: { width: 0 }, layer: 'below' };
    const layout = baseLayout(c, {
      shapes: [band],
      xaxis: axis(c, 'Frequency (Hz)', { anchor: 'y2', hoverformat: '.1f' }),
      yaxis: axis(c, 'dB re 1 N²/Hz', { domain: [0.56, 1], ...span('y') }),
      yaxis2: axis(c, 'dB re 1 (m/s²)²/Hz', { domain: [0, 0.44], ...span('y2') }),
    });
    return { data, layout };
  }, [check, theme]);
  return <Plot label={`Power spectral density of each channel's background noise, band ${check.bandHz.low}–${check.bandHz.high} Hz shaded`} data={fig.data} layout={fig.layout} config={plotConfig} height={380} />;
}

export function NoisePanel({ campaignId, canAct }: { campaignId: string; canAct: boolean }) {
  const client = useQueryClient();
  const toast = useToast();
  const checks = useNoiseChecks(campaignId);
  const latest = checks.data?.checks[0] ?? null;
  const [open, setOpen] = useState(false);
  const detail = useNoiseCheck(campaignId, latest?.id ?? null, open);
  const [busy, setBusy] = useState(false);
  const [units, setUnits] = useState<'volts' | 'engineering'>('volts');
  const fileRef = useRef<HTMLInputElement>(null);
  // A retry of the same action reuses its key (never stored twice); a different action gets a new one.
  const pendingKey = useRef<{ what: string; key: string } | null>(null);

  async function run(what: string, call: (key: string) => Promise<{ replayed: boolean; check: NoiseCheck }>) {
    setBusy(true);
    if (pendingKey.current?.what !== what) pendingKey.current = { what, key: newIdempotencyKey() };
    try {
      const answer = await call(pendingKey.current.key);
      pendingKey.current = null;
      client.setQueryData(noiseKeys.one(campaignId, answer.check.id), answer.check);
      await client.invalidateQueries({ queryKey: noiseKeys.list(campaignId), exact: true });
      toast(answer.check.status === 'ok' ? 'ok' : 'info', answer.check.status === 'ok' ? 'Background noise recorded: quiet enough on every channel.' : 'Background noise recorded: read the cautions before striking.');
    } catch (err) {
      // A network failure or a server error keeps the key, so the retry cannot store the check twice.
      if (!(err instanceof ApiError && (err.status === 0 || err.status >= 500))) pendingKey.current = null;
      toast('error', err instanceof Error ? err.message : 'The background noise could not be recorded.');
    } finally {
      setBusy(false);
    }
  }

  const listen = () => run('listen', (key) => api(`/campaigns/${campaignId}/noise-checks/simulate`, { body: { durationS: 10, idempotencyKey: key } }));
  const upload = () => {
    const file = fileRef.current?.files?.[0];
    if (!file) return toast('info', 'Choose the quiet recording first (CSV, WAV or JSON, one column per channel).');
    const form = new FormData();
    form.append('units', units);
    form.append('file', file);
    return run(`upload:${file.name}:${file.size}:${file.lastModified}:${units}`, (key) => uploadRecording(`/campaigns/${campaignId}/noise-checks`, form, key, () => undefined));
  };

  return (
    <div className="space-y-3 text-sm" data-testid="noise-panel">
      {checks.isPending && <Spinner label="Loading the background-noise checks…" />}
      {checks.isError && <Notice tone="error">The background-noise checks could not be loaded: {checks.error.message}</Notice>}
      {checks.isSuccess && !latest && (
        <p className="text-[var(--muted)]" data-testid="noise-empty">
          No background-noise check yet. Before the first hit, record some seconds with nobody touching the structure: it shows the floor every hit will carry, how close the hammer channel's noise comes to the trigger level, and any mains hum.
        </p>
      )}
      {latest && (
        <div className="space-y-2" data-testid="noise-latest" data-check={latest.id}>
          <div className="flex flex-wrap items-center gap-2">
            <StatusWord status={latest.status} />
            <span className="text-xs text-[var(--muted)]">
              {new Date(latest.recordedAt).toLocaleString()}
              {latest.recordedBy ? ` · ${latest.recordedBy}` : ''} · <span className="num">{latest.durationS.toFixed(1)} s</span> · {latest.source.startsWith('simulated') ? 'simulated rig' : 'uploaded'}
            </span>
          </div>
          {new Date(latest.recordedAt).toDateString() !== new Date().toDateString() && (
            <p className="text-xs text-warn" data-testid="noise-stale">
              This check is from an earlier day: cables, mounts and the machines around change, so record a fresh one before today's first hit.
            </p>
          )}
          <ul className="space-y-1.5">
            {latest.channels.map((ch) => (
              <li key={ch.channel} className="flex gap-2" data-noise-channel={ch.channel} data-noise-status={ch.status}>
                <span aria-hidden className={ch.status === 'ok' ? 'text-ok' : 'text-warn'}>
                  {ch.status === 'ok' ? '✓' : '▲'}
                </span>
                <span>
                  <span className="num font-medium">
                    ch{ch.channel} {ch.role === 'force' ? 'hammer' : ch.dof}
                  </span>
                  : {ch.message}
                </span>
              </li>
            ))}
          </ul>
          <button type="button" className="text-xs text-accent underline-offset-2 hover:underline" aria-expanded={open} onClick={() => setOpen((v) => !v)} data-testid="noise-spectrum-toggle">
            {open ? 'Hide the noise spectrum' : 'Show the noise spectrum (PSD)'}
          </button>
          {open && detail.isPending && <Spinner label="Loading the noise spectrum…" />}
          {open && detail.isError && <Notice tone="error">The noise spectrum could not be loaded: {detail.error.message}</Notice>}
          {open && detail.data && (
            <div data-testid="noise-spectrum">
              <NoiseSpectrum check={detail.data} />
              <p className="text-xs text-[var(--muted)]">Welch PSD (Hann, 50 % overlap, mean removed), one-sided, in dB re 1 unit²/Hz; the band of interest shaded. A narrow peak standing out of the floor is a tone (mains hum at 50/60 Hz, a running machine).</p>
            </div>
          )}
        </div>
      )}
      {canAct && (
        <div className="space-y-2 border-t border-[var(--line)] pt-3">
          <Button variant="secondary" onClick={() => void listen()} disabled={busy} className="w-full" data-testid="noise-listen">
            {busy ? 'Recording…' : 'Listen 10 s with the simulated rig'}
          </Button>
          <label className="flex flex-col gap-1 text-xs text-[var(--muted)]">
            Or upload a quiet recording (1–60 s; CSV, WAV or JSON, one column per channel)
            <input ref={fileRef} type="file" accept=".csv,.wav,.json,text/csv,audio/wav,application/json" className="w-full text-xs text-[var(--ink)]" aria-label="Quiet recording file" />
          </label>
          <div className="flex items-end gap-2">
            <label className="flex flex-1 flex-col gap-1 text-xs text-[var(--muted)]">
              Values in
              <select value={units} onChange={(e) => setUnits(e.target.value as 'volts' | 'engineering')} className="min-h-10 rounded-md border border-[var(--line)] bg-[var(--panel)] px-2 text-sm text-[var(--ink)]" aria-label="Values in">
                <option value="volts">volts (the kit's sensitivities apply)</option>
                <option value="engineering">N and m/s²</option>
              </select>
            </label>
            <Button variant="secondary" onClick={() => void upload()} disabled={busy}>
              Upload
            </Button>
          </div>
        </div>
      )}
    </div>
  );
}
