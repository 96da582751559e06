// The "simulated rig": hits from @resonote/sim for any campaign, so anyone can try Resonote
// without hardware. The demo bar and baseplate use their own models; any other geometry gets a
// beam-like model along its longest extent (the free-free bar's Euler–Bernoulli modes scaled to
// that length) — invented, for trying the workflow, not a model of the real structure.
import { pumpSkidBaseplate, steelBarModel, type ModalModel } from '@resonote/sim';

export interface RigPoint {
  label: string;
  x: number;
  y: number;
  z: number;
}

export function rigModel(kind: 'steel-bar' | 'pump-skid' | 'generic', points: RigPoint[]): ModalModel {
  if (points.length === 0) throw new RangeError('the campaign has no points to simulate');
  if (kind === 'pump-skid') {
    const plate = pumpSkidBaseplate();
    const labels = new Set(plate.points.map((p) => p.label));
    if (points.every((p) => labels.has(p.label))) return plate.model;
  }
  const extent = (axis: 'x' | 'y' | 'z') => Math.max(...points.map((p) => p[axis])) - Math.min(...points.map((p) => p[axis]));
  const axis = kind === 'steel-bar' ? 'x' : (['x', 'y', 'z'] as const).reduce((a, b) => (extent(b) > extent(a) ? b : a));
  const min = Math.min(...points.map((p) => p[axis]));
  const lengthMm = Math.max(extent(axis), 100);
  return steelBarModel({
    points: points.map((p) => ({ label: p.label, xM: (p[axis] - min) / 1000 })),
    lengthM: kind === 'steel-bar' ? Math.max(lengthMm, 1000) / 1000 : lengthMm / 1000,
  });
}

/** Contact time of the hammer tips offered by the simulated rig (harder tip → shorter contact, docs/methods.md#roll-off). */
export const rigTips = { soft: 2.0e-3, medium: 0.8e-3, hard: 0.3e-3 } as const;

/** Noise floors of the rig's measurement chain, rms: invented for a plausible IEPE chain, not a datasheet value. */
export const rigNoise = { forceN: 0.02, responseMs2: 0.005 } as const;
