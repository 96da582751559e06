// Suggesting the physical modes of a stabilization diagram by frequency AND shape: a pole joins a mode
// when it is close in frequency, its vectors agree with the mode's (MAC), and the mode has no pole of that
// order yet. So two modes 0.5 % apart with different shapes (or, with several references, different
// participation) stay two modes. Physical poles persist across orders, noise poles do not (the usual basis of
// automated pole selection, e.g. Reynders, Houbrechts & De Roeck, MSSP 29 (2012) 228–250; cited from memory).
import { mac } from '../assurance.ts';
import { median } from '../stats.ts';
import type { Complex } from '../types.ts';
import type { Stability } from './stability.ts';
import { groupKeepRules, type GroupKeepOptions } from './grouping-options.ts';

/** What `suggestModes` needs of a diagram pole; the vectors are optional (a diagram sent to a browser may lack them). */
export interface SuggestablePole {
  fHz: number;
  zeta: number;
  stable: Stability;
  shape?: Complex;
  participation?: Complex;
}

export interface SuggestOptions extends GroupKeepOptions {
  /** Largest |Δf|/f between a pole and the mode's latest member; default 0.01 with vectors, 0.002 without. */
  frequencyTolerance?: number;
  /** Smallest MAC between a pole's vectors (shape, and participation when there are ≥ 2 references) and the mode's latest member; default 0.9. */
  macThreshold?: number;
  /** Poles of these classes are clustered; default ['all'] (stable in f, ζ and vector). */
  classes?: Stability[];
}

/** One suggested mode. */
export interface SuggestedMode {
  /** Median natural frequency (Hz) and damping ratio (fraction of critical) of the members. */
  frequencyHz: number;
  dampingRatio: number;
  /** The member nearest the medians of f and ζ: its order and index into that order's `poles`. */
  representative: { order: number; index: number };
  /** Number of orders with a member, and that over the diagram's orders. */
  orderCount: number;
  share: number;
  /** (max − min)/median of the members' f and ζ, in %. */
  frequencySpreadPercent: number;
  dampingSpreadPercent: number;
  /** Smallest MAC of a member's shape against the representative's (1 when the diagram has no vectors). */
  minMac: number;
}

interface Member {
  order: number;
  index: number;
  p: SuggestablePole;
}

/**
 * Groups the stable poles of a stabilization diagram into modes, order by order: each pole (nearest first)
 * joins the mode whose latest member is nearest in frequency among those within `frequencyTolerance`, with
 * MAC ≥ `macThreshold` on the shape and (≥ 2 references) on the participation vector, and without a pole of
 * this order; otherwise it starts a mode. Then members with stray damping are dropped and modes seen at too
 * few orders are discarded. Thresholds are Resonote's defaults (common practice, not a standard); the lead
 * reviews the suggestion on the diagram. In: a diagram (as from `stabilizationDiagram`). Out: modes by frequency.
 */
export function suggestModes(diagram: { orders: { order: number; poles: SuggestablePole[] }[] }, options: SuggestOptions = {}): SuggestedMode[] {
  if (!diagram || !Array.isArray(diagram.orders)) throw new RangeError('diagram has no orders: run stabilizationDiagram first');
  const withVectors = diagram.orders.some((o) => o.poles.some((p) => p.shape && p.shape.re && p.shape.re.length > 0));
  const fTol = options.frequencyTolerance ?? (withVectors ? 0.01 : 0.002);
  const macMin = options.macThreshold ?? 0.9;
  const classes = options.classes ?? ['all'];
  const { dTol, minShare, minOrders } = groupKeepRules(options, [
    ['frequencyTolerance', fTol, 0, 0.5],
    ['macThreshold', macMin, 0, 1],
  ]);
  if (!Array.isArray(classes) || classes.length === 0) throw new RangeError('classes is empty: give stability classes such as ["all"]');
  const totalOrders = diagram.orders.length;
  if (totalOrders === 0) return [];

  const modes: Member[][] = [];
  const agree = (a: SuggestablePole, b: SuggestablePole): number => {
    let m = 1;
    if (a.shape && b.shape && a.shape.re.length === b.shape.re.length && a.shape.re.length > 0) m = Math.min(m, mac(a.shape, b.shape));
    if (a.participation && b.participation && a.participation.re.length > 1 && a.participation.re.length === b.participation.re.length) {
      m = Math.min(m, mac(a.participation, b.participation));
    }
    return m;
  };
  const byOrder = [...diagram.orders].sort((a, b) => a.order - b.order);
  for (const row of byOrder) {
    const cand = row.poles
      .map((p, index) => ({ order: row.order, index, p }))
      .filter((m) => classes.includes(m.p.stable) && m.p.fHz > 0 && Number.isFinite(m.p.fHz) && m.p.zeta > 0 && Number.isFinite(m.p.zeta));
    // all (pole, mode) pairs that may join, nearest in frequency first
    const pairs: { c: number; k: number; df: number }[] = [];
    cand.forEach((m, c) => {
      modes.forEach((mode, k) => {
        const last = mode[mode.length - 1];
        const df = Math.abs(m.p.fHz - last.p.fHz) / last.p.fHz;
        if (df <= fTol && agree(m.p, last.p) >= macMin) pairs.push({ c, k, df });
      });
    });
    pairs.sort((a, b) => a.df - b.df);
    const usedPole = new Set<number>();
    const usedMode = new Set<number>();
    for (const { c, k } of pairs) {
      if (usedPole.has(c) || usedMode.has(k)) continue;
      usedPole.add(c);
      usedMode.add(k);
      modes[k].push(cand[c]);
    }
    cand.forEach((m, c) => {
      if (!usedPole.has(c)) modes.push([m]);
    });
  }

  const out: SuggestedMode[] = [];
  for (const mode of modes) {
    const zMid = median(mode.map((m) => m.p.zeta));
    const members = mode.filter((m) => Math.abs(m.p.zeta - zMid) <= dTol * zMid);
    if (members.length < minOrders || members.length < minShare * totalOrders) continue;
    const fs = members.map((m) => m.p.fHz);
    const zs = members.map((m) => m.p.zeta);
    const f = median(fs);
    const z = median(zs);
    // representative: the member nearest the medians (f by the frequency tolerance, ζ by the damping tolerance)
    const dist = (m: Member) => Math.hypot((m.p.fHz - f) / (fTol * f), (m.p.zeta - z) / (dTol * z));
    const top = members.reduce((a, b) => (dist(b) < dist(a) ? b : a));
    let minMac = 1;
    for (const m of members) if (m !== top) minMac = Math.min(minMac, agree(m.p, top.p));
    out.push({
      frequencyHz: f,
      dampingRatio: z,
      representative: { order: top.order, index: top.index },
      orderCount: members.length,
      share: members.length / totalOrders,
      frequencySpreadPercent: (100 * (Math.max(...fs) - Math.min(...fs))) / f,
      dampingSpreadPercent: (100 * (Math.max(...zs) - Math.min(...zs))) / z,
      minMac,
    });
  }
  return out.sort((a, b) => a.frequencyHz - b.frequencyHz);
}
