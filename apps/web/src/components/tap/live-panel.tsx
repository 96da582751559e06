// "Live input" on Tap: hits captured from an audio-class interface. The engineer picks the input,
// sees its real sample rate and channel count against the campaign's settings, watches a level
// meter per channel (headroom in dB, overload within 1 dB of full scale), and strikes: each hit
// is cut by the trigger, sent to the DOF on screen with its key, and its verdict comes back while
// the next hit is already armed. Hits that cannot be sent wait on this device and go out in order.
import { useEffect, useMemo, useState } from 'react';
import { createPortal } from 'react-dom';
import { Link } from 'react-router';
import { useQuery, useQueryClient } from '@tanstack/react-query';
import { CALIBRATOR_DEFAULT, sensitivityDeviation } from '@resonote/contracts';
import { api } from '../../lib/api.ts';
import { keys, useChannels, useSettings, type Channel } from '../../lib/campaign-data.ts';
import type { HitsAnswer } from '../../lib/hits-data.ts';
import { toneOf } from '../../lib/live/calibrator.ts';
import { OVERLOAD_PEAK, type Slope } from '../../lib/live/capture-engine.ts';
import { useReadings, type ReadingStore } from '../../lib/live/readings.ts';
import { useFailure } from '../../lib/mutation.ts';
import { Button, Notice, Spinner } from '../ui.tsx';
import { SafetyNote } from './safety-note.tsx';
import { VerdictBadge } from './verdict.tsx';
import { neededChannels, useLiveInput, type Capture, type Scaling } from './use-live-input.ts';

export const inputScalingKey = (campaignId: string) => ['campaign', campaignId, 'input-scaling'] as const;
export const useInputScaling = (campaignId: string) => useQuery({ queryKey: inputScalingKey(campaignId), queryFn: () => api<{ scaling: Scaling[] }>(`/campaigns/${campaignId}/input-scaling`) });

const stateWords = { off: 'stopped', starting: 'starting…', armed: 'armed', recording: 'recording' } as const;
const field = 'num min-h-10 w-full rounded-md border border-[var(--line)] bg-[var(--panel)] px-2 text-sm';

