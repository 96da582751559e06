// Benchmark: does the live input's AudioWorklet drop samples at 96 kHz × 4 channels? Chromium
// opens an AudioContext at 96 000 Hz; a generator worklet writes four channels whose every sample
// encodes the audio thread's own frame counter (`currentFrame`, wrapped at 2^16, channel c offset
// by c·16384, scaled by 2^-17 so every value is exact in float32), straight into the product's
// capture worklet as Vite built it for the web app (apps/web/dist/assets/capture-worklet-*.js,
// the same code Tap loads). Channel 1 is a sawtooth rising through the trigger level once per
// 2^16 frames (0.68 s), so the capture engine cuts a 0.5 s record about every 0.68 s.
// Counted for a fixed run (60 s by default, BENCH_DROPS_S):
//   - frames the capture worklet saw (its meter readings' framesSeen) against frames expected
//     from the context's currentTime over the same run (resolution: one meter window, 50 ms);
//   - frames the audio thread skipped (gaps in currentFrame between render quanta, the worklet's
//     own count) and the stream-break verdict of every record (docs/methods.md#stream-break);
//   - in every record, each sample against the one before it on every channel: a step other than
//     +1 count is a gap or a repeat, and the channels' offsets show whether they stay aligned.
//   npm run bench:live-drops   (builds the web app when stale)
import fs from 'node:fs';
import http from 'node:http';
import os from 'node:os';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { launchBrowser } from '../support/browser.ts';
import { streamBreak } from '../../apps/web/src/lib/live/stream-break.ts';
import { SILENT_RUN_FRAMES } from '../../apps/web/src/lib/live/capture-engine.ts';

const FS = 96_000;
const CHANNELS = 4;
const SECONDS = Number(process.env.BENCH_DROPS_S ?? 60);
const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '../..');
const bootstrap = path.join(root, 'scripts/bootstrap.mjs');
const { buildWeb } = (await import(bootstrap)) as { buildWeb: () => void };
buildWeb();
const assets = path.join(root, 'apps/web/dist/assets');
const workletFile = fs.readdirSync(assets).find((f) => /^capture-worklet-.*\.js$/.test(f));
if (!workletFile) throw new Error(`no capture-worklet-*.js in ${assets}: the web build did not emit the worklet`);

// Sample = ((currentFrame + i + c·16384) mod 2^16) · 2^-17: exact in float32 (17 bits), in [0, 0.5).
const generator = `
class CounterSource extends AudioWorkletProcessor {
  process(_inputs, outputs) {
    const out = outputs[0];
    for (let c = 0; c < out.length; c++) {
      const ch = out[c];
      for (let i = 0; i < ch.length; i++) ch[i] = ((currentFrame + i + c * 16384) & 65535) / 131072;
    }
    return true;
  }
}
registerProcessor('counter-source', CounterSource);
`;
const pageHtml = '<!doctype html><meta charset="utf-8"><title>worklet drops</title><p>live-drops bench</p>';

const server = http.createServer((req, res) => {
  if (req.url === '/capture-worklet.js') res.writeHead(200, { 'content-type': 'text/javascript' }).end(fs.readFileSync(path.join(assets, workletFile)));
  else if (req.url === '/counter-source.js') res.writeHead(200, { 'content-type': 'text/javascript' }).end(generator);
  else res.writeHead(200, { 'content-type': 'text/html' }).end(pageHtml);
});
await new Promise<void>((r) => server.listen(0, '127.0.0.1', r));
const base = `http://127.0.0.1:${(server.address() as { port: number }).port}`;

interface RunResult {
  error?: string;
  contextRate: number;
  baseLatency: number;
  outputLatency: number | null;
  seconds: number;
  expectedFrames: number;
  framesSeen: number;
  droppedByWorklet: number;
  meters: number;
  trackChannels: number | null;
  records: { startFrame: number; lostFrames: number; silentRun: number; frames: number; badSteps: number; missing: number; misaligned: number }[];
}

