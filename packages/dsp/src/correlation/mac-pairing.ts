import { macMatrix } from '../modal/shape-tools.ts';
import type { Complex } from '../types.ts';

type Shape = Complex | ArrayLike<number>;

export interface AutoMacOptions {
  /** Off-diagonal MAC at or above which two modes count as hard to tell apart (default 0.2, common practice). */
  threshold?: number;
}

export interface AutoMac {
  /** matrix[a][b] = MAC(shapes[a], shapes[b]), 0…1, ones on the diagonal. */
  matrix: Float64Array[];
  /** Largest off-diagonal value and its modes (a < b); null for a single mode. */
  maxOffDiagonal: { a: number; b: number; value: number } | null;
  /** Every pair a < b with MAC ≥ threshold, highest first. */
  above: { a: number; b: number; value: number }[];
  threshold: number;
}

/**
 * Auto-MAC of one set of shapes over one set of DOFs (e.g. the model's modes at the planned points):
 * MAC(φ_a, φ_b) for every pair, by `macMatrix` (Allemang & Brown 1982, "A correlation coefficient for
 * modal vector analysis", IMAC I). Off-diagonal values near 1 mean the DOFs cannot tell those modes
 * apart; the default threshold 0.2 is common practice, the lead may set another.
 */
export function autoMac(shapes: readonly Shape[], options: AutoMacOptions = {}): AutoMac {
  const threshold = options.threshold ?? 0.2;
  if (typeof threshold !== 'number' || !(threshold >= 0 && threshold <= 1)) {
    throw new RangeError(`threshold=${String(threshold)} must be between 0 and 1`);
  }
  const matrix = macMatrix(shapes, shapes);
  let maxOffDiagonal: AutoMac['maxOffDiagonal'] = null;
  const above: AutoMac['above'] = [];
  for (let a = 0; a < matrix.length; a++) {
    for (let b = a + 1; b < matrix.length; b++) {
      const value = matrix[a]![b]!;
      if (!maxOffDiagonal || value > maxOffDiagonal.value) maxOffDiagonal = { a, b, value };
      if (value >= threshold) above.push({ a, b, value });
    }
  }
  above.sort((x, y) => y.value - x.value || x.a - y.a || x.b - y.b);
  return { matrix, maxOffDiagonal, above, threshold };
}

export interface CorrelationMode {
  /** Natural frequency, Hz (≥ 0). */
  frequencyHz: number;
  /** Shape over the common DOFs (real or complex; test and model on the same DOFs, in the same order). */
  shape: Shape;
}

export interface MacPairOptions {
  /** Smallest MAC that may form a pair (default 0.6, Resonote's choice; common practice calls ≥ 0.9 good). */
  minMac?: number;
}

export interface ModePair {
  test: number;
  model: number;
  mac: number;
  testHz: number;
  modelHz: number;
  /** (f_test − f_model)/f_model × 100: positive when the test mode is higher; null when f_model = 0. */
  frequencyDifferencePercent: number | null;
}

export interface MacPairs {
  /** mac[t][m] = MAC(test t, model m), 0…1. */
  mac: Float64Array[];
  /** One-to-one pairs, in model order. */
  pairs: ModePair[];
  /** Test modes and model modes left without a partner (indices, ascending). */
  unpairedTest: number[];
  unpairedModel: number[];
  minMac: number;
}

function checkModes(modes: readonly CorrelationMode[], name: string): void {
  if (!Array.isArray(modes) || modes.length === 0) throw new RangeError(`${name} is empty: give at least one mode`);
  modes.forEach((mode, i) => {
    const f = mode?.frequencyHz;
    if (typeof f !== 'number' || !Number.isFinite(f) || f < 0) {
      throw new RangeError(`${name}[${i}].frequencyHz=${String(f)} must be ≥ 0 and finite`);
    }
  });
}

/**
 * Pairs test modes with model modes one-to-one by MAC (Allemang & Brown 1982, "A correlation coefficient
 * for modal vector analysis", IMAC I; the MAC table comes from `macMatrix`). Rule (greedy by MAC,
 * Resonote's documented choice): of all test–model combinations with MAC ≥ minMac, the highest MAC is
 * paired first, its test and model modes are taken out, and so on; equal MACs (within 1e-12) go to the
 * smaller |frequency difference|, then the lower test index, then the lower model index. The strongest
 * correlation therefore always wins, which a maximum-sum assignment (Hungarian) does not promise. Each
 * pair carries its MAC and the frequency difference (f_test − f_model)/f_model × 100 %. Modes without a
 * partner are listed as unpaired.
 */
export function macPairs(test: readonly CorrelationMode[], model: readonly CorrelationMode[], options: MacPairOptions = {}): MacPairs {
  checkModes(test, 'test');
  checkModes(model, 'model');
  const minMac = options.minMac ?? 0.6;
  if (typeof minMac !== 'number' || !(minMac >= 0 && minMac <= 1)) throw new RangeError(`minMac=${String(minMac)} must be between 0 and 1`);
  let mac: Float64Array[];
  try {
    mac = macMatrix(
      test.map((t) => t.shape),
      model.map((m) => m.shape),
    );
  } catch (e) {
    throw new RangeError(`test and model shapes: ${(e as Error).message.replace('shapesA', 'test').replace('shapesB', 'model')}`);
  }
  const diff = (t: number, m: number): number | null => {
    const fm = model[m]!.frequencyHz;
    return fm > 0 ? ((test[t]!.frequencyHz - fm) / fm) * 100 : null;
  };
  const absDiff = (t: number, m: number) => Math.abs(diff(t, m) ?? Infinity);
  const candidates: { t: number; m: number; v: number }[] = [];
  for (let t = 0; t < test.length; t++) for (let m = 0; m < model.length; m++) if (mac[t]![m]! >= minMac) candidates.push({ t, m, v: mac[t]![m]! });
  candidates.sort((a, b) => (Math.abs(a.v - b.v) > 1e-12 ? b.v - a.v : absDiff(a.t, a.m) - absDiff(b.t, b.m) || a.t - b.t || a.m - b.m));
  const testUsed = new Uint8Array(test.length);
  const modelUsed = new Uint8Array(model.length);
  const pairs: ModePair[] = [];
  for (const c of candidates) {
    if (testUsed[c.t] || modelUsed[c.m]) continue;
    testUsed[c.t] = 1;
    modelUsed[c.m] = 1;
    pairs.push({
      test: c.t,
      model: c.m,
      mac: c.v,
      testHz: test[c.t]!.frequencyHz,
      modelHz: model[c.m]!.frequencyHz,
      frequencyDifferencePercent: diff(c.t, c.m),
    });
  }
  pairs.sort((a, b) => a.model - b.model);
  const unpaired = (used: Uint8Array) => Array.from(used.keys()).filter((i) => !used[i]);
  return { mac, pairs, unpairedTest: unpaired(testUsed), unpairedModel: unpaired(modelUsed), minMac };
}
