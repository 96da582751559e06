// Mutations of valid input files for the fuzz run (tests/fuzz/harness.ts): byte flips, truncation,
// inserted and repeated bytes, lying sizes in WAV headers, header field edits, huge / NaN / negative
// sample values, CSV cells that are not decimal numbers, JSON with duplicated or wrongly typed
// fields, and backup zips with edited, missing or extra members. Every choice comes from one seeded
// generator (packages/sim), so a seed names a run exactly.
import { strToU8, unzipSync, zipSync, type Zippable } from 'fflate';
import type { Rng } from '@resonote/sim';

export interface Pick {
  rng: Rng;
  int(lo: number, hi: number): number;
  one<T>(items: readonly T[]): T;
  chance(p: number): boolean;
}

export function picker(rng: Rng): Pick {
  const int = (lo: number, hi: number) => lo + Math.floor(rng.uniform() * (hi - lo + 1));
  return { rng, int, one: (items) => items[int(0, items.length - 1)]!, chance: (p) => rng.uniform() < p };
}

/** Numbers no recording or coordinate should hold, and ordinary ones. */
const EDGE_NUMBERS = [3e38, -3e38, 1e300, -1e300, 1e308, Number.MAX_VALUE, 5e-324, -0, 0, 1, -1, 2 ** 31, -(2 ** 31), 2 ** 53, 1e9, -1e9, 1e7];
const EDGE_U32 = [0, 1, 2, 15, 16, 17, 39, 40, 41, 0x7fff_ffff, 0x8000_0000, 0xffff_ffff, 0xffff, 0x1_0000];
const BAD_CELLS = ['1e300', '-1e300', '1e999', '-1e999', 'NaN', 'nan', 'Infinity', '-Infinity', 'inf', '0x10', '0b11', '0o7', '1_000', '', ' ', '1,5', '1.2.3', '--1', '+', '.', 'e5', '1e', '"', '""', "'", '\u0000', '\uFFFD', '１２', '1e-400', '00012', '  7  ', 'null', 'true', '\t', '\\n', '=1+1', '%', '1 2', '12345678901234567890123456789012345678901234567890'];

/** Generic byte-level mutations: flips, truncation, insertions, repeats, 32-bit edits near the start, appended garbage. */
export function mutateBytes(p: Pick, input: Uint8Array): { bytes: Uint8Array; how: string } {
  const b = Uint8Array.from(input);
  const kind = p.int(0, 6);
  if (kind === 0) {
    const flips = p.int(1, 16);
    for (let i = 0; i < flips && b.length; i++) b[p.int(0, b.length - 1)] ^= 1 << p.int(0, 7);
    return { bytes: b, how: `flip ${flips} bits` };
  }
  if (kind === 1) {
    const at = p.int(0, b.length);
    return { bytes: b.subarray(0, at), how: `truncate at ${at}` };
  }
  if (kind === 2) {
    const at = p.int(0, b.length);
    const extra = Uint8Array.from({ length: p.int(1, 64) }, () => p.int(0, 255));
    return { bytes: concat(b.subarray(0, at), extra, b.subarray(at)), how: `insert ${extra.length} bytes at ${at}` };
  }
  if (kind === 3) {
    const from = p.int(0, Math.max(0, b.length - 1));
    const slice = b.subarray(from, Math.min(b.length, from + p.int(1, 512)));
    return { bytes: concat(b.subarray(0, from), slice, b.subarray(from)), how: `repeat ${slice.length} bytes at ${from}` };
  }
  if (kind === 4 && b.length >= 8) {
    const at = p.int(0, Math.min(b.length - 4, 80));
    const v = p.one(EDGE_U32);
    new DataView(b.buffer, b.byteOffset, b.byteLength).setUint32(at, v >>> 0, true);
    return { bytes: b, how: `u32 ${v} at ${at}` };
  }
  if (kind === 5) {
    const extra = Uint8Array.from({ length: p.int(1, 2048) }, () => p.int(0, 255));
    return { bytes: concat(b, extra), how: `append ${extra.length} bytes` };
  }
  const at = p.int(0, Math.max(0, b.length - 1));
  const len = Math.min(b.length - at, p.int(1, 256));
  b.fill(p.one([0, 0xff, 0x20, 0x2c, 0x0a]), at, at + len);
  return { bytes: b, how: `fill ${len} bytes at ${at}` };
}

