// A ModalModel of packages/dsp as JSON (typed arrays → number arrays) and back: fits keep the whole
// model for synthesis; each row of the mode table keeps its one mode.
import type { Complex, ModalModel } from '@resonote/dsp';

export interface StoredMode {
  fHz: number;
  zeta: number;
  lambda: { re: number; im: number };
  residues: { re: number[]; im: number[] }[];
  shape: { re: number[]; im: number[] };
  shapeReference: string;
  mpc: number;
  realShape: number[];
}

export interface StoredModel {
  kind: ModalModel['kind'];
  bandHz: [number, number];
  responses: string[];
  references: string[];
  transposed: boolean;
  modes: StoredMode[];
  residuals: { upper: number[][]; lower: number[][] } | null;
}

export function storeModel(m: ModalModel): StoredModel {
  const c = (x: Complex) => ({ re: Array.from(x.re), im: Array.from(x.im) });
  return {
    kind: m.kind,
    bandHz: m.bandHz,
    responses: m.responses,
    references: m.references,
    transposed: m.transposed,
    modes: m.modes.map((x) => ({ fHz: x.fHz, zeta: x.zeta, lambda: x.lambda, residues: x.residues.map(c), shape: c(x.shape), shapeReference: x.shapeReference, mpc: x.mpc, realShape: Array.from(x.realShape) })),
    residuals: m.residuals ? { upper: m.residuals.upper.map((a) => Array.from(a)), lower: m.residuals.lower.map((a) => Array.from(a)) } : null,
  };
}

export function loadModel(s: StoredModel): ModalModel {
  const c = (x: { re: number[]; im: number[] }) => ({ re: Float64Array.from(x.re), im: Float64Array.from(x.im) });
  return {
    kind: s.kind,
    bandHz: s.bandHz,
    responses: s.responses,
    references: s.references,
    transposed: s.transposed,
    modes: s.modes.map((x) => ({ fHz: x.fHz, zeta: x.zeta, lambda: x.lambda, residues: x.residues.map(c), shape: c(x.shape), shapeReference: x.shapeReference, mpc: x.mpc, realShape: Float64Array.from(x.realShape) })),
    residuals: s.residuals ? { upper: s.residuals.upper.map((a) => Float64Array.from(a)), lower: s.residuals.lower.map((a) => Float64Array.from(a)) } : null,
  };
}

/** The model of one mode alone, without residual terms (they belong to the fitted band only). */
export function singleMode(s: StoredModel, index: number): StoredModel {
  return { ...s, modes: [s.modes[index]!], residuals: null };
}
