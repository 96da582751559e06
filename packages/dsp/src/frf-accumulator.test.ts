// FrfAccumulator: averageFrf one hit at a time (apps/api keeps one per DOF so a new hit costs one
// record's transforms). The reference is averageFrf itself (docs/methods.md#frf-averaging): the
// same sums accumulated in the same order must give the same bits, on both FFT paths' shapes.
import { describe, expect, it } from 'vitest';
import { mulberry32 } from '../test/helpers.ts';
import { FrfAccumulator, averageFrf, type AverageFrfOptions, type AveragedFrf, type Hit } from './frf.ts';

const fs = 2048;
const n = 1024;
const options: AverageFrfOptions = { forceWindow: { startS: 0.01, lengthS: 0.02, taperS: 0.002 }, exponentialWindow: { startS: 0.01, tauS: 0.1 }, offsets: { preTriggerSamples: 16 }, hv: true };

/** A hammer-like pulse on an offset and a decaying two-tone response, with noise, per seed. */
function record(seed: number, channels = 2): Hit {
  const rnd = mulberry32(seed);
  const force = new Float32Array(n);
  const responses = Array.from({ length: channels }, () => new Float32Array(n));
  for (let i = 0; i < n; i++) {
    const t = i / fs;
    force[i] = 0.3 + (i >= 20 && i < 30 ? 40 * Math.sin((Math.PI * (i - 20)) / 10) : 0) + 0.05 * (rnd() - 0.5);
    responses.forEach((r, c) => (r[i] = -0.1 + (i >= 20 ? Math.exp(-8 * t) * (Math.sin(2 * Math.PI * (110 + 40 * c) * t) + 0.4 * Math.sin(2 * Math.PI * 390 * t)) : 0) + 0.02 * (rnd() - 0.5)));
  }
  return { force, responses };
}

function arrays(frf: AveragedFrf): Float64Array[] {
  return [frf.f, frf.gff, ...frf.h1.flatMap((h) => [h.re, h.im]), ...frf.h2.flatMap((h) => [h.re, h.im]), ...frf.hv!.flatMap((h) => [h.re, h.im]), ...frf.coherence, ...frf.gxx, ...frf.gfx.flatMap((h) => [h.re, h.im])];
}

function expectSameBits(a: AveragedFrf, b: AveragedFrf) {
  expect(a.averages).toBe(b.averages);
  const x = arrays(a);
  const y = arrays(b);
  expect(x.length).toBe(y.length);
  x.forEach((arr, i) => expect(Buffer.from(arr.buffer, arr.byteOffset, arr.byteLength).equals(Buffer.from(y[i]!.buffer, y[i]!.byteOffset, y[i]!.byteLength))).toBe(true));
}

describe('FrfAccumulator', () => {
  const hits = [1, 2, 3, 4, 5].map((s) => record(s));

  it('gives after each added hit exactly the bits averageFrf gives for the hits so far', () => {
    const acc = new FrfAccumulator(n, 2, fs, options);
    hits.forEach((h, i) => {
      acc.add(h);
      expect(acc.count).toBe(i + 1);
      expectSameBits(acc.result(), averageFrf(hits.slice(0, i + 1), fs, options));
    });
  });

  it('goes on from a copy without changing the original', () => {
    const acc = new FrfAccumulator(n, 2, fs, options);
    acc.add(hits[0]!);
    acc.add(hits[1]!);
    const branch = acc.copy();
    branch.add(hits[2]!);
    expectSameBits(acc.result(), averageFrf(hits.slice(0, 2), fs, options));
    expectSameBits(branch.result(), averageFrf(hits.slice(0, 3), fs, options));
    // One hit averaged: γ² ≡ 1 where there is energy (Bendat & Piersol 2010, coherence of one record).
    const one = new FrfAccumulator(n, 2, fs, options);
    one.add(hits[0]!);
    expect(Math.abs(one.result().coherence[0]![100]! - 1)).toBeLessThan(1e-12);
  });

  it('refuses a hit of another shape, and a result before any hit, with the index of the hit', () => {
    const acc = new FrfAccumulator(n, 2, fs, options);
    expect(() => acc.result()).toThrow(/at least one hit/);
    acc.add(hits[0]!);
    expect(() => acc.add(record(9, 3))).toThrow(/hits\[1\] has 3 response channels but hits\[0\] has 2/);
    expect(() => acc.add({ force: new Float32Array(n - 1), responses: [new Float32Array(n - 1), new Float32Array(n - 1)] })).toThrow(/hits\[1\]\.force/);
    // The refused hits left the sums as they were.
    expectSameBits(acc.result(), averageFrf(hits.slice(0, 1), fs, options));
  });
});
