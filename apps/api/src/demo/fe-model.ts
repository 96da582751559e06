// An FE model of a demo structure, made from the simulator's own modal model with a deliberate
// stiffness difference, written in Resonote's FE-modes CSV (docs/fe-model-format.md).
//
// How: the whole stiffness matrix is taken `stiffnessFactor` times the simulator's (K' = c·K, M
// unchanged). Then K'φ = ω'²Mφ has the same mass-normalised eigenvectors φ and ω' = √c·ω, so each
// frequency is the simulator's times √c and the shapes are the simulator's unchanged (closed form:
// f ∝ √(k/m), e.g. Blevins 1979). With c = 1.04 the model is 1.98 % stiffer in frequency than the
// structure the simulated rig measures; a test should read (1/√1.04 − 1) = −1.94 % against it.
import { feModelToCsv, type FeModel } from '@resonote/contracts';
import type { DemoStructure } from '@resonote/sim';

/** The demo model's stiffness relative to the simulated structure (4 % stiffer). */
export const DEMO_MODEL_STIFFNESS_FACTOR = 1.04;

const AXES = ['X', 'Y', 'Z'] as const;

/** Nodes at the structure's points (mm); elastic modes (f > 0) with the mass-normalised shapes (1/√kg). */
export function feModelFromStructure(structure: DemoStructure, stiffnessFactor = DEMO_MODEL_STIFFNESS_FACTOR, name?: string): FeModel {
  if (!(stiffnessFactor > 0) || !Number.isFinite(stiffnessFactor)) throw new RangeError(`stiffnessFactor=${stiffnessFactor} must be > 0`);
  const nodes = structure.points.map((p) => ({ label: p.label, x: p.xMm, y: p.yMm, z: p.zMm }));
  const elastic = structure.model.modes.filter((m) => m.fnHz > 0).sort((a, b) => a.fnHz - b.fnHz);
  const modes = elastic.map((m, r) => ({
    number: r + 1,
    frequencyHz: m.fnHz * Math.sqrt(stiffnessFactor),
    modalMassKg: null,
    shape: nodes.flatMap((n) =>
      AXES.map((a) => {
        const plus = m.shape[`${n.label}:+${a}`];
        const minus = m.shape[`${n.label}:-${a}`];
        return plus ?? (minus !== undefined ? -minus : 0);
      }),
    ),
  }));
  return { name: name ?? `${structure.name} — model (stiffness ×${stiffnessFactor})`, normalisation: 'mass', fileUnits: { length: 'mm', frequency: 'Hz', mass: 'kg' }, nodes, modes };
}

export const feModelCsvFromStructure = (structure: DemoStructure, stiffnessFactor = DEMO_MODEL_STIFFNESS_FACTOR, name?: string): string =>
  feModelToCsv(feModelFromStructure(structure, stiffnessFactor, name));
