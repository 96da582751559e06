// The live input on Tap: an audio-class interface read through getUserMedia and an AudioWorklet
// (lib/live/capture-worklet.ts around the pure CaptureEngine). Every captured record becomes a
// float32 WAV of volts with an Idempotency-Key made at capture, goes to IndexedDB first
// (lib/live/outbox.ts) and is sent in capture order through the ordinary upload route; hits wait
// there while the server or the network is away. See docs/decisions/live-capture.md.
import { useCallback, useEffect, useRef, useState } from 'react';
import { useQueryClient } from '@tanstack/react-query';
import type { AcquisitionSettings } from '@resonote/contracts';
import workletUrl from '../../lib/live/capture-worklet.ts?worker&url';
import { recordFrames, type CaptureOptions, type MeterReading, type Slope } from '../../lib/live/capture-engine.ts';
import type { WorkletIn, WorkletOut } from '../../lib/live/capture-worklet.ts';
import { encodeFloat32Wav } from '../../lib/live/wav.ts';
import * as outbox from '../../lib/live/outbox.ts';
import { ApiError } from '../../lib/api.ts';
import type { Channel } from '../../lib/campaign-data.ts';
import { hitKeys, invalidateTestData, newIdempotencyKey, uploadRecording, type EntryHits, type HitsAnswer, type HitSummary } from '../../lib/hits-data.ts';
import { isTransient, retryDelayMs, type Waiting } from '../../lib/retry.ts';

export interface Scaling {
  channelId: string;
  channel: number;
  fullScaleVolts: number;
  acLowCutHz: number | null;
  version: number;
}

export interface DeviceInfo {
  label: string;
  /** What the track reports (getSettings), which may be missing on some browsers. */
  trackRateHz: number | null;
  trackChannels: number | null;
  /** The rate the worklet really runs at (the AudioContext's). */
  contextRateHz: number;
}

export interface Capture {
  key: string;
  entryLabel: string;
  capturedAt: number;
  state: 'checking' | 'waiting' | 'stored' | 'refused';
  /** Largest |sample| per channel over full scale, for the overload badge of the hit. */
  peaks: number[];
  hit?: HitSummary;
  message?: string;
}

export type EngineState = 'off' | 'starting' | 'armed' | 'recording';

export interface LivePlan {
  campaignId: string;
  entryId: string;
  entryLabel: string;
  channels: Channel[];
  scaling: Scaling[];
  settings: AcquisitionSettings;
  slope: Slope;
  hysteresis: number;
  /** Stop after this many hits (null: until stopped by hand). */
  stopAfter: number | null;
}

/** Channel count the interface must deliver: inputs are the channel-map numbers, 1-based. */
export const neededChannels = (channels: Channel[]) => Math.max(0, ...channels.map((c) => c.channel));

