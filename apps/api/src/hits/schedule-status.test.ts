import { describe, expect, it } from 'vitest';
import { statusFrom } from './schedule-status.ts';
import { mainChannel } from './entry-result.ts';

// The rule under test is the product's own (design.md, "Tap"): done = required accepted hits and
// mean coherence at the threshold; flagged = hits in, coherence low; in progress = hits missing.
describe('statusFrom', () => {
  const base = { hitCount: 5, accepted: 5, requiredHits: 5, meanCoherence: 0.95, threshold: 0.9, current: 'planned' as const };

  it('is done when the required accepted hits are in and the mean coherence reaches the threshold', () => {
    expect(statusFrom(base)).toBe('done');
    expect(statusFrom({ ...base, meanCoherence: 0.9 })).toBe('done');
  });

  it('is flagged when the hits are in but the coherence is below the threshold', () => {
    expect(statusFrom({ ...base, meanCoherence: 0.89 })).toBe('flagged');
    expect(statusFrom({ ...base, meanCoherence: null })).toBe('flagged');
  });

  it('is in progress while accepted hits are missing, even with rejected hits only', () => {
    expect(statusFrom({ ...base, accepted: 4 })).toBe('in-progress');
    expect(statusFrom({ ...base, hitCount: 2, accepted: 0 })).toBe('in-progress');
  });

  it('keeps the status of an entry without any hit (a skipped entry stays skipped)', () => {
    expect(statusFrom({ ...base, hitCount: 0, accepted: 0, current: 'skipped' })).toBe('skipped');
  });
});

describe('mainChannel', () => {
  const channels = [{ dof: 'P2:+X' }, { dof: 'P7:-Z' }, { dof: 'P7:+Y' }];

  it('finds the channel at the entry’s response point and axis whatever the written sign', () => {
    expect(mainChannel(channels, 'P7:+Z')).toBe(1);
    expect(mainChannel(channels, 'P7:+Y')).toBe(2);
  });

  it('falls back to the first channel when none measures the response DOF', () => {
    expect(mainChannel(channels, 'P9:+Z')).toBe(0);
  });
});