export function LivePanel({ campaignId, entryId, entryLabel, isLead, onStored }: { campaignId: string; entryId: string; entryLabel: string; isLead: boolean; onStored: (a: HitsAnswer) => void }) {
  const channels = useChannels(campaignId);
  const settings = useSettings(campaignId);
  const scaling = useInputScaling(campaignId);
  const live = useLiveInput(onStored);
  const client = useQueryClient();
  const fail = useFailure();
  const [deviceId, setDeviceId] = useState('');
  const [slope, setSlope] = useState<Slope>('rising');
  const [hysteresisPct, setHysteresisPct] = useState('50');
  const [stopAfter, setStopAfter] = useState('');

  const sorted = useMemo(() => [...(channels.data?.channels ?? [])].sort((a, b) => a.channel - b.channel), [channels.data]);
  const s = settings.data?.current.settings;
  const scale = scaling.data?.scaling ?? [];
  const unscaled = sorted.filter((c) => !scale.some((x) => x.channel === c.channel));
  const need = neededChannels(sorted);
  const hyst = Number(hysteresisPct) / 100;
  const stopN = stopAfter.trim() === '' ? null : Number(stopAfter);
  const optionsOk = Number.isFinite(hyst) && hyst >= 0 && hyst < 1 && (stopN === null || (Number.isInteger(stopN) && stopN >= 1));
  const plan = s && { campaignId, entryId, entryLabel, channels: sorted, scaling: scale, settings: s, slope, hysteresis: hyst, stopAfter: stopN };

  const { retarget, resume } = live;
  // Tap's slot beside the DOF's progress (tap-page.tsx, id tap-live-strip): while capturing, the state and the
  // meters go there so they stay in view with the verdict and the FRF.
  // Looked up at every render of the panel (each change of state and each capture).
  const strip = live.running ? document.getElementById('tap-live-strip') : null;
  useEffect(() => {
    if (plan && optionsOk) retarget(plan);
  });
  useEffect(() => void resume(campaignId), [campaignId, resume]);
  // While the live input runs, the DOF it sends to is armed for this engineer, so everyone on the
  // campaign sees it in the armed-DOF list (the same arming as the watched-folder bridge's).
  const running = live.running;
  useEffect(() => {
    if (!running) return;
    api(`/campaigns/${campaignId}/arming`, { method: 'PUT', body: { entryId } })
      .then((next) => client.setQueryData(['campaign', campaignId, 'arming'], next))
      .catch(() => undefined);
  }, [running, campaignId, entryId, client]);

  if (channels.isPending || settings.isPending || scaling.isPending) return <Spinner label="Loading the channel map and the settings…" />;
  if (channels.isError || settings.isError || scaling.isError) return <Notice tone="error">The channel map, settings or input scaling could not be loaded. Reload the page.</Notice>;

  const rate = live.device?.contextRateHz ?? null;
  const rateDiffers = rate !== null && s !== undefined && Math.abs(rate - s.sampleRateHz) > 1e-3 * s.sampleRateHz;
  const lowCuts = scale.filter((x) => x.acLowCutHz !== null && s !== undefined && s.bandHz.low < x.acLowCutHz);
  const blocked = !s || unscaled.length > 0 || sorted.length === 0 || !optionsOk || (rateDiffers && !s.resampleUploads);

  const stateLine = (compact: boolean) => (
    <div className={`flex flex-wrap items-center justify-between gap-x-2 ${compact ? 'text-xs' : `text-sm ${live.running ? '-order-4' : ''}`}`} aria-live="polite">
      <p>
        Live input: <strong data-testid="live-state-word">{stateWords[live.engine]}</strong>
        {live.engine === 'armed' && s && <span className="text-[var(--muted)]">{compact ? ` — strike above ${s.triggerLevelN} N` : ` — strike when ready (above ${s.triggerLevelN} N)`}</span>}
      </p>
      <p className={live.pending ? 'font-semibold text-warn' : 'text-[var(--muted)]'} data-testid="live-pending" data-count={live.pending}>
        {live.pending === 0 ? 'none waiting to be sent' : `${live.pending} hit${live.pending === 1 ? '' : 's'} waiting to be sent${live.waitingFor ? ` (${live.waitingFor.reason === 'unreachable' ? 'server not reachable' : 'server busy'}; kept on this device, sent in order)` : ''}`}
      </p>
    </div>
  );

  async function takeRate() {
    if (!settings.data || rate === null) return;
    try {
      await api(`/campaigns/${campaignId}/settings`, { method: 'PUT', body: { baseVersion: settings.data.current.version, settings: { ...settings.data.current.settings, sampleRateHz: Math.round(rate) }, reason: `sample rate of the live input (${Math.round(rate)} Hz)` } });
      await client.invalidateQueries({ queryKey: keys.settings(campaignId) });
    } catch (err) {
      fail(err, [keys.settings(campaignId)]);
    }
  }

  return (
    <div className="flex flex-col gap-3" data-testid="live-panel" data-engine={live.engine}>
      {/* While capturing, what the engineer watches with the hammer in hand comes first (state,
          meters, Stop, the latest captures) so it stays in view at 768×1024; the set-up below it. */}

      {unscaled.length > 0 && (
        <Notice tone="error">
          Channel{unscaled.length > 1 ? 's' : ''} {unscaled.map((c) => c.channel).join(', ')} {unscaled.length > 1 ? 'have' : 'has'} no input scaling (volts at full scale), so samples cannot become volts. {isLead ? 'Enter it' : 'The lead enters it'} in{' '}
          <Link to="../kit" className="underline">
            Kit
          </Link>{' '}
          beside the channel map.
        </Notice>
      )}

      <div className="flex flex-col gap-1">
        <label htmlFor="live-device" className="text-sm font-medium">
          Input device
        </label>
        <div className="flex gap-2">
          <select id="live-device" value={deviceId} onChange={(e) => setDeviceId(e.target.value)} className="min-h-11 min-w-0 flex-1 rounded-md border border-[var(--line)] bg-[var(--panel)] px-2 text-sm" disabled={live.running}>
            <option value="">Default input</option>
            {live.devices.map((d, i) => (
              <option key={d.deviceId || i} value={d.deviceId}>
                {d.label || `Input ${i + 1} (name shown after access is allowed)`}
              </option>
            ))}
          </select>
          {live.devices.every((d) => !d.label) && (
            <Button variant="secondary" onClick={() => void live.allow()} disabled={live.running}>
              Allow access
            </Button>
          )}
        </div>
        <p className={`text-xs text-[var(--muted)] ${live.running ? 'hidden' : ''}`}>
          Needs {need} input channel{need === 1 ? '' : 's'}: interface input <span className="num">n</span> is channel <span className="num">n</span> of the channel map. Echo cancellation, noise suppression and automatic gain are switched off.
        </p>
      </div>

      {live.device && (
        <p className="num text-xs" data-testid="live-device-info">
          {live.device.label}: {Math.round(live.device.contextRateHz)} Hz, {live.device.trackChannels ?? '?'} channel{live.device.trackChannels === 1 ? '' : 's'}
          {live.device.trackChannels !== null && live.device.trackChannels < need ? ` — fewer than the ${need} the channel map needs` : ''}
        </p>
      )}
      {rateDiffers && s && (
        <Notice tone={s.resampleUploads ? 'info' : 'error'}>
          <span data-testid="live-rate-differs">
            The input runs at <span className="num">{Math.round(rate!)} Hz</span>; the campaign's settings ask for <span className="num">{s.sampleRateHz} Hz</span>.{' '}
            {s.resampleUploads ? 'Resampling is allowed: each hit is resampled to the settings’ rate on the server (all channels alike) and the FRF says so.' : 'Hits at another rate are refused: the lead sets the campaign to this rate (44.1, 48 and 96 kHz are usual) or allows resampling in the settings.'}
          </span>
          {isLead && !s.resampleUploads && (
            <Button variant="secondary" className="mt-2" onClick={() => void takeRate()}>
              Set the campaign to {Math.round(rate!)} Hz
            </Button>
          )}
        </Notice>
      )}

      {!live.running && (
      <div className="grid grid-cols-3 gap-2">
        <label className="flex flex-col gap-1 text-xs font-medium">
          Trigger slope
          <select value={slope} onChange={(e) => setSlope(e.target.value as Slope)} className={field} disabled={live.running}>
            <option value="rising">rising</option>
            <option value="falling">falling</option>
          </select>
        </label>
        <label className="flex flex-col gap-1 text-xs font-medium">
          Hysteresis
          <span className="flex items-center gap-1">
            <input value={hysteresisPct} onChange={(e) => setHysteresisPct(e.target.value)} inputMode="decimal" className={field} aria-invalid={!(hyst >= 0 && hyst < 1)} disabled={live.running} />
            <span className="num text-[var(--muted)]">%</span>
          </span>
        </label>
        <label className="flex flex-col gap-1 text-xs font-medium">
          Stop after
          <span className="flex items-center gap-1">
            <input value={stopAfter} onChange={(e) => setStopAfter(e.target.value)} inputMode="numeric" placeholder="—" className={field} data-testid="live-stop-after" disabled={live.running} />
            <span className="text-[var(--muted)]">hits</span>
          </span>
        </label>
      </div>
      )}
      {s && (
        <p className="num text-xs text-[var(--muted)]">
          Trigger {s.triggerLevelN} N ({slope}, hysteresis {hysteresisPct} %) on channel {sorted.find((c) => c.kind === 'hammer')?.channel ?? '?'}, pre-trigger {(s.preTriggerS * 1000).toFixed(1)} ms, record {s.recordLengthS} s (settings){stopN !== null ? `, stop after ${stopN} hits` : ''}
        </p>
      )}

      {live.running ? (
        <Button variant="secondary" onClick={() => void live.stop()} className="-order-2 min-h-11 w-full" data-testid="live-stop">
          Stop the live input
        </Button>
      ) : (
        <Button onClick={() => plan && void live.start(deviceId, plan)} disabled={blocked} className="min-h-14 w-full text-base" data-testid="live-start">
          Start: arm {entryLabel}
        </Button>
      )}
      {live.error && (
        <div className="-order-5" data-testid="live-error" role="alert">
          <Notice tone="error">{live.error}</Notice>
        </div>
      )}

      {!(live.running && strip) && stateLine(false)}

      {live.running && !strip && (
        <div className="-order-3">
          <Meters channels={sorted} readings={live.readings} />
        </div>
      )}
      {live.running &&
        strip &&
        createPortal(
          <div className="space-y-0.5 rounded-md border border-accent/40 px-2 py-1" data-testid="live-strip">
            {stateLine(true)}
            <Meters channels={sorted} readings={live.readings} compact />
          </div>,
          strip,
        )}
      {live.running && strip && <p className="-order-3 text-xs text-[var(--muted)]">State and level meters: beside the DOF, above.</p>}
      <FrameLine readings={live.readings} running={live.running} />

      <div className={live.running ? '-order-1' : ''}>
        <CaptureList captures={live.captures} max={live.running ? 4 : 30} />
      </div>
      {lowCuts.length > 0 && s && (
        <Notice tone="info">
          <span data-testid="live-low-cut">
            The band of interest starts at <span className="num">{s.bandHz.low} Hz</span>, below the interface's AC-coupling low cut-off on channel{lowCuts.length > 1 ? 's' : ''} {lowCuts.map((x) => `${x.channel} (${x.acLowCutHz} Hz)`).join(', ')}: the FRF there is shaped by the interface, not the structure.
          </span>
        </Notice>
      )}
      <details className="rounded-md border border-warn/50 bg-warn/8 px-3 py-1.5 text-xs" data-testid="live-instrument-note" open={!live.running}>
        <summary className="cursor-pointer font-semibold text-warn">An audio interface is not a calibrated measurement instrument unless its scaling has been checked</summary>
        <p className="mt-0.5">Enter each channel's volts at full scale in Kit and check a sensor with a handheld calibrator below before you trust levels in N and m/s².</p>
      </details>
      <SafetyNote />
      {live.running && s && <SensitivityCheck campaignId={campaignId} channels={sorted.filter((c) => c.kind === 'accelerometer')} scaling={scale} grab={live.grab} />}
    </div>
  );
}

