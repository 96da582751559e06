// Pre-test planning from a model (issue 19; docs/methods.md): the modes of interest, candidate DOFs,
// Effective Independence (Kammer 1991) to keep N of them, the driving-point measure to propose the
// reference among the kept ones, and the auto-MAC of the kept set.
import { modelShapesAtDofs, type FeModel, type PointNodeLink } from '@resonote/contracts';
import { autoMac, drivingPointMeasure, effectiveIndependence } from '@resonote/dsp';
import { HttpError } from '../errors.ts';

export interface ProposalInput {
  bandHz?: [number, number];
  modes?: number[];
  candidates: 'nodes' | 'points';
  axes: ('X' | 'Y' | 'Z')[];
  sensors: number;
  threshold: number;
  keep?: string[];
}

interface Candidate {
  dof: string;
  node: string;
  x: number;
  y: number;
  z: number;
  /** One value per chosen mode. */
  values: number[];
}

const AXIS = { X: 0, Y: 1, Z: 2 } as const;
const bad = (message: string, details?: unknown) => new HttpError(400, 'cannot-propose', message, details);

export function chooseModes(model: FeModel, input: Pick<ProposalInput, 'bandHz' | 'modes'>) {
  let chosen = model.modes;
  if (input.bandHz) {
    const [lo, hi] = input.bandHz;
    chosen = model.modes.filter((m) => m.frequencyHz >= lo && m.frequencyHz <= hi);
    if (!chosen.length) throw bad(`No mode of the model lies between ${lo} and ${hi} Hz (the model's modes run from ${model.modes[0]?.frequencyHz.toFixed(2)} to ${model.modes.at(-1)?.frequencyHz.toFixed(2)} Hz).`);
  } else if (input.modes) {
    const want = new Set(input.modes);
    chosen = model.modes.filter((m) => want.has(m.number));
    const missing = input.modes.filter((n) => !model.modes.some((m) => m.number === n));
    if (missing.length) throw bad(`The model has no mode numbered ${missing.join(', ')}.`);
  }
  return chosen;
}