export function useLiveInput(onStored: (answer: HitsAnswer) => void) {
  const client = useQueryClient();
  const [devices, setDevices] = useState<MediaDeviceInfo[]>([]);
  const [device, setDevice] = useState<DeviceInfo | null>(null);
  const [engine, setEngine] = useState<EngineState>('off');
  const [meter, setMeter] = useState<MeterReading | null>(null);
  const [frames, setFrames] = useState({ seen: 0, dropped: 0 });
  const [captures, setCaptures] = useState<Capture[]>([]);
  const [pending, setPending] = useState(0);
  const [waitingFor, setWaitingFor] = useState<Waiting | null>(null);
  const [error, setError] = useState<string | null>(null);
  const run = useRef<{ ctx: AudioContext; stream: MediaStream; node: AudioWorkletNode; plan: LivePlan; taken: number } | null>(null);
  const sending = useRef(false);
  const onStoredRef = useRef(onStored);
  onStoredRef.current = onStored;
  const grabs = useRef(new Map<number, (c: Float32Array[]) => void>());

  const refreshDevices = useCallback(async () => {
    if (!navigator.mediaDevices?.enumerateDevices) return;
    const all = await navigator.mediaDevices.enumerateDevices();
    setDevices(all.filter((d) => d.kind === 'audioinput'));
  }, []);
  useEffect(() => {
    void refreshDevices();
    navigator.mediaDevices?.addEventListener?.('devicechange', refreshDevices);
    return () => navigator.mediaDevices?.removeEventListener?.('devicechange', refreshDevices);
  }, [refreshDevices]);

  const patch = (key: string, change: Partial<Capture>) => setCaptures((list) => list.map((c) => (c.key === key ? { ...c, ...change } : c)));

  const apply = useCallback(
    (campaignId: string, entryId: string, answer: HitsAnswer) => {
      if (answer.frf) client.setQueryData(hitKeys.frf(campaignId, entryId, 'accelerance'), answer.frf);
      client.setQueryData<EntryHits>(hitKeys.entryHits(campaignId, entryId), (old) => {
        if (!old) return old;
        const byId = new Map(old.hits.map((h) => [h.id, h]));
        for (const h of answer.hits) byId.set(h.id, { ...byId.get(h.id), ...h } as HitSummary);
        return { ...old, entry: { ...old.entry, status: answer.entry.status }, hits: [...byId.values()].sort((a, b) => a.sequence - b.sequence) };
      });
      void invalidateTestData(client, campaignId);
    },
    [client],
  );

  /** Sends the campaign's waiting hits one at a time, oldest first, until none is left. */
  const drain = useCallback(
    async (campaignId: string) => {
      if (sending.current) return;
      sending.current = true;
      let attempt = 0;
      try {
        for (;;) {
          const list = (await outbox.waiting(campaignId)).filter((i) => !i.refused);
          setPending(list.length);
          const item = list[0];
          if (!item) break;
          const form = new FormData();
          form.append('units', 'volts');
          form.append('kind', 'accelerance');
          form.append('file', new Blob([item.wav], { type: 'audio/wav' }), `live-${new Date(item.capturedAt).toISOString()}.wav`);
          try {
            const answer = await uploadRecording(`/campaigns/${campaignId}/schedule/${item.entryId}/hits`, form, item.key, () => {});
            await outbox.drop(item.id!);
            attempt = 0;
            setWaitingFor(null);
            apply(campaignId, item.entryId, answer);
            patch(item.key, { state: 'stored', hit: answer.hits[0], message: answer.hits.length === 0 ? answer.skipped.map((s) => s.reason).join('; ') || 'no hit found in the record' : undefined });
            // Capture → verdict on screen (two frames later it is painted), read by tests/bench/live-latency.ts.
            const start = item.capturedAt - performance.timeOrigin;
            requestAnimationFrame(() => requestAnimationFrame(() => performance.measure('resonote-live-verdict', { start, end: performance.now() })));
            onStoredRef.current(answer);
          } catch (err) {
            if (isTransient(err)) {
              attempt += 1;
              const delay = retryDelayMs(attempt, err.retryAfterS);
              setWaitingFor({ reason: err.status === 0 ? 'unreachable' : 'unavailable', message: err.message, attempt, nextTryAt: Date.now() + delay });
              patch(item.key, { state: 'waiting' });
              await new Promise((r) => setTimeout(r, delay));
            } else {
              const message = err instanceof ApiError ? `${err.message} (${err.status})` : err instanceof Error ? err.message : 'refused';
              await outbox.markRefused(item, message);
              patch(item.key, { state: 'refused', message });
            }
          }
        }
      } finally {
        sending.current = false;
        setWaitingFor(null);
      }
    },
    [apply],
  );

  const stop = useCallback(async () => {
    const r = run.current;
    run.current = null;
    if (!r) return;
    // Meter readings still queued in the port must not bring the state back to "armed".
    r.node.port.onmessage = null;
    r.node.port.postMessage({ type: 'stop' } satisfies WorkletIn);
    r.node.disconnect();
    r.stream.getTracks().forEach((t) => t.stop());
    await r.ctx.close().catch(() => undefined);
    setEngine('off');
    setMeter(null);
  }, []);
  useEffect(() => () => void stop(), [stop]);

  /** Asks for the input (labels of devices appear after the permission) without starting capture. */
  const allow = useCallback(async () => {
    setError(null);
    try {
      const s = await navigator.mediaDevices.getUserMedia({ audio: true });
      s.getTracks().forEach((t) => t.stop());
      await refreshDevices();
    } catch (err) {
      setError(`The browser gave no access to the audio input: ${err instanceof Error ? err.message : String(err)}`);
    }
  }, [refreshDevices]);

  const start = useCallback(
    async (deviceId: string, plan: LivePlan) => {
      await stop();
      setError(null);
      setEngine('starting');
      const n = neededChannels(plan.channels);
      try {
        const stream = await navigator.mediaDevices.getUserMedia({
          audio: { deviceId: deviceId ? { exact: deviceId } : undefined, channelCount: { ideal: n }, echoCancellation: false, noiseSuppression: false, autoGainControl: false },
        });
        const track = stream.getAudioTracks()[0]!;
        const got = track.getSettings();
        const ctx = new AudioContext(got.sampleRate ? { sampleRate: got.sampleRate, latencyHint: 'interactive' } : { latencyHint: 'interactive' });
        await ctx.audioWorklet.addModule(workletUrl);
        const fs = ctx.sampleRate;
        setDevice({ label: track.label || 'audio input', trackRateHz: got.sampleRate ?? null, trackChannels: got.channelCount ?? null, contextRateHz: fs });
        const s = plan.settings;
        const byNumber = new Map(plan.scaling.map((x) => [x.channel, x]));
        const sorted = [...plan.channels].sort((a, b) => a.channel - b.channel);
        const hammer = sorted.find((c) => c.kind === 'hammer')!;
        // At another rate than the settings' the server resamples (resampleUploads); 1 % more
        // samples make sure the resampled record still holds a whole record after its trigger.
        const frames = recordFrames(fs, s.recordLengthS * (Math.abs(fs - s.sampleRateHz) > 1e-3 * s.sampleRateHz ? 1.01 : 1), s.preTriggerS);
        const options: CaptureOptions = {
          channels: n,
          sampleRateHz: fs,
          forceChannel: hammer.channel - 1,
          forceNPerUnit: (byNumber.get(hammer.channel)!.fullScaleVolts * 1000) / hammer.sensitivityBase,
          triggerLevelN: s.triggerLevelN,
          slope: plan.slope,
          hysteresis: plan.hysteresis,
          ...frames,
          meterFrames: Math.max(128, Math.round(fs / 20)),
        };
        const source = ctx.createMediaStreamSource(stream);
        const node = new AudioWorkletNode(ctx, 'resonote-live-capture', { numberOfInputs: 1, numberOfOutputs: 1, outputChannelCount: [1], channelCount: n, channelCountMode: 'explicit', channelInterpretation: 'discrete', processorOptions: options });
        const mute = ctx.createGain();
        mute.gain.value = 0;
        source.connect(node).connect(mute).connect(ctx.destination);
        const current = { ctx, stream, node, plan, taken: 0 };
        run.current = current;
        node.port.onmessage = (e: MessageEvent<WorkletOut>) => {
          const m = e.data;
          if (run.current !== current) return;
          if (m.type === 'meter') {
            setMeter(m);
            setFrames({ seen: m.framesSeen, dropped: m.droppedFrames });
            setEngine(m.state);
          } else if (m.type === 'grab') {
            grabs.current.get(m.id)?.(m.channels);
            grabs.current.delete(m.id);
          } else if (m.type === 'record') {
            const p = current.plan;
            if (p.stopAfter !== null && current.taken >= p.stopAfter) return;
            current.taken += 1;
            const capturedAt = Date.now();
            const volts = sorted.map((c) => {
              const raw = m.channels[c.channel - 1]!;
              const k = byNumber.get(c.channel)!.fullScaleVolts;
              const out = new Float32Array(raw.length);
              for (let i = 0; i < raw.length; i++) out[i] = raw[i]! * k;
              return out;
            });
            const key = `live-${newIdempotencyKey()}`;
            setCaptures((list) => [{ key, entryLabel: p.entryLabel, capturedAt, state: 'checking' as const, peaks: sorted.map((c) => m.peaks[c.channel - 1] ?? 0) }, ...list].slice(0, 30));
            void (async () => {
              const wav = await encodeFloat32Wav(volts, Math.round(fs)).arrayBuffer();
              await outbox.keep({ key, campaignId: p.campaignId, entryId: p.entryId, entryLabel: p.entryLabel, capturedAt, sampleRateHz: fs, wav });
              void drain(p.campaignId);
            })().catch((err) => setError(`A captured hit could not be kept on this device: ${err instanceof Error ? err.message : String(err)}`));
            if (p.stopAfter !== null && current.taken >= p.stopAfter) void stop();
          }
        };
      } catch (err) {
        setEngine('off');
        setError(`The live input could not start: ${err instanceof Error ? err.message : String(err)}`);
      }
    },
    [drain, stop],
  );

  /** The DOF (and options) the next captures go to: the current one on screen. */
  const retarget = useCallback((plan: LivePlan) => {
    if (run.current) run.current.plan = plan;
  }, []);

  /** Records `seconds` of plain samples (all channels, digital units) for the calibrator check. */
  const grab = useCallback((seconds: number): Promise<{ channels: Float32Array[]; sampleRateHz: number }> => {
    const r = run.current;
    if (!r) return Promise.reject(new Error('Start the live input first.'));
    const id = Math.random();
    const fs = r.ctx.sampleRate;
    return new Promise((resolve) => {
      grabs.current.set(id, (channels) => resolve({ channels, sampleRateHz: fs }));
      r.node.port.postMessage({ type: 'grab', frames: Math.round(seconds * fs), id } satisfies WorkletIn);
    });
  }, []);

  /** Picks up hits left waiting on this device (an earlier visit, a reload) and sends them. */
  const resume = useCallback(
    async (campaignId: string) => {
      const list = await outbox.waiting(campaignId);
      setPending(list.filter((i) => !i.refused).length);
      if (list.length) {
        setCaptures((old) => [...list.filter((i) => !old.some((c) => c.key === i.key)).map((i) => ({ key: i.key, entryLabel: i.entryLabel, capturedAt: i.capturedAt, state: i.refused ? ('refused' as const) : ('waiting' as const), peaks: [], message: i.refused })), ...old]);
        void drain(campaignId);
      }
    },
    [drain],
  );

  return { devices, device, engine, meter, frames, captures, pending, waitingFor, error, allow, start, stop, retarget, grab, resume, running: engine !== 'off' };
}
