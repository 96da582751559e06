// Decodes an uploaded recording — CSV, WAV (16/24/32-bit PCM, 32/64-bit float, extensible, multichannel) or JSON —
// into one Float64Array per channel, in the units the uploader declared. Nothing here touches
// the database; a malformed file throws RecordingError with a readable message.
import Papa from 'papaparse';
import { looksBinary, parseDecimal, quoteForMessage } from '../http/text-input.ts';

export class RecordingError extends Error {}

export interface DecodedRecording {
  /** Sample rate found in the file (WAV header, CSV time column, JSON field), Hz; null if the file has none. */
  sampleRateHz: number | null;
  channels: Float64Array[];
  /** True for integer PCM WAV: samples are fractions of full scale (multiply by the front end's full-scale value). */
  fractionOfFullScale?: boolean;
}

function checkFinite(channels: Float64Array[]) {
  for (let c = 0; c < channels.length; c++) {
    const ch = channels[c]!;
    for (let i = 0; i < ch.length; i++) {
      if (!Number.isFinite(ch[i])) throw new RecordingError(`channel ${c + 1}, sample ${i + 1} is not a finite number (${ch[i]}).`);
    }
  }
}

/** The WAV sample formats read here: integer PCM (format 1) of 16, 24 or 32 bits, IEEE float (format 3) of 32 or 64 bits. */
const WAV_FORMATS = 'use 16-, 24- or 32-bit PCM, or 32- or 64-bit float';

/**
 * RIFF/WAVE reader (also WAVE_FORMAT_EXTENSIBLE, whose sub-format names PCM or float). PCM
 * samples are scaled to ±1 at full scale (so a file from a ±fullScale V front end is multiplied by
 * fullScale afterwards); float samples are taken as they are. A chunk that announces more bytes
 * than the file holds is refused with both numbers.
 */
export function decodeWav(buf: Buffer): DecodedRecording {
  if (buf.length < 12 || buf.toString('ascii', 0, 4) !== 'RIFF' || buf.toString('ascii', 8, 12) !== 'WAVE') {
    throw new RecordingError('This is not a WAV file (no RIFF/WAVE header).');
  }
  let offset = 12;
  let fmt: { format: number; channels: number; rate: number; bits: number; blockAlign: number } | null = null;
  let data: { start: number; length: number } | null = null;
  while (offset + 8 <= buf.length) {
    const id = buf.toString('latin1', offset, offset + 4);
    const size = buf.readUInt32LE(offset + 4);
    const body = offset + 8;
    const remain = buf.length - body;
    if (id === 'fmt ') {
      if (size < 16) throw new RecordingError(`The WAV file's fmt chunk announces ${size} bytes; a format chunk has at least 16.`);
      if (size > remain) throw new RecordingError(`The WAV file's fmt chunk is truncated: it announces ${size} bytes but only ${remain} remain in the file.`);
      let format = buf.readUInt16LE(body);
      if (format === 0xfffe) {
        // WAVE_FORMAT_EXTENSIBLE: cbSize 22, then valid bits, channel mask and the sub-format GUID, whose first two bytes are the format code.
        if (size < 40) throw new RecordingError(`The WAV file's fmt chunk says WAVE_FORMAT_EXTENSIBLE but has ${size} bytes; that format needs 40.`);
        format = buf.readUInt16LE(body + 24);
      }
      fmt = { format, channels: buf.readUInt16LE(body + 2), rate: buf.readUInt32LE(body + 4), blockAlign: buf.readUInt16LE(body + 12), bits: buf.readUInt16LE(body + 14) };
    } else if (id === 'data') {
      if (size > remain) throw new RecordingError(`The WAV file is truncated: its data chunk announces ${size} bytes but only ${remain} are there.`);
      data = { start: body, length: size };
      break;
    } else if (size > remain) {
      throw new RecordingError(`The WAV file's ${quoteForMessage(id)} chunk announces ${size} bytes but only ${remain} remain in the file${fmt ? '' : ' (before any fmt chunk)'}; no data chunk follows it.`);
    }
    offset = body + size + (size % 2);
  }
  if (!fmt) throw new RecordingError('The WAV file has no format chunk before its samples.');
  if (!data) {
    if (offset < buf.length) throw new RecordingError(`The WAV file ends inside a chunk header (${buf.length - offset} bytes left at byte ${offset}); it has no data chunk.`);
    throw new RecordingError('The WAV file has no data chunk.');
  }
  const { format, channels, rate, bits, blockAlign } = fmt;
  const supported = (format === 1 && (bits === 16 || bits === 24 || bits === 32)) || (format === 3 && (bits === 32 || bits === 64));
  if (!supported) throw new RecordingError(`WAV format ${format} with ${bits} bits is not supported: ${WAV_FORMATS}.`);
  if (channels < 1) throw new RecordingError('The WAV file declares no channels.');
  if (!(rate > 0)) throw new RecordingError('The WAV file declares a sample rate of 0 Hz.');
  const bytes = bits / 8;
  const frame = bytes * channels;
  if (blockAlign !== frame) throw new RecordingError(`The WAV header contradicts itself: block align ${blockAlign} bytes, but ${channels} channel${channels === 1 ? '' : 's'} × ${bytes} bytes make ${frame}.`);
  const frames = Math.floor(data.length / frame);
  if (frames === 0) throw new RecordingError('The WAV file holds no samples.');
  const out = Array.from({ length: channels }, () => new Float64Array(frames));
  // One loop per sample format, reading through a DataView (little-endian), channel by channel,
  // written out per format so no sample passes through a function call (which would box it).
  const view = new DataView(buf.buffer, buf.byteOffset + data.start, frames * frame);
  for (let c = 0; c < channels; c++) {
    const ch = out[c]!;
    let at = c * bytes;
    if (format === 3 && bits === 32) for (let i = 0; i < frames; i++, at += frame) ch[i] = view.getFloat32(at, true);
    else if (format === 3) for (let i = 0; i < frames; i++, at += frame) ch[i] = view.getFloat64(at, true);
    else if (bits === 16) for (let i = 0; i < frames; i++, at += frame) ch[i] = view.getInt16(at, true) / 32768;
    else if (bits === 24) for (let i = 0; i < frames; i++, at += frame) ch[i] = (view.getUint8(at) | (view.getUint8(at + 1) << 8) | (view.getInt8(at + 2) << 16)) / 8388608;
    else for (let i = 0; i < frames; i++, at += frame) ch[i] = view.getInt32(at, true) / 2147483648;
  }
  checkFinite(out);
  return { sampleRateHz: rate, channels: out, fractionOfFullScale: format === 1 };
}

