import { describe, expect, it } from 'vitest';
import { halfSine } from '../test/helpers.ts';
import { splitRecords } from './records.ts';

// Expected indices are worked out by hand from the closed form of the half-sine pulse
// 100·sin(π·k/10) (1 ms at 10 kHz): the first sample ≥ 5 N after the pulse starts is k = 1
// (30.9 N); the trigger rule itself is docs/methods.md#trigger.
describe('splitRecords', () => {
  const fs = 10_000;
  const n = 1000;
  const pre = 100;

  function stream(pulseStartsS: number[], length: number, offsetN = 0): Float64Array {
    const x = new Float64Array(length).fill(offsetN);
    for (const t of pulseStartsS) {
      const p = halfSine(length, fs, 100, 1e-3, t);
      for (let i = 0; i < length; i++) x[i]! += p[i]!;
    }
    return x;
  }

  it('cuts a continuous recording into records that start one pre-trigger before each trigger sample', () => {
    const force = stream([0.05, 0.25, 0.45], 6000);
    const response = force.map((v) => 2 * v);
    const out = splitRecords([force, response], fs, { recordSamples: n, preTriggerSamples: pre, level: 5 });
    // triggers at 501, 2501, 4501 (closed form above) → starts 401, 2401, 4401
    expect(out.records.map((r) => r.startIndex)).toEqual([401, 2401, 4401]);
    expect(out.skipped).toEqual([]);
    expect(out.records[1]!.channels).toHaveLength(2);
    expect(out.records[1]!.channels[0]!.length).toBe(n);
    // the response channel is cut at the same samples: 2 × the force, exactly (float32 of an exact double)
    expect(out.records[1]!.channels[1]![pre + 4]).toBe(Math.fround(2 * force[2401 + pre + 4]!));
  });

  it('triggers on the force less its offset, the mean of the first pre-trigger samples', () => {
    // An offset of 50 N alone would cross a 5 N level at sample 0; less the offset it triggers at 501.
    const force = stream([0.05], 2000, 50);
    const out = splitRecords([force], fs, { recordSamples: n, preTriggerSamples: pre, level: 5 });
    expect(out.records.map((r) => r.startIndex)).toEqual([401]);
  });

  it('reports a hit too close behind the previous record and one cut short by the end, and stores neither', () => {
    const force = stream([0.05, 0.145, 0.3, 0.55], 6000);
    const out = splitRecords([force], fs, { recordSamples: n, preTriggerSamples: pre, level: 5 });
    // trigger 501 → record 401..1400; trigger 1451 needs its record from 1351 < 1401 → skipped;
    // trigger 3001 → record at 2901; trigger 5501 → record to 6400 > 6000 → cut short
    expect(out.records.map((r) => r.startIndex)).toEqual([401, 2901]);
    expect(out.skipped).toEqual([
      { timeS: 0.1451, kind: 'short-pre-trigger' },
      { timeS: 0.5501, kind: 'cut-short' },
    ]);
  });

  it('takes records that are already triggered back to back as they are', () => {
    // Three blocks of 1000 samples, each with its pulse from sample 79 of the block (trigger ≥ pre/2 = 50):
    // a free search would start the first record at −20 and skip it. The first 100 samples hold
    // part of the first pulse, so the offset estimate is ≈ 6.4 N (Σ of a 10-sample half-sine of
    // 100 N ≈ 636 N over 100 samples); a 10 N level stays above that baseline.
    const force = stream([0.0079, 0.1079, 0.2079], 3000);
    const out = splitRecords([force], fs, { recordSamples: n, preTriggerSamples: pre, level: 10 });
    expect(out.records.map((r) => r.startIndex)).toEqual([0, 1000, 2000]);
  });

  it('finds nothing in a recording that never reaches the level', () => {
    const out = splitRecords([stream([0.05], 2000)], fs, { recordSamples: n, preTriggerSamples: pre, level: 101 });
    expect(out).toEqual({ records: [], skipped: [] });
  });

  it('refuses channels of different lengths with both lengths in the message', () => {
    expect(() => splitRecords([new Float64Array(10), new Float64Array(9)], fs, { recordSamples: 5, preTriggerSamples: 1, level: 1 })).toThrow(/9 samples, channels\[0\] has 10/);
  });
});
