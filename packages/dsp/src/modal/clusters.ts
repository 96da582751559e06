// Suggesting the physical modes of a stabilization diagram: fully stable poles that come back at
// many model orders at the same frequency and damping are one mode; a pole that passes the checks at
// one or two orders only is a numerical (noise) pole. This replaces "take the stable poles of the
// highest order", which at high orders can pick noise poles that happen to pass the three checks.
import { median } from '../stats.ts';
import { groupKeepRules, type GroupKeepOptions } from './grouping-options.ts';

/** What clustering needs of a diagram pole. */
export interface ClusterablePole {
  fHz: number;
  zeta: number;
  stable: 'new' | 'freq' | 'freq-damp' | 'all';
}

export interface PoleClusterOptions extends GroupKeepOptions {
  /** Poles closer than this relative frequency gap chain into one cluster; default 0.01 (1 %, the frequency tolerance of the stability checks). */
  frequencyTolerance?: number;
}

export interface PoleCluster {
  /** Median natural frequency (Hz) and damping ratio (fraction of critical) of the members. */
  fHz: number;
  zeta: number;
  /** Spread of the members: (max − min)/median of f, in %. */
  fSpreadPercent: number;
  /** Number of orders the cluster has a pole at, and that number over the diagram's orders. */
  orders: number;
  share: number;
  /** The member at the highest order: the pole to choose for shapes (its order and index in that order's list). */
  representative: { order: number; index: number };
}

/**
 * Groups the fully stable ('all') poles of a stabilization diagram into modes.
 *
 * 1. The 'all' poles of every order, sorted by frequency, are chained: a gap larger than
 *    `frequencyTolerance`·f starts a new cluster (single linkage in frequency).
 * 2. In each cluster one pole per order is kept (the one nearest the cluster's median frequency), and
 *    members whose damping ratio strays more than `dampingTolerance` from the median are dropped.
 * 3. A cluster is a mode when its poles come from at least `minShare` of the diagram's orders and at
 *    least `minOrders` orders; its representative is the member at the highest order.
 *
 * The idea — physical poles persist across model orders, spurious ones do not, so cluster the stable
 * poles and keep the populous clusters — is the usual basis of automated pole selection (e.g.
 * Reynders, Houbrechts & De Roeck, Mech. Syst. Signal Process. 29 (2012) 228–250; cited from memory).
 * The thresholds are Resonote's defaults (common practice, not a standard): the lead reviews the
 * suggestion on the diagram before computing shapes.
 *
 * In: diagram orders with their poles (Hz, fraction of critical, stability class). Out: clusters by
 * ascending frequency.
 */
export function clusterStablePoles(diagram: { orders: { order: number; poles: ClusterablePole[] }[] }, options: PoleClusterOptions = {}): PoleCluster[] {
  if (!diagram || !Array.isArray(diagram.orders)) throw new RangeError('diagram has no orders: run stabilizationDiagram first');
  const tol = options.frequencyTolerance ?? 0.01;
  const { dTol, minShare, minOrders } = groupKeepRules(options, [['frequencyTolerance', tol, 0, 0.5]]);
  const totalOrders = diagram.orders.length;
  if (totalOrders === 0) return [];

  const stable = diagram.orders
    .flatMap((o) => o.poles.map((p, index) => ({ order: o.order, index, fHz: p.fHz, zeta: p.zeta, stable: p.stable })))
    .filter((p) => p.stable === 'all' && p.fHz > 0 && Number.isFinite(p.fHz) && Number.isFinite(p.zeta))
    .sort((a, b) => a.fHz - b.fHz);

  const chains: (typeof stable)[] = [];
  for (const p of stable) {
    const last = chains.at(-1);
    const prev = last?.at(-1);
    if (last && prev && (p.fHz - prev.fHz) / prev.fHz <= tol) last.push(p);
    else chains.push([p]);
  }

  const clusters: PoleCluster[] = [];
  for (const chain of chains) {
    const fMid = median(chain.map((p) => p.fHz));
    const perOrder = new Map<number, (typeof chain)[number]>();
    for (const p of chain) {
      const seen = perOrder.get(p.order);
      if (!seen || Math.abs(p.fHz - fMid) < Math.abs(seen.fHz - fMid)) perOrder.set(p.order, p);
    }
    let members = [...perOrder.values()];
    const zMid = median(members.map((p) => p.zeta));
    members = members.filter((p) => Math.abs(p.zeta - zMid) <= dTol * zMid);
    if (members.length < minOrders || members.length < minShare * totalOrders) continue;
    const fs = members.map((p) => p.fHz);
    const f = median(fs);
    const top = members.reduce((a, b) => (b.order > a.order ? b : a));
    clusters.push({
      fHz: f,
      zeta: median(members.map((p) => p.zeta)),
      fSpreadPercent: (100 * (Math.max(...fs) - Math.min(...fs))) / f,
      orders: members.length,
      share: members.length / totalOrders,
      representative: { order: top.order, index: top.index },
    });
  }
  return clusters;
}
