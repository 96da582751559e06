// Finite-element modes brought in before a test: Resonote's own CSV and JSON formats
// (docs/fe-model-format.md), their parsers and one canonical in-memory form (mm, Hz, kg).
// Both parsers collect every problem (row and column for CSV, path for JSON), up to MAX_FE_PROBLEMS.
import Papa from 'papaparse';
import { z } from 'zod';
import { pointLabelSchema } from './common.ts';

export const FE_MODEL_FORMAT = 'resonote-fe-modes';
export const FE_MODEL_FORMAT_VERSION = 1;
/** Most nodes one model may carry. */
export const MAX_FE_NODES = 20_000;
/** Most modes one model may carry. */
export const MAX_FE_MODES = 200;
/** Most shape entries (nodes × modes) one model may carry. */
export const MAX_FE_SHAPE_ENTRIES = 500_000;
/** Largest file accepted, in characters. */
export const MAX_FE_CHARS = 40 * 1024 * 1024;
/** Problems reported at most; `truncated` tells when there were more. */
export const MAX_FE_PROBLEMS = 100;
/** Coordinates beyond ±100 m are refused (as the geometry's). */
const MAX_COORDINATE_MM = 100_000;

export const feLengthUnits = ['mm', 'm'] as const;
export const feMassUnits = ['kg', 't'] as const;
export const feNormalisations = ['mass', 'none'] as const;
export type FeLengthUnit = (typeof feLengthUnits)[number];
export type FeMassUnit = (typeof feMassUnits)[number];
/** 'mass': φᵀMφ = 1 in the file's mass unit (shapes in unit^-½); 'none': any scale, modal mass optional. */
export type FeNormalisation = (typeof feNormalisations)[number];
export const FE_AXES = ['X', 'Y', 'Z'] as const;

export interface FeNode {
  label: string;
  /** Coordinates in mm, in the model's global axes. */
  x: number;
  y: number;
  z: number;
}

export interface FeMode {
  /** The model's mode number, a positive integer, unique in the model. */
  number: number;
  frequencyHz: number;
  /** φᵀMφ in kg for the shape as given; null when not given (and always for normalisation 'mass', where it is 1). */
  modalMassKg: number | null;
  /** Translations per node in node order, [X, Y, Z] each: shape[3·k + a] for node k, axis a (kg^-½ for 'mass'). */
  shape: number[];
}

/** The canonical model: mm, Hz, kg, whatever units the file used. */
export interface FeModel {
  name: string | null;
  normalisation: FeNormalisation;
  /** The units the file stated (values here are converted to mm and kg). */
  fileUnits: { length: FeLengthUnit; frequency: 'Hz'; mass: FeMassUnit };
  nodes: FeNode[];
  modes: FeMode[];
}

export interface FeProblem {
  /** CSV: the file's line (1-based); JSON: null. */
  row: number | null;
  /** CSV: the column's name (see docs/fe-model-format.md); JSON: the field or axis; null for the row as a whole. */
  column: string | null;
  /** JSON: where in the document, such as `modes[2].shape[5][3]`; CSV: null. */
  path: string | null;
  message: string;
}

export type FeParseResult =
  | { ok: true; model: FeModel }
  /** `truncated`: more problems than the ones listed, or reading stopped at MAX_FE_PROBLEMS. */
  | { ok: false; message: string; problems: FeProblem[]; truncated: boolean };

/** Strict decimal: digits with an optional point and exponent. No hex, no Infinity/NaN, no thousands separators. */
const DECIMAL = /^[+-]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?$/;
const INTEGER = /^\d+$/;

class Problems {
  readonly list: FeProblem[] = [];
  count = 0;
  /** Reading stopped at MAX_FE_PROBLEMS: more problems may follow. */
  stopped = false;
  add(row: number | null, column: string | null, path: string | null, message: string): void {
    this.count++;
    if (this.list.length < MAX_FE_PROBLEMS) this.list.push({ row, column, path, message });
  }
  get full(): boolean {
    return this.count >= MAX_FE_PROBLEMS;
  }
  get truncated(): boolean {
    return this.stopped || this.count > this.list.length;
  }
  result(): FeParseResult {
    const first = this.list[0]!;
    const where = first.row !== null ? `line ${first.row}${first.column ? `, ${first.column}` : ''}` : first.path ?? 'the file';
    return {
      ok: false,
      message: `The model was not read: ${this.count}${this.truncated ? '+' : ''} problem${this.count > 1 ? 's' : ''}. First: ${where}: ${first.message}.`,
      problems: this.list,
      truncated: this.truncated,
    };
  }
}

