import { describe, expect, it } from 'vitest';
import { clusterStablePoles, type ClusterablePole } from './clusters.ts';

/** A diagram of orders 2…40: two modes stable from order 8 on (small drift), and noise poles that pass the checks at one or two orders. */
function diagram(): { orders: { order: number; poles: ClusterablePole[] }[] } {
  const orders = Array.from({ length: 20 }, (_, i) => 2 * i + 2);
  return {
    orders: orders.map((order) => {
      const poles: ClusterablePole[] = [];
      if (order >= 8) {
        poles.push({ fHz: 100 * (1 + 0.001 * Math.sin(order)), zeta: 0.01 * (1 + 0.05 * Math.cos(order)), stable: 'all' });
        poles.push({ fHz: 250 * (1 - 0.002 * Math.cos(order)), zeta: 0.02, stable: order === 20 ? 'freq-damp' : 'all' });
      }
      // Noise: stable by chance at single orders, at frequencies that wander.
      if (order === 30 || order === 32) poles.push({ fHz: 171 + order, zeta: 0.05, stable: 'all' });
      if (order === 40) poles.push({ fHz: 320, zeta: 0.004, stable: 'all' });
      // Never stable: ignored.
      poles.push({ fHz: 400 + order, zeta: 0.1, stable: 'new' });
      return { order, poles: poles.sort((a, b) => a.fHz - b.fHz) };
    }),
  };
}

describe('clusterStablePoles', () => {
  it('keeps the poles that persist across orders as modes and drops the ones stable at a single order', () => {
    const d = diagram();
    const clusters = clusterStablePoles(d);
    expect(clusters.map((c) => Math.round(c.fHz))).toEqual([100, 250]);
    expect(clusters[0]!.orders).toBe(17); // orders 8 … 40
    expect(clusters[1]!.orders).toBe(16); // one order only 'freq-damp'
    expect(clusters[0]!.share).toBeCloseTo(17 / 20, 12);
    // The representative is the member at the highest order, and points at that pole.
    const rep = clusters[0]!.representative;
    expect(rep.order).toBe(40);
    expect(d.orders.find((o) => o.order === 40)!.poles[rep.index]!.fHz).toBeCloseTo(100 * (1 + 0.001 * Math.sin(40)), 12);
    // The highest order alone would also have offered the noise pole at 320 Hz.
    expect(d.orders.at(-1)!.poles.filter((p) => p.stable === 'all').map((p) => Math.round(p.fHz))).toEqual([100, 250, 320]);
  });

  it('needs a pole at minShare of the orders and minOrders orders', () => {
    expect(clusterStablePoles(diagram(), { minShare: 0.9 })).toEqual([]);
    expect(clusterStablePoles(diagram(), { minShare: 0.01, minOrders: 2 }).map((c) => Math.round(c.fHz))).toEqual([100, 202, 250]);
  });

  it('drops members whose damping strays from the cluster median', () => {
    const d = diagram();
    // A pole of the 100 Hz chain with ten times the damping at one order is not counted.
    d.orders[10]!.poles[0] = { fHz: 100, zeta: 0.1, stable: 'all' };
    expect(clusterStablePoles(d)[0]!.orders).toBe(16);
  });

  it('returns nothing for an empty diagram and refuses bad options, naming them', () => {
    expect(clusterStablePoles({ orders: [] })).toEqual([]);
    expect(() => clusterStablePoles(diagram(), { frequencyTolerance: 0 })).toThrow(/frequencyTolerance=0/);
    expect(() => clusterStablePoles(diagram(), { minShare: 2 })).toThrow(/minShare=2/);
    expect(() => clusterStablePoles(diagram(), { minOrders: 0 })).toThrow(/minOrders=0/);
    expect(() => clusterStablePoles(null as never)).toThrow(RangeError);
  });
});
