import type { ModalModel } from './modal-model.ts';

/** A geometry point: label and coordinates in mm in the right-handed global frame. */
export interface GeometryPoint {
  label: string;
  xMm: number;
  yMm: number;
  zMm: number;
}

/**
 * A demo structure: points and lines for the wireframe, and the modal model whose DOF labels use
 * the same point labels (`<label>:<±X|±Y|±Z>`).
 */
export interface DemoStructure {
  name: string;
  /** Plain-words description, including what is approximate or invented. */
  description: string;
  points: GeometryPoint[];
  lines: [string, string][];
  model: ModalModel;
}