function FrameLine({ readings, running }: { readings: ReadingStore; running: boolean }) {
  const { frames } = useReadings(readings);
  if (!running && frames.seen === 0) return null;
  return (
    <p className="num text-xs text-[var(--muted)]" data-testid="live-frames">
      {frames.seen.toLocaleString('en')} frames read, {frames.dropped} skipped by the audio thread
      {frames.upstream !== null ? `, ${frames.upstream} dropped before it` : ' (this browser does not report frames dropped before it)'}
      {'; '}
      <span data-testid="live-interrupted" data-count={frames.interrupted} className={frames.interrupted ? 'font-semibold text-warn' : ''}>
        {frames.interrupted === 0 ? 'no record interrupted' : `${frames.interrupted} record${frames.interrupted === 1 ? '' : 's'} interrupted (not sent — hit again)`}
      </span>
    </p>
  );
}

function Meters({ channels, readings, compact = false }: { channels: Channel[]; readings: ReadingStore; compact?: boolean }) {
  const { meter } = useReadings(readings);
  return (
    <div className={compact ? 'space-y-0.5' : 'space-y-1.5'} data-testid="live-meters" aria-label="Level per channel" title="Headroom below digital full scale; overload from 1 dB below it.">
      {channels.map((c) => {
        const i = c.channel - 1;
        const peak = meter?.peaks[i] ?? 0;
        const head = meter?.headroomDb[i] ?? Infinity;
        const over = meter?.overload[i] ?? false;
        // Bar on a dB scale: −60 dBFS at the left, 0 dBFS at the right.
        const width = peak > 0 ? Math.max(0, Math.min(100, ((20 * Math.log10(peak) + 60) / 60) * 100)) : 0;
        return (
          <div key={c.id} className={`grid items-center gap-2 ${compact ? 'grid-cols-[3rem_minmax(0,1fr)_5.5rem] text-[11px] leading-4' : 'grid-cols-[4.5rem_minmax(0,1fr)_6.5rem] text-xs'}`} data-testid="live-meter" data-channel={c.channel} data-overload={over}>
            <span className="num">ch {c.channel} {c.kind === 'hammer' ? 'F' : 'a'}</span>
            <div className={`relative overflow-hidden rounded bg-[var(--line)] ${compact ? 'h-2' : 'h-3'}`}>
              <div className={`h-full ${over ? 'bg-bad' : 'bg-accent'}`} style={{ width: `${width}%` }} />
              <div className="absolute inset-y-0 border-l border-bad" style={{ left: `${((20 * Math.log10(OVERLOAD_PEAK) + 60) / 60) * 100}%` }} aria-hidden />
            </div>
            <span className={`num text-right ${over ? 'font-semibold text-bad' : ''}`}>{over ? '✕ overload' : Number.isFinite(head) ? `${head.toFixed(1)} dB left` : 'silent'}</span>
          </div>
        );
      })}
      {!compact && <p className="text-xs text-[var(--muted)]">Headroom below digital full scale; overload from 1 dB below it.</p>}
    </div>
  );
}

