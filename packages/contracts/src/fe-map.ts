// Test points ↔ FE nodes, and the model's shapes at the test DOFs. Pure functions shared by the API
// (stored map, correlation) and the web app (the editable map). Test geometry and model are taken to
// share one set of global axes and the mm unit; a transform between them is not handled here.
import { dofLabelSchema, parseDof } from './common.ts';
import type { FeModel, FeNode } from './fe-model.ts';

export interface MapPoint {
  label: string;
  /** mm, the test geometry's axes. */
  x: number;
  y: number;
  z: number;
}

export interface PointNodeLink {
  point: string;
  /** The model node's label, or null when none qualifies. */
  node: string | null;
  /** Distance point → node in mm (also for a match by label, so a wrong label shows). */
  distanceMm: number | null;
  /** Other points linked to the same node (a coarse mesh or a misplaced point). */
  sharedWith: string[];
}

export interface MapOptions {
  /** 'label': same label, without regard to case; 'nearest': the closest node within toleranceMm. */
  by: 'label' | 'nearest';
  /** Largest accepted distance in mm for 'nearest' (> 0). */
  toleranceMm?: number;
}

const distance = (p: MapPoint, n: FeNode) => Math.hypot(p.x - n.x, p.y - n.y, p.z - n.z);

/**
 * Links each test point to a model node, by label or by the nearest node (Euclidean distance in mm,
 * ties to the node listed first) within `toleranceMm`. Points without a qualifying node get `node: null`.
 * A brute-force search, O(points × nodes).
 */
export function mapPointsToNodes(points: readonly MapPoint[], nodes: readonly FeNode[], options: MapOptions): PointNodeLink[] {
  if (options.by === 'nearest') {
    const tol = options.toleranceMm;
    if (typeof tol !== 'number' || !Number.isFinite(tol) || tol <= 0) throw new RangeError(`toleranceMm=${String(tol)} must be > 0 mm and finite`);
  } else if (options.by !== 'label') {
    throw new RangeError(`by=${String(options.by)} must be "label" or "nearest"`);
  }
  const byLabel = new Map(nodes.map((n) => [n.label.toLowerCase(), n]));
  const links: PointNodeLink[] = points.map((p) => {
    let best: FeNode | null = null;
    let bestD = Infinity;
    if (options.by === 'label') {
      best = byLabel.get(p.label.toLowerCase()) ?? null;
      bestD = best ? distance(p, best) : Infinity;
    } else {
      for (const n of nodes) {
        const d = distance(p, n);
        if (d < bestD) {
          bestD = d;
          best = n;
        }
      }
      if (bestD > options.toleranceMm!) best = null;
    }
    return { point: p.label, node: best ? best.label : null, distanceMm: best ? bestD : null, sharedWith: [] };
  });
  const byNode = new Map<string, string[]>();
  for (const l of links) if (l.node) byNode.set(l.node, [...(byNode.get(l.node) ?? []), l.point]);
  for (const l of links) if (l.node) l.sharedWith = byNode.get(l.node)!.filter((p) => p !== l.point);
  return links;
}

const AXIS = { X: 0, Y: 1, Z: 2 } as const;

/**
 * The model's shapes at test DOFs (`B01:+Z`): for each mode, one value per DOF, the node's translation
 * along the DOF's axis with the DOF's sign (−Z reads −φ_Z). Shapes come as stored in the model (kg^-½
 * for normalisation 'mass'). DOFs whose point has no linked node are listed in `unmapped` and left out
 * of `dofs` and `shapes`, so both stay aligned.
 */
export function modelShapesAtDofs(
  model: FeModel,
  links: readonly PointNodeLink[],
  dofLabels: readonly string[],
): { dofs: string[]; shapes: number[][]; unmapped: string[] } {
  const nodeIndex = new Map(model.nodes.map((n, k) => [n.label.toLowerCase(), k]));
  const pointToNode = new Map(links.filter((l) => l.node).map((l) => [l.point.toLowerCase(), nodeIndex.get(l.node!.toLowerCase())]));
  const dofs: string[] = [];
  const columns: { k: number; axis: number; sign: number }[] = [];
  const unmapped: string[] = [];
  for (const label of dofLabels) {
    if (!dofLabelSchema.safeParse(label).success) throw new RangeError(`DOF "${label}" is not written point:±axis, for example B01:+Z`);
    const { point, direction } = parseDof(label.trim());
    const k = pointToNode.get(point.toLowerCase());
    if (k === undefined) {
      unmapped.push(label);
      continue;
    }
    dofs.push(label);
    columns.push({ k, axis: AXIS[direction[1] as keyof typeof AXIS], sign: direction[0] === '-' ? -1 : 1 });
  }
  const shapes = model.modes.map((m) => columns.map((c) => c.sign * m.shape[3 * c.k + c.axis]!));
  return { dofs, shapes, unmapped };
}
