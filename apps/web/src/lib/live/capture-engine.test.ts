// The live input's trigger and ring buffer (docs/methods.md#live-trigger), fed in 128-frame
// blocks as the audio thread hands them over. Expected values are counted by hand from the
// synthetic streams the tests build (a pulse at a known frame is a known record start).
import { describe, expect, it } from 'vitest';
import { CaptureEngine, headroomDb, OVERLOAD_PEAK, recordFrames, type CaptureOptions, type CapturedRecord, type MeterReading } from './capture-engine.ts';

const base: CaptureOptions = { channels: 2, sampleRateHz: 48_000, forceChannel: 0, forceNPerUnit: 100, triggerLevelN: 5, slope: 'rising', hysteresis: 0.5, preTriggerSamples: 100, recordSamples: 1000, meterFrames: 480 };

/** A stream of `frames` frames, channel 1 = channel 0 × 0.5, with half-sine pulses of `peakN` at the given frames. */
function stream(frames: number, pulses: { at: number; peakN: number; width?: number }[], nPerUnit = 100, channels = 2): Float32Array[] {
  const out = Array.from({ length: channels }, () => new Float32Array(frames));
  for (const p of pulses) {
    const w = p.width ?? 20;
    for (let k = 0; k < w; k++) out[0]![p.at + k] = ((p.peakN / nPerUnit) * Math.sin((Math.PI * (k + 0.5)) / w));
  }
  for (let c = 1; c < channels; c++) for (let i = 0; i < frames; i++) out[c]![i] = 0.5 * out[0]![i]!;
  return out;
}

function feed(engine: CaptureEngine, data: Float32Array[], block = 128) {
  const records: CapturedRecord[] = [];
  const meters: MeterReading[] = [];
  for (let i = 0; i < data[0]!.length; i += block) engine.process(data.map((c) => c.subarray(i, Math.min(i + block, c.length))), (r) => records.push(r), (m) => meters.push(m));
  return { records, meters };
}

/** First frame of a pulse whose value reaches `levelN` (computed from the same half-sine). */
function crossing(at: number, peakN: number, levelN: number, width = 20) {
  for (let k = 0; k < width; k++) if (Math.fround((peakN / 100) * Math.sin((Math.PI * (k + 0.5)) / width)) >= levelN / 100) return at + k;
  throw new Error('no crossing');
}

