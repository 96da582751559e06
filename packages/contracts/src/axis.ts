// Directions with sign. A DOF stays as the engineer wrote it (`P7:-Z`), but the physical axis is the
// point and the axis letter: `P7:-Z` and `P7:+Z` measure along the same line with opposite sign. The
// common convention of Resonote: every FRF, reciprocity pair and shape is put on the positive axis of
// each point. Since an FRF is linear in the response and in the force, reversing the measured
// direction of either end reverses the FRF: H(i,−d) = −H(i,+d) and H(−d,j) = −H(+d,j) (Ewins, Modal
// Testing: Theory, Practice and Application, 2000, §4.2 — the FRF as response over force along the
// stated directions). One function here so the API, the hand-over and the web app agree.

/** Words for screens and exports. */
export const AXIS_CONVENTION =
  'Directions: every FRF and shape is given on the positive axis of each point (+X, +Y, +Z). A DOF written with a minus sign (for example P7:-Z) was measured against that axis; its values were multiplied by −1, since H(i,−d) = −H(i,+d).';

export interface CanonicalDof {
  /** The DOF as written, e.g. `P7:-Z`. */
  written: string;
  point: string;
  axis: 'X' | 'Y' | 'Z';
  /** +1 if written along the positive axis, −1 against it. */
  sign: 1 | -1;
  /** The DOF on the positive axis, e.g. `P7:+Z`: the key that identifies the physical axis. */
  canonical: string;
}

/** Reads `point:±axis`; null when the label is not a DOF. */
export function canonicalDof(label: string): CanonicalDof | null {
  const m = /^(.+):([+-])([XYZxyz])$/.exec(label.trim());
  if (!m) return null;
  const axis = m[3]!.toUpperCase() as 'X' | 'Y' | 'Z';
  return { written: label.trim(), point: m[1]!, axis, sign: m[2] === '-' ? -1 : 1, canonical: `${m[1]}:+${axis}` };
}

/** The DOF on the positive axis; a label that is not a DOF is returned unchanged. */
export const canonicalLabel = (label: string): string => canonicalDof(label)?.canonical ?? label;

/** The sign that brings values measured along `label` onto the positive axis (+1 or −1). */
export const axisSign = (label: string): 1 | -1 => canonicalDof(label)?.sign ?? 1;

/** True when two DOFs lie on the same physical axis (same point and axis letter), whatever their signs. */
export function sameAxis(a: string, b: string): boolean {
  const x = canonicalDof(a);
  const y = canonicalDof(b);
  return Boolean(x && y && x.canonical === y.canonical);
}

/**
 * The factor that puts an FRF H(response, reference), measured along the written directions, on
 * the positive axes of both points: sign(response)·sign(reference). A driving point measured as
 * P:−Z against P:+Z gets −1, so its imaginary accelerance part has the usual driving-point sign.
 */
export const frfAxisFactor = (response: string, reference: string): 1 | -1 => (axisSign(response) * axisSign(reference)) as 1 | -1;

/**
 * True when entry b is the reciprocal of entry a (response and excitation swapped), by physical
 * axis whatever the written signs; a driving point has no reciprocal. The reciprocity check pairs
 * entries with it (Ewins 2000, Modal Testing, ch. 3), and the web uses it to tell which checks a
 * new hit can change.
 */
export const isReciprocal = (a: { responseDof: string; excitationDof: string }, b: { responseDof: string; excitationDof: string }): boolean =>
  sameAxis(a.responseDof, b.excitationDof) && sameAxis(a.excitationDof, b.responseDof) && !sameAxis(a.responseDof, a.excitationDof);
