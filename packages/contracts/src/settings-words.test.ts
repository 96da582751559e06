import { describe, expect, it } from 'vitest';
import { settingsChangeInWords, settingsFieldWords } from './settings-words.ts';
import { defaultAcquisitionSettings } from './settings.ts';

describe('settingsChangeInWords', () => {
  it('says a force window change in milliseconds: 0.02 → 0.04 s reads "force window length 20 → 40 ms"', () => {
    expect(settingsChangeInWords({ field: 'forceWindow.lengthS', before: 0.02, after: 0.04 })).toBe('force window length 20 → 40 ms');
  });

  it('keeps float noise out: 0.0071 s of pre-trigger reads 7.1 ms (in IEEE 754 doubles 0.0071 × 1000 = 7.1000000000000005)', () => {
    expect(0.0071 * 1000).not.toBe(7.1);
    expect(settingsChangeInWords({ field: 'preTriggerS', before: 0.0071, after: 0.01 })).toBe('pre-trigger 7.1 → 10 ms');
  });

  it('gives choices and ratios in words: the exponential window mode, the double-hit ratio in %', () => {
    expect(settingsChangeInWords({ field: 'exponentialWindow.mode', before: 'end-level', after: 'tau' })).toBe('exponential window by end level → by time constant');
    expect(settingsChangeInWords({ field: 'doubleHitRatio', before: 0.04, after: 0.1 })).toBe('double-hit threshold (second peak / first) 4 → 10 %');
    expect(settingsChangeInWords({ field: 'resampleUploads', before: false, after: true })).toBe('resample uploads at other rates off → on');
  });

  it('says "not set" for a field that appears or disappears, with the unit of the side that has a value', () => {
    expect(settingsChangeInWords({ field: 'exponentialWindow.tauS', before: null, after: 0.25 })).toBe('exponential window time constant τ not set → 250 ms');
  });

  it('shows an unknown field by its path rather than dropping it', () => {
    expect(settingsChangeInWords({ field: 'futureField', before: 1, after: 2 })).toBe('futureField 1 → 2');
  });

  it('has words for every field of the settings (so no raw key reaches the history)', () => {
    const paths = Object.entries(defaultAcquisitionSettings).flatMap(([k, v]) => (typeof v === 'object' && v !== null ? Object.keys(v).map((kk) => `${k}.${kk}`) : [k]));
    for (const p of [...paths, 'exponentialWindow.tauS']) expect(settingsFieldWords[p], p).toBeDefined();
  });
});
