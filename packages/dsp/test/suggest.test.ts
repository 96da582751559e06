// suggestModes on hand-made diagrams: the rule, not the estimator.
import { describe, expect, it } from 'vitest';
import { clusterStablePoles, suggestModes, type SuggestablePole } from '../src/modal/index.ts';

const v = (...x: number[]) => ({ re: Float64Array.from(x), im: new Float64Array(x.length) });

/** Orders 10, 12, …, 40; at each, two stable poles 0.5 % apart (100 and 100.5 Hz) with shapes [1, 1, 0] and [1, −1, 1]. */
function closePairDiagram(withVectors: boolean) {
  return {
    orders: Array.from({ length: 16 }, (_, i) => {
      const jitter = 1e-4 * Math.sin(i); // ±0.01 % scatter across orders
      const poles: SuggestablePole[] = [
        { fHz: 100 * (1 + jitter), zeta: 0.005, stable: 'all', ...(withVectors ? { shape: v(1, 1, 0) } : {}) },
        { fHz: 100.5 * (1 - jitter), zeta: 0.006, stable: 'all', ...(withVectors ? { shape: v(1, -1, 1) } : {}) },
      ];
      return { order: 10 + 2 * i, poles };
    }),
  };
}

describe('suggestModes', () => {
  it('keeps two modes 0.5 % apart with different shapes as two modes (frequency tolerance 1 %, MAC 1/6 < 0.9)', () => {
    const s = suggestModes(closePairDiagram(true));
    expect(s.map((m) => m.frequencyHz.toFixed(1))).toEqual(['100.0', '100.5']);
    expect(s.map((m) => m.orderCount)).toEqual([16, 16]);
    expect(s[0].dampingRatio).toBeCloseTo(0.005, 9);
    expect(s[0].minMac).toBeCloseTo(1, 9);
    expect(s[0].frequencySpreadPercent).toBeLessThan(0.03);
  });

  it('keeps them apart without vectors too (one pole per order per mode, 0.2 % tolerance), where 1 % frequency chaining merges them', () => {
    expect(suggestModes(closePairDiagram(false))).toHaveLength(2);
    // the frequency-only rule of clusterStablePoles joins poles within 1 %: one mode (the defect of issue 14)
    expect(clusterStablePoles(closePairDiagram(false))).toHaveLength(1);
  });

  it('drops a pole column seen at fewer than 40 % of the orders, and poles that are not fully stable', () => {
    const d = closePairDiagram(true);
    d.orders.slice(0, 5).forEach((o) => o.poles.push({ fHz: 150, zeta: 0.01, stable: 'all', shape: v(0, 1, 1) }));
    d.orders.forEach((o) => o.poles.push({ fHz: 170, zeta: 0.01, stable: 'freq-damp', shape: v(1, 0, 1) }));
    expect(suggestModes(d).map((m) => m.frequencyHz.toFixed(1))).toEqual(['100.0', '100.5']);
    expect(suggestModes(d, { classes: ['all', 'freq-damp'] }).map((m) => m.frequencyHz.toFixed(1))).toEqual(['100.0', '100.5', '170.0']);
  });

  it('refuses bad options with a RangeError naming them', () => {
    expect(() => suggestModes(closePairDiagram(true), { macThreshold: 1.5 })).toThrow(/macThreshold=1.5/);
    expect(() => suggestModes(closePairDiagram(true), { minOrders: 0 })).toThrow(/minOrders=0/);
    expect(() => suggestModes(undefined as never)).toThrow(/diagram has no orders/);
  });
});