const TIME_COLUMNS = new Set(['t', 'time', 'time_s', 'time (s)', 'seconds', 's']);

/** CSV with a header; an optional first time column (s), then one column per channel. Every value a plain decimal number. */
export function decodeCsv(text: string): DecodedRecording {
  const body = text.replace(/^\uFEFF/, '');
  if (!body.trim()) throw new RecordingError('The CSV file is empty.');
  if (looksBinary(body)) throw new RecordingError('This is not a text CSV: the file holds binary bytes (a WAV or zip file named .csv?). Export the recording as CSV text, or upload the WAV as .wav.');
  const parsed = Papa.parse<string[]>(body, { skipEmptyLines: 'greedy', delimiter: '' });
  const rows = parsed.data;
  const names = rows[0]!.map((h) => h.trim());
  const header = names.map((h) => h.toLowerCase());
  const hasTime = TIME_COLUMNS.has(header[0] ?? '');
  const width = header.length;
  const channelCount = width - (hasTime ? 1 : 0);
  if (channelCount < 1) throw new RecordingError('The CSV has no channel columns.');
  const n = rows.length - 1;
  if (n < 2) throw new RecordingError('The CSV holds fewer than two samples.');
  const channels = Array.from({ length: channelCount }, () => new Float64Array(n));
  const time = hasTime ? new Float64Array(n) : null;
  for (let i = 0; i < n; i++) {
    const row = rows[i + 1]!;
    if (row.length !== width) throw new RecordingError(`Line ${i + 2} has ${row.length} values; the header has ${width}.`);
    for (let j = 0; j < width; j++) {
      const cell = parseDecimal(row[j]!);
      if (!cell.ok) throw new RecordingError(`Line ${i + 2}, column ${j + 1} (${quoteForMessage(names[j]!)}): the value ${cell.reason}.`);
      if (hasTime && j === 0) time![i] = cell.value;
      else channels[j - (hasTime ? 1 : 0)]![i] = cell.value;
    }
  }
  let sampleRateHz: number | null = null;
  if (time) {
    const dt = (time[n - 1]! - time[0]!) / (n - 1);
    if (!(dt > 0)) throw new RecordingError('The time column does not increase.');
    for (let i = 1; i < n; i++) {
      if (Math.abs(time[i]! - time[i - 1]! - dt) > 0.01 * dt + 1e-12) throw new RecordingError(`The time column is not evenly spaced at line ${i + 2}.`);
    }
    sampleRateHz = 1 / dt;
  }
  return { sampleRateHz, channels };
}

/** What a JSON value is, for a message, without serialising it (it may be nested thousands deep). */
function describeJsonValue(v: unknown): string {
  if (typeof v === 'string') return `the text ${quoteForMessage(v)}`;
  if (Array.isArray(v)) return 'an array';
  if (v === null) return 'null';
  if (typeof v === 'object') return 'an object';
  return String(v);
}

