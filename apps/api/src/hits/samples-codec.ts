// The byte layouts of what the hit path stores: a hit's samples (`hit.samples`: float32
// little-endian, channel after channel in storage order) and an averaged FRF (`frf_result.data`:
// float64, Gff then per response channel H1 re/im, H2 re/im, coherence, Gxx).
import os from 'node:os';
import type { AveragedFrf } from '@resonote/dsp';

const littleEndian = os.endianness() === 'LE';

/**
 * The stored bytes of a hit's channels. Channels that are consecutive views of one float32 block
 * (what dsp `splitRecords` cuts) are that block's bytes as they are, without a copy, on a
 * little-endian machine; others are copied once.
 */
export function packSamples(channels: Float32Array[]): Buffer {
  const n = channels[0]!.length;
  channels.forEach((ch, c) => {
    if (ch.length !== n) throw new RangeError(`channel ${c} holds ${ch.length} samples, channel 0 holds ${n}`);
  });
  const first = channels[0]!;
  if (littleEndian && channels.every((ch, c) => ch.buffer === first.buffer && ch.byteOffset === first.byteOffset + c * n * 4)) {
    return Buffer.from(first.buffer, first.byteOffset, channels.length * n * 4);
  }
  const out = Buffer.alloc(channels.length * n * 4);
  if (littleEndian) {
    const all = new Float32Array(out.buffer, out.byteOffset, channels.length * n);
    channels.forEach((ch, c) => all.set(ch, c * n));
  } else {
    channels.forEach((ch, c) => {
      for (let i = 0; i < n; i++) out.writeFloatLE(ch[i]!, (c * n + i) * 4);
    });
  }
  return out;
}

/** The channels of stored samples: views of `buf` when it is 4-byte aligned on a little-endian machine, else of a copy. */
export function unpackSamples(buf: Buffer, channelCount: number, n: number): Float32Array[] {
  if (buf.length !== channelCount * n * 4) throw new Error(`stored samples hold ${buf.length / 4} values, expected ${channelCount} × ${n}`);
  let all: Float32Array;
  if (littleEndian && buf.byteOffset % 4 === 0) all = new Float32Array(buf.buffer, buf.byteOffset, channelCount * n);
  else {
    const copy = new Uint8Array(buf.length);
    copy.set(buf);
    all = new Float32Array(copy.buffer);
    if (!littleEndian) {
      const view = new DataView(copy.buffer);
      for (let i = 0; i < all.length; i++) all[i] = view.getFloat32(i * 4, true);
    }
  }
  return Array.from({ length: channelCount }, (_, c) => all.subarray(c * n, (c + 1) * n));
}

const ARRAYS_PER_CHANNEL = 6; // h1 re/im, h2 re/im, coherence, gxx

export function encodeFrf(frf: AveragedFrf): Buffer {
  const lines = frf.f.length;
  const channels = frf.h1.length;
  const all = new Float64Array(lines * (1 + ARRAYS_PER_CHANNEL * channels));
  all.set(frf.gff, 0);
  for (let c = 0; c < channels; c++) {
    const base = lines * (1 + ARRAYS_PER_CHANNEL * c);
    all.set(frf.h1[c]!.re, base);
    all.set(frf.h1[c]!.im, base + lines);
    all.set(frf.h2[c]!.re, base + 2 * lines);
    all.set(frf.h2[c]!.im, base + 3 * lines);
    all.set(frf.coherence[c]!, base + 4 * lines);
    all.set(frf.gxx[c]!, base + 5 * lines);
  }
  return Buffer.from(all.buffer);
}

/** The spectra of `encodeFrf` back, with the frequency lines k·fs/samples (the cross spectra are not stored). */
export function decodeFrf(buf: Buffer, channels: number, fs: number, samples: number, averages: number): AveragedFrf {
  const lines = Math.floor(samples / 2) + 1;
  const expected = lines * (1 + ARRAYS_PER_CHANNEL * channels) * 8;
  if (buf.length !== expected) throw new Error(`a stored FRF holds ${buf.length} bytes, expected ${expected} for ${channels} channels × ${lines} lines`);
  const copy = new Uint8Array(buf.length);
  copy.set(buf);
  const all = new Float64Array(copy.buffer);
  const f = new Float64Array(lines);
  for (let k = 0; k < lines; k++) f[k] = (k * fs) / samples;
  const part = (c: number, j: number) => all.slice(lines * (1 + ARRAYS_PER_CHANNEL * c) + j * lines, lines * (1 + ARRAYS_PER_CHANNEL * c) + (j + 1) * lines);
  const idx = Array.from({ length: channels }, (_, c) => c);
  return {
    f,
    gff: all.slice(0, lines),
    h1: idx.map((c) => ({ re: part(c, 0), im: part(c, 1) })),
    h2: idx.map((c) => ({ re: part(c, 2), im: part(c, 3) })),
    coherence: idx.map((c) => part(c, 4)),
    gxx: idx.map((c) => part(c, 5)),
    gfx: [],
    averages,
  };
}
