// Reads a geometry CSV (`label,x,y,z` with a header, coordinates in mm, optional `directions`
// column such as "+Z -X") with papaparse, and reports every problem with its line number.
import Papa from 'papaparse';
import { directions as allDirections, MAX_IMPORT_ROWS, pointLabelSchema, type Direction } from '@resonote/contracts';
import { looksBinary, parseDecimal, quoteForMessage } from '../http/text-input.ts';

export interface CsvPoint {
  line: number;
  label: string;
  x: number;
  y: number;
  z: number;
  directions: Direction[] | null;
}

export interface CsvProblem {
  line: number;
  message: string;
}

/**
 * `points` on a refusal are the rows that passed (empty when the file as a whole is unreadable:
 * no header, binary, too many rows); `badRows` counts every row with a problem, `problems` lists
 * the first MAX_PROBLEMS of them.
 */
export type CsvResult = { ok: true; points: CsvPoint[] } | { ok: false; message: string; problems: CsvProblem[]; points: CsvPoint[]; badRows: number; rows: number };

const MAX_PROBLEMS = 50;

function parseDirections(text: string): Direction[] | string {
  const parts = text.split(/[\s;,|]+/).filter(Boolean).map((p) => p.toUpperCase());
  const out: Direction[] = [];
  for (const p of parts) {
    const d = (/^[XYZ]$/.test(p) ? `+${p}` : p) as Direction;
    if (!allDirections.includes(d)) return `${quoteForMessage(p)} is not a direction (use +X, -X, +Y, -Y, +Z or -Z)`;
    if (!out.includes(d)) out.push(d);
  }
  return out;
}

export function parseGeometryCsv(text: string): CsvResult {
  const body = text.replace(/^\uFEFF/, '');
  if (!body.trim()) return { ok: false, message: 'The file is empty: it needs a header line `label,x,y,z` and one line per point.', problems: [], points: [], badRows: 0, rows: 0 };
  if (looksBinary(body)) return { ok: false, message: 'This is not a text CSV: the file holds binary bytes. Export the geometry as CSV text (`label,x,y,z`, mm).', problems: [], points: [], badRows: 0, rows: 0 };
  const parsed = Papa.parse<string[]>(body, { skipEmptyLines: false, delimiter: '' });
  const rows = parsed.data;
  const header = (rows[0] ?? []).map((h) => h.trim().toLowerCase());
  const col = (name: string) => header.indexOf(name);
  const missing = ['label', 'x', 'y', 'z'].filter((c) => col(c) < 0);
  if (missing.length) {
    return {
      ok: false,
      message: `Line 1 (the header) lacks the column${missing.length > 1 ? 's' : ''} ${missing.join(', ')}. Expected a header like \`label,x,y,z\` (coordinates in mm).`,
      problems: [{ line: 1, message: `missing column${missing.length > 1 ? 's' : ''}: ${missing.join(', ')}` }],
      points: [],
      badRows: 0,
      rows: 0,
    };
  }
  const dataRows = rows.slice(1).map((cells, i) => ({ cells, line: i + 2 })).filter((r) => r.cells.some((c) => c.trim() !== ''));
  if (dataRows.length === 0) return { ok: false, message: 'The file has a header but no points.', problems: [], points: [], badRows: 0, rows: 0 };
  if (dataRows.length > MAX_IMPORT_ROWS) {
    return { ok: false, message: `The file has ${dataRows.length.toLocaleString('en-US')} points; one import takes at most ${MAX_IMPORT_ROWS.toLocaleString('en-US')}. Split it into several files.`, problems: [], points: [], badRows: 0, rows: dataRows.length };
  }
  const dirCol = col('directions');
  // Every row is read (the good ones may be imported on their own, `badRows: 'skip'`); the list keeps the first MAX_PROBLEMS.
  const all: CsvProblem[] = [];
  const problems = { push: (p: CsvProblem) => all.push(p) };
  const seen = new Map<string, number>();
  const points: CsvPoint[] = [];
  for (const { cells, line } of dataRows) {
    const label = (cells[col('label')] ?? '').trim();
    const labelCheck = pointLabelSchema.safeParse(label);
    if (!labelCheck.success) {
      problems.push({ line, message: label ? `label ${quoteForMessage(label)}: ${labelCheck.error.issues[0]!.message}` : 'the label is empty' });
      continue;
    }
    const key = label.toLowerCase();
    if (seen.has(key)) {
      problems.push({ line, message: `label ${quoteForMessage(label)} already appears on line ${seen.get(key)}` });
      continue;
    }
    seen.set(key, line);
    const coords: number[] = [];
    let bad = false;
    for (const axis of ['x', 'y', 'z'] as const) {
      const raw = (cells[col(axis)] ?? '').trim();
      const cell = parseDecimal(raw);
      if (!cell.ok) {
        problems.push({ line, message: `column ${col(axis) + 1} (${axis}, mm): the value ${cell.reason}` });
        bad = true;
        break;
      }
      const value = cell.value;
      if (Math.abs(value) > 100_000) {
        problems.push({ line, message: `column ${col(axis) + 1} (${axis}): ${raw} mm is beyond ±100 000 mm` });
        bad = true;
        break;
      }
      coords.push(value);
    }
    if (bad) continue;
    let dirs: Direction[] | null = null;
    if (dirCol >= 0 && (cells[dirCol] ?? '').trim() !== '') {
      const d = parseDirections(cells[dirCol]!);
      if (typeof d === 'string') {
        problems.push({ line, message: d });
        continue;
      }
      dirs = d;
    }
    points.push({ line, label, x: coords[0]!, y: coords[1]!, z: coords[2]!, directions: dirs });
  }
  if (all.length) {
    const badLines = new Set(all.map((p) => p.line)).size;
    const more = all.length > MAX_PROBLEMS ? ` (showing the first ${MAX_PROBLEMS})` : '';
    return { ok: false, message: `Nothing was imported: ${badLines} line${badLines > 1 ? 's have' : ' has'} a problem${more}. First: line ${all[0]!.line}: ${all[0]!.message}.`, problems: all.slice(0, MAX_PROBLEMS), points, badRows: badLines, rows: dataRows.length };
  }
  return { ok: true, points };
}

/** `label,x,y,z,directions` for export; the same file imports back unchanged. */
export function geometryToCsv(points: { label: string; x: number; y: number; z: number; directions: string[] }[]): string {
  const lines = ['label,x,y,z,directions'];
  for (const p of points) lines.push(`${p.label},${p.x},${p.y},${p.z},${p.directions.join(' ')}`);
  return lines.join('\n') + '\n';
}

/** Natural order of labels: B2 before B10. */
export const labelCollator = new Intl.Collator('en', { numeric: true, sensitivity: 'base' });
