// Before test points are linked to model nodes: are the two in the same length unit and axes?
// The formats carry no transform, so a model in metres read as mm, or with Y and Z swapped, would
// map to nonsense; this refuses such a map and says why.
import { HttpError } from '../errors.ts';

interface Xyz {
  x: number;
  y: number;
  z: number;
}

/** A factor of 10 between the two extents counts as "another unit" (mm vs m is 1000; a cm mix-up 10). */
export const MAX_EXTENT_RATIO = 10;
/** An axis is "thin" when its extent is below this share of the largest (a plate, a beam). */
const THIN = 0.1;

function extents(p: readonly Xyz[]): [number, number, number] {
  const lo = [Infinity, Infinity, Infinity];
  const hi = [-Infinity, -Infinity, -Infinity];
  for (const q of p) {
    [q.x, q.y, q.z].forEach((v, a) => {
      lo[a] = Math.min(lo[a]!, v);
      hi[a] = Math.max(hi[a]!, v);
    });
  }
  return [hi[0]! - lo[0]!, hi[1]! - lo[1]!, hi[2]! - lo[2]!];
}

const mm = (v: number) => (v >= 1000 ? `${(v / 1000).toPrecision(3)} m` : `${v.toPrecision(3)} mm`);

/**
 * Throws a 422 when the test geometry and the model differ in size by more than MAX_EXTENT_RATIO
 * (bounding-box diagonals) or when both are flat (one axis under 10 % of the largest) along different
 * axes. Fewer than two points, or a geometry of one spot, cannot be checked and passes.
 */
export function checkGeometryAgainstModel(points: readonly Xyz[], nodes: readonly Xyz[], fileLengthUnit: string): void {
  if (points.length < 2 || nodes.length < 2) return;
  const ep = extents(points);
  const en = extents(nodes);
  const dp = Math.hypot(...ep);
  const dn = Math.hypot(...en);
  if (dp === 0 || dn === 0) return;
  const ratio = dn / dp;
  if (ratio > MAX_EXTENT_RATIO || ratio < 1 / MAX_EXTENT_RATIO) {
    const factor = ratio > 1 ? ratio : 1 / ratio;
    throw new HttpError(
      422,
      'units-mismatch',
      `The test geometry spans ${mm(dp)} and the model ${mm(dn)}: the model is ${factor.toPrecision(2)} times ${ratio > 1 ? 'larger' : 'smaller'}, so the two are not in the same length unit. The model file says its lengths are in ${fileLengthUnit}; check its units record (mm or m) or the geometry's coordinates. Nothing was mapped.`,
      { geometryExtentMm: dp, modelExtentMm: dn, ratio, modelFileLengthUnit: fileLengthUnit },
    );
  }
  const thin = (e: number[]) => {
    const max = Math.max(...e);
    const a = e.indexOf(Math.min(...e));
    return e[a]! < THIN * max ? a : -1;
  };
  const tp = thin(ep);
  const tn = thin(en);
  if (tp >= 0 && tn >= 0 && tp !== tn) {
    const axis = 'XYZ';
    throw new HttpError(
      422,
      'axes-mismatch',
      `The test geometry is flat along ${axis[tp]} but the model is flat along ${axis[tn]}: the two do not share their axes. Resonote takes both in one set of global axes; turn the model or the geometry so they match. Nothing was mapped.`,
      { geometryExtentsMm: ep, modelExtentsMm: en },
    );
  }
}