export function proposePlan(model: FeModel, links: readonly PointNodeLink[], points: readonly { label: string; x: number; y: number; z: number }[], input: ProposalInput) {
  const modes = chooseModes(model, input);
  const axes = [...new Set(input.axes)];
  let candidates: Candidate[];
  if (input.candidates === 'nodes') {
    candidates = model.nodes.flatMap((n, k) =>
      axes.map((a) => ({ dof: `${n.label}:+${a}`, node: n.label, x: n.x, y: n.y, z: n.z, values: modes.map((m) => m.shape[3 * k + AXIS[a]]!) })),
    );
  } else {
    const dofLabels = points.flatMap((p) => axes.map((a) => `${p.label}:+${a}`));
    const sub: FeModel = { ...model, modes };
    const at = modelShapesAtDofs(sub, links, dofLabels);
    if (!at.dofs.length) throw bad('No test point is linked to a model node yet: map the points to the model first, or plan from the model nodes.');
    const pointBy = new Map(points.map((p) => [p.label, p]));
    const linkBy = new Map(links.map((l) => [l.point, l.node]));
    candidates = at.dofs.map((dof, i) => {
      const label = dof.split(':')[0]!;
      const p = pointBy.get(label)!;
      return { dof, node: linkBy.get(label) ?? '', x: p.x, y: p.y, z: p.z, values: at.shapes.map((s) => s[i]!) };
    });
  }
  const n = candidates.length;
  const m = modes.length;
  if (input.sensors < m) throw bad(`Keep at least as many DOFs as modes of interest: ${m} modes, ${input.sensors} DOFs asked. Narrow the band or ask for more DOFs.`);
  if (input.sensors > n) throw bad(`There are only ${n} candidate DOFs (${input.candidates === 'nodes' ? 'model nodes' : 'mapped points'} × ${axes.join(', ')}); ask for at most ${n}.`);
  const index = new Map(candidates.map((c, i) => [c.dof.toLowerCase(), i]));
  const keep = (input.keep ?? []).map((d) => {
    const i = index.get(d.trim().toLowerCase());
    if (i === undefined) throw bad(`The DOF ${d} to keep is not among the candidates.`);
    return i;
  });
  const shapes = modes.map((_, r) => Float64Array.from(candidates, (c) => c.values[r]!));
  let efi;
  try {
    efi = effectiveIndependence(shapes, { target: input.sensors, keep });
  } catch (e) {
    if (e instanceof RangeError) throw bad(`Effective Independence cannot run on these candidates: ${e.message}.`);
    throw e;
  }
  const kept = Array.from(efi.kept);
  const edOf = new Map(kept.map((i, k) => [i, efi.ed[k]!]));
  const rankOf = new Map(Array.from(efi.ranking).map((i, r) => [i, r + 1]));
  const keptView = kept
    .map((i) => ({ dof: candidates[i]!.dof, node: candidates[i]!.node, x: candidates[i]!.x, y: candidates[i]!.y, z: candidates[i]!.z, ed: edOf.get(i)!, rank: rankOf.get(i)! }))
    .sort((a, b) => a.rank - b.rank);
  const ranking = Array.from(efi.ranking)
    .slice(0, 500)
    .map((i, r) => ({ rank: r + 1, dof: candidates[i]!.dof, initialEd: efi.initialEd[i]!, kept: edOf.has(i) }));

  const keptShapes = modes.map((_, r) => Float64Array.from(kept, (i) => candidates[i]!.values[r]!));
  let dp;
  try {
    dp = drivingPointMeasure(keptShapes);
  } catch (e) {
    if (e instanceof RangeError) throw bad(`The driving-point measure cannot run on the kept DOFs: ${e.message}.`);
    throw e;
  }
  const dpView = (k: number) => ({ dof: candidates[kept[k]!]!.dof, product: dp.product[k]!, geometricMean: dp.geometricMean[k]!, minimum: dp.minimum[k]!, weakestMode: modes[dp.weakestMode[k]!]!.number });
  const reference = dpView(dp.ranking[0]!);
  const referenceAlternatives = Array.from(dp.ranking).slice(1, 6).map(dpView);

  const am = autoMac(keptShapes, { threshold: input.threshold });
  const modeView = modes.map((md) => ({ number: md.number, frequencyHz: md.frequencyHz }));
  const worst = am.maxOffDiagonal;
  const describe = (a: number, b: number) => `mode ${modes[a]!.number} (${modes[a]!.frequencyHz.toFixed(1)} Hz) and mode ${modes[b]!.number} (${modes[b]!.frequencyHz.toFixed(1)} Hz)`;
  const words = !worst
    ? 'One mode of interest: there is no pair to tell apart.'
    : worst.value >= input.threshold
      ? `The largest off-diagonal auto-MAC is ${worst.value.toFixed(3)}, between ${describe(worst.a, worst.b)}: at or above the threshold ${input.threshold}, so these DOFs do not tell those modes apart well. ${am.above.length} pair${am.above.length > 1 ? 's' : ''} reach the threshold; add DOFs, another axis, or keep other candidates.`
      : `The largest off-diagonal auto-MAC is ${worst.value.toFixed(3)}, between ${describe(worst.a, worst.b)}: below the threshold ${input.threshold}, so the planned DOFs tell the ${m} modes apart.`;
  const refWords =
    reference.minimum > 0
      ? `Proposed reference ${reference.dof}: every mode of interest moves there; the weakest, mode ${reference.weakestMode}, at ${(100 * reference.minimum).toFixed(0)} % of its largest amplitude.`
      : `Proposed reference ${reference.dof}, but mode ${reference.weakestMode} has a node there: no kept DOF sees every mode; consider two references.`;
  return {
    modes: modeView,
    candidates: { kind: input.candidates, axes, count: n },
    sensors: input.sensors,
    kept: keptView,
    ranking,
    informationKept: efi.informationKept,
    reference,
    referenceAlternatives,
    referenceWords: refWords,
    autoMac: { matrix: am.matrix.map((r) => Array.from(r)), maxOffDiagonal: worst ? { a: modes[worst.a]!.number, b: modes[worst.b]!.number, value: worst.value } : null, above: am.above.map((p) => ({ a: modes[p.a]!.number, b: modes[p.b]!.number, value: p.value })), threshold: input.threshold, words },
    method:
      'Effective Independence (Kammer 1991) keeps the DOFs that keep the modes most independent; the reference is the kept DOF with the largest product of relative modal amplitudes over the modes of interest; auto-MAC (Allemang & Brown 1982) of the kept set.',
  };
}