const captureWords: Record<Capture['state'], string> = { checking: 'checking', waiting: 'waiting to be sent', stored: 'stored', refused: 'refused', interrupted: 'not sent' };

function CaptureList({ captures, max }: { captures: Capture[]; max: number }) {
  if (captures.length === 0) return <p className="text-xs text-[var(--muted)]">No hit captured yet in this session.</p>;
  return (
    <ol className="space-y-1 text-xs" data-testid="live-captures" aria-label="Captured hits">
      {captures.slice(0, max).map((c) => (
        <li key={c.key} className="flex flex-wrap items-center gap-2" data-testid="live-capture" data-state={c.state} data-verdict={c.hit?.verdict ?? ''} data-trigger-frame={c.triggerFrame ?? ''}>
          <span className="num text-[var(--muted)]">{new Date(c.capturedAt).toLocaleTimeString()}</span>
          <span className="num">{c.entryLabel}</span>
          <span className="font-medium">{captureWords[c.state]}</span>
          {c.hit && (
            <>
              <span className="num">hit {c.hit.sequence}</span>
              <VerdictBadge verdict={c.hit.verdict} />
            </>
          )}
          {c.peaks.some((p) => p >= OVERLOAD_PEAK) && <span className="font-semibold text-bad">✕ near full scale</span>}
          {c.message && <span className={c.state === 'interrupted' ? 'font-semibold text-warn' : 'text-[var(--muted)]'}>{c.message}</span>}
        </li>
      ))}
    </ol>
  );
}

