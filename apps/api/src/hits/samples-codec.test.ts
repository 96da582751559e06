import { describe, expect, it } from 'vitest';
import type { AveragedFrf } from '@resonote/dsp';
import { decodeFrf, encodeFrf, packSamples, unpackSamples } from './samples-codec.ts';

describe('hit samples codec', () => {
  it('packs channels as float32 little-endian, channel after channel, and unpacks them unchanged', () => {
    const channels = [Float32Array.from([1.5, -2, 3.25]), Float32Array.from([0.1, 0.2, 0.3])];
    const buf = packSamples(channels);
    // 2 channels × 3 samples × 4 bytes; the first float of channel 1 sits at byte (1·3 + 0)·4 = 12
    expect(buf.length).toBe(24);
    expect(buf.readFloatLE(12)).toBe(Math.fround(0.1));
    const back = unpackSamples(buf, 2, 3);
    expect(back.map((c) => Array.from(c))).toEqual(channels.map((c) => Array.from(c)));
  });

  it('stores channels that are consecutive views of one block as that block, bytes unchanged, and reads them back as views', () => {
    const block = Float32Array.from([1.5, -2, 3.25, 0.1, 0.2, 0.3]);
    const channels = [block.subarray(0, 3), block.subarray(3, 6)];
    const buf = packSamples(channels);
    // Same layout as a copy (float32 LE, channel after channel): channel 1's first value at byte 12.
    expect(buf.length).toBe(24);
    expect(buf.readFloatLE(12)).toBe(Math.fround(0.1));
    expect(buf.buffer).toBe(block.buffer);
    // Views that are not consecutive in one block are copied, in channel order.
    const swapped = packSamples([block.subarray(3, 6), block.subarray(0, 3)]);
    expect(swapped.buffer).not.toBe(block.buffer);
    expect(swapped.readFloatLE(0)).toBe(Math.fround(0.1));
    expect(swapped.readFloatLE(12)).toBe(1.5);
    const back = unpackSamples(Buffer.from(buf), 2, 3);
    expect(back.map((c) => Array.from(c))).toEqual(channels.map((c) => Array.from(c)));
  });

  it('reads stored bytes that start at an odd offset (a pooled buffer) through a copy', () => {
    const bytes = Buffer.alloc(25);
    bytes.writeFloatLE(2.5, 1);
    bytes.writeFloatLE(-0.75, 13);
    const back = unpackSamples(bytes.subarray(1), 2, 3);
    expect(back[0]![0]).toBe(2.5);
    expect(back[1]![0]).toBe(-0.75);
  });

  it('refuses stored bytes that do not hold channels × samples values, with both counts', () => {
    expect(() => unpackSamples(Buffer.alloc(20), 2, 3)).toThrow('stored samples hold 5 values, expected 2 × 3');
  });

  it('refuses channels of different lengths rather than writing a misaligned blob', () => {
    expect(() => packSamples([new Float32Array(3), new Float32Array(2)])).toThrow('channel 1 holds 2 samples, channel 0 holds 3');
  });
});

describe('stored FRF codec', () => {
  // 8 samples at 1 kHz → 5 lines at k·fs/N = 0, 125, 250, 375, 500 Hz (the DFT's bins).
  const lines = 5;
  const ramp = (a: number) => Float64Array.from({ length: lines }, (_, k) => a + k);
  const frf: AveragedFrf = {
    f: Float64Array.from({ length: lines }, (_, k) => k * 125),
    gff: ramp(100),
    h1: [{ re: ramp(1), im: ramp(2) }, { re: ramp(11), im: ramp(12) }],
    h2: [{ re: ramp(3), im: ramp(4) }, { re: ramp(13), im: ramp(14) }],
    coherence: [ramp(5), ramp(15)],
    gxx: [ramp(6), ramp(16)],
    gfx: [],
    averages: 3,
  };

  it('gives back every stored spectrum and the frequency lines k·fs/N', () => {
    const back = decodeFrf(encodeFrf(frf), 2, 1000, 8, 3);
    expect(Array.from(back.f)).toEqual([0, 125, 250, 375, 500]);
    expect(Array.from(back.gff)).toEqual(Array.from(frf.gff));
    expect(Array.from(back.h1[1]!.im)).toEqual(Array.from(frf.h1[1]!.im));
    expect(Array.from(back.h2[0]!.re)).toEqual(Array.from(frf.h2[0]!.re));
    expect(Array.from(back.coherence[1]!)).toEqual(Array.from(frf.coherence[1]!));
    expect(Array.from(back.gxx[0]!)).toEqual(Array.from(frf.gxx[0]!));
    expect(back.averages).toBe(3);
  });

  it('refuses a stored FRF whose size does not match its channels and lines', () => {
    // (1 + 6·2 channels) × 5 lines × 8 bytes = 520 bytes expected; one channel fewer is 280
    expect(() => decodeFrf(encodeFrf(frf), 1, 1000, 8, 3)).toThrow('a stored FRF holds 520 bytes, expected 280 for 1 channels × 5 lines');
  });
});
