import type { StabilityTolerances } from '@resonote/dsp';
import type { FrfKind } from '@resonote/contracts';

export interface FitJob {
  f: Float64Array;
  kind: FrfKind;
  frfs: { response: string; reference: string; re: Float64Array; im: Float64Array }[];
  bandHz: [number, number];
  orders: number[];
  tolerances: Partial<StabilityTolerances>;
}

export interface StoredDiagram {
  bandHz: [number, number];
  dtS: number;
  lines: number;
  responses: string[];
  references: string[];
  transposed: boolean;
  orders: { order: number; poles: { fHz: number; zeta: number; stable: string; lambda: { re: number; im: number }; shape?: { re: number[]; im: number[] }; participation?: { re: number[]; im: number[] } }[] }[];
}

export interface FitResult {
  cmif: { f: number[]; values: number[][] };
  diagram: StoredDiagram;
  /** CMIF peaks with no suggested mode near them (dsp cmifPeaksWithoutColumn), Hz. */
  cmifPeaksWithoutColumn?: number[];
}

export type FitMessage =
  | { type: 'progress'; progress: number; message: string }
  | { type: 'done'; result: FitResult }
  | { type: 'failed'; message: string };
