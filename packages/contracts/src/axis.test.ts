import { describe, expect, it } from 'vitest';
import { canonicalDof, frfAxisFactor, sameAxis } from './axis.ts';

describe('directions with sign', () => {
  it('keeps the written DOF and names the physical axis on the positive side', () => {
    expect(canonicalDof('P7:-Z')).toEqual({ written: 'P7:-Z', point: 'P7', axis: 'Z', sign: -1, canonical: 'P7:+Z' });
    expect(canonicalDof('B01:+x')?.canonical).toBe('B01:+X');
    expect(canonicalDof('not a dof')).toBeNull();
  });

  it('recognises P:−Z and P:+Z as one axis, and tells other axes and points apart', () => {
    expect(sameAxis('P7:-Z', 'P7:+Z')).toBe(true);
    expect(sameAxis('P7:+Z', 'P7:+Y')).toBe(false);
    expect(sameAxis('P7:+Z', 'P8:+Z')).toBe(false);
  });

  it('flips an FRF once per reversed end: H(i,−d) = −H(i,+d) (Ewins 2000, §4.2: FRF = response / force along the stated directions)', () => {
    expect(frfAxisFactor('P1:+Z', 'P7:-Z')).toBe(-1);
    expect(frfAxisFactor('P1:-Z', 'P7:+Z')).toBe(-1);
    expect(frfAxisFactor('P1:-Z', 'P7:-Z')).toBe(1);
    expect(frfAxisFactor('P1:+Z', 'P7:+Z')).toBe(1);
  });
});