function SensitivityCheck({ campaignId, channels, scaling, grab }: { campaignId: string; channels: Channel[]; scaling: Scaling[]; grab: (s: number) => Promise<{ channels: Float32Array[]; sampleRateHz: number }> }) {
  const [channelId, setChannelId] = useState(channels[0]?.id ?? '');
  const [level, setLevel] = useState(String(CALIBRATOR_DEFAULT.levelMs2Rms));
  const [freq, setFreq] = useState(String(CALIBRATOR_DEFAULT.frequencyHz));
  const [busy, setBusy] = useState(false);
  const [result, setResult] = useState<{ measured: number; kit: number; percent: number; db: number; hz: number; stored: boolean } | null>(null);
  const [problem, setProblem] = useState<string | null>(null);
  const fail = useFailure();
  const ch = channels.find((c) => c.id === channelId);
  const sc = ch && scaling.find((x) => x.channel === ch.channel);

  async function run() {
    if (!ch || !sc) return;
    setBusy(true);
    setProblem(null);
    setResult(null);
    try {
      const seconds = 2;
      const rec = await grab(seconds);
      const x = rec.channels[ch.channel - 1]!;
      const volts = Float32Array.from(x, (v) => v * sc.fullScaleVolts);
      const tone = toneOf(volts, rec.sampleRateHz);
      if (tone.irregularCycles > 0) throw new RangeError(`${tone.irregularCycles} ${tone.irregularCycles === 1 ? 'cycle' : 'cycles'} of the tone came out irregular (a break in the stream, or the sensor moved on the calibrator), so nothing was stored: record the calibrator again.`);
      const dev = sensitivityDeviation(tone.rms, Number(level), ch.sensitivityBase);
      setResult({ measured: dev.measured, kit: ch.sensitivityBase, percent: dev.percent, db: dev.db, hz: tone.frequencyHz, stored: false });
      await api(`/campaigns/${campaignId}/sensitivity-checks`, { body: { channelId: ch.id, referenceMs2Rms: Number(level), referenceHz: Number(freq), measuredVoltsRms: tone.rms, measuredHz: tone.frequencyHz, sampleRateHz: rec.sampleRateHz, durationS: seconds } });
      setResult((r) => r && { ...r, stored: true });
    } catch (err) {
      if (err instanceof RangeError) setProblem(err.message);
      else fail(err, [['campaign', campaignId, 'sensitivity-checks']]);
    } finally {
      setBusy(false);
    }
  }

  return (
    <details className="rounded-md border border-[var(--line)] p-2 text-sm" data-testid="sensitivity-check">
      <summary className="cursor-pointer font-medium">Check a sensor with a handheld calibrator</summary>
      <div className="mt-2 space-y-2">
        <p className="text-xs text-[var(--muted)]">Mount the accelerometer on the calibrator, switch it on, and record 2 s. A common calibrator runs at 10 m/s² RMS and 159.2 Hz (ω = 1000 rad/s); enter yours if it differs.</p>
        <div className="grid grid-cols-3 gap-2">
          <label className="flex flex-col gap-1 text-xs font-medium">
            Channel
            <select value={channelId} onChange={(e) => setChannelId(e.target.value)} className={field}>
              {channels.map((c) => (
                <option key={c.id} value={c.id}>
                  {c.channel} · {c.model} {c.serial}
                </option>
              ))}
            </select>
          </label>
          <label className="flex flex-col gap-1 text-xs font-medium">
            Level (m/s² RMS)
            <input value={level} onChange={(e) => setLevel(e.target.value)} inputMode="decimal" className={field} />
          </label>
          <label className="flex flex-col gap-1 text-xs font-medium">
            Frequency (Hz)
            <input value={freq} onChange={(e) => setFreq(e.target.value)} inputMode="decimal" className={field} />
          </label>
        </div>
        <Button variant="secondary" disabled={busy || !sc || !(Number(level) > 0) || !(Number(freq) > 0)} onClick={() => void run()}>
          {busy ? 'Recording 2 s…' : 'Record the calibrator'}
        </Button>
        {problem && <Notice tone="error">{problem}</Notice>}
        {result && (
          <p className="num text-xs" data-testid="sensitivity-result">
            Measured {result.measured.toFixed(3)} mV/(m/s²) at {result.hz.toFixed(1)} Hz against the kit's {result.kit.toFixed(3)} mV/(m/s²): {result.percent >= 0 ? '+' : ''}
            {result.percent.toFixed(2)} % ({result.db >= 0 ? '+' : ''}
            {result.db.toFixed(2)} dB). {result.stored ? 'Stored as a check.' : 'Storing…'}
          </p>
        )}
      </div>
    </details>
  );
}
