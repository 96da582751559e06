import { describe, expect, it } from 'vitest';
import { defaultFitSelection, leftOutSummary } from './fit-selection.ts';

const entry = (id: string, responseDof: string, excitationDof: string, status: string, acceptedHits = 5) => ({ id, responseDof, excitationDof, status, acceptedHits });

describe('defaultFitSelection (docs/methods.md#fit-selection)', () => {
  const entries = [
    entry('a', 'P07:+Z', 'P01:+Z', 'done'),
    entry('b', 'P07:+Z', 'P02:+Z', 'flagged'),
    entry('c', 'P07:+Z', 'P03:+Z', 'in-progress', 2),
    entry('d', 'P07:+Z', 'P04:+Z', 'planned', 0),
    entry('e', 'P01:+Z', 'P05:+Z', 'done'),
  ];

  it('takes the entries at the current reference with accepted hits and leaves out flagged ones', () => {
    const s = defaultFitSelection(entries, { testType: 'roving-hammer', referenceDofs: ['P07:+Z'] });
    expect(s.chosen).toEqual(['a', 'c']);
    expect(s.leftOut.map((e) => [e.id, e.reason])).toEqual([
      ['b', 'flagged'],
      ['e', 'other-reference'],
    ]);
    expect(leftOutSummary(s.leftOut, 'roving-hammer')).toBe('1 flagged for low coherence (P02:+Z); 1 measured at an earlier reference (P01:+Z)');
  });

  it('reads the reference on the excitation side in a roving-response test, whatever the sign written', () => {
    const s = defaultFitSelection([entry('a', 'P01:+Z', 'P07:-Z', 'done'), entry('b', 'P02:+Z', 'P08:+Z', 'done')], { testType: 'roving-response', referenceDofs: ['P07:+Z'] });
    expect(s.chosen).toEqual(['a']);
    expect(s.leftOut.map((e) => e.id)).toEqual(['b']);
  });
});