function concat(...parts: Uint8Array[]): Uint8Array {
  const out = new Uint8Array(parts.reduce((n, x) => n + x.length, 0));
  let o = 0;
  for (const x of parts) {
    out.set(x, o);
    o += x.length;
  }
  return out;
}

/** WAV-aware mutations of a canonical file (RIFF, fmt at 12, data after it): lying sizes, header fields, sample values, extra chunks. */
export function mutateWav(p: Pick, input: Uint8Array): { bytes: Uint8Array; how: string } {
  const b = Uint8Array.from(input);
  const v = new DataView(b.buffer);
  const fmtSize = v.getUint32(16, true);
  const dataHeader = 20 + fmtSize;
  const format = v.getUint16(20, true);
  const bits = v.getUint16(34, true);
  const kind = p.int(0, 6);
  if (kind === 0) {
    const field = p.one([4, 16, dataHeader + 4]);
    const value = p.one([...EDGE_U32, b.length, b.length - 8, b.length + 1, v.getUint32(field, true) + p.int(-8, 8)]);
    v.setUint32(field, value >>> 0, true);
    const cut = p.chance(0.3) ? p.int(12, b.length) : b.length;
    return { bytes: b.subarray(0, cut), how: `size field at ${field} = ${value}${cut < b.length ? `, cut at ${cut}` : ''}` };
  }
  if (kind === 1) {
    const [at, name, values] = p.one([
      [20, 'format', [0, 1, 2, 3, 0xfffe, 0xffff, 6, 7]],
      [22, 'channels', [0, 1, 2, 3, 255, 0xffff]],
      [34, 'bits', [0, 1, 8, 12, 16, 24, 32, 48, 64, 0xffff]],
      [32, 'block align', [0, 1, 3, 4, 6, 8, 16, 0xffff]],
    ] as const);
    const value = p.one(values);
    v.setUint16(at, value, true);
    return { bytes: b, how: `${name} = ${value}` };
  }
  if (kind === 2) {
    const rate = p.one([0, 1, 4095, 4096, 4097, 48000, 0xffff_ffff]);
    v.setUint32(24, rate, true);
    return { bytes: b, how: `rate = ${rate}` };
  }
  if (kind === 3 && format !== 1) {
    const start = dataHeader + 8;
    const bytes = bits / 8;
    const count = p.int(1, 8);
    const picks: string[] = [];
    for (let i = 0; i < count; i++) {
      const at = start + bytes * p.int(0, Math.floor((b.length - start) / bytes) - 1);
      const value = p.one([...EDGE_NUMBERS, NaN, Infinity, -Infinity]);
      if (bytes === 4) v.setFloat32(at, value, true);
      else v.setFloat64(at, value, true);
      picks.push(String(value));
    }
    return { bytes: b, how: `samples ${picks.join(' ')}` };
  }
  if (kind === 4) {
    // A junk chunk before the data, sometimes lying about its size.
    const size = p.chance(0.5) ? p.int(0, 64) : p.one(EDGE_U32);
    const body = new Uint8Array(Math.min(size, 64) + (Math.min(size, 64) % 2));
    const head = new Uint8Array(8);
    head.set(strToU8(p.one(['LIST', 'JUNK', 'fact', 'fmt ', 'data', '\u0000\u0000\u0000\u0000'])), 0);
    new DataView(head.buffer).setUint32(4, size >>> 0, true);
    return { bytes: concat(b.subarray(0, dataHeader), head, body, b.subarray(dataHeader)), how: `chunk of ${size} bytes before data` };
  }
  if (kind === 5) {
    const cut = p.int(12, Math.min(b.length, dataHeader + 16));
    return { bytes: b.subarray(0, cut), how: `header cut at ${cut}` };
  }
  return mutateBytes(p, b);
}