function tooMuch(message: string): FeParseResult {
  return { ok: false, message, problems: [{ row: null, column: null, path: null, message }], truncated: false };
}

// ---------------------------------------------------------------------------------------------
// Shared semantic checks, fed by either reader with positions for its messages.

interface Where {
  row: number | null;
  path: string | null;
}

interface Draft {
  name: string | null;
  normalisation: FeNormalisation;
  units: FeModel['fileUnits'];
  nodes: { node: FeNode; at: Where }[];
  modes: { number: number; frequency: number; modalMass: number | null; at: Where }[];
  shapes: { mode: number; node: string; values: [number, number, number]; at: Where }[];
}

function assemble(d: Draft, p: Problems): FeParseResult {
  const lengthScale = d.units.length === 'm' ? 1000 : 1;
  const massScale = d.units.mass === 't' ? 1000 : 1;
  const nodeIndex = new Map<string, number>();
  const nodes: FeNode[] = [];
  for (const { node, at } of d.nodes) {
    const key = node.label.toLowerCase();
    const seen = nodeIndex.get(key);
    if (seen !== undefined) {
      const first = d.nodes[seen]!.at;
      p.add(at.row, 'label', at.path && `${at.path}.label`, `node "${node.label}" is listed twice (first ${first.row !== null ? `on line ${first.row}` : `at ${first.path}`})`);
      continue;
    }
    const c = [node.x, node.y, node.z].map((v) => v * lengthScale);
    let bad = false;
    c.forEach((v, a) => {
      if (Math.abs(v) > MAX_COORDINATE_MM) {
        p.add(at.row, 'xyz'[a]!, at.path && `${at.path}.${'xyz'[a]}`, `${'xyz'[a]} = ${v} mm is beyond ±${MAX_COORDINATE_MM} mm`);
        bad = true;
      }
    });
    nodeIndex.set(key, nodes.length);
    nodes.push({ label: node.label, x: bad ? 0 : c[0]!, y: bad ? 0 : c[1]!, z: bad ? 0 : c[2]! });
  }
  if (d.nodes.length === 0) p.add(null, null, null, 'the model has no nodes');
  if (d.modes.length === 0) p.add(null, null, null, 'the model has no modes');

  const modeIndex = new Map<number, number>();
  const modes: FeMode[] = [];
  const modeAt: Where[] = [];
  for (const m of d.modes) {
    const seen = modeIndex.get(m.number);
    if (seen !== undefined) {
      const first = modeAt[seen]!;
      p.add(m.at.row, 'mode', m.at.path && `${m.at.path}.number`, `mode ${m.number} is listed twice (first ${first.row !== null ? `on line ${first.row}` : `at ${first.path}`})`);
      continue;
    }
    if (m.frequency < 0) p.add(m.at.row, 'frequency', m.at.path && `${m.at.path}.frequency`, `frequency ${m.frequency} Hz is negative (write a rigid-body mode as 0)`);
    if (m.modalMass !== null && !(m.modalMass > 0)) {
      p.add(m.at.row, 'modal_mass', m.at.path && `${m.at.path}.modalMass`, `modal mass ${m.modalMass} must be > 0`);
    }
    if (d.normalisation === 'mass' && m.modalMass !== null && m.modalMass !== 1) {
      p.add(m.at.row, 'modal_mass', m.at.path && `${m.at.path}.modalMass`, `normalisation is "mass", so the modal mass is 1 ${d.units.mass}: leave it empty, or state normalisation "none"`);
    }
    modeIndex.set(m.number, modes.length);
    modeAt.push(m.at);
    modes.push({
      number: m.number,
      frequencyHz: m.frequency,
      modalMassKg: d.normalisation === 'mass' || m.modalMass === null ? null : m.modalMass * massScale,
      shape: new Array<number>(3 * nodes.length).fill(0),
    });
  }
  if (d.normalisation === 'none') {
    const given = d.modes.filter((m) => m.modalMass !== null).length;
    if (given > 0 && given < d.modes.length) {
      for (const m of d.modes) {
        if (m.modalMass === null) p.add(m.at.row, 'modal_mass', m.at.path && `${m.at.path}.modalMass`, `mode ${m.number} has no modal mass while ${given} other modes have one: give it for every mode or for none`);
      }
    }
  }

  // φ in (file mass unit)^-½ → kg^-½ for mass-normalised shapes
  const shapeScale = d.normalisation === 'mass' ? 1 / Math.sqrt(massScale) : 1;
  const filled = modes.map(() => new Uint8Array(nodes.length));
  const firstShape = modes.map(() => new Map<number, Where>());
  for (const s of d.shapes) {
    const mi = modeIndex.get(s.mode);
    const ni = nodeIndex.get(s.node.toLowerCase());
    if (mi === undefined) p.add(s.at.row, 'mode', s.at.path, `mode ${s.mode} is not declared (no mode row for it)`);
    if (ni === undefined) p.add(s.at.row, 'node', s.at.path, `node "${s.node}" is not declared (no node row for it)`);
    if (mi === undefined || ni === undefined) continue;
    if (filled[mi]![ni]) {
      const first = firstShape[mi]!.get(ni)!;
      p.add(s.at.row, 'node', s.at.path, `mode ${s.mode} at node "${s.node}" is given twice (first ${first.row !== null ? `on line ${first.row}` : `at ${first.path}`})`);
      continue;
    }
    filled[mi]![ni] = 1;
    firstShape[mi]!.set(ni, s.at);
    for (let a = 0; a < 3; a++) modes[mi]!.shape[3 * ni + a] = s.values[a]! * shapeScale;
  }
  modes.forEach((mode, mi) => {
    const missing: string[] = [];
    filled[mi]!.forEach((f, ni) => {
      if (!f) missing.push(nodes[ni]!.label);
    });
    const at = modeAt[mi]!;
    if (missing.length) {
      const list = missing.slice(0, 5).map((l) => `"${l}"`).join(', ') + (missing.length > 5 ? ', …' : '');
      p.add(at.row, 'shape', at.path && `${at.path}.shape`, `mode ${mode.number} has no shape entry for ${missing.length} node${missing.length > 1 ? 's' : ''}: ${list}`);
    } else if (mode.shape.every((v) => v === 0)) {
      p.add(at.row, 'shape', at.path && `${at.path}.shape`, `mode ${mode.number} has a zero shape at every node`);
    }
  });
  if (p.count) return p.result();
  return { ok: true, model: { name: d.name, normalisation: d.normalisation, fileUnits: d.units, nodes, modes } };
}

