import { readShapes, type RealShapes } from './shapes.ts';

export interface DrivingPointMeasure {
  /** Per candidate: Π_r |φ_ir| / max_j |φ_jr| (dimensionless, 0…1); 0 where any mode has a node. */
  product: Float64Array;
  /** Per candidate: the m-th root of `product`, the geometric-mean relative amplitude (0…1). */
  geometricMean: Float64Array;
  /** Per candidate: min_r |φ_ir| / max_j |φ_jr| (0…1), the weakest mode's relative amplitude there. */
  minimum: Float64Array;
  /** Per candidate: the mode (index into `shapes`) that gives `minimum`. */
  weakestMode: Int32Array;
  /** Every candidate, best first: by `product`, ties (1e-12 relative) by `minimum`, then by lower index. */
  ranking: Int32Array;
}

/**
 * A measure for choosing the reference (driving point) so that every mode of interest is excited and
 * seen there — no mode sits at a node of the reference. For candidate DOF i and the m modes of interest
 * (`shapes[r][i]` = mode r at candidate i, real, any scaling per mode), with each mode's amplitudes
 * taken relative to its largest, a_ir = |φ_ir| / max_j |φ_jr| (0…1):
 *   product_i = Π_r a_ir      (the product of the modal amplitudes over the modes of interest, each mode
 *                              normalised to its largest amplitude; 0 at a node of any mode)
 *   minimum_i = min_r a_ir    (the weakest mode at that DOF, relative to where it is strongest)
 * The product rewards DOFs where every mode is strong; the minimum tells how weakly the worst mode is
 * excited. Choosing the driving point by the product of the mode-shape amplitudes is common practice
 * (named the "optimum driving point" in the model-validation literature — from memory, not checked
 * against a publication); the normalisation per mode makes the measure independent of how each shape
 * is scaled. Pick the reference high in `ranking` and check its `minimum` against the lowest level a
 * mode should keep at the reference (Resonote leaves that threshold to the lead).
 */
export function drivingPointMeasure(shapes: RealShapes): DrivingPointMeasure {
  const { n, m, phi } = readShapes(shapes, 'shapes');
  const peak = new Float64Array(m);
  for (let i = 0; i < n; i++) for (let r = 0; r < m; r++) peak[r] = Math.max(peak[r]!, Math.abs(phi[i * m + r]!));
  const product = new Float64Array(n);
  const geometricMean = new Float64Array(n);
  const minimum = new Float64Array(n);
  const weakestMode = new Int32Array(n);
  for (let i = 0; i < n; i++) {
    // sum of logs, so many modes with small amplitudes do not underflow before the m-th root
    let logSum = 0;
    let min = Infinity;
    let weakest = 0;
    for (let r = 0; r < m; r++) {
      const a = Math.abs(phi[i * m + r]!) / peak[r]!;
      logSum += a > 0 ? Math.log(a) : -Infinity;
      if (a < min) {
        min = a;
        weakest = r;
      }
    }
    product[i] = Math.exp(logSum);
    geometricMean[i] = Math.exp(logSum / m);
    minimum[i] = min;
    weakestMode[i] = weakest;
  }
  // values equal to 1e-12 (relative) count as ties, so mirror-image DOFs of a symmetric structure
  // rank by index whatever the rounding of the shapes
  const differ = (x: number, y: number) => (Math.abs(x - y) > 1e-12 * Math.max(Math.abs(x), Math.abs(y)) ? y - x : 0);
  const ranking = Int32Array.from({ length: n }, (_, i) => i).sort(
    (a, b) => differ(product[a]!, product[b]!) || differ(minimum[a]!, minimum[b]!) || a - b,
  );
  return { product, geometricMean, minimum, weakestMode, ranking };
}
