// The live input on Tap: an audio-class interface read through getUserMedia and an AudioWorklet
// (lib/live/capture-worklet.ts around the pure CaptureEngine). Every captured record becomes a
// float32 WAV of volts with an Idempotency-Key made at capture, goes to IndexedDB first
// (lib/live/outbox.ts) and is sent in capture order through the ordinary upload route; hits wait
// there while the server or the network is away. See docs/decisions/live-capture.md.
import { useCallback, useEffect, useRef, useState } from 'react';
import { flushSync } from 'react-dom';
import { useQueryClient } from '@tanstack/react-query';
import type { AcquisitionSettings } from '@resonote/contracts';
import workletUrl from '../../lib/live/capture-worklet.ts?worker&url';
import { armingFailure, contextNotRunning, tooFewChannels } from '../../lib/live/arming-words.ts';
import { DropLedger, streamBreak, trackDroppedFrames } from '../../lib/live/stream-break.ts';
import { recordFrames, SILENT_RUN_FRAMES, type CaptureOptions, type Slope } from '../../lib/live/capture-engine.ts';
import { ReadingStore } from '../../lib/live/readings.ts';
import type { WorkletIn, WorkletOut } from '../../lib/live/capture-worklet.ts';
import { encodeWavBuffer } from '../../lib/live/wav.ts';
import { showFreshHit } from '../../lib/live/fresh-verdict.ts';
import * as outbox from '../../lib/live/outbox.ts';
import type { OutboxItem } from '../../lib/live/outbox.ts';
import { ApiError } from '../../lib/api.ts';
import type { Channel } from '../../lib/campaign-data.ts';
import { hitKeys, invalidateTestData, markApplied, newIdempotencyKey, uploadRecording, type EntryHits, type HitsAnswer, type HitSummary } from '../../lib/hits-data.ts';
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
  /** Stream frame of the trigger (this session's captures only). */
  triggerFrame?: number;
  /** interrupted: the input stream broke inside the record; it was not sent (hit again). */
  state: 'checking' | 'waiting' | 'stored' | 'refused' | 'interrupted';
  /** Largest |sample| per channel over full scale, for the overload badge of the hit. */
  peaks: number[];
  hit?: HitSummary;
  message?: string;
}

/** A hit waiting to be sent; `kept` resolves to its IndexedDB id once it is on disk (undefined if that failed). */
interface Queued {
  item: OutboxItem;
  kept: Promise<number | undefined>;
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
  const [readings] = useState(() => new ReadingStore());
  const [captures, setCaptures] = useState<Capture[]>([]);
  const [pending, setPending] = useState(0);
  const [waitingFor, setWaitingFor] = useState<Waiting | null>(null);
  const [error, setError] = useState<string | null>(null);
  const run = useRef<{ ctx: AudioContext; stream: MediaStream; node: AudioWorkletNode; plan: LivePlan; taken: number; interrupted: number } | null>(null);
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

  // The verdict comes from the POST answer alone and is painted first (flushSync of the capture
  // list and lib/live/fresh-verdict.ts: only the verdict words re-render); the Tap page's list of
  // hits, the selection, the refetches and the FRF plot's redraw follow after that frame is
  // painted, so none of them delays it. markApplied: the campaign event of this same change then
  // refetches nothing again.
  const apply = useCallback(
    (campaignId: string, entryId: string, answer: HitsAnswer) => {
      markApplied(answer.hits);
      client.setQueryData<EntryHits>(hitKeys.entryHits(campaignId, entryId), (old) => {
        if (!old) return old;
        const byId = new Map(old.hits.map((h) => [h.id, h]));
        for (const h of answer.hits) byId.set(h.id, { ...byId.get(h.id), ...h } as HitSummary);
        return { ...old, entry: { ...old.entry, status: answer.entry.status }, hits: [...byId.values()].sort((a, b) => a.sequence - b.sequence) };
      });
    },
    [client],
  );
  const refresh = useCallback((campaignId: string) => void invalidateTestData(client, campaignId), [client]);

  // Hits to send, in capture order. A fresh capture is sent at once, while its IndexedDB write
  // runs beside the POST (`kept`); it leaves memory only once that write is done, so a reload or
  // a crash at any point finds it on disk, and its Idempotency-Key makes the resend store nothing twice.
  const queue = useRef<Queued[]>([]);
  const refreshDue = useRef(false);
  const waitingIn = (campaignId: string) => queue.current.filter((q) => q.item.campaignId === campaignId).length;

