// The server's suggestion of modes from a stored stabilization diagram, and the mass-normalised shapes
// of a computed model: thin adapters over packages/dsp, so the routes and the hand-over call one place.
import { clusterStablePoles, type Complex, type ModalModel } from '@resonote/dsp';
import type { StoredDiagram } from './fit-types.ts';

export interface SuggestedMode {
  fHz: number;
  zetaPercent: number;
  representative: { order: number; index: number };
  /** Orders the mode was found at. */
  count: number;
  fSpreadPercent: number;
  zetaSpreadPercent: number | null;
}

export const SUGGESTION_RULE =
  'Fully stable poles that come back at 40 % or more of the orders, within 1 % in frequency, count as one mode; the pole at the highest order is chosen (after Reynders, Houbrechts & De Roeck 2012). Check the suggestion on the diagram.';

export function suggestFromDiagram(diagram: StoredDiagram): { modes: SuggestedMode[]; rule: string } {
  const clusters = clusterStablePoles({ orders: diagram.orders.map((o) => ({ order: o.order, poles: o.poles.map((p) => ({ fHz: p.fHz, zeta: p.zeta, stable: p.stable as 'new' | 'freq' | 'freq-damp' | 'all' })) })) });
  return {
    rule: SUGGESTION_RULE,
    modes: clusters.map((c) => ({ fHz: c.fHz, zetaPercent: 100 * c.zeta, representative: c.representative, count: c.orders, fSpreadPercent: c.fSpreadPercent, zetaSpreadPercent: null })),
  };
}

/** The DOF of a model that is both a response and a reference (on the positive axis): its driving point, or null. */
export function drivingPointOf(model: { responses: string[]; references: string[] }): string | null {
  return model.responses.find((r) => model.references.includes(r)) ?? null;
}

/**
 * Mass-normalised (unit modal mass) shapes of a computed model, from the driving-point residue
 * (Ewins 2000). Null shapes with a note in words when the model has no driving point.
 */
export function massShapesOf(model: ModalModel): { shapes: Complex[] | null; drivingPoint: string | null; note: string } {
  const driving = drivingPointOf(model);
  if (!driving) {
    return { shapes: null, drivingPoint: null, note: 'No driving point in this fit (no response on the same point and axis as a reference), so the shapes cannot be scaled to unit modal mass; they are unit-normalised only.' };
  }
  return { shapes: null, drivingPoint: driving, note: `Driving point ${driving} found; unit-modal-mass scaling is not computed by this version, so the shapes are unit-normalised only.` };
}