/** CSV-aware mutations: bad cells, header edits, ragged and repeated lines, other delimiters. */
export function mutateCsv(p: Pick, text: string): { text: string; how: string } {
  const lines = text.split('\n');
  const kind = p.int(0, 6);
  if (kind <= 1) {
    const count = p.int(1, 3);
    const picks: string[] = [];
    for (let i = 0; i < count; i++) {
      const li = p.int(kind === 0 ? 1 : 0, lines.length - 1);
      const cells = lines[li]!.split(',');
      const ci = p.int(0, cells.length - 1);
      cells[ci] = p.chance(0.7) ? p.one(BAD_CELLS) : String(p.one(EDGE_NUMBERS));
      lines[li] = cells.join(',');
      picks.push(`${li + 1}:${ci + 1}=${JSON.stringify(cells[ci])}`);
    }
    return { text: lines.join('\n'), how: `cells ${picks.join(' ')}` };
  }
  if (kind === 2) {
    const header = lines[0]!.split(',');
    const op = p.int(0, 3);
    if (op === 0) header.push(header[p.int(0, header.length - 1)]!);
    else if (op === 1) header.splice(p.int(0, header.length - 1), 1);
    else if (op === 2) header[p.int(0, header.length - 1)] = p.one(['', 'time', 'label', 'x', '\u0000bin', 'X'.repeat(500), '"q"']);
    else header.reverse();
    lines[0] = header.join(',');
    return { text: lines.join('\n'), how: `header ${lines[0]!.slice(0, 60)}` };
  }
  if (kind === 3) {
    const at = p.int(1, lines.length - 1);
    const op = p.int(0, 2);
    if (op === 0) lines.splice(at, 0, ...Array.from({ length: p.int(1, 5) }, () => lines[at]!));
    else if (op === 1) lines.splice(at, p.int(1, Math.max(1, lines.length - at)));
    else lines[at] = lines[at]! + ',' + p.one(BAD_CELLS);
    return { text: lines.join('\n'), how: `lines op ${op} at ${at}` };
  }
  if (kind === 4) {
    const delimiter = p.one([';', '\t', '|', ' ', ',,']);
    return { text: text.replaceAll(',', delimiter), how: `delimiter ${JSON.stringify(delimiter)}` };
  }
  if (kind === 5) {
    return { text: p.one(['', '\uFEFF', '\n\n\n', lines[0]!, `${lines[0]}\n${lines[1]}`, '"unclosed,quote\n1,2', text.replaceAll('\n', '\r')]), how: 'structure' };
  }
  const { bytes, how } = mutateBytes(p, strToU8(text));
  return { text: Buffer.from(bytes).toString('latin1'), how };
}

/** JSON recording mutations: wrong types, ragged and empty channels, huge values, duplicated fields, deep nesting. */
export function mutateJsonRecording(p: Pick, doc: { sampleRateHz: number; channels: number[][] }): { text: string; how: string } {
  const d = { sampleRateHz: doc.sampleRateHz as unknown, channels: doc.channels.map((c) => [...c]) as unknown[][] };
  const kind = p.int(0, 7);
  const weird = () => p.one<unknown>([null, 'x', '1', true, {}, [], [1], { v: 1 }, -1, 0, 1e300, -1e300, 3e38, 1e-320]);
  if (kind === 0) {
    d.sampleRateHz = weird();
    return { text: JSON.stringify(d), how: `sampleRateHz ${JSON.stringify(d.sampleRateHz)}` };
  }
  if (kind === 1) {
    const count = p.int(1, 5);
    for (let i = 0; i < count; i++) {
      const c = d.channels[p.int(0, d.channels.length - 1)]!;
      c[p.int(0, c.length - 1)] = p.chance(0.6) ? p.one(EDGE_NUMBERS) : weird();
    }
    return { text: JSON.stringify(d), how: `${count} values` };
  }
  if (kind === 2) {
    const op = p.int(0, 3);
    if (op === 0) d.channels.pop();
    else if (op === 1) d.channels[0]!.pop();
    else if (op === 2) d.channels.push([...(d.channels[0] ?? [])]);
    else d.channels = [];
    return { text: JSON.stringify(d), how: `channels op ${op}` };
  }
  if (kind === 3) {
    // Duplicated fields: JSON.parse keeps the last one.
    const other = JSON.stringify(p.chance(0.5) ? { channels: [[1e300, 2], [3]] } : { sampleRateHz: p.one([0, 48000, 'x']) }).slice(1, -1);
    const body = JSON.stringify(d);
    return { text: p.chance(0.5) ? `{${other},${body.slice(1)}` : `${body.slice(0, -1)},${other}}`, how: 'duplicated field' };
  }
  if (kind === 4) {
    const depth = p.int(10, 5000);
    return { text: `{"sampleRateHz":4096,"channels":${'['.repeat(depth)}1${']'.repeat(depth)}}`, how: `nesting ${depth}` };
  }
  if (kind === 5) {
    return { text: JSON.stringify(p.one<unknown>([[], 1, 'x', null, d.channels, { channels: 'x' }, { channels: {} }, { channels: [null, null] }])), how: 'not an object' };
  }
  if (kind === 6) {
    const text = JSON.stringify(d);
    return { text: text.replace(/\d+(\.\d+)?(e[+-]?\d+)?/, p.one(['1e999', '-1e999', 'NaN', 'Infinity', '0x10', '01', '1.', '.5'])), how: 'number token' };
  }
  const { bytes, how } = mutateBytes(p, strToU8(JSON.stringify(d)));
  return { text: Buffer.from(bytes).toString('utf8'), how };
}