const browser = await launchBrowser(['--autoplay-policy=no-user-gesture-required']);
const logs: string[] = [];
try {
  const page = await browser.newPage();
  page.on('console', (m) => logs.push(`${m.type()}: ${m.text()}`));
  await page.goto(base);
  console.log(`load average at the start: ${os.loadavg().map((l) => l.toFixed(2)).join(', ')} on ${os.cpus().length} cores`);
  // Chromium's MediaStreamAudioDestinationNode gives a 2-channel track whatever its channelCount
  // (measured here: "stream track 2 channels"), so the MediaStream hop runs 2 of the 4 channels.
  for (const [via, channels] of [['direct', CHANNELS], ['stream', 2]] as const) {
    console.log(`${via === 'direct' ? 'generator worklet → capture worklet (one context)' : 'generator → MediaStream → second context → capture worklet'}: running ${SECONDS} s at ${FS} Hz × ${channels} channels through ${workletFile}…`);
    const r: RunResult = await page.evaluate(
      async ({ fs, channels, seconds, via }) => {
        // (No named function in here: the page gets this code as text, without tsx's helpers.)
        const contexts: AudioContext[] = [];
        try {
          for (let i = 0; i < (via === 'stream' ? 2 : 1); i++) {
            const c = new AudioContext({ sampleRate: fs, latencyHint: 'interactive' });
            if (c.state !== 'running') await Promise.race([c.resume(), new Promise((r) => setTimeout(r, 3000))]);
            contexts.push(c);
          }
        } catch (err) {
          return { error: `new AudioContext({ sampleRate: ${fs} }) threw: ${String(err)}` } as RunResult;
        }
        const ctx = contexts[0]!;
        const gen = contexts[contexts.length - 1]!;
        if (ctx.state !== 'running' || gen.state !== 'running') return { error: `the AudioContext stays "${ctx.state}"`, contextRate: ctx.sampleRate } as RunResult;
        await gen.audioWorklet.addModule('/counter-source.js');
        await ctx.audioWorklet.addModule('/capture-worklet.js');
        const options = { channels, sampleRateHz: ctx.sampleRate, forceChannel: 0, forceNPerUnit: 1, triggerLevelN: 0.25, slope: 'rising', hysteresis: 0.5, preTriggerSamples: Math.round(0.01 * fs), recordSamples: Math.round(0.5 * fs), meterFrames: Math.round(fs / 20) };
        const counter = new AudioWorkletNode(gen, 'counter-source', { numberOfInputs: 0, numberOfOutputs: 1, outputChannelCount: [channels] });
        // "stream": through a MediaStream from a second context at the same rate, as an interface's
        // samples reach the capture worklet on Tap (MediaStreamAudioSourceNode).
        let source: AudioNode = counter;
        let trackChannels: number | null = null;
        if (via === 'stream') {
          const dest = gen.createMediaStreamDestination();
          dest.channelCount = channels;
          dest.channelCountMode = 'explicit';
          dest.channelInterpretation = 'discrete';
          counter.connect(dest);
          trackChannels = dest.stream.getAudioTracks()[0]?.getSettings().channelCount ?? null;
          source = ctx.createMediaStreamSource(dest.stream);
        }
        const capture = new AudioWorkletNode(ctx, 'resonote-live-capture', { numberOfInputs: 1, numberOfOutputs: 1, outputChannelCount: [1], channelCount: channels, channelCountMode: 'explicit', channelInterpretation: 'discrete', processorOptions: options });
        const mute = ctx.createGain();
        mute.gain.value = 0;
        const out = { framesSeen: 0, dropped: 0, meters: 0, firstMeterTime: -1, firstMeterFrames: 0, lastMeterTime: 0 };
        const records: RunResult['records'] = [];
        capture.port.onmessage = (e: MessageEvent) => {
          const m = e.data;
          if (m.type === 'meter') {
            out.meters += 1;
            if (out.firstMeterTime < 0) {
              out.firstMeterTime = ctx.currentTime;
              out.firstMeterFrames = m.framesSeen;
            }
            out.lastMeterTime = ctx.currentTime;
            out.framesSeen = m.framesSeen;
            out.dropped = m.droppedFrames;
          } else if (m.type === 'record') {
            const chs = m.channels as Float32Array[];
            const n = chs[0]!.length;
            let badSteps = 0;
            let missing = 0;
            let misaligned = 0;
            for (let c = 0; c < chs.length; c++) {
              const x = chs[c]!;
              for (let i = 1; i < n; i++) {
                const step = (Math.round(x[i]! * 131072) - Math.round(x[i - 1]! * 131072)) & 65535;
                if (step !== 1) {
                  badSteps += 1;
                  missing += (step - 1) & 65535;
                }
              }
              if (c > 0) for (let i = 0; i < n; i++) if (((Math.round(x[i]! * 131072) - Math.round(chs[0]![i]! * 131072)) & 65535) !== c * 16384) misaligned += 1;
            }
            records.push({ startFrame: m.startFrame, lostFrames: m.lostFrames, silentRun: m.silentRun, frames: n, badSteps, missing, misaligned });
          }
        };
        source.connect(capture).connect(mute).connect(ctx.destination);
        await new Promise((r) => setTimeout(r, seconds * 1000));
        // Expected frames between the first and the last meter reading, from the context's clock.
        const result: RunResult = {
          contextRate: ctx.sampleRate,
          baseLatency: ctx.baseLatency,
          outputLatency: 'outputLatency' in ctx ? ctx.outputLatency : null,
          seconds: out.lastMeterTime - out.firstMeterTime,
          expectedFrames: Math.round((out.lastMeterTime - out.firstMeterTime) * ctx.sampleRate),
          framesSeen: out.framesSeen - out.firstMeterFrames,
          droppedByWorklet: out.dropped,
          meters: out.meters,
          records,
          trackChannels: null,
        };
        capture.port.postMessage({ type: 'stop' });
        await ctx.close();
        if (gen !== ctx) await gen.close();
        return { ...result, trackChannels };
      },
      { fs: FS, channels, seconds: SECONDS, via },
    );
    if (r.error) {
      console.log(`Chromium could not run the capture at ${FS} Hz: ${r.error}`);
      process.exitCode = 1;
    } else {
      const broken = r.records.map((x) => streamBreak({ lostInWorklet: x.lostFrames, silentRun: x.silentRun, droppedUpstream: 0 }, SILENT_RUN_FRAMES, r.contextRate)).filter((b): b is string => b !== null);
      const bad = r.records.filter((x) => x.badSteps > 0 || x.misaligned > 0);
      console.log(`  context: ${r.contextRate} Hz (asked ${FS})${r.trackChannels !== null ? `, stream track ${r.trackChannels} channels` : ''}, base latency ${(r.baseLatency * 1000).toFixed(1)} ms, output latency ${r.outputLatency === null ? 'not reported' : `${(r.outputLatency * 1000).toFixed(1)} ms`}`);
      console.log(`  frames: ${r.framesSeen.toLocaleString('en')} seen by the capture worklet against ${r.expectedFrames.toLocaleString('en')} expected from currentTime over ${r.seconds.toFixed(2)} s (difference ${r.framesSeen - r.expectedFrames}; resolution one meter window, ${Math.round(FS / 20)} frames); ${r.meters} meter readings`);
      console.log(`  skipped by the audio thread (currentFrame gaps): ${r.droppedByWorklet} frames`);
      console.log(`  records: ${r.records.length} of ${r.records[0]?.frames ?? 0} frames × ${channels} channels; counter steps ≠ +1: ${r.records.reduce((s, x) => s + x.badSteps, 0)} (${r.records.reduce((s, x) => s + x.missing, 0)} counts missing) in ${bad.length} records; samples off their channel offset: ${r.records.reduce((s, x) => s + x.misaligned, 0)}`);
      console.log(`  stream-break detection: ${broken.length} of ${r.records.length} records flagged${broken.length ? ` (first: ${broken[0]})` : ''}`);
    }
  }
  console.log(`load average (1, 5, 15 min) at the end: ${os.loadavg().map((l) => l.toFixed(2)).join(', ')} on ${os.cpus().length} cores`);
  const noisy = logs.filter((l) => !l.startsWith('log:'));
  if (noisy.length) console.log(`browser console: ${noisy.slice(0, 5).join(' | ')}`);
} finally {
  await browser.close();
  server.close();
}