// ---------------------------------------------------------------------------------------------
// CSV

/** Columns of each CSV record, after the record kind in the first column. */
export const FE_CSV_RECORDS = {
  format: ['format', 'version'],
  name: ['name'],
  units: ['length', 'frequency', 'mass'],
  normalisation: ['normalisation'],
  node: ['label', 'x', 'y', 'z'],
  mode: ['mode', 'frequency', 'modal_mass'],
  shape: ['mode', 'node', 'X', 'Y', 'Z'],
} as const;
type RecordKind = keyof typeof FE_CSV_RECORDS;
const OPTIONAL_CELLS: Partial<Record<RecordKind, string[]>> = { mode: ['modal_mass'] };

/**
 * Reads Resonote's FE-modes CSV (docs/fe-model-format.md): one record per line, the kind first
 * (`format`, `name`, `units`, `normalisation`, `node`, `mode`, `shape`), comma-separated, `#` lines are
 * comments. Values come back in mm, Hz and kg. Every problem is collected with its line and column.
 */
export function parseFeModelCsv(text: string): FeParseResult {
  if (typeof text !== 'string') return tooMuch('the file is not text');
  if (text.length > MAX_FE_CHARS) return tooMuch(`the file has ${text.length} characters; a model file takes at most ${MAX_FE_CHARS}`);
  const body = text.replace(/^\uFEFF/, '');
  if (!body.trim()) return tooMuch('the file is empty: it starts with the line `format,resonote-fe-modes,1`');
  const parsed = Papa.parse<string[]>(body, { delimiter: ',', skipEmptyLines: false });
  const p = new Problems();
  const rows = parsed.data;
  const quoteError = parsed.errors.find((e) => e.type === 'Quotes');
  if (quoteError) return tooMuch(`line ${(quoteError.row ?? 0) + 1}: a quote is not closed (${quoteError.message})`);
  // A quoted cell holding a line break would shift every later line number: refuse it.
  for (const [i, cells] of rows.entries()) {
    if (cells.some((c) => /[\r\n]/.test(c))) return tooMuch(`line ${i + 1}: a quoted cell holds a line break; keep every record on one line`);
  }
  const counts = { node: 0, mode: 0, shape: 0 };
  for (const cells of rows) {
    const k = (cells[0] ?? '').trim().toLowerCase();
    if (k === 'node' || k === 'mode' || k === 'shape') counts[k]++;
  }
  if (counts.node > MAX_FE_NODES) return tooMuch(`the file has ${counts.node} nodes; a model takes at most ${MAX_FE_NODES}`);
  if (counts.mode > MAX_FE_MODES) return tooMuch(`the file has ${counts.mode} modes; a model takes at most ${MAX_FE_MODES}`);
  if (counts.shape > MAX_FE_SHAPE_ENTRIES) return tooMuch(`the file has ${counts.shape} shape rows; a model takes at most ${MAX_FE_SHAPE_ENTRIES} (nodes × modes)`);

  const draft: Draft = {
    name: null,
    normalisation: 'none',
    units: { length: 'mm', frequency: 'Hz', mass: 'kg' },
    nodes: [],
    modes: [],
    shapes: [],
  };
  const headerAt: Partial<Record<'format' | 'name' | 'units' | 'normalisation', number>> = {};
  let firstRecord = true;

  const decimal = (raw: string, row: number, column: string): number | null => {
    if (raw === '') {
      p.add(row, column, null, `${column} is empty`);
      return null;
    }
    if (!DECIMAL.test(raw)) {
      p.add(row, column, null, `"${raw}" is not a decimal number (digits, an optional "." and exponent; no hex, no Infinity, no decimal comma)`);
      return null;
    }
    const v = Number(raw);
    if (!Number.isFinite(v)) {
      p.add(row, column, null, `"${raw}" is out of range`);
      return null;
    }
    return v;
  };
  const integer = (raw: string, row: number, column: string): number | null => {
    if (!INTEGER.test(raw) || Number(raw) < 1 || Number(raw) > 1_000_000) {
      p.add(row, column, null, raw === '' ? `${column} is empty` : `"${raw}" is not a mode number (a whole number from 1 to 1 000 000)`);
      return null;
    }
    return Number(raw);
  };

  for (const [i, rawCells] of rows.entries()) {
    const row = i + 1;
    const cells = rawCells.map((c) => c.trim());
    if (cells.every((c) => c === '') || cells[0]!.startsWith('#')) continue;
    const kind = cells[0]!.toLowerCase() as RecordKind;
    if (!(kind in FE_CSV_RECORDS)) {
      p.add(row, 'kind', null, `"${cells[0]}" is not a record kind (use ${Object.keys(FE_CSV_RECORDS).join(', ')})`);
      firstRecord = false;
      continue;
    }
    if (firstRecord && kind !== 'format') p.add(row, 'kind', null, `the first record must be \`format,${FE_MODEL_FORMAT},${FE_MODEL_FORMAT_VERSION}\``);
    firstRecord = false;
    const columns = FE_CSV_RECORDS[kind];
    // spreadsheets pad rows with empty cells: allow them, refuse anything else past the last column
    const extra = cells.slice(1 + columns.length);
    if (extra.some((c) => c !== '')) {
      let used = cells.length;
      while (used > 0 && cells[used - 1] === '') used--;
      p.add(row, null, null, `a ${kind} record has ${columns.length} value${columns.length > 1 ? 's' : ''} (${columns.join(', ')}) but this line has ${used - 1}; a decimal comma splits a number in two — use a point`);
      continue;
    }
    const cell = (k: number) => cells[1 + k] ?? '';
    const missing = columns.filter((c, k) => cell(k) === '' && !(OPTIONAL_CELLS[kind] ?? []).includes(c));
    if (missing.length && kind !== 'node' && kind !== 'shape' && kind !== 'mode') {
      p.add(row, missing[0]!, null, `${missing.join(', ')} ${missing.length > 1 ? 'are' : 'is'} empty`);
      continue;
    }
    if (kind === 'format' || kind === 'name' || kind === 'units' || kind === 'normalisation') {
      if (headerAt[kind] !== undefined) {
        p.add(row, 'kind', null, `the ${kind} record is given twice (first on line ${headerAt[kind]})`);
        continue;
      }
      headerAt[kind] = row;
    }
    switch (kind) {
      case 'format':
        if (cell(0) !== FE_MODEL_FORMAT) p.add(row, 'format', null, `"${cell(0)}" is not this format: write ${FE_MODEL_FORMAT}`);
        else if (cell(1) !== String(FE_MODEL_FORMAT_VERSION)) p.add(row, 'version', null, `version "${cell(1)}" is not known: this reader takes version ${FE_MODEL_FORMAT_VERSION}`);
        break;
      case 'name':
        if (cell(0).length > 200) p.add(row, 'name', null, 'the name has more than 200 characters');
        else draft.name = cell(0);
        break;
      case 'units': {
        const [length, frequency, mass] = [cell(0), cell(1), cell(2)];
        if (!(feLengthUnits as readonly string[]).includes(length)) p.add(row, 'length', null, `length unit "${length}" is not accepted: write mm or m`);
        else draft.units.length = length as FeLengthUnit;
        if (frequency !== 'Hz') p.add(row, 'frequency', null, `frequency unit "${frequency}" is not accepted: write Hz`);
        if (!(feMassUnits as readonly string[]).includes(mass)) p.add(row, 'mass', null, `mass unit "${mass}" is not accepted: write kg or t`);
        else draft.units.mass = mass as FeMassUnit;
        break;
      }
      case 'normalisation':
        if (!(feNormalisations as readonly string[]).includes(cell(0))) p.add(row, 'normalisation', null, `"${cell(0)}" is not a normalisation: write mass or none`);
        else draft.normalisation = cell(0) as FeNormalisation;
        break;
      case 'node': {
        const label = cell(0);
        const check = pointLabelSchema.safeParse(label);
        if (!check.success) p.add(row, 'label', null, label ? `label "${label}": ${check.error.issues[0]!.message}` : 'label is empty');
        const xyz = [decimal(cell(1), row, 'x'), decimal(cell(2), row, 'y'), decimal(cell(3), row, 'z')];
        if (check.success && xyz.every((v) => v !== null)) draft.nodes.push({ node: { label: check.data, x: xyz[0]!, y: xyz[1]!, z: xyz[2]! }, at: { row, path: null } });
        break;
      }
      case 'mode': {
        const number = integer(cell(0), row, 'mode');
        const frequency = decimal(cell(1), row, 'frequency');
        const massCell = cell(2);
        const modalMass = massCell === '' ? null : decimal(massCell, row, 'modal_mass');
        if (number !== null && frequency !== null && (massCell === '' || modalMass !== null)) draft.modes.push({ number, frequency, modalMass, at: { row, path: null } });
        break;
      }
      case 'shape': {
        const mode = integer(cell(0), row, 'mode');
        const node = cell(1);
        if (!node) p.add(row, 'node', null, 'node is empty');
        const v = [decimal(cell(2), row, 'X'), decimal(cell(3), row, 'Y'), decimal(cell(4), row, 'Z')];
        if (mode !== null && node && v.every((x) => x !== null)) draft.shapes.push({ mode, node, values: v as [number, number, number], at: { row, path: null } });
        break;
      }
    }
    if (p.full) {
      p.stopped = true;
      return p.result();
    }
  }
  if (headerAt.format === undefined && !p.list.some((x) => x.column === 'kind')) p.add(1, 'kind', null, `the file lacks the record \`format,${FE_MODEL_FORMAT},${FE_MODEL_FORMAT_VERSION}\``);
  if (headerAt.units === undefined) p.add(null, 'units', null, 'the file does not state its units: add the record `units,mm,Hz,kg` (length, frequency, mass)');
  if (headerAt.normalisation === undefined) p.add(null, 'normalisation', null, 'the file does not state the shapes’ normalisation: add `normalisation,mass` or `normalisation,none`');
  if (p.count) return p.result();
  return assemble(draft, p);
}

