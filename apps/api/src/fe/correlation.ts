// Test ↔ model correlation (issue 19; docs/methods.md): the campaign's mode table (test) against one
// stored model version, over the test DOFs whose points are linked to model nodes. Pairs by MAC
// (Allemang & Brown 1982), frequency difference in %, the MAC matrix, and cross-orthogonality with the
// SEREP-reduced mass (O'Callahan, Avitabile & Riemer 1989) where both sides have mass-normalised shapes.
import { canonicalLabel, massNormalisedShape, modelShapesAtDofs, type FeModel, type PointNodeLink } from '@resonote/contracts';
import { crossOrthogonality, macPairs } from '@resonote/dsp';
import type { Db } from '@resonote/db/client';
import type { Tx } from '../http/audit.ts';
import { tableRows } from '../modes/mode-table.ts';

export interface TestMode {
  /** 1-based position in the mode table (by frequency). */
  mode: number;
  fHz: number;
  /** Real part of the unit-normalised shape per DOF (positive axis of each point). */
  shape: Map<string, number>;
  /** Mass-normalised real shape (1/√kg) per DOF, or null. */
  massShape: Map<string, number> | null;
}

/**
 * The test modes to correlate: the campaign's mode table (GET …/modes), every row in frequency order.
 * The one place the test side comes from, so another source can be put here.
 */
export async function testModesForCorrelation(db: Db | Tx, campaignId: string): Promise<{ source: string; modes: TestMode[] }> {
  const rows = await tableRows(db, campaignId);
  const toMap = (s: unknown) => new Map((s as { dof: string; real: number }[]).map((e) => [canonicalLabel(e.dof), e.real]));
  return {
    source: "the campaign's mode table",
    modes: rows.map((r, i) => ({ mode: i + 1, fHz: r.fHz, shape: toMap(r.shape), massShape: r.massShape ? toMap(r.massShape) : null })),
  };
}

/** Model modes within the tested band widened by half on each side take part (Resonote's rule). */
export const MODEL_BAND_MARGIN = 0.5;

export type Correlation = ReturnType<typeof correlate>;