describe('live capture engine', () => {
  it('cuts one record per hit, starting the pre-trigger before the first frame at or above the trigger level', () => {
    const data = stream(10_000, [{ at: 2000, peakN: 50 }, { at: 6000, peakN: 80 }]);
    const { records } = feed(new CaptureEngine(base), data);
    expect(records).toHaveLength(2);
    const t0 = crossing(2000, 50, 5);
    expect(records[0]!.triggerFrame).toBe(t0);
    expect(records[0]!.startFrame).toBe(t0 - 100);
    expect(records[0]!.channels[0]).toHaveLength(1000);
    // The record holds the stream's samples exactly (both channels, across block edges of the ring).
    for (let k = 0; k < 1000; k++) {
      expect(records[0]!.channels[0]![k]).toBe(data[0]![t0 - 100 + k]);
      expect(records[0]!.channels[1]![k]).toBe(data[1]![t0 - 100 + k]);
    }
    expect(records[1]!.triggerFrame).toBe(crossing(6000, 80, 5));
    // Peaks per channel: 80 N / 100 N per unit, the half-sine's largest sample (sin of 0.975·π/2).
    expect(records[1]!.peaks[0]).toBeCloseTo(0.8 * Math.sin((Math.PI * 9.5) / 20), 6);
  });

  it('keeps a second pulse inside the record with the first (the double-hit check sees it) and triggers again only after the record', () => {
    const data = stream(10_000, [{ at: 2000, peakN: 50 }, { at: 2300, peakN: 30 }, { at: 3500, peakN: 40 }]);
    const { records } = feed(new CaptureEngine(base), data);
    expect(records.map((r) => r.triggerFrame)).toEqual([crossing(2000, 50, 5), crossing(3500, 40, 5)]);
    expect(Math.max(...records[0]!.channels[0]!.subarray(300 + 100 - 20, 300 + 100 + 40))).toBeGreaterThan(0.25);
  });

  it('does not trigger below the level, and with hysteresis needs the force to fall back before the next trigger', () => {
    expect(feed(new CaptureEngine(base), stream(5000, [{ at: 1000, peakN: 4.9 }])).records).toHaveLength(0);
    // A force that stays above level × (1 − hysteresis) = 2.5 N after a record does not trigger again.
    const held = stream(5000, [{ at: 1000, peakN: 50 }]);
    for (let i = 1020; i < 4000; i++) held[0]![i] = 0.04; // 4 N: above the re-arm level, above the trigger level too
    expect(feed(new CaptureEngine(base), held).records).toHaveLength(1);
  });

  it('triggers on the falling slope for a force channel wired with reversed sign', () => {
    const data = stream(5000, [{ at: 1000, peakN: 50 }]);
    for (const c of data) for (let i = 0; i < c.length; i++) c[i] = -c[i]!;
    expect(feed(new CaptureEngine(base), data).records).toHaveLength(0);
    const { records } = feed(new CaptureEngine({ ...base, slope: 'falling' }), data);
    expect(records.map((r) => r.triggerFrame)).toEqual([crossing(1000, 50, 5)]);
  });

  it('skips a hit too early for a full pre-trigger rather than padding it', () => {
    expect(feed(new CaptureEngine(base), stream(3000, [{ at: 50, peakN: 50 }])).records).toHaveLength(0);
  });

  it('reads level meters with headroom in dB and overload within 1 dB of full scale', () => {
    // Headroom = −20·log10(peak): 0.5 → 6.02 dB, 0.9 → 0.915 dB (< 1 dB: overload).
    expect(headroomDb(0.5)).toBeCloseTo(6.0206, 4);
    expect(OVERLOAD_PEAK).toBeCloseTo(0.891251, 6);
    const data = [new Float32Array(960).fill(0.9), new Float32Array(960).fill(-0.5)];
    const { meters } = feed(new CaptureEngine({ ...base, triggerLevelN: 1e9 }), data);
    expect(meters).toHaveLength(2);
    expect(meters[0]!.frame).toBe(480);
    expect(meters[0]!.headroomDb[0]).toBeCloseTo(-20 * Math.log10(Math.fround(0.9)), 6);
    expect(meters[0]!.overload).toEqual([true, false]);
    expect(meters[0]!.headroomDb[1]).toBeCloseTo(6.0206, 4);
  });

  // A correctness test, not a speed test (tests/bench/live-samples.ts prints the speed): a loaded machine may need long.
  it('counts every frame of a long 96 kHz × 4-channel run and finds every hit at its frame', { timeout: 120_000 }, () => {
    const fs = 96_000;
    const opts = { ...base, channels: 4, sampleRateHz: fs, ...recordFrames(fs, 0.5, 0.01), meterFrames: 4800 };
    const engine = new CaptureEngine(opts);
    const seconds = 60;
    const chunk = fs; // one second at a time, so the test holds one second of stream in memory
    let triggers: number[] = [];
    const expected: number[] = [];
    let meters = 0;
    for (let s = 0; s < seconds; s++) {
      const data = stream(chunk, [{ at: 40_000, peakN: 60 }], 100, 4);
      expected.push(s * chunk + crossing(40_000, 60, 5));
      for (let i = 0; i < chunk; i += 128) engine.process(data.map((c) => c.subarray(i, Math.min(i + 128, chunk))), (r) => triggers.push(r.triggerFrame), () => (meters += 1));
    }
    expect(opts.recordSamples).toBe(48_000);
    expect(engine.framesSeen).toBe(seconds * fs);
    // 60 s / 50 ms per meter reading = 1200 readings: one per 4800 frames, none skipped.
    expect(meters).toBe(1200);
    expect(triggers).toEqual(expected);
    triggers = [];
  });

  it('refuses impossible options with the bad value named', () => {
    expect(() => new CaptureEngine({ ...base, forceChannel: 2 })).toThrow(/forceChannel=2/);
    expect(() => new CaptureEngine({ ...base, preTriggerSamples: 1000 })).toThrow(/preTriggerSamples=1000/);
    expect(() => new CaptureEngine({ ...base, triggerLevelN: 0 })).toThrow(/triggerLevelN=0/);
    expect(() => new CaptureEngine(base).process([new Float32Array(4)], () => {})).toThrow(/1 channels, expected 2/);
  });
});
