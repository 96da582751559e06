import { describe, expect, it } from 'vitest';
import type { ScheduleEntry } from './campaign-data.ts';
import { checksAffected, type CampaignNotice } from './checks-refresh.ts';

// A roving-hammer schedule with the accelerometer at P07:+Z, plus the reciprocal of the P04 entry
// (hammer at P07, response at P04). Linearity needs 4 accepted hits (apps/api/src/hits/checks.ts
// entryLinearity); reciprocity pairs H(P07,P04) with H(P04,P07) (Ewins 2000, Modal Testing, ch. 3).
const entry = (id: string, responseDof: string, excitationDof: string, acceptedHits: number) => ({ id, responseDof, excitationDof, acceptedHits }) as ScheduleEntry;
const schedule = (counts: Record<string, number>) => [
  entry('a', 'P07:+Z', 'P01:+Z', counts.a ?? 0),
  entry('b', 'P07:+Z', 'P04:+Z', counts.b ?? 0),
  entry('b-reciprocal', 'P04:-Z', 'P07:+Z', counts['b-reciprocal'] ?? 0),
  entry('drive', 'P07:+Z', 'P07:+Z', counts.drive ?? 0),
];
const hit = (entryId: string): CampaignNotice => ({ type: 'hit', entryId, hits: ['h:1'] });

describe('which notices can change the reciprocity and linearity checks', () => {
  it('passes over hits at an entry with no reciprocal while it has fewer than 4 accepted hits', () => {
    expect(checksAffected([hit('a')], schedule({ a: 0 }), schedule({ a: 1 }))).toBe(false);
    expect(checksAffected([hit('a')], schedule({ a: 2 }), schedule({ a: 3 }))).toBe(false);
    // A driving point is nobody's reciprocal, even with the other entries measured.
    expect(checksAffected([hit('drive')], schedule({ drive: 1, a: 5, b: 5 }), schedule({ drive: 2, a: 5, b: 5 }))).toBe(false);
  });

  it('counts the hit that gives an entry its 4th accepted hit, and every one after', () => {
    expect(checksAffected([hit('a')], schedule({ a: 3 }), schedule({ a: 4 }))).toBe(true);
    expect(checksAffected([hit('a')], schedule({ a: 7 }), schedule({ a: 8 }))).toBe(true);
  });

  it('counts a hit at an entry whose reciprocal has hits, whatever the written signs', () => {
    expect(checksAffected([hit('b')], schedule({ b: 0, 'b-reciprocal': 2 }), schedule({ b: 1, 'b-reciprocal': 2 }))).toBe(true);
    expect(checksAffected([hit('b-reciprocal')], schedule({ b: 2, 'b-reciprocal': 1 }), schedule({ b: 2, 'b-reciprocal': 2 }))).toBe(true);
    // Without hits on the other side there is no pair yet.
    expect(checksAffected([hit('b')], schedule({ b: 0 }), schedule({ b: 1 }))).toBe(false);
  });

  it('passes over a rejected hit (the accepted hits did not change), but not a verdict that takes a line away', () => {
    expect(checksAffected([hit('a')], schedule({ a: 6 }), schedule({ a: 6 }))).toBe(false);
    expect(checksAffected([{ type: 'verdict', entryId: 'a' }], schedule({ a: 4 }), schedule({ a: 3 }))).toBe(true);
  });

  it('takes schedule changes, jobs, resyncs and an unread schedule as changing everything, and arming as nothing', () => {
    const s = schedule({ a: 1 });
    expect(checksAffected([{ type: 'schedule' }], s, s)).toBe(true);
    expect(checksAffected([{ type: 'job' }], s, s)).toBe(true);
    expect(checksAffected([{ type: 'hit', entryId: 'a', resync: true }], s, s)).toBe(true);
    expect(checksAffected([hit('a')], s, undefined)).toBe(true);
    expect(checksAffected([hit('unknown')], s, schedule({ a: 1 }))).toBe(true);
    expect(checksAffected([{ type: 'arming', entryId: 'a' }], s, s)).toBe(false);
    // One window holding a passed-over hit and one that counts: the checks are read again.
    expect(checksAffected([hit('a'), hit('b')], schedule({ a: 1, b: 0, 'b-reciprocal': 1 }), schedule({ a: 2, b: 1, 'b-reciprocal': 1 }))).toBe(true);
  });
});
