// The server's suggestion of modes from a stored stabilization diagram, and the mass-normalised shapes
// of a computed model: thin adapters over packages/dsp (suggestModes, massNormalisedShapes), so the
// routes and the hand-over call one place.
import { massNormalisedShapes, suggestModes, type ModalModel, type Stability } from '@resonote/dsp';
import type { StoredDiagram } from './fit-types.ts';

export interface SuggestedMode {
  fHz: number;
  zetaPercent: number;
  representative: { order: number; index: number };
  /** Orders the mode was found at. */
  count: number;
  fSpreadPercent: number;
  zetaSpreadPercent: number;
  /** Smallest MAC of a member's shape against the representative's. */
  minMac: number;
}

export const SUGGESTION_RULE =
  'Fully stable poles count as one mode when they come back at 40 % or more of the orders within 1 % in frequency AND their shapes agree (MAC ≥ 0.9), so close modes with different shapes stay apart; the pole nearest the median frequency and damping is chosen (after Reynders, Houbrechts & De Roeck 2012). Check the suggestion on the diagram.';

const typed = (v: { re: number[]; im: number[] } | undefined) => (v ? { re: Float64Array.from(v.re), im: Float64Array.from(v.im) } : undefined);

/** The diagram as dsp's suggestModes reads it (pole vectors back to typed arrays where the fit kept them). */
export function suggestableDiagram(diagram: StoredDiagram) {
  return { orders: diagram.orders.map((o) => ({ order: o.order, poles: o.poles.map((p) => ({ fHz: p.fHz, zeta: p.zeta, stable: p.stable as Stability, shape: typed(p.shape), participation: typed(p.participation) })) })) };
}

export function suggestFromDiagram(diagram: StoredDiagram): { modes: SuggestedMode[]; rule: string } {
  return {
    rule: SUGGESTION_RULE,
    modes: suggestModes(suggestableDiagram(diagram)).map((c) => ({
      fHz: c.frequencyHz,
      zetaPercent: 100 * c.dampingRatio,
      representative: c.representative,
      count: c.orderCount,
      fSpreadPercent: c.frequencySpreadPercent,
      zetaSpreadPercent: c.dampingSpreadPercent,
      minMac: c.minMac,
    })),
  };
}

/** The DOF of a model that is both a response and a reference (on the positive axis): its driving point, or null. */
export function drivingPointOf(model: { responses: string[]; references: string[] }): string | null {
  return model.references.find((r) => model.responses.includes(r)) ?? null;
}

/**
 * Mass-normalised (unit modal mass, 1/√kg) shapes of a computed model, from the driving-point residue
 * (Ewins 2000; dsp massNormalisedShapes). Per mode null with the reason in `note` when the fit has no
 * driving point or the driving-point residue has the wrong sign for that mode.
 */
export function massShapesOf(model: ModalModel): { shapes: ({ dof: string; re: number; im: number; real: number }[] | null)[]; drivingPoint: string | null; note: string } {
  const out = massNormalisedShapes(model);
  if (!out.drivingPoint) return { shapes: model.modes.map(() => null), drivingPoint: null, note: out.note ?? 'No driving point: the shapes are unit-normalised only.' };
  const bad: string[] = [];
  const shapes = out.modes.map((m) => {
    if (m.status !== 'ok') {
      bad.push(`${m.fHz.toFixed(2)} Hz`);
      return null;
    }
    return out.responses.map((dof, j) => ({ dof, re: m.phi.re[j]!, im: m.phi.im[j]!, real: m.realPhi[j]! }));
  });
  const note = bad.length
    ? `Mass-normalised from the driving point ${out.drivingPoint}, except the mode${bad.length === 1 ? '' : 's'} at ${bad.join(', ')}: the driving-point residue has the wrong sign (a noise pole or a DOF direction error), so no unit-modal-mass shape is given.`
    : `Mass-normalised from the driving point ${out.drivingPoint} (unit modal mass, Ewins 2000).`;
  return { shapes, drivingPoint: out.drivingPoint, note };
}
