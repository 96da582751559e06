// Decodes an uploaded recording — CSV, WAV (16/24-bit PCM, 32-bit float, multichannel) or JSON —
// into one Float64Array per channel, in the units the uploader declared. Nothing here touches
// the database; a malformed file throws RecordingError with a readable message.
import Papa from 'papaparse';

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

/**
 * RIFF/WAVE reader. PCM samples are scaled to ±1 at full scale (so a file from a ±fullScale V
 * front end is multiplied by fullScale afterwards); 32-bit float samples are taken as they are.
 */
export function decodeWav(buf: Buffer): DecodedRecording {
  if (buf.length < 12 || buf.toString('ascii', 0, 4) !== 'RIFF' || buf.toString('ascii', 8, 12) !== 'WAVE') {
    throw new RecordingError('This is not a WAV file (no RIFF/WAVE header).');
  }
  let offset = 12;
  let fmt: { format: number; channels: number; rate: number; bits: number; blockAlign: number } | null = null;
  let data: { start: number; length: number } | null = null;
  while (offset + 8 <= buf.length) {
    const id = buf.toString('ascii', offset, offset + 4);
    const size = buf.readUInt32LE(offset + 4);
    const body = offset + 8;
    if (id === 'fmt ') {
      if (size < 16 || body + 16 > buf.length) throw new RecordingError('The WAV file is truncated inside its format chunk.');
      let format = buf.readUInt16LE(body);
      if (format === 0xfffe && size >= 40) format = buf.readUInt16LE(body + 24); // WAVE_FORMAT_EXTENSIBLE sub-format
      fmt = { format, channels: buf.readUInt16LE(body + 2), rate: buf.readUInt32LE(body + 4), blockAlign: buf.readUInt16LE(body + 12), bits: buf.readUInt16LE(body + 14) };
    } else if (id === 'data') {
      data = { start: body, length: Math.min(size, buf.length - body) };
      if (size > buf.length - body) throw new RecordingError(`The WAV file is truncated: its data chunk announces ${size} bytes but only ${buf.length - body} are there.`);
      break;
    }
    offset = body + size + (size % 2);
  }
  if (!fmt) throw new RecordingError('The WAV file has no format chunk.');
  if (!data) throw new RecordingError('The WAV file has no data chunk.');
  const { format, channels, rate, bits } = fmt;
  const supported = (format === 1 && (bits === 16 || bits === 24)) || (format === 3 && bits === 32);
  if (!supported) throw new RecordingError(`WAV format ${format} with ${bits} bits is not supported: use 16- or 24-bit PCM, or 32-bit float.`);
  if (channels < 1) throw new RecordingError('The WAV file declares no channels.');
  if (!(rate > 0)) throw new RecordingError('The WAV file declares a sample rate of 0 Hz.');
  const bytes = bits / 8;
  const frame = bytes * channels;
  const frames = Math.floor(data.length / frame);
  if (frames === 0) throw new RecordingError('The WAV file holds no samples.');
  const out = Array.from({ length: channels }, () => new Float64Array(frames));
  let p = data.start;
  for (let i = 0; i < frames; i++) {
    for (let c = 0; c < channels; c++) {
      let v: number;
      if (format === 3) v = buf.readFloatLE(p);
      else if (bits === 16) v = buf.readInt16LE(p) / 32768;
      else v = buf.readIntLE(p, 3) / 8388608;
      out[c]![i] = v;
      p += bytes;
    }
  }
  checkFinite(out);
  return { sampleRateHz: rate, channels: out, fractionOfFullScale: format === 1 };
}

const TIME_COLUMNS = new Set(['t', 'time', 'time_s', 'time (s)', 'seconds', 's']);

