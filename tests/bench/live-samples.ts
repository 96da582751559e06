// Benchmark: the live input's capture engine over a long 96 kHz × 4-channel stream, fed in the
// 128-frame blocks of the audio thread, as the AudioWorklet does. Prints the frames fed and
// counted, the hits put in and found (each at its own frame), and the speed against real time.
//   node --import tsx tests/bench/live-samples.ts [minutes=20]
import { CaptureEngine, recordFrames } from '../../apps/web/src/lib/live/capture-engine.ts';

const minutes = Number(process.argv[2] ?? 20);
const fs = 96_000;
const channels = 4;
const block = 128;
const engine = new CaptureEngine({ channels, sampleRateHz: fs, forceChannel: 0, forceNPerUnit: 100, triggerLevelN: 5, slope: 'rising', hysteresis: 0.5, ...recordFrames(fs, 0.5, 0.01), meterFrames: fs / 20 });
// One second of stream, reused: noise-free zeros with one 20-frame half-sine of 60 N at frame 40 000.
const second = Array.from({ length: channels }, () => new Float32Array(fs));
for (let k = 0; k < 20; k++) for (let c = 0; c < channels; c++) second[c]![40_000 + k] = (0.6 / (c + 1)) * Math.sin((Math.PI * (k + 0.5)) / 20);
let firstAbove = 40_000;
while (second[0]![firstAbove]! < 0.05) firstAbove += 1;

let fed = 0;
let found = 0;
let misplaced = 0;
let meters = 0;
const started = performance.now();
for (let s = 0; s < minutes * 60; s++) {
  for (let i = 0; i < fs; i += block) {
    engine.process(
      second.map((c) => c.subarray(i, i + block)),
      (r) => {
        // The i-th hit is at second i (a record ends within its second: 0.5 s after 0.42 s).
        if (r.triggerFrame !== found * fs + firstAbove) misplaced += 1;
        found += 1;
      },
      () => (meters += 1),
    );
    fed += block;
  }
}
const seconds = (performance.now() - started) / 1000;
const streamS = minutes * 60;
console.log(`stream: ${streamS} s at ${fs} Hz × ${channels} channels in ${block}-frame blocks`);
console.log(`frames fed ${fed}, counted by the engine ${engine.framesSeen}, dropped ${fed - engine.framesSeen}`);
console.log(`hits put in ${streamS}, found ${found}, at another frame ${misplaced}; meter readings ${meters} (expected ${streamS * 20})`);
console.log(`processing: ${seconds.toFixed(1)} s for ${streamS} s of stream = ${(streamS / seconds).toFixed(0)} × real time`);
if (fed !== engine.framesSeen || found !== streamS || misplaced !== 0 || meters !== streamS * 20) process.exit(1);