/** Writes the canonical model as CSV in mm, Hz, kg; `parseFeModelCsv` reads it back unchanged. */
export function feModelToCsv(model: FeModel): string {
  const q = (s: string) => (/[",]/.test(s) ? `"${s.replace(/"/g, '""')}"` : s);
  const lines = [`format,${FE_MODEL_FORMAT},${FE_MODEL_FORMAT_VERSION}`];
  if (model.name !== null) lines.push(`name,${q(model.name)}`);
  lines.push('units,mm,Hz,kg', `normalisation,${model.normalisation}`);
  for (const n of model.nodes) lines.push(`node,${n.label},${n.x},${n.y},${n.z}`);
  for (const m of model.modes) lines.push(`mode,${m.number},${m.frequencyHz},${m.modalMassKg ?? ''}`);
  for (const m of model.modes) {
    model.nodes.forEach((n, k) => lines.push(`shape,${m.number},${n.label},${m.shape[3 * k]},${m.shape[3 * k + 1]},${m.shape[3 * k + 2]}`));
  }
  return lines.join('\n') + '\n';
}

// ---------------------------------------------------------------------------------------------
// JSON

const finite = (what: string) => z.number({ error: `${what} must be a number` }).finite(`${what} must be finite`);

/** The JSON document as zod sees it (structure and types; the cross-checks follow in `validateFeModelJson`). */
export const feModelJsonSchema = z.strictObject({
  format: z.literal(FE_MODEL_FORMAT, { error: `format must be "${FE_MODEL_FORMAT}"` }),
  version: z.literal(FE_MODEL_FORMAT_VERSION, { error: `version must be ${FE_MODEL_FORMAT_VERSION}` }),
  name: z.string().max(200).nullable().optional(),
  units: z.strictObject({
    length: z.enum(feLengthUnits, { error: 'length unit must be "mm" or "m"' }),
    frequency: z.literal('Hz', { error: 'frequency unit must be "Hz"' }),
    mass: z.enum(feMassUnits, { error: 'mass unit must be "kg" or "t"' }),
  }),
  normalisation: z.enum(feNormalisations, { error: 'normalisation must be "mass" or "none"' }),
  nodes: z
    .array(z.strictObject({ label: pointLabelSchema, x: finite('x'), y: finite('y'), z: finite('z') }))
    .max(MAX_FE_NODES, `a model takes at most ${MAX_FE_NODES} nodes`),
  modes: z
    .array(
      z.strictObject({
        number: z.number().int('a mode number is a whole number').min(1).max(1_000_000),
        frequency: finite('frequency'),
        modalMass: finite('modalMass').nullable().optional(),
        shape: z.array(z.tuple([z.string().min(1, 'node is empty'), finite('X'), finite('Y'), finite('Z')])),
      }),
    )
    .max(MAX_FE_MODES, `a model takes at most ${MAX_FE_MODES} modes`),
});
export type FeModelJson = z.infer<typeof feModelJsonSchema>;

function pathText(path: readonly PropertyKey[]): string {
  return path.map((k, i) => (typeof k === 'number' ? `[${k}]` : `${i ? '.' : ''}${String(k)}`)).join('');
}

/** Validates an already-parsed JSON document (such as a request body); values come back in mm, Hz and kg. */
export function validateFeModelJson(value: unknown): FeParseResult {
  if (value && typeof value === 'object' && Array.isArray((value as { modes?: unknown }).modes)) {
    const entries = ((value as { modes: { shape?: unknown }[] }).modes).reduce((n, m) => n + (Array.isArray(m?.shape) ? m.shape.length : 0), 0);
    if (entries > MAX_FE_SHAPE_ENTRIES) return tooMuch(`the document has ${entries} shape entries; a model takes at most ${MAX_FE_SHAPE_ENTRIES} (nodes × modes)`);
  }
  const parsed = feModelJsonSchema.safeParse(value);
  const p = new Problems();
  if (!parsed.success) {
    for (const issue of parsed.error.issues) {
      const path = pathText(issue.path);
      const last = issue.path[issue.path.length - 1];
      const column = issue.path.length >= 4 && issue.path[2] === 'shape' && typeof last === 'number' ? (['node', 'X', 'Y', 'Z'][last] ?? null) : typeof last === 'string' ? last : null;
      p.add(null, column, path || '(document)', issue.message);
    }
    return p.result();
  }
  const doc = parsed.data;
  const draft: Draft = {
    name: doc.name ?? null,
    normalisation: doc.normalisation,
    units: doc.units,
    nodes: doc.nodes.map((node, k) => ({ node, at: { row: null, path: `nodes[${k}]` } })),
    modes: doc.modes.map((m, k) => ({ number: m.number, frequency: m.frequency, modalMass: m.modalMass ?? null, at: { row: null, path: `modes[${k}]` } })),
    shapes: doc.modes.flatMap((m, k) =>
      m.shape.map(([node, x, y, zv], j) => ({ mode: m.number, node, values: [x, y, zv] as [number, number, number], at: { row: null, path: `modes[${k}].shape[${j}]` } })),
    ),
  };
  return assemble(draft, p);
}

/** Reads Resonote's FE-modes JSON text (docs/fe-model-format.md). */
export function parseFeModelJson(text: string): FeParseResult {
  if (typeof text !== 'string') return tooMuch('the file is not text');
  if (text.length > MAX_FE_CHARS) return tooMuch(`the file has ${text.length} characters; a model file takes at most ${MAX_FE_CHARS}`);
  let value: unknown;
  try {
    value = JSON.parse(text.replace(/^\uFEFF/, ''));
  } catch (e) {
    return tooMuch(`the file is not valid JSON: ${(e as Error).message}`);
  }
  return validateFeModelJson(value);
}

/** Writes the canonical model as JSON in mm, Hz, kg; `parseFeModelJson` reads it back unchanged. */
export function feModelToJson(model: FeModel): string {
  const doc: FeModelJson = {
    format: FE_MODEL_FORMAT,
    version: FE_MODEL_FORMAT_VERSION,
    name: model.name,
    units: { length: 'mm', frequency: 'Hz', mass: 'kg' },
    normalisation: model.normalisation,
    nodes: model.nodes.map((n) => ({ label: n.label, x: n.x, y: n.y, z: n.z })),
    modes: model.modes.map((m) => ({
      number: m.number,
      frequency: m.frequencyHz,
      modalMass: m.modalMassKg,
      shape: model.nodes.map((n, k) => [n.label, m.shape[3 * k]!, m.shape[3 * k + 1]!, m.shape[3 * k + 2]!] as [string, number, number, number]),
    })),
  };
  return JSON.stringify(doc, null, 1) + '\n';
}

/**
 * The mode's shape scaled to unit modal mass (φᵀMφ = 1 kg, entries in kg^-½): as stored for
 * normalisation 'mass', φ/√m_r when the modal mass m_r (kg) is known, null otherwise.
 */
export function massNormalisedShape(model: FeModel, mode: FeMode): number[] | null {
  if (model.normalisation === 'mass') return mode.shape.slice();
  if (mode.modalMassKg === null) return null;
  const s = 1 / Math.sqrt(mode.modalMassKg);
  return mode.shape.map((v) => v * s);
}