  /** Sends the campaign's waiting hits one at a time, oldest first, until none is left. */
  const drain = useCallback(
    async (campaignId: string) => {
      if (sending.current) return;
      sending.current = true;
      let attempt = 0;
      try {
        for (;;) {
          setPending(waitingIn(campaignId));
          const next = queue.current.find((q) => q.item.campaignId === campaignId);
          if (!next) break;
          const item = next.item;
          const form = new FormData();
          form.append('units', 'volts');
          form.append('kind', 'accelerance');
          form.append('file', new Blob([item.wav], { type: 'audio/wav' }), `live-${new Date(item.capturedAt).toISOString()}.wav`);
          const leave = async () => {
            const id = await next.kept;
            queue.current = queue.current.filter((q) => q !== next);
            return id;
          };
          try {
            const sentAt = performance.now();
            // Capture → sent: the volts and the WAV (and any hit before it in the queue).
            performance.measure('resonote-live-keep', { start: item.capturedAt - performance.timeOrigin, end: sentAt });
            const answer = await uploadRecording(`/campaigns/${campaignId}/schedule/${item.entryId}/hits`, form, item.key, () => {});
            const answerAt = performance.now();
            performance.measure('resonote-live-post', { start: sentAt, end: answerAt });
            attempt = 0;
            const hit = answer.hits[answer.hits.length - 1];
            // The verdict words first: the capture list and the verdict panel, nothing else.
            flushSync(() => {
              setWaitingFor(null);
              patch(item.key, { state: 'stored', hit: answer.hits[0], message: answer.hits.length === 0 ? answer.skipped.map((s) => s.reason).join('; ') || 'no hit found in the record' : undefined });
              if (hit) showFreshHit(item.entryId, hit);
            });
            // Then the page, the refetches and the FRF, in a task after the frame that shows it.
            let followed = false;
            const follow = () => {
              if (followed) return;
              followed = true;
              apply(campaignId, item.entryId, answer);
              onStoredRef.current(answer);
              // The refetches and the FRF's redraw (hundreds of ms of main thread on a slow machine)
              // wait while more hits are queued behind this one, so they never hold up those
              // hits' verdicts; the last hit of a run brings the FRF up to date.
              if (queue.current.some((q) => q !== next && q.item.campaignId === campaignId)) refreshDue.current = true;
              else refresh(campaignId);
            };
            // Capture → verdict on screen: two frames after the answer, the first is painted; read by
            // tests/bench/live-latency.ts.
            const start = item.capturedAt - performance.timeOrigin;
            requestAnimationFrame(() =>
              requestAnimationFrame(() => {
                const end = performance.now();
                performance.measure('resonote-live-paint', { start: answerAt, end });
                performance.measure('resonote-live-verdict', { start, end });
                setTimeout(follow, 0);
              }),
            );
            // A tab in the background paints no frames: follow anyway.
            setTimeout(follow, 1000);
            const id = await leave();
            if (id !== undefined) await outbox.drop(id).catch(() => undefined);
          } catch (err) {
            if (isTransient(err)) {
              attempt += 1;
              const delay = retryDelayMs(attempt, err.retryAfterS);
              setWaitingFor({ reason: err.status === 0 ? 'unreachable' : 'unavailable', message: err.message, attempt, nextTryAt: Date.now() + delay });
              patch(item.key, { state: 'waiting' });
              await new Promise((r) => setTimeout(r, delay));
            } else {
              const message = err instanceof ApiError ? `${err.message} (${err.status})` : err instanceof Error ? err.message : 'refused';
              const id = await leave();
              // Kept on this device with the server's words, shown, not sent again.
              if (id !== undefined) await outbox.markRefused({ ...item, id }, message);
              patch(item.key, { state: 'refused', message });
            }
          }
        }
      } finally {
        sending.current = false;
        setWaitingFor(null);
        if (refreshDue.current) {
          refreshDue.current = false;
          refresh(campaignId);
        }
      }
    },
    [apply, refresh],
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
    readings.set({ meter: null });
  }, [readings]);
  useEffect(() => () => void stop(), [stop]);

  /** Asks for the input (labels of devices appear after the permission) without starting capture. */
  const allow = useCallback(async () => {
    setError(null);
    try {
      const s = await navigator.mediaDevices.getUserMedia({ audio: true });
      s.getTracks().forEach((t) => t.stop());
      await refreshDevices();
    } catch (err) {
      setError(armingFailure(err));
    }
  }, [refreshDevices]);

  const start = useCallback(
    async (deviceId: string, plan: LivePlan) => {
      await stop();
      setError(null);
      setEngine('starting');
      const n = neededChannels(plan.channels);
      let opened: MediaStream | null = null;
      try {
        const stream = await navigator.mediaDevices.getUserMedia({
          audio: { deviceId: deviceId ? { exact: deviceId } : undefined, channelCount: { ideal: n }, echoCancellation: false, noiseSuppression: false, autoGainControl: false },
        });
        opened = stream;
        const track = stream.getAudioTracks()[0];
        if (!track) throw new DOMException('the stream has no audio track', 'NotFoundError');
        const got = track.getSettings();
        if (got.channelCount !== undefined && got.channelCount < n) {
          stream.getTracks().forEach((t) => t.stop());
          setEngine('off');
          setDevice({ label: track.label || 'audio input', trackRateHz: got.sampleRate ?? null, trackChannels: got.channelCount, contextRateHz: got.sampleRate ?? 0 });
          setError(tooFewChannels(got.channelCount, n));
          return;
        }
        const ctx = new AudioContext(got.sampleRate ? { sampleRate: got.sampleRate, latencyHint: 'interactive' } : { latencyHint: 'interactive' });
        await ctx.audioWorklet.addModule(workletUrl);
        // resume() stays pending where the browser holds audio back; 3 s is ample for a running one.
        if (ctx.state !== 'running') await Promise.race([ctx.resume().catch(() => undefined), new Promise((r) => setTimeout(r, 3000))]);
        if (ctx.state !== 'running') {
          stream.getTracks().forEach((t) => t.stop());
          const state = ctx.state;
          await ctx.close().catch(() => undefined);
          setEngine('off');
          setError(contextNotRunning(state));
          return;
        }
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
        const current = { ctx, stream, node, plan, taken: 0, interrupted: 0 };
        run.current = current;
        // Upstream drops (docs/methods.md#stream-break): the track's counter against worklet frames.
        const ledger = new DropLedger(options.recordSamples + Math.round(fs));
        // Frames reach the worklet some time after the source counted a drop among them: a reading
        // counts as "before the record" only this long before its first frame (common practice: 0.2 s,
        // far above the interactive path's 10–40 ms).
        const marginFrames = Math.round(0.2 * fs);
        node.port.onmessage = (e: MessageEvent<WorkletOut>) => {
          const m = e.data;
          if (run.current !== current) return;
          if (m.type === 'meter') {
            const upstream = trackDroppedFrames(track);
            if (upstream !== null) ledger.add({ frame: m.framesSeen, dropped: upstream });
            readings.set({ meter: m, frames: { seen: m.framesSeen, dropped: m.droppedFrames, upstream, interrupted: current.interrupted } });
            setEngine(m.state);
          } else if (m.type === 'grab') {
            grabs.current.get(m.id)?.(m.channels);
            grabs.current.delete(m.id);
          } else if (m.type === 'record') {
            const p = current.plan;
            if (p.stopAfter !== null && current.taken >= p.stopAfter) return;
            const upstreamNow = trackDroppedFrames(track);
            const broken = streamBreak({ lostInWorklet: m.lostFrames, silentRun: m.silentRun, droppedUpstream: upstreamNow === null ? 0 : ledger.droppedSince(m.startFrame - marginFrames, upstreamNow) }, SILENT_RUN_FRAMES, fs);
            if (broken) {
              // Not a measurement of one hit: not sent, counted, and the next hit is already armed.
              current.interrupted += 1;
              readings.set({ frames: { ...readings.get().frames, interrupted: current.interrupted } });
              setCaptures((list) => [{ key: `interrupted-${m.triggerFrame}`, entryLabel: p.entryLabel, capturedAt: Date.now(), triggerFrame: m.triggerFrame, state: 'interrupted' as const, peaks: sorted.map((c) => m.peaks[c.channel - 1] ?? 0), message: `input stream interrupted — hit again (${broken}; not sent)` }, ...list].slice(0, 30));
              return;
            }
            current.taken += 1;
            const capturedAt = Date.now();
            const key = `live-${newIdempotencyKey()}`;
            setCaptures((list) => [{ key, entryLabel: p.entryLabel, capturedAt, triggerFrame: m.triggerFrame, state: 'checking' as const, peaks: sorted.map((c) => m.peaks[c.channel - 1] ?? 0) }, ...list].slice(0, 30));
            // Volts in channel-number order, written straight into the WAV's data chunk.
            const wav = encodeWavBuffer(
              sorted.map((c) => m.channels[c.channel - 1]!),
              Math.round(fs),
              sorted.map((c) => byNumber.get(c.channel)!.fullScaleVolts),
            );
            const item: OutboxItem = { key, campaignId: p.campaignId, entryId: p.entryId, entryLabel: p.entryLabel, capturedAt, sampleRateHz: fs, wav };
            const kept = outbox.keep(item).catch((err: unknown) => {
              setError(`A captured hit could not be kept on this device (it is being sent from memory; do not reload until it is stored): ${err instanceof Error ? err.message : String(err)}`);
              return undefined;
            });
            queue.current.push({ item, kept });
            void drain(p.campaignId);
            if (p.stopAfter !== null && current.taken >= p.stopAfter) void stop();
          }
        };
      } catch (err) {
        if (!run.current) opened?.getTracks().forEach((t) => t.stop());
        setEngine('off');
        setError(armingFailure(err));
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
      // Older than anything captured in this visit: ahead of it in the queue.
      const known = new Set(queue.current.map((q) => q.item.key));
      queue.current = [...list.filter((i) => !i.refused && !known.has(i.key)).map((item) => ({ item, kept: Promise.resolve(item.id) })), ...queue.current];
      setPending(waitingIn(campaignId));
      if (list.length) {
        setCaptures((old) => [...list.filter((i) => !old.some((c) => c.key === i.key)).map((i) => ({ key: i.key, entryLabel: i.entryLabel, capturedAt: i.capturedAt, state: i.refused ? ('refused' as const) : ('waiting' as const), peaks: [], message: i.refused })), ...old]);
        void drain(campaignId);
      }
    },
    [drain],
  );

  return { devices, device, engine, readings, captures, pending, waitingFor, error, allow, start, stop, retarget, grab, resume, running: engine !== 'off' };
}
