import { describe, expect, it } from 'vitest';
import { halfSine } from '../test/helpers.ts';
import { averageFrf } from './frf.ts';
import { removeOffsets } from './offsets.ts';

describe('removeOffsets', () => {
  it('subtracts the mean of the pre-trigger samples of each channel (arithmetic mean, by hand)', () => {
    // pre-trigger [1, 3] → mean 2; [10, 20] → mean 15
    const [a, b] = removeOffsets([Float32Array.from([1, 3, 7, 2]), [10, 20, 30, 15]], 2);
    expect(Array.from(a!)).toEqual([-1, 1, 5, 0]);
    expect(Array.from(b!)).toEqual([-5, 5, 15, 0]);
  });

  it('uses the first sample alone when there is no pre-trigger, and rejects a negative count', () => {
    expect(Array.from(removeOffsets([[4, 5, 6]], 0)[0]!)).toEqual([0, 1, 2]);
    expect(() => removeOffsets([[1, 2]], -1)).toThrow(RangeError);
  });
});

describe('averageFrf offsets option', () => {
  it('gives the same FRF on offset records as on the offset-free records (linearity of the DFT)', () => {
    const fs = 1024;
    const n = 1024;
    const pre = 64;
    const force = halfSine(n, fs, 100, 0.004, pre / fs);
    const resp = force.map((v, i) => (i > 0 ? 0.5 * force[i - 1]! : 0) + 0.1 * v);
    const clean = averageFrf([{ force, responses: [resp] }], fs, { forceWindow: null, exponentialWindow: null });
    const shifted = { force: force.map((v) => v + 3.5), responses: [resp.map((v) => v - 0.25)] };
    const fixed = averageFrf([shifted], fs, { forceWindow: null, exponentialWindow: null, offsets: { preTriggerSamples: pre } });
    let m = 0;
    for (let k = 0; k < clean.f.length; k++) m = Math.max(m, Math.abs(fixed.h1[0]!.re[k]! - clean.h1[0]!.re[k]!), Math.abs(fixed.h1[0]!.im[k]! - clean.h1[0]!.im[k]!));
    expect(m).toBeLessThan(1e-12);
    // without the option the +3.5 N offset adds 3.5·n·Δt = 3.5 N·s to F(0): H1(0) differs
    const raw = averageFrf([shifted], fs, { forceWindow: null, exponentialWindow: null });
    expect(Math.abs(raw.h1[0]!.re[0]! - clean.h1[0]!.re[0]!)).toBeGreaterThan(1e-3);
  });
});
