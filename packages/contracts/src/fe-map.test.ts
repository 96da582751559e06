// Test points ↔ FE nodes (Euclidean distance in mm) and the model's shapes at signed test DOFs.
import { describe, expect, it } from 'vitest';
import { mapPointsToNodes, modelShapesAtDofs } from './fe-map.ts';
import { parseFeModelCsv, type FeModel } from './fe-model.ts';

const csv = `format,resonote-fe-modes,1
units,mm,Hz,kg
normalisation,mass
node,N1,0,0,0
node,N2,100,0,0
node,N3,200,0,0
mode,1,50,
mode,2,140,
shape,1,N1,0.1,0.2,0.3
shape,1,N2,0.4,0.5,0.6
shape,1,N3,0.7,0.8,0.9
shape,2,N1,-1,0,1
shape,2,N2,0,0,0
shape,2,N3,1,0,-1
`;
const parsed = parseFeModelCsv(csv);
if (!parsed.ok) throw new Error(parsed.message);
const model: FeModel = parsed.model;

describe('mapPointsToNodes', () => {
  const points = [
    { label: 'A', x: 3, y: 4, z: 0 }, // 5 mm from N1 (3-4-5 triangle)
    { label: 'B', x: 100, y: 0, z: 12 }, // 12 mm from N2
    { label: 'n3', x: 150, y: 0, z: 0 }, // 50 mm from N2 and N3: the first listed wins
  ];

  it('links each point to the nearest node within the tolerance, with the distance in mm', () => {
    const links = mapPointsToNodes(points, model.nodes, { by: 'nearest', toleranceMm: 10 });
    expect(links.map((l) => [l.point, l.node, l.distanceMm])).toEqual([
      ['A', 'N1', 5],
      ['B', null, null],
      ['n3', null, null],
    ]);
    const wide = mapPointsToNodes(points, model.nodes, { by: 'nearest', toleranceMm: 60 });
    expect(wide.map((l) => [l.node, l.distanceMm])).toEqual([['N1', 5], ['N2', 12], ['N2', 50]]);
    expect(wide[1]!.sharedWith).toEqual(['n3']);
  });

  it('links by label without regard to case, and still reports the distance so a misplaced label shows', () => {
    const links = mapPointsToNodes(points, model.nodes, { by: 'label' });
    expect(links.map((l) => [l.point, l.node, l.distanceMm])).toEqual([
      ['A', null, null],
      ['B', null, null],
      ['n3', 'N3', 50],
    ]);
  });

  it('refuses a missing or non-positive tolerance and an unknown rule', () => {
    expect(() => mapPointsToNodes(points, model.nodes, { by: 'nearest' })).toThrow(/toleranceMm=undefined/);
    expect(() => mapPointsToNodes(points, model.nodes, { by: 'nearest', toleranceMm: 0 })).toThrow(/toleranceMm=0/);
    expect(() => mapPointsToNodes(points, model.nodes, { by: 'closest' as 'label' })).toThrow(/by=closest/);
  });
});

describe('modelShapesAtDofs', () => {
  it('reads each DOF’s axis with its sign from the linked node, and lists DOFs of unlinked points apart', () => {
    const links = [
      { point: 'A', node: 'N1', distanceMm: 0, sharedWith: [] },
      { point: 'C', node: 'N3', distanceMm: 0, sharedWith: [] },
      { point: 'D', node: null, distanceMm: null, sharedWith: [] },
    ];
    const r = modelShapesAtDofs(model, links, ['A:+Z', 'A:-X', 'C:+Y', 'D:+Z']);
    expect(r.dofs).toEqual(['A:+Z', 'A:-X', 'C:+Y']);
    expect(r.unmapped).toEqual(['D:+Z']);
    expect(r.shapes).toEqual([
      [0.3, -0.1, 0.8],
      [1, 1, 0],
    ]);
    expect(() => modelShapesAtDofs(model, links, ['A+Z'])).toThrow(/DOF "A\+Z" is not written point:±axis/);
  });
});
