/**
 * DOF labels: `<pointLabel>:<sign><axis>`, e.g. `12:+Z`, `P07:-Y` (docs/methods.md#dof-signs).
 * The axis is X, Y or Z of the right-handed global frame; the sign is `+`, `-` or the Unicode minus
 * `−` (U+2212), which is accepted on input and written back as ASCII `-`.
 */

export type Axis = 'X' | 'Y' | 'Z';

export interface ParsedDof {
  /** Point label, e.g. `P07`. */
  point: string;
  axis: Axis;
  /** +1 for a positive direction, −1 for a negative one. */
  sign: 1 | -1;
  /** Canonical label with ASCII sign, e.g. `P07:-Y`. */
  label: string;
  /** Canonical label of the positive direction at the same point, e.g. `P07:+Y`. */
  positive: string;
}

const DOF_PATTERN = /^(.+):([+\-\u2212])([XYZ])$/;

/**
 * Parses a DOF label. Throws RangeError naming the label when it is malformed.
 */
export function parseDof(label: string): ParsedDof {
  if (typeof label !== 'string') throw new RangeError(`dof=${String(label)} must be a string like "12:+Z"`);
  const m = DOF_PATTERN.exec(label);
  if (!m) throw new RangeError(`dof="${label}" is not a DOF label of the form "<point>:<+|-><X|Y|Z>"`);
  const point = m[1];
  const axis = m[3] as Axis;
  const sign: 1 | -1 = m[2] === '+' ? 1 : -1;
  return {
    point,
    axis,
    sign,
    label: `${point}:${sign > 0 ? '+' : '-'}${axis}`,
    positive: `${point}:+${axis}`,
  };
}

/** Builds a canonical DOF label, e.g. `dofLabel('B01', 'Z')` → `B01:+Z`. */
export function dofLabel(point: string, axis: Axis, sign: 1 | -1 = 1): string {
  return `${point}:${sign > 0 ? '+' : '-'}${axis}`;
}