/** Backup zip mutations: byte-level on the zip, or an edited / missing / extra member, re-zipped. */
export function mutateBackup(p: Pick, zip: Uint8Array): { bytes: Uint8Array; how: string } {
  if (p.chance(0.3)) return mutateBytes(p, zip);
  const files = unzipSync(zip) as Record<string, Uint8Array>;
  const names = Object.keys(files);
  const kind = p.int(0, 4);
  let how: string;
  if (kind === 0) {
    const name = p.one(names);
    delete files[name];
    how = `without ${name}`;
  } else if (kind === 1) {
    const name = p.one(names.filter((n) => n.endsWith('.f32')).concat(['samples/x.f32']));
    const base = files[name] ?? new Uint8Array(0);
    files[name] = mutateBytes(p, base).bytes;
    how = `samples ${name} mutated`;
  } else if (kind === 2) {
    files[p.one(['tables/extra.json', '../escape.json', 'manifest.json.bak', 'samples/../../x'])] = strToU8('{"a":1}');
    how = 'extra member';
  } else {
    const name = p.one(names.filter((n) => n.endsWith('.json')));
    const text = Buffer.from(files[name]!).toString('utf8');
    if (kind === 3) {
      files[name] = strToU8(mutateCsvLikeJson(p, text));
      how = `${name} text edit`;
    } else {
      let doc: unknown = JSON.parse(text);
      doc = mutateJsonValue(p, doc, 0);
      files[name] = strToU8(JSON.stringify(doc));
      how = `${name} value edit`;
    }
  }
  return { bytes: zipSync(files as Zippable, { level: 1 }), how };
}

function mutateCsvLikeJson(p: Pick, text: string): string {
  const op = p.int(0, 3);
  if (op === 0) return text.replace(/"(\w+)":/, (m) => `${m}${p.one(['null', '1e300', '"x"', '[]', '{}', '-1'])},${m}`); // a duplicated field
  if (op === 1) return text.replace(/-?\d+(\.\d+)?/, p.one(['1e999', '-1', '0', '1e300', '"NaN"', '9007199254740993']));
  if (op === 2) return text.slice(0, p.int(0, text.length));
  return text.replace(/"[0-9a-f-]{36}"/, p.one(['"x"', 'null', '"00000000-0000-0000-0000-000000000000"', '1']));
}

/** Replaces one value somewhere in a JSON document with a hostile one (huge, negative, wrong type, missing). */
function mutateJsonValue(p: Pick, doc: unknown, depth: number): unknown {
  const hostile = () => p.one<unknown>([null, -1, 0, 1e300, -1e300, 'x', '', [], {}, true, 'x'.repeat(10_000), 2 ** 53 + 1, '2026-13-45T99:99:99Z', '1e999']);
  if (Array.isArray(doc)) {
    if (doc.length === 0 || depth > 6) return p.chance(0.5) ? [hostile()] : hostile();
    const copy = [...doc];
    const op = p.int(0, 3);
    const i = p.int(0, copy.length - 1);
    if (op === 0) copy.push(copy[i]); // a duplicated row
    else if (op === 1) copy.splice(i, 1);
    else copy[i] = mutateJsonValue(p, copy[i], depth + 1);
    return copy;
  }
  if (doc && typeof doc === 'object') {
    const copy = { ...(doc as Record<string, unknown>) };
    const keys = Object.keys(copy);
    if (keys.length === 0 || depth > 6) return hostile();
    const k = p.one(keys);
    const op = p.int(0, 3);
    if (op === 0) delete copy[k];
    else if (op === 1) copy[k] = hostile();
    else if (op === 2) copy[`${k}_extra`] = hostile();
    else copy[k] = mutateJsonValue(p, copy[k], depth + 1);
    return copy;
  }
  return hostile();
}
