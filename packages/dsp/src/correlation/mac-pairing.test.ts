// autoMac and macPairs (Allemang & Brown 1982, IMAC I). The spring–mass chain and its copy with spring 3
// 5 % stiffer come from scipy.linalg.eigh (tests/reference/efi_reference.py → spring-chain.json).
import { describe, expect, it } from 'vitest';
import { autoMac, macPairs, type CorrelationMode } from './mac-pairing.ts';
import { expectClose, loadCorrelationFixture, simplySupportedBeam } from '../../test/correlation-support.ts';

const chain = loadCorrelationFixture('spring-chain.json');
const modesOf = (set: { fHz: number[]; shapes: number[][] }): CorrelationMode[] =>
  set.fHz.map((f, r) => ({ frequencyHz: f, shape: set.shapes[r]! }));
const model = modesOf(chain.model);
const test = modesOf(chain.test);

describe('autoMac', () => {
  it('is the identity for simply supported beam modes over all 41 equally spaced points (discrete orthogonality of sines)', () => {
    // Σ_i sin(jπi/N)·sin(kπi/N) = (N/2)·δ_jk for 0 < j, k < N (closed form)
    const a = autoMac(simplySupportedBeam(3, 41));
    for (let p = 0; p < 3; p++) for (let q = 0; q < 3; q++) expect(a.matrix[p]![q]).toBeCloseTo(p === q ? 1 : 0, 14);
    expect(a.above).toEqual([]);
    expect(a.threshold).toBe(0.2);
  });

  it('cannot tell modes 1 and 3 apart at x = L/4 and 3L/4 alone: MAC = 1 (spatial aliasing, closed form)', () => {
    // sin(π/4) = sin(3π/4) = sin(3π/4) = sin(9π/4) = √2/2, so both modes read [√2/2, √2/2]
    const beam = simplySupportedBeam(3, 41).map((s) => [s[10]!, s[30]!]);
    const a = autoMac([beam[0]!, beam[2]!]);
    expect(a.maxOffDiagonal!.value).toBeCloseTo(1, 14);
    expect(a.above).toHaveLength(1);
    expect(a.above[0]).toMatchObject({ a: 0, b: 1 });
  });

  it('lists every pair at or above the threshold the lead sets, highest first', () => {
    const s = simplySupportedBeam(3, 41).map((v) => [v[5]!, v[20]!, v[30]!]);
    const a = autoMac(s, { threshold: 0 });
    expect(a.above).toHaveLength(3);
    expect(a.above[0]!.value).toBeGreaterThanOrEqual(a.above[1]!.value);
    expect(a.maxOffDiagonal!.value).toBe(a.above[0]!.value);
    expect(() => autoMac(s, { threshold: 1.5 })).toThrow(/threshold=1.5/);
  });
});

describe('macPairs on a chain with one spring 5 % stiffer (scipy.linalg.eigh reference)', () => {
  it('pairs every mode with its own, with the MAC table and the frequency differences of numpy', () => {
    const r = macPairs(test, model);
    r.mac.forEach((row, t) => expectClose(row, chain.macTestModel[t], 1e-12));
    expect(r.pairs.map((p) => [p.test, p.model])).toEqual([[0, 0], [1, 1], [2, 2], [3, 3], [4, 4]]);
    r.pairs.forEach((p, k) => {
      expect(p.mac).toBeCloseTo(chain.macTestModel[k][k], 12);
      expect(p.frequencyDifferencePercent!).toBeCloseTo(chain.freqDiffPercent[k], 10);
    });
    expect(r.unpairedTest).toEqual([]);
    expect(r.unpairedModel).toEqual([]);
  });

  it('finds every test frequency above its model one by less than √1.05 − 1 = 2.47 %: one spring 5 % stiffer gives K ≤ K′ ≤ 1.05·K (Courant–Fischer min–max)', () => {
    const pairs = macPairs(test, model).pairs;
    expect(pairs.length, 'every test mode paired').toBe(test.length);
    for (const p of pairs) {
      expect(p.frequencyDifferencePercent!).toBeGreaterThan(0);
      expect(p.frequencyDifferencePercent!).toBeLessThan((Math.sqrt(1.05) - 1) * 100);
    }
  });

  it('pairs test modes given out of order, and reports the model mode the test did not find as unpaired', () => {
    const order = [4, 2, 0, 1];
    const r = macPairs(order.map((k) => test[k]!), model);
    expect(r.pairs.map((p) => [order[p.test], p.model])).toEqual([[0, 0], [1, 1], [2, 2], [4, 4]]);
    expect(r.unpairedModel).toEqual([3]);
    expect(r.unpairedTest).toEqual([]);
  });

  it('leaves modes unpaired when their MAC is below minMac, and gives no percentage against a 0 Hz model mode', () => {
    // [1, 0] against [1, 1]: MAC = 1²/(1·2) = 0.5 (Allemang & Brown 1982 definition, by hand)
    const r = macPairs([{ frequencyHz: 10, shape: [1, 0] }], [{ frequencyHz: 10, shape: [1, 1] }]);
    expect(r.pairs).toEqual([]);
    expect(r.unpairedTest).toEqual([0]);
    expect(r.unpairedModel).toEqual([0]);
    const rigid = macPairs([{ frequencyHz: 0.2, shape: [1, 1] }], [{ frequencyHz: 0, shape: [1, 1] }]);
    expect(rigid.pairs[0]!.frequencyDifferencePercent).toBeNull();
    expect(rigid.pairs[0]!.mac).toBe(1);
  });

  it('pairs the highest MAC first (greedy rule), even when a maximum-sum assignment would pair differently', () => {
    // MAC(t0, m0) = 1; MAC(t0, m1) = MAC(t1, m0) = 0.8 (cos² of 26.57°); MAC(t1, m1) = 0.36 < minMac.
    // Greedy takes (t0, m0) and leaves t1, m1 unpaired; the largest sum (0.8 + 0.8) would cross them.
    const t0 = [1, 0];
    const m0 = [1, 0];
    const m1 = [2, 1]; // MAC with [1, 0] = 4/5
    const t1 = [2, -1]; // MAC with [1, 0] = 4/5, with [2, 1] = 9/25
    const r = macPairs([{ frequencyHz: 1, shape: t0 }, { frequencyHz: 2, shape: t1 }], [{ frequencyHz: 1, shape: m0 }, { frequencyHz: 2, shape: m1 }]);
    expect(r.mac[1]![1]).toBeCloseTo(9 / 25, 15);
    expect(r.pairs.map((p) => [p.test, p.model])).toEqual([[0, 0]]);
    expect(r.unpairedTest).toEqual([1]);
    expect(r.unpairedModel).toEqual([1]);
  });

  it('refuses empty sets, bad frequencies, shapes of other lengths and a bad minMac', () => {
    expect(() => macPairs([], model)).toThrow(/test is empty/);
    expect(() => macPairs([{ frequencyHz: -1, shape: [1, 2, 3, 4, 5] }], model)).toThrow(/test\[0\]\.frequencyHz=-1/);
    expect(() => macPairs([{ frequencyHz: Number.NaN, shape: [1, 2, 3, 4, 5] }], model)).toThrow(/frequencyHz=NaN/);
    expect(() => macPairs([{ frequencyHz: 1, shape: [1, 2] }], model)).toThrow(/test\[0\] against model\[0\]/);
    expect(() => macPairs(test, model, { minMac: 2 })).toThrow(/minMac=2/);
  });
});
