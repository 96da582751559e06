// The FE-modes formats of docs/fe-model-format.md: the documented examples, round trips, unit
// conversions (SI: 1 m = 1000 mm, 1 t = 1000 kg) and row-numbered, column-named errors.
import { readFileSync } from 'node:fs';
import { dirname, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import {
  feModelToCsv,
  feModelToJson,
  massNormalisedShape,
  MAX_FE_MODES,
  MAX_FE_NODES,
  MAX_FE_PROBLEMS,
  parseFeModelCsv,
  parseFeModelJson,
  validateFeModelJson,
  type FeModel,
  type FeParseResult,
  type FeProblem,
} from './fe-model.ts';

const doc = readFileSync(resolve(dirname(fileURLToPath(import.meta.url)), '../../../docs/fe-model-format.md'), 'utf8');
const block = (lang: string) => doc.split('```' + lang + '\n')[1]!.split('```')[0]!;
const exampleCsv = block('csv');
const exampleJson = block('json');

function ok(r: FeParseResult): FeModel {
  if (!r.ok) throw new Error(`expected a model, got: ${r.message}\n${JSON.stringify(r.problems, null, 1)}`);
  return r.model;
}
function problems(r: FeParseResult): FeProblem[] {
  if (r.ok) throw new Error('expected problems, got a model');
  return r.problems;
}
const csvHead = 'format,resonote-fe-modes,1\nunits,mm,Hz,kg\nnormalisation,none\n';

describe('FE model CSV and JSON', () => {
  it('reads the documented CSV example: four nodes in mm, two modes, shapes in node order [X, Y, Z]', () => {
    const m = ok(parseFeModelCsv(exampleCsv));
    expect(m.name).toBe('Bracket FE rev A');
    expect(m.normalisation).toBe('mass');
    expect(m.nodes.map((n) => n.label)).toEqual(['P1', 'P2', 'P3', 'P4']);
    expect(m.nodes[2]).toEqual({ label: 'P3', x: 200, y: 100, z: 0 });
    expect(m.modes.map((x) => [x.number, x.frequencyHz, x.modalMassKg])).toEqual([[1, 85.3, null], [2, 212.7, null]]);
    expect(m.modes[1]!.shape).toEqual([0, 0, 0.74, 0, 0, -0.71, 0, 0, -0.69, 0.002, 0, 0.72]);
  });

  it('reads the documented JSON example into the same model as the CSV example', () => {
    expect(ok(parseFeModelJson(exampleJson))).toEqual(ok(parseFeModelCsv(exampleCsv)));
  });

  it('writes CSV and JSON that read back unchanged (round trip), CRLF line ends and a BOM included', () => {
    const m = ok(parseFeModelCsv(exampleCsv));
    expect(ok(parseFeModelCsv(feModelToCsv(m)))).toEqual(m);
    expect(ok(parseFeModelJson(feModelToJson(m)))).toEqual(m);
    expect(ok(parseFeModelCsv('\uFEFF' + feModelToCsv(m).replace(/\n/g, '\r\n')))).toEqual(m);
    const odd: FeModel = {
      ...m,
      name: 'Plate, "rev B"',
      normalisation: 'none',
      modes: m.modes.map((x, r) => ({ ...x, modalMassKg: [0.125, 3.5e-3][r]!, shape: x.shape.map((v) => v * 1e-7 + 1 / 3) })),
    };
    expect(ok(parseFeModelCsv(feModelToCsv(odd)))).toEqual(odd);
    expect(ok(parseFeModelJson(feModelToJson(odd)))).toEqual(odd);
  });

  it('converts m to mm, and tonne-normalised shapes to kg^-½ (÷√1000) and modal masses in t to kg (×1000)', () => {
    const inMetres = exampleCsv
      .replace('units,mm,Hz,kg', 'units,m,Hz,t')
      .replace(/^node,(\w+),(\d+),(\d+),0$/gm, (_, label, x, y) => `node,${label},${Number(x) / 1000},${Number(y) / 1000},0`);
    const metres = ok(parseFeModelCsv(inMetres));
    expect(metres.nodes[2]).toMatchObject({ x: 200, y: 100, z: 0 });
    expect(metres.fileUnits).toEqual({ length: 'm', frequency: 'Hz', mass: 't' });
    expect(metres.modes[0]!.shape[2]).toBeCloseTo(0.61 / Math.sqrt(1000), 15);
    // 0.2 m is 200 mm; 200 m is beyond the ±100 000 mm limit, 100 m is on it (allowed)
    expect(problems(parseFeModelCsv(exampleCsv.replace('units,mm,Hz,kg', 'units,m,Hz,kg')))).toEqual([
      { row: 7, column: 'x', path: null, message: 'x = 200000 mm is beyond ±100000 mm' },
      { row: 8, column: 'x', path: null, message: 'x = 200000 mm is beyond ±100000 mm' },
    ]);
    const scaled = ok(parseFeModelCsv(csvHead.replace('kg', 't') + 'node,A,0,0,0\nmode,1,10,0.002\nshape,1,A,0,0,2\n'));
    expect(scaled.modes[0]!.modalMassKg).toBeCloseTo(2, 12);
    // φ/√m with m = 2 kg: 2/√2 = √2 (unit modal mass)
    expect(massNormalisedShape(scaled, scaled.modes[0]!)![2]).toBeCloseTo(Math.SQRT2, 15);
    const none = ok(parseFeModelCsv(csvHead + 'node,A,0,0,0\nmode,1,10,\nshape,1,A,0,0,2\n'));
    expect(massNormalisedShape(none, none.modes[0]!)).toBeNull();
  });

  it('refuses bad numbers with their line and column: hex, Infinity, NaN, a decimal comma, out of range, empty', () => {
    const text = csvHead + ['node,A,0x1A,0,0', 'node,B,0,Infinity,0', 'node,C,0,0,NaN', 'node,D,1,5,0,0', 'node,E,1e999,0,0', 'node,F,0,,0', 'mode,1,ten,'].join('\n');
    const p = problems(parseFeModelCsv(text));
    expect(p.map((x) => [x.row, x.column])).toEqual([[4, 'x'], [5, 'y'], [6, 'z'], [7, null], [8, 'x'], [9, 'y'], [10, 'frequency']]);
    expect(p[0]!.message).toMatch(/"0x1A" is not a decimal number/);
    expect(p[3]!.message).toMatch(/has 4 values .* but this line has 5; a decimal comma/);
    expect(p[4]!.message).toMatch(/"1e999" is out of range/);
    expect(p[5]!.message).toBe('y is empty');
  });

  it('reports every mode lacking shape entries on its mode line, with the count and the first node labels', () => {
    const text = csvHead + 'node,A,0,0,0\nnode,B,1,0,0\nnode,C,2,0,0\nmode,1,10,\nmode,2,20,\nshape,1,A,0,0,1\nshape,2,A,0,0,1\nshape,2,B,0,0,1\nshape,2,C,0,0,-1\n';
    const p = problems(parseFeModelCsv(text));
    expect(p).toEqual([{ row: 7, column: 'shape', path: null, message: 'mode 1 has no shape entry for 2 nodes: "B", "C"' }]);
  });

  it('refuses duplicate node labels (without regard to case), duplicate modes and a shape entry given twice, naming the first line', () => {
    const text = csvHead + 'node,A,0,0,0\nnode,a,1,0,0\nmode,1,10,\nmode,1,11,\nshape,1,A,0,0,1\nshape,1,A,0,0,2\n';
    const p = problems(parseFeModelCsv(text));
    expect(p.map((x) => [x.row, x.column, x.message])).toEqual([
      [5, 'label', 'node "a" is listed twice (first on line 4)'],
      [7, 'mode', 'mode 1 is listed twice (first on line 6)'],
      [9, 'node', 'mode 1 at node "A" is given twice (first on line 8)'],
    ]);
  });

  it('refuses shape rows for undeclared nodes or modes, unknown record kinds and a missing format, units or normalisation', () => {
    const p = problems(parseFeModelCsv(csvHead + 'node,A,0,0,0\nmode,1,10,\nshape,1,A,0,0,1\nshape,2,A,0,0,1\nshape,1,Z9,0,0,1\nelement,1,A,B\n'));
    expect(p.map((x) => [x.row, x.column])).toEqual([[9, 'kind']]);
    const q = problems(parseFeModelCsv(csvHead + 'node,A,0,0,0\nmode,1,10,\nshape,1,A,0,0,1\nshape,2,A,0,0,1\nshape,1,Z9,0,0,1\n'));
    expect(q.map((x) => [x.row, x.column, x.message])).toEqual([
      [7, 'mode', 'mode 2 is not declared (no mode row for it)'],
      [8, 'node', 'node "Z9" is not declared (no node row for it)'],
    ]);
    const r = problems(parseFeModelCsv('node,A,0,0,0\nmode,1,10,\nshape,1,A,0,0,1\n'));
    expect(r.map((x) => [x.row, x.column])).toEqual([[1, 'kind'], [null, 'units'], [null, 'normalisation']]);
    expect(problems(parseFeModelCsv(csvHead + 'name,"Plate\nnode,A,0,0,0\n'))[0]!.message).toMatch(/^line 4: a quote is not closed/);
    expect(problems(parseFeModelCsv(csvHead + 'name,"Plate\nrev B"\nnode,A,0,0,0\n'))[0]!.message).toBe('line 4: a quoted cell holds a line break; keep every record on one line');
    expect(problems(parseFeModelCsv('format,resonote-fe-modes,2\nunits,mm,Hz,lb\nnormalisation,unit\n')).map((x) => [x.row, x.column])).toEqual([
      [1, 'version'],
      [2, 'mass'],
      [3, 'normalisation'],
    ]);
  });

  it('refuses a modal mass other than 1 with mass-normalised shapes, and modal masses given for only some modes', () => {
    const a = problems(parseFeModelCsv(exampleCsv.replace('mode,1,85.3,', 'mode,1,85.3,2.5')));
    expect(a).toMatchObject([{ row: 10, column: 'modal_mass' }]);
    const b = problems(parseFeModelCsv(csvHead + 'node,A,0,0,0\nmode,1,10,0.5\nmode,2,20,\nshape,1,A,0,0,1\nshape,2,A,0,0,1\n'));
    expect(b).toMatchObject([{ row: 6, column: 'modal_mass', message: expect.stringMatching(/mode 2 has no modal mass while 1 other/) }]);
    const c = problems(parseFeModelCsv(csvHead + 'node,A,0,0,0\nmode,1,-1,\nmode,2,20,0\nshape,1,A,0,0,1\nshape,2,A,0,0,0\n'));
    // mode 1: negative frequency; mode 2: modal mass 0; mode 1 then lacks the modal mass mode 2 states; mode 2's shape is all zeros
    expect(c.map((x) => [x.row, x.column])).toEqual([[5, 'frequency'], [6, 'modal_mass'], [5, 'modal_mass'], [6, 'shape']]);
  });

  it('collects at most 100 problems and says there were more', () => {
    const rows = Array.from({ length: 150 }, (_, i) => `node,N${i},0x${i},0,0`).join('\n');
    const r = parseFeModelCsv(csvHead + rows);
    expect(r.ok).toBe(false);
    if (r.ok) return;
    expect(r.problems).toHaveLength(MAX_FE_PROBLEMS);
    expect(r.truncated).toBe(true);
    expect(r.message).toMatch(/^The model was not read: 100\+ problems\. First: line 4, x:/);
  });

  it(`refuses more than ${MAX_FE_NODES} nodes or ${MAX_FE_MODES} modes before reading further`, () => {
    const nodes = Array.from({ length: MAX_FE_NODES + 1 }, (_, i) => `node,N${i},0,0,0`).join('\n');
    expect(problems(parseFeModelCsv(csvHead + nodes))[0]!.message).toBe(`the file has ${MAX_FE_NODES + 1} nodes; a model takes at most ${MAX_FE_NODES}`);
    const modes = Array.from({ length: MAX_FE_MODES + 1 }, (_, i) => `mode,${i + 1},${i},`).join('\n');
    expect(problems(parseFeModelCsv(csvHead + modes))[0]!.message).toMatch(/201 modes; a model takes at most 200/);
    const json = JSON.parse(exampleJson);
    json.modes = Array.from({ length: MAX_FE_MODES + 1 }, (_, i) => ({ ...json.modes[0], number: i + 1 }));
    expect(problems(validateFeModelJson(json))[0]).toMatchObject({ path: 'modes', message: 'a model takes at most 200 modes' });
  });

  it('refuses JSON with numbers as strings, infinite values, unknown fields, duplicates and missing entries, naming the path', () => {
    const base = () => JSON.parse(exampleJson);
    const a = base();
    a.nodes[1].x = '200';
    a.modes[1].shape[3][3] = 1e999; // JSON.stringify turns it into null
    a.extra = true;
    const pa = problems(validateFeModelJson(a));
    expect(pa.map((x) => [x.path, x.column])).toEqual([
      ['nodes[1].x', 'x'],
      ['modes[1].shape[3][3]', 'Z'],
      ['(document)', null],
    ]);
    expect(problems(parseFeModelJson(exampleJson.replace('"x": 200', '"x": 1e999')))).toMatchObject([{ path: 'nodes[1].x' }]);
    expect(problems(parseFeModelJson(exampleJson.replace('"x": 200', '"x": 0x1A')))[0]!.message).toMatch(/^the file is not valid JSON/);
    const b = base();
    b.nodes[3].label = 'p1';
    expect(problems(validateFeModelJson(b))[0]).toMatchObject({ path: 'nodes[3].label', column: 'label', message: 'node "p1" is listed twice (first at nodes[0])' });
    const c = base();
    c.modes[1].number = 1;
    expect(problems(validateFeModelJson(c))[0]).toMatchObject({ path: 'modes[1].number', message: 'mode 1 is listed twice (first at modes[0])' });
    const d = base();
    d.modes[0].shape.splice(1, 1);
    d.modes[1].shape[3][0] = 'P5';
    expect(problems(validateFeModelJson(d)).map((x) => [x.path, x.message])).toEqual([
      ['modes[1].shape[3]', 'node "P5" is not declared (no node row for it)'],
      ['modes[0].shape', 'mode 1 has no shape entry for 1 node: "P2"'],
      ['modes[1].shape', 'mode 2 has no shape entry for 1 node: "P4"'],
    ]);
  });
});
