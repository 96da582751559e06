import { describe, expect, it } from 'vitest';
import { encodeWavBuffer } from './wav.ts';

// The layout is the RIFF WAVE format (Microsoft/IBM, "Multimedia Programming Interface and Data
// Specifications 1.0", 1991; format tag 3 = IEEE float from Microsoft's WAVEFORMATEX): a 44-byte
// header, then the samples little-endian, one frame of every channel after another.
describe('the live input’s float32 WAV', () => {
  it('writes the header of a 2-channel IEEE-float file and the samples interleaved, each times its channel’s scale', () => {
    const force = Float32Array.from([0.1, -0.25, 0.5]);
    const accel = Float32Array.from([-1, 0.75, 0.001]);
    const buf = encodeWavBuffer([force, accel], 48_000, [0.5, 5]);
    const v = new DataView(buf);
    const text = (at: number, n: number) => String.fromCharCode(...new Uint8Array(buf, at, n));
    expect(buf.byteLength).toBe(44 + 3 * 2 * 4);
    expect([text(0, 4), text(8, 4), text(12, 4), text(36, 4)]).toEqual(['RIFF', 'WAVE', 'fmt ', 'data']);
    expect(v.getUint32(4, true)).toBe(36 + 24);
    expect(v.getUint16(20, true)).toBe(3);
    expect(v.getUint16(22, true)).toBe(2);
    expect(v.getUint32(24, true)).toBe(48_000);
    expect(v.getUint32(28, true)).toBe(48_000 * 2 * 4); // byte rate = fs · channels · 4
    expect(v.getUint16(32, true)).toBe(8); // block align = channels · 4
    expect(v.getUint16(34, true)).toBe(32);
    expect(v.getUint32(40, true)).toBe(24);
    const read = Array.from({ length: 6 }, (_, i) => v.getFloat32(44 + 4 * i, true));
    // float32 of x·k, frame by frame (force, then response).
    const want = [0, 1, 2].flatMap((i) => [Math.fround(force[i]! * 0.5), Math.fround(accel[i]! * 5)]);
    expect(read).toEqual(want);
  });

  it('refuses channels of unequal length, a scale list of the wrong length and a rate that is not a whole number', () => {
    expect(() => encodeWavBuffer([new Float32Array(3), new Float32Array(2)], 48_000)).toThrow(RangeError);
    expect(() => encodeWavBuffer([new Float32Array(3)], 48_000, [1, 2])).toThrow(RangeError);
    expect(() => encodeWavBuffer([new Float32Array(3)], 44_100.5)).toThrow(RangeError);
  });
});
