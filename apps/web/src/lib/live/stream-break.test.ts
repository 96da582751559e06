// Breaks in the live input's stream (docs/methods.md#stream-break): frames the audio thread
// skipped, runs of digital silence on every channel, and frames the source dropped upstream (the
// track's totalFrames − deliveredFrames). Expected values are counted by hand from the synthetic
// streams built here (a break at a known frame is inside or outside a known record).
import { describe, expect, it } from 'vitest';
import { CaptureEngine, SILENT_RUN_FRAMES, type CaptureOptions, type CapturedRecord } from './capture-engine.ts';
import { DropLedger, streamBreak } from './stream-break.ts';

const base: CaptureOptions = { channels: 2, sampleRateHz: 44_100, forceChannel: 0, forceNPerUnit: 100, triggerLevelN: 5, slope: 'rising', hysteresis: 0.5, preTriggerSamples: 100, recordSamples: 2000, meterFrames: 441 };

/** A noise floor of ±1e-4 (never exactly 0) on both channels, and a 20-frame half-sine of 50 N at `at`. */
function noisy(frames: number, at: number): Float32Array[] {
  const out = [new Float32Array(frames), new Float32Array(frames)];
  for (let i = 0; i < frames; i++) {
    out[0]![i] = 1e-4 * (((i * 7919) % 13) - 6.5);
    out[1]![i] = 1e-4 * (((i * 104729) % 11) - 5.5);
  }
  for (let k = 0; k < 20; k++) out[0]![at + k] = 0.5 * Math.sin((Math.PI * (k + 0.5)) / 20);
  return out;
}

function feed(engine: CaptureEngine, data: Float32Array[], breaks: Map<number, number> = new Map()) {
  const records: CapturedRecord[] = [];
  for (let i = 0; i < data[0]!.length; i += 128) {
    const lost = breaks.get(i);
    if (lost) engine.markBreak(lost);
    engine.process(data.map((c) => c.subarray(i, Math.min(i + 128, c.length))), (r) => records.push(r));
  }
  return records;
}

describe('stream breaks in a live record', () => {
  it('finds none in a whole stream with a noise floor', () => {
    const [r] = feed(new CaptureEngine(base), noisy(6000, 1000));
    expect(r).toMatchObject({ lostFrames: 0, silentRun: 0 });
    expect(streamBreak({ lostInWorklet: r!.lostFrames, silentRun: r!.silentRun, droppedUpstream: 0 }, SILENT_RUN_FRAMES, 44_100)).toBeNull();
  });

  it('measures a run of 441 frames (10 ms at 44.1 kHz) of digital silence on every channel inside the record', () => {
    const data = noisy(6000, 1000);
    for (const c of data) c.fill(0, 1500, 1941);
    const [r] = feed(new CaptureEngine(base), data);
    expect(r!.silentRun).toBe(441);
    expect(streamBreak({ lostInWorklet: 0, silentRun: r!.silentRun, droppedUpstream: 0 }, SILENT_RUN_FRAMES, 44_100)).toBe('441 frames (10.0 ms) of digital silence on every channel');
  });

  it('counts a silent run in the pre-trigger as inside the record, one before it not, and silence on one channel only never', () => {
    const inPre = noisy(6000, 1000);
    for (const c of inPre) c.fill(0, 940, 990); // the record starts at the trigger (≈ 1003) − 100
    expect(feed(new CaptureEngine(base), inPre)[0]!.silentRun).toBe(50);
    const before = noisy(6000, 1000);
    for (const c of before) c.fill(0, 500, 800);
    expect(feed(new CaptureEngine(base), before)[0]!.silentRun).toBe(0);
    const oneChannel = noisy(6000, 1000);
    oneChannel[1]!.fill(0, 1500, 2500);
    expect(feed(new CaptureEngine(base), oneChannel)[0]!.silentRun).toBe(0);
  });

  it('marks a record broken by frames the audio thread skipped while it was open or within its pre-trigger, not before', () => {
    // Blocks start at multiples of 128; the trigger is at frame 1001 (the half-sine's second sample,
    // 0.117, is the first ≥ 5 N / 100 N = 0.05), the record spans 901–2900 with 100 frames of pre-trigger.
    expect(feed(new CaptureEngine(base), noisy(6000, 1000), new Map([[1536, 256]]))[0]!.lostFrames).toBe(256);
    expect(feed(new CaptureEngine(base), noisy(6000, 1000), new Map([[896, 128]]))[0]!.lostFrames).toBe(0);
    // With 200 frames of pre-trigger the record starts at 801: a break at 896 is inside it, one at 768 is not.
    expect(feed(new CaptureEngine({ ...base, preTriggerSamples: 200 }), noisy(6000, 1000), new Map([[896, 128]]))[0]!.lostFrames).toBe(128);
    expect(feed(new CaptureEngine({ ...base, preTriggerSamples: 200 }), noisy(6000, 1000), new Map([[768, 128]]))[0]!.lostFrames).toBe(0);
    expect(feed(new CaptureEngine(base), noisy(6000, 1000), new Map([[3200, 128]]))[0]!.lostFrames).toBe(0);
  });

  it('counts frames dropped upstream since the last reading before a record began', () => {
    const ledger = new DropLedger(10_000);
    ledger.add({ frame: 1000, dropped: 0 });
    ledger.add({ frame: 3000, dropped: 0 });
    ledger.add({ frame: 5000, dropped: 441 });
    // A record from frame 3500: the reading at 3000 is its baseline, and 441 frames went since.
    expect(ledger.droppedSince(3500, 441)).toBe(441);
    // A record from frame 6000 (after the 441 were counted at 5000): whole unless more are dropped.
    expect(ledger.droppedSince(6000, 441)).toBe(0);
    expect(ledger.droppedSince(6000, 882)).toBe(441);
    // Before the first reading nothing clears it: every drop counted so far is held against it.
    expect(ledger.droppedSince(500, 441)).toBe(441);
    expect(() => ledger.add({ frame: 4000, dropped: 441 })).toThrow(/frame=4000/);
    expect(() => new DropLedger(0)).toThrow(/keepFrames=0/);
  });

  it('keeps only the readings a record and its margin need', () => {
    const ledger = new DropLedger(2000);
    for (let f = 0; f <= 10_000; f += 500) ledger.add({ frame: f, dropped: f >= 9000 ? 100 : 0 });
    // The baseline for a record from 8600 is the reading at 8500 (0 dropped).
    expect(ledger.droppedSince(8600, 100)).toBe(100);
    expect(ledger.droppedSince(9200, 100)).toBe(0);
  });

  it('puts every cause in words with frames and milliseconds', () => {
    expect(streamBreak({ lostInWorklet: 128, silentRun: 0, droppedUpstream: 441 }, SILENT_RUN_FRAMES, 44_100)).toBe("441 frames (10.0 ms) dropped before the browser's audio thread; 128 frames (2.9 ms) skipped by the audio thread");
    expect(streamBreak({ lostInWorklet: 0, silentRun: SILENT_RUN_FRAMES - 1, droppedUpstream: 0 }, SILENT_RUN_FRAMES, 44_100)).toBeNull();
  });
});
