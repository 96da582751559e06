import { describe, expect, it } from 'vitest';
import { halfSine } from '../test/helpers.ts';
import { findTrigger } from './trigger.ts';

describe('findTrigger', () => {
  const fs = 10000;
  const x = halfSine(1000, fs, 100, 1e-3, 0.05); // pulse from sample 500

  it('returns the first sample whose magnitude reaches the level, and the record start one pre-trigger earlier', () => {
    const t = findTrigger(x, fs, { level: 5, preTriggerS: 0.01 })!;
    // closed form: 100·sin(π·k/10) ≥ 5 first at k = 1 (30.9 N), i.e. sample 501
    expect(t.index).toBe(501);
    expect(t.timeS).toBeCloseTo(0.0501, 12);
    expect(t.startIndex).toBe(401);
    expect(t.clamped).toBe(false);
  });

  it('triggers on a negative-going force too, since it compares |force|', () => {
    const t = findTrigger(x.map((v) => -v), fs, { level: 5, preTriggerS: 0 })!;
    expect(t.index).toBe(501);
  });

  it('clamps the record start at sample 0 and says so', () => {
    const t = findTrigger(x, fs, { level: 5, preTriggerS: 0.2 })!;
    expect(t.startIndex).toBe(0);
    expect(t.clamped).toBe(true);
  });

  it('returns null when the level is never reached', () => {
    expect(findTrigger(x, fs, { level: 101, preTriggerS: 0 })).toBeNull();
  });
});