/** CSV with a header; an optional first time column (s), then one column per channel. */
export function decodeCsv(text: string): DecodedRecording {
  const body = text.replace(/^\uFEFF/, '');
  if (!body.trim()) throw new RecordingError('The CSV file is empty.');
  const parsed = Papa.parse<string[]>(body, { skipEmptyLines: 'greedy', delimiter: '' });
  const rows = parsed.data;
  const header = rows[0]!.map((h) => h.trim().toLowerCase());
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
      const raw = row[j]!.trim();
      const v = raw === '' ? NaN : Number(raw);
      if (!Number.isFinite(v)) throw new RecordingError(`Line ${i + 2}, column "${rows[0]![j]!.trim()}": "${raw}" is not a number.`);
      if (hasTime && j === 0) time![i] = v;
      else channels[j - (hasTime ? 1 : 0)]![i] = v;
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
  const lengths = new Set((o.channels as unknown[]).map((c) => (Array.isArray(c) ? c.length : -1)));
  if (lengths.has(-1)) throw new RecordingError('Every entry of "channels" must be an array of numbers.');
  if (lengths.size !== 1) throw new RecordingError('All channels must hold the same number of samples.');
  const channels = (o.channels as unknown[][]).map((c, ci) =>
    Float64Array.from(c, (v, i) => {
      if (typeof v !== 'number' || !Number.isFinite(v)) throw new RecordingError(`channel ${ci + 1}, sample ${i + 1} is not a finite number.`);
      return v;
    }),
  );
  if (channels.length === 0 || channels[0]!.length < 2) throw new RecordingError('The JSON holds no samples.');
  return { sampleRateHz: (o.sampleRateHz as number | undefined) ?? null, channels };
}

export function decodeRecording(name: string, mime: string, buf: Buffer): DecodedRecording {
  const lower = name.toLowerCase();
  if (lower.endsWith('.wav') || mime.includes('wav')) return decodeWav(buf);
  if (lower.endsWith('.json') || mime.includes('json')) return decodeJson(buf.toString('utf8'));
  if (lower.endsWith('.csv') || lower.endsWith('.txt') || mime.includes('csv') || mime.startsWith('text/')) return decodeCsv(buf.toString('utf8'));
  throw new RecordingError(`"${name}" is neither CSV, WAV nor JSON (judged by its name and type).`);
}

/** Writes channels as a WAV file (32-bit float or 16/24-bit PCM scaled by 1/fullScale) — used by tests and the demo. */
export function encodeWav(channels: ArrayLike<number>[], sampleRateHz: number, format: 'float32' | 'pcm16' | 'pcm24' = 'float32', fullScale = 1): Buffer {
  const n = channels[0]!.length;
  const bits = format === 'float32' ? 32 : format === 'pcm16' ? 16 : 24;
  const bytes = bits / 8;
  const dataLength = n * channels.length * bytes;
  const buf = Buffer.alloc(44 + dataLength);
  buf.write('RIFF', 0, 'ascii');
  buf.writeUInt32LE(36 + dataLength, 4);
  buf.write('WAVE', 8, 'ascii');
  buf.write('fmt ', 12, 'ascii');
  buf.writeUInt32LE(16, 16);
  buf.writeUInt16LE(format === 'float32' ? 3 : 1, 20);
  buf.writeUInt16LE(channels.length, 22);
  buf.writeUInt32LE(Math.round(sampleRateHz), 24);
  buf.writeUInt32LE(Math.round(sampleRateHz) * channels.length * bytes, 28);
  buf.writeUInt16LE(channels.length * bytes, 32);
  buf.writeUInt16LE(bits, 34);
  buf.write('data', 36, 'ascii');
  buf.writeUInt32LE(dataLength, 40);
  let p = 44;
  for (let i = 0; i < n; i++) {
    for (const ch of channels) {
      const v = ch[i]! / fullScale;
      if (format === 'float32') buf.writeFloatLE(ch[i]!, p);
      else if (format === 'pcm16') buf.writeInt16LE(Math.max(-32768, Math.min(32767, Math.round(v * 32768))), p);
      else buf.writeIntLE(Math.max(-8388608, Math.min(8388607, Math.round(v * 8388608))), p, 3);
      p += bytes;
    }
  }
  return buf;
}