/** JSON: { "sampleRateHz": 4096, "channels": [[…force…], [… response …], …] }. */
export function decodeJson(text: string): DecodedRecording {
  let doc: unknown;
  try {
    doc = JSON.parse(text);
  } catch {
    throw new RecordingError('The JSON file is not valid JSON.');
  }
  const o = doc as { sampleRateHz?: unknown; channels?: unknown };
  if (!o || typeof o !== 'object' || !Array.isArray(o.channels)) throw new RecordingError('The JSON needs "channels": an array with one array of samples per channel.');
  if (o.sampleRateHz !== undefined && !(typeof o.sampleRateHz === 'number' && o.sampleRateHz > 0)) throw new RecordingError('"sampleRateHz" must be a positive number.');
  if (o.channels.length === 0) throw new RecordingError('The JSON has no channels: "channels" is an empty array.');
  const lengths = new Set((o.channels as unknown[]).map((c) => (Array.isArray(c) ? c.length : -1)));
  if (lengths.has(-1)) throw new RecordingError('Every entry of "channels" must be an array of numbers.');
  if (lengths.size !== 1) throw new RecordingError('All channels must hold the same number of samples.');
  const channels = (o.channels as unknown[][]).map((c, ci) =>
    Float64Array.from(c, (v, i) => {
      if (typeof v !== 'number' || !Number.isFinite(v)) throw new RecordingError(`channel ${ci + 1}, sample ${i + 1} is not a finite number (${describeJsonValue(v)}).`);
      return v;
    }),
  );
  if (channels[0]!.length < 2) throw new RecordingError('The JSON holds fewer than two samples per channel.');
  return { sampleRateHz: (o.sampleRateHz as number | undefined) ?? null, channels };
}

export function decodeRecording(name: string, mime: string, buf: Buffer): DecodedRecording {
  const lower = name.toLowerCase();
  if (lower.endsWith('.wav') || mime.includes('wav')) return decodeWav(buf);
  if (lower.endsWith('.json') || mime.includes('json')) return decodeJson(buf.toString('utf8'));
  if (lower.endsWith('.csv') || lower.endsWith('.txt') || mime.includes('csv') || mime.startsWith('text/')) return decodeCsv(buf.toString('utf8'));
  throw new RecordingError(`"${name}" is neither CSV, WAV nor JSON (judged by its name and type).`);
}

export type WavSampleFormat = 'float32' | 'float64' | 'pcm16' | 'pcm24' | 'pcm32';

/**
 * Writes channels as a WAV file (32/64-bit float, or 16/24/32-bit PCM scaled by 1/fullScale) — used
 * by tests, the fuzz script and the demo. `extensible` writes a WAVE_FORMAT_EXTENSIBLE fmt chunk
 * (40 bytes, the sub-format GUID naming PCM or float).
 */
export function encodeWav(channels: ArrayLike<number>[], sampleRateHz: number, format: WavSampleFormat = 'float32', fullScale = 1, options: { extensible?: boolean } = {}): Buffer {
  const n = channels[0]!.length;
  const bits = { float32: 32, float64: 64, pcm16: 16, pcm24: 24, pcm32: 32 }[format];
  const isFloat = format === 'float32' || format === 'float64';
  const bytes = bits / 8;
  const fmtSize = options.extensible ? 40 : 16;
  const dataLength = n * channels.length * bytes;
  const header = 12 + 8 + fmtSize + 8;
  const buf = Buffer.alloc(header + dataLength);
  buf.write('RIFF', 0, 'ascii');
  buf.writeUInt32LE(header - 8 + dataLength, 4);
  buf.write('WAVE', 8, 'ascii');
  buf.write('fmt ', 12, 'ascii');
  buf.writeUInt32LE(fmtSize, 16);
  buf.writeUInt16LE(options.extensible ? 0xfffe : isFloat ? 3 : 1, 20);
  buf.writeUInt16LE(channels.length, 22);
  buf.writeUInt32LE(Math.round(sampleRateHz), 24);
  buf.writeUInt32LE(Math.round(sampleRateHz) * channels.length * bytes, 28);
  buf.writeUInt16LE(channels.length * bytes, 32);
  buf.writeUInt16LE(bits, 34);
  if (options.extensible) {
    buf.writeUInt16LE(22, 36); // cbSize
    buf.writeUInt16LE(bits, 38); // valid bits per sample
    buf.writeUInt32LE(0, 40); // channel mask: none assigned
    // KSDATAFORMAT_SUBTYPE_PCM / _IEEE_FLOAT: {0000000X-0000-0010-8000-00AA00389B71}
    Buffer.from([isFloat ? 3 : 1, 0, 0, 0, 0, 0, 0x10, 0, 0x80, 0, 0, 0xaa, 0, 0x38, 0x9b, 0x71]).copy(buf, 44);
  }
  buf.write('data', header - 8, 'ascii');
  buf.writeUInt32LE(dataLength, header - 4);
  let p = header;
  const full = 2 ** (bits - 1);
  for (let i = 0; i < n; i++) {
    for (const ch of channels) {
      const v = ch[i]! / fullScale;
      if (format === 'float32') buf.writeFloatLE(ch[i]!, p);
      else if (format === 'float64') buf.writeDoubleLE(ch[i]!, p);
      else {
        const q = Math.max(-full, Math.min(full - 1, Math.round(v * full)));
        if (bits === 16) buf.writeInt16LE(q, p);
        else if (bits === 24) buf.writeIntLE(q, p, 3);
        else buf.writeInt32LE(q, p);
      }
      p += bytes;
    }
  }
  return buf;
}