export function correlate(model: FeModel, links: readonly PointNodeLink[], test: { source: string; modes: TestMode[] }, minMac = 0.6) {
  const empty = (why: string) => ({ ok: false as const, why, source: test.source });
  if (!test.modes.length) return empty('The mode table is empty: fit modes and add them to the table first.');
  const mapped = links.filter((l) => l.node).length;
  if (!mapped) return empty('No test point is linked to a model node: map the points to the model first.');
  let dofs = [...test.modes[0]!.shape.keys()];
  for (const t of test.modes.slice(1)) dofs = dofs.filter((d) => t.shape.has(d));
  const fLo = Math.min(...test.modes.map((t) => t.fHz)) * (1 - MODEL_BAND_MARGIN);
  const fHi = Math.max(...test.modes.map((t) => t.fHz)) * (1 + MODEL_BAND_MARGIN);
  const modelModes = model.modes.filter((m) => m.frequencyHz >= fLo && m.frequencyHz <= fHi);
  if (!modelModes.length) return empty(`The model has no mode between ${fLo.toFixed(1)} and ${fHi.toFixed(1)} Hz, the tested band widened by half.`);
  const sub: FeModel = { ...model, modes: modelModes };
  const at = modelShapesAtDofs(sub, links, dofs);
  if (at.dofs.length < 2) return empty(`Only ${at.dofs.length} DOF measured in every test mode is linked to a model node; MAC needs at least 2.`);
  const testVec = test.modes.map((t) => Float64Array.from(at.dofs, (d) => t.shape.get(d)!));
  let pairs;
  try {
    pairs = macPairs(
      test.modes.map((t, i) => ({ frequencyHz: t.fHz, shape: testVec[i]! })),
      modelModes.map((m, r) => ({ frequencyHz: m.frequencyHz, shape: Float64Array.from(at.shapes[r]!) })),
      { minMac },
    );
  } catch (e) {
    if (e instanceof RangeError) return empty(`The shapes cannot be compared: ${e.message}.`);
    throw e;
  }
  const pairView = pairs.pairs.map((p) => ({
    testMode: test.modes[p.test]!.mode,
    modelMode: modelModes[p.model]!.number,
    testHz: p.testHz,
    modelHz: p.modelHz,
    mac: p.mac,
    frequencyDifferencePercent: p.frequencyDifferencePercent,
  }));

  // Cross-orthogonality over the pairs, where both sides are mass-normalised.
  let xo: { ok: true; method: string; matrix: number[][]; diagonal: number[]; maxOffDiagonal: number | null; words: string } | { ok: false; why: string };
  const massModel = modelModes.map((m) => massNormalisedShape(sub, m));
  const paired = pairs.pairs;
  if (!paired.length) xo = { ok: false, why: 'No pair of modes: nothing to check.' };
  else if (massModel.some((s, r) => !s && paired.some((p) => p.model === r))) xo = { ok: false, why: 'The model gives neither mass-normalised shapes nor modal masses, so cross-orthogonality cannot be computed.' };
  else if (paired.some((p) => !test.modes[p.test]!.massShape || at.dofs.some((d) => !test.modes[p.test]!.massShape!.has(d))))
    xo = { ok: false, why: 'Not every paired test mode has a mass-normalised shape (a fit with a driving point gives one), so cross-orthogonality cannot be computed.' };
  else if (at.dofs.length < paired.length) xo = { ok: false, why: `Cross-orthogonality with the reduced mass needs at least as many DOFs (${at.dofs.length}) as paired modes (${paired.length}).` };
  else {
    const massSub: FeModel = { ...sub, modes: paired.map((p) => ({ ...modelModes[p.model]!, shape: massModel[p.model]! })), normalisation: 'mass' };
    const mAt = modelShapesAtDofs(massSub, links, at.dofs);
    const tMass = paired.map((p) => Float64Array.from(at.dofs, (d) => test.modes[p.test]!.massShape!.get(d)!));
    try {
      const o = crossOrthogonality(tMass, mAt.shapes.map((s) => Float64Array.from(s)));
      const matrix = o.matrix.map((r) => Array.from(r));
      const diagonal = matrix.map((r, i) => r[i]!);
      const off = o.maxOffDiagonal ? Math.abs(o.maxOffDiagonal.value) : null;
      const minDiag = Math.min(...diagonal.map(Math.abs));
      xo = {
        ok: true,
        method: 'SEREP-reduced model mass at the test DOFs',
        matrix,
        diagonal,
        maxOffDiagonal: off,
        words: `Diagonal from ${minDiag.toFixed(2)} to ${Math.max(...diagonal.map(Math.abs)).toFixed(2)}, largest off-diagonal ${off === null ? '—' : off.toFixed(2)} (common acceptance, from aerospace practice: diagonal ≥ 0.9, off-diagonal ≤ 0.1).`,
      };
    } catch (e) {
      if (!(e instanceof RangeError)) throw e;
      xo = { ok: false, why: `Cross-orthogonality cannot be computed: ${e.message}.` };
    }
  }
  const diffs = pairView.map((p) => p.frequencyDifferencePercent).filter((v): v is number => v !== null);
  const worstDiff = diffs.length ? diffs.reduce((a, b) => (Math.abs(b) > Math.abs(a) ? b : a)) : null;
  const minPairMac = pairView.length ? Math.min(...pairView.map((p) => p.mac)) : null;
  const words = pairView.length
    ? `${pairView.length} of ${test.modes.length} test modes pair with a model mode (MAC ≥ ${minMac}); lowest MAC ${minPairMac!.toFixed(3)}, largest frequency difference ${worstDiff!.toFixed(2)} %. Compared over ${at.dofs.length} DOFs.`
    : `No test mode pairs with a model mode at MAC ≥ ${minMac}, over ${at.dofs.length} DOFs.`;
  return {
    ok: true as const,
    source: test.source,
    minMac,
    dofs: at.dofs,
    unmappedDofs: at.unmapped,
    testModes: test.modes.map((t) => ({ mode: t.mode, fHz: t.fHz })),
    modelModes: modelModes.map((m) => ({ number: m.number, frequencyHz: m.frequencyHz })),
    mac: pairs.mac.map((r) => Array.from(r)),
    pairs: pairView,
    unpairedTest: pairs.unpairedTest.map((i) => test.modes[i]!.mode),
    unpairedModel: pairs.unpairedModel.map((i) => modelModes[i]!.number),
    crossOrthogonality: xo,
    words,
    method: 'Modes paired one-to-one by MAC (Allemang & Brown 1982), highest first; frequency difference (f_test − f_model)/f_model × 100 %; cross-orthogonality Φ_testᵀ M_a Φ_model with the SEREP-reduced mass (O’Callahan, Avitabile & Riemer 1989).',
  };
}
