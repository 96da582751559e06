// A float32 WAV (IEEE float, format 3) of volts, channels interleaved in channel-number order:
// what the live input uploads for each captured hit (the API decodes it in hits/recording.ts).
export function encodeFloat32Wav(channels: Float32Array[], sampleRateHz: number): Blob {
  const n = channels.length;
  const frames = channels[0]?.length ?? 0;
  if (n === 0 || channels.some((c) => c.length !== frames)) throw new RangeError('every channel must have the same number of samples');
  if (!(sampleRateHz > 0) || !Number.isInteger(sampleRateHz)) throw new RangeError(`sampleRateHz=${sampleRateHz} must be a whole number > 0`);
  const dataBytes = frames * n * 4;
  const buf = new ArrayBuffer(44 + dataBytes);
  const v = new DataView(buf);
  const text = (at: number, s: string) => {
    for (let i = 0; i < s.length; i++) v.setUint8(at + i, s.charCodeAt(i));
  };
  text(0, 'RIFF');
  v.setUint32(4, 36 + dataBytes, true);
  text(8, 'WAVE');
  text(12, 'fmt ');
  v.setUint32(16, 16, true);
  v.setUint16(20, 3, true);
  v.setUint16(22, n, true);
  v.setUint32(24, sampleRateHz, true);
  v.setUint32(28, sampleRateHz * n * 4, true);
  v.setUint16(32, n * 4, true);
  v.setUint16(34, 32, true);
  text(36, 'data');
  v.setUint32(40, dataBytes, true);
  let at = 44;
  for (let i = 0; i < frames; i++) {
    for (let c = 0; c < n; c++) {
      v.setFloat32(at, channels[c]![i]!, true);
      at += 4;
    }
  }
  return new Blob([buf], { type: 'audio/wav' });
}
