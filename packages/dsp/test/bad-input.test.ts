import { describe, expect, it } from 'vitest';
import * as dsp from '../src/index.ts';

const ok = [1, 2, 3, 4];
const noWin = { forceWindow: null, exponentialWindow: null };

describe('bad input is refused with a RangeError that names the value', () => {
  it('refuses empty arrays', () => {
    expect(() => dsp.transientSpectrum([], 100)).toThrow(new RangeError('x is empty (length 0)'));
    expect(() => dsp.energySpectralDensity(new Float64Array(0), 100)).toThrow(RangeError);
    expect(() => dsp.welchPsd([], 100)).toThrow(/x is empty/);
    expect(() => dsp.averageFrf([], 100, noWin)).toThrow(/hits is empty/);
    expect(() => dsp.checkHit([], [], 100)).toThrow(/force is empty/);
    expect(() => dsp.findTrigger([], 100, { level: 1, preTriggerS: 0 })).toThrow(/force is empty/);
  });

  it('refuses NaN and Infinity samples, naming the index', () => {
    expect(() => dsp.transientSpectrum([1, 2, NaN], 100)).toThrow(new RangeError('x[2]=NaN is not finite'));
    expect(() => dsp.linearSpectrum([1, Infinity], 100, { scaling: 'rms' })).toThrow('x[1]=Infinity is not finite');
    expect(() => dsp.welchCsd(ok, [1, 2, -Infinity, 4], 100, { segmentLength: 2 })).toThrow('y[2]=-Infinity is not finite');
    const force = new Float64Array(16);
    force[12] = NaN;
    expect(() => dsp.checkHit(force, [], 100)).toThrow(new RangeError('force[12]=NaN is not finite'));
    const hits = [
      { force: new Float64Array(8).fill(1), responses: [new Float64Array(8)] },
      { force: new Float64Array(8).fill(1), responses: [Float64Array.from([0, 0, 0, NaN, 0, 0, 0, 0])] },
    ];
    expect(() => dsp.averageFrf(hits, 100, noWin)).toThrow(new RangeError('hits[1].responses[0][3]=NaN is not finite'));
  });

  it('refuses fs that is zero, negative or not finite', () => {
    expect(() => dsp.transientSpectrum(ok, 0)).toThrow(new RangeError('fs=0 must be > 0 and finite'));
    expect(() => dsp.energySpectralDensity(ok, -5)).toThrow('fs=-5 must be > 0');
    expect(() => dsp.welchPsd(ok, NaN)).toThrow('fs=NaN must be > 0');
    expect(() => dsp.forceWindow(4, Infinity, { startS: 0, lengthS: 0, taperS: 0 })).toThrow('fs=Infinity');
    expect(() => dsp.averageFrf([{ force: ok, responses: [ok] }], 0, noWin)).toThrow('fs=0');
  });

  it('refuses mismatched lengths and hits of unequal length', () => {
    expect(() => dsp.welchCoherence(ok, [1, 2, 3], 100, { segmentLength: 2 })).toThrow(
      new RangeError('y has length 3 but x has length 4: lengths must match'),
    );
    expect(() => dsp.checkHit(ok, [[1, 2]], 100)).toThrow('responses[0] has length 2 but force has length 4');
    expect(() =>
      dsp.averageFrf(
        [
          { force: ok, responses: [ok] },
          { force: [1, 2, 3], responses: [[1, 2, 3]] },
        ],
        100,
        noWin,
      ),
    ).toThrow('hits[1].force has length 3 but hits[0].force has length 4');
    expect(() => dsp.averageFrf([{ force: ok, responses: [[1, 2]] }], 100, noWin)).toThrow(
      'hits[0].responses[0] has length 2 but hits[0].force has length 4',
    );
    expect(() =>
      dsp.averageFrf(
        [
          { force: ok, responses: [ok] },
          { force: ok, responses: [ok, ok] },
        ],
        100,
        noWin,
      ),
    ).toThrow('hits[1] has 2 response channels but hits[0] has 1');
    expect(() => dsp.convertFrf({ re: new Float64Array(3), im: new Float64Array(3) }, [1, 2], 'mobility', 'receptance')).toThrow(
      'f has length 2 but h.re has length 3',
    );
  });

  it('refuses bad settings, naming them', () => {
    expect(() => dsp.welchPsd(ok, 100, { segmentLength: 8 })).toThrow('segmentLength=8 must not exceed the signal length 4');
    expect(() => dsp.welchPsd(ok, 100, { segmentLength: 2, overlapSamples: 2 })).toThrow('overlapSamples=2 must be less than segmentLength=2');
    expect(() => dsp.linearSpectrum(ok, 100, { scaling: 'power' as never })).toThrow("scaling=power must be 'rms' or 'peak'");
    expect(() => dsp.exponentialWindow(4, 100, { startS: 0, tauS: 0 })).toThrow('options.tauS=0 must be > 0');
    expect(() => dsp.forceWindow(4, 100, { startS: -1, lengthS: 0, taperS: 0 })).toThrow('options.startS=-1 must be >= 0');
    expect(() => dsp.tauFromEndLevel(1, 0, 1)).toThrow('p=1 must be between 0 and 1');
    expect(() => dsp.tauFromEndLevel(1, 2, 0.01)).toThrow('recordS=1 must be greater than startS=2');
    expect(() => dsp.findTrigger(ok, 100, { level: 0, preTriggerS: 0 })).toThrow('level=0 must be > 0');
    expect(() => dsp.convertFrf({ re: new Float64Array(1), im: new Float64Array(1) }, [1], 'velocity' as never, 'mobility')).toThrow(
      "from=velocity must be 'receptance', 'mobility' or 'accelerance'",
    );
    expect(() =>
      dsp.averageFrf([{ force: ok, responses: [ok] }], 100, { forceWindow: null, exponentialWindow: { startS: 0, tauS: -1 } }),
    ).toThrow('tauS=-1 must be > 0');
  });

  it('refuses finite samples so large that the spectrum would overflow, instead of returning Infinity', () => {
    expect(() => dsp.energySpectralDensity([1e308, 1e308], 1)).toThrow('x holds values so large that its spectrum overflows');
  });

  it('never returns NaN for silent records: H and coherence are 0 where nothing was measured', () => {
    const zero = new Float64Array(64);
    const r = dsp.averageFrf([{ force: zero, responses: [zero] }], 100, { ...noWin, hv: true });
    for (const arr of [r.h1[0].re, r.h1[0].im, r.h2[0].re, r.hv![0].re, r.coherence[0], r.gff]) {
      expect(arr).toHaveLength(33); // 64 samples → 33 one-sided lines
      for (const v of arr) expect(v).toBe(0);
    }
    const c = dsp.welchCoherence(zero, zero, 100, { segmentLength: 16 });
    expect(c.coherence).toHaveLength(9); // 16-sample segments → 9 one-sided lines
    for (const v of c.coherence) expect(v).toBe(0);
  });
});
