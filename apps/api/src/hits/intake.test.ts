import { describe, expect, it } from 'vitest';
import { defaultAcquisitionSettings } from '@resonote/contracts';
import { splitByTrigger } from './intake.ts';

// A rectangular 10-sample pulse of 100 N: with a 5 N trigger level the trigger is the pulse's
// first sample (docs/methods.md#trigger); the record starts round(preTriggerS·fs) before it.
describe('splitByTrigger', () => {
  const s = { ...defaultAcquisitionSettings, sampleRateHz: 1000, recordLengthS: 1, preTriggerS: 0.05, triggerLevelN: 5 };
  const fs = s.sampleRateHz;
  const pulseAt = (length: number, starts: number[]) => {
    const x = new Float64Array(length);
    for (const p of starts) for (let i = p; i < p + 10 && i < length; i++) x[i] = 100;
    return x;
  };

  it('cuts records of the settings’ length, one pre-trigger before each trigger', () => {
    const force = pulseAt(3500, [200, 1500]);
    const out = splitByTrigger([force, force.map((v) => v / 10)], fs, s);
    // 1000 samples per record, 50 before the trigger: starts 150 and 1450
    expect(out.records.map((r) => r.startIndex)).toEqual([150, 1450]);
    expect(out.records[0]!.channels[1]![50]).toBe(10);
    expect(out.skipped).toEqual([]);
  });

  it('says in words why a hit at the end of the file was not stored', () => {
    const out = splitByTrigger([pulseAt(2100, [200, 1500])], fs, s);
    expect(out.records.map((r) => r.startIndex)).toEqual([150]);
    expect(out.skipped).toEqual([{ timeS: 1.5, reason: 'the hit at 1.500 s is cut short by the end of the file (a record needs 1.000 s)' }]);
  });

  it('says in words why a hit right behind the previous record was not stored', () => {
    // record 150..1149; the next trigger at 1180 would need its record from 1130 < 1150
    const out = splitByTrigger([pulseAt(4000, [200, 1180, 2500])], fs, s);
    expect(out.records.map((r) => r.startIndex)).toEqual([150, 2450]);
    expect(out.skipped).toEqual([{ timeS: 1.18, reason: 'the hit at 1.180 s starts before a full pre-trigger of 50.0 ms could be recorded' }]);
  });
});
