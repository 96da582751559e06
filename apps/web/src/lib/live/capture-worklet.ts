// The AudioWorklet of the live input: a thin wrapper that hands each 128-frame block of the
// audio thread to CaptureEngine (capture-engine.ts, pure and unit-tested) and posts completed
// records, meter readings and a count of frames the audio thread skipped to the page. It also
// grabs a plain stretch of samples for the calibrator check. Loaded with
// `audioWorklet.addModule(url)`, the url from Vite's `?worker&url` import (live-input.ts).
import { CaptureEngine, type CaptureOptions } from './capture-engine.ts';

// The AudioWorkletGlobalScope is not in TypeScript's DOM library.
declare const currentFrame: number;
declare function registerProcessor(name: string, ctor: unknown): void;
declare class AudioWorkletProcessor {
  readonly port: MessagePort;
  constructor(options?: unknown);
}

export type WorkletIn = { type: 'grab'; frames: number; id: number } | { type: 'stop' };
export type WorkletOut =
  | { type: 'record'; startFrame: number; triggerFrame: number; channels: Float32Array[]; peaks: number[]; lostFrames: number; silentRun: number }
  | { type: 'meter'; frame: number; peaks: number[]; headroomDb: number[]; overload: boolean[]; state: 'armed' | 'recording'; framesSeen: number; droppedFrames: number }
  | { type: 'grab'; id: number; channels: Float32Array[] };

class LiveCaptureProcessor extends AudioWorkletProcessor {
  private engine: CaptureEngine;
  private lastFrame = -1;
  private dropped = 0;
  private running = true;
  private grab: { id: number; left: number; parts: Float32Array[][] } | null = null;

  constructor(options: { processorOptions: CaptureOptions }) {
    super(options);
    this.engine = new CaptureEngine(options.processorOptions);
    this.port.onmessage = (e: MessageEvent<WorkletIn>) => {
      if (e.data.type === 'stop') this.running = false;
      else if (e.data.type === 'grab') this.grab = { id: e.data.id, left: e.data.frames, parts: [] };
    };
  }

  process(inputs: Float32Array[][]): boolean {
    if (!this.running) return false;
    const input = inputs[0];
    // The audio thread calls once per render quantum (128 frames); a gap in currentFrame between
    // two calls is frames it never rendered. Quanta before the stream delivers have no channels.
    const skipped = this.lastFrame >= 0 ? currentFrame - this.lastFrame - 128 : 0;
    this.lastFrame = currentFrame;
    if (!input || input.length === 0) return true;
    // Skipped quanta once the stream delivers are a break in it (docs/methods.md#stream-break).
    if (skipped > 0) {
      this.dropped += skipped;
      this.engine.markBreak(skipped);
    }
    const frames = input[0]!.length;
    const n = this.engine.options.channels;
    const block = Array.from({ length: n }, (_, c) => input[c] ?? new Float32Array(frames));
    this.engine.process(
      block,
      (r) => this.port.postMessage({ type: 'record', ...r } satisfies WorkletOut, r.channels.map((c) => c.buffer)),
      (m) => this.port.postMessage({ type: 'meter', ...m, state: this.engine.state, framesSeen: this.engine.framesSeen, droppedFrames: this.dropped } satisfies WorkletOut),
    );
    if (this.grab) {
      const g = this.grab;
      const take = Math.min(frames, g.left);
      g.parts.push(block.map((c) => c.slice(0, take)));
      g.left -= take;
      if (g.left === 0) {
        const total = g.parts.reduce((s, p) => s + p[0]!.length, 0);
        const channels = Array.from({ length: n }, (_, c) => {
          const out = new Float32Array(total);
          let at = 0;
          for (const p of g.parts) {
            out.set(p[c]!, at);
            at += p[c]!.length;
          }
          return out;
        });
        this.port.postMessage({ type: 'grab', id: g.id, channels } satisfies WorkletOut, channels.map((c) => c.buffer));
        this.grab = null;
      }
    }
    return true;
  }
}

registerProcessor('resonote-live-capture', LiveCaptureProcessor);
