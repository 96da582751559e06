// "Compute shapes": the chosen poles of a finished fit give the shapes (residues with residual
// terms), MPC, the MAC matrix, the window-corrected damping, unit-modal-mass shapes, the synthesis
// error per FRF and warnings in words; stored on the fit and audited.
import { z } from 'zod';
import { eq } from 'drizzle-orm';
import { correctWindowDamping, estimateShapes, fitQuality, frac, macMatrix, synthesize, type Complex, type ModalModel } from '@resonote/dsp';
import { AXIS_CONVENTION } from '@resonote/contracts';
import { modalFit } from '@resonote/db/schema';
import type { Db } from '@resonote/db/client';
import type { SessionUser } from '../context.ts';
import { badRequest, conflict } from '../errors.ts';
import { audit } from '../http/audit.ts';
import { exponentialWindowOf } from '../hits/settings-to-dsp.ts';
import { frfSetFor, type FitRow } from './frf-set.ts';
import type { FitResult } from './fit-types.ts';
import { storeModel } from './model-store.ts';
import { mpcWarnings, synthesisWarnings } from './quality.ts';
import { massShapesOf } from './suggest.ts';

export const computeShapesSchema = z.strictObject({ poles: z.array(z.strictObject({ order: z.number().int().min(1), index: z.number().int().min(0) })).min(1, 'pick at least one pole').max(60) });

export async function computeShapes(db: Db, fit: FitRow, access: { campaignId: string }, body: z.infer<typeof computeShapesSchema>, me: SessionUser) {
  if (fit.status !== 'done' || !fit.result) throw conflict(`The fit is ${fit.status}; choose poles once it is done.`);
  const request = fit.request as { entryIds: string[]; bandHz: [number, number]; resultHashes: string[]; settingsVersion: number };
  const result = fit.result as FitResult;
  const picked = body.poles.map((p, i) => {
    const order = result.diagram.orders.find((o) => o.order === p.order);
    const pole = order?.poles[p.index];
    if (!pole) throw badRequest(`poles[${i}]: the diagram has no pole ${p.index} at order ${p.order}.`);
    return pole;
  });
  const { set, settings, resultHashes } = await frfSetFor(db, access.campaignId, request.entryIds);
  if (settings.version !== request.settingsVersion || [...resultHashes].sort().join() !== [...request.resultHashes].sort().join()) {
    throw conflict('The FRFs changed since this fit ran (new hits, verdicts or settings); run the fit again.');
  }
  let model: ModalModel;
  try {
    model = estimateShapes(set, picked.map((p) => ({ lambda: p.lambda })), { bandHz: request.bandHz, residuals: true });
  } catch (err) {
    if (err instanceof RangeError) throw badRequest(`The shapes cannot be estimated: ${err.message}`);
    throw err;
  }
  const exp = exponentialWindowOf(settings.settings);
  let corrected: { fHz: number; zeta: number }[] = model.modes.map((m) => ({ fHz: m.fHz, zeta: m.zeta }));
  let correction = 'none (no exponential window)';
  if (exp) {
    try {
      corrected = correctWindowDamping(corrected, exp.tauS);
      correction = `exponential window τ = ${exp.tauS.toFixed(4)} s removed exactly (σ_true = σ_est − 1/τ, Fladung 1997)`;
    } catch (err) {
      throw badRequest(`A chosen pole has less damping than the exponential window added (${(err as Error).message}); it is not a structural mode.`);
    }
  }
  const mass = massShapesOf(model);
  const shapes = model.modes.map((m) => m.shape);
  const mac = macMatrix(shapes, shapes).map((row) => Array.from(row));
  // How well the model reproduces each FRF: FRAC of measured against synthesized over the band.
  const inBand = Array.from(set.f).map((x, k) => [x, k] as const).filter(([x]) => x >= request.bandHz[0] && x <= request.bandHz[1]).map(([, k]) => k);
  // Synthesis error per FRF, 100·‖H − Ĥ‖/‖H‖ over the band (dsp fitQuality).
  const quality = fitQuality(set, model, request.bandHz);
  const fit2 = set.frfs.map((x) => {
    const syn = synthesize(model, set.f, x.response, x.reference, set.kind);
    const pick = (c: Complex) => ({ re: Float64Array.from(inBand, (k) => c.re[k]!), im: Float64Array.from(inBand, (k) => c.im[k]!) });
    return { response: x.response, reference: x.reference, frac: frac(pick(x.h), pick(syn)), errorPercent: quality.frfs.find((q) => q.response === x.response && q.reference === x.reference)?.errorPercent ?? null };
  });
  const table = model.modes.map((m, i) => ({
    mode: i + 1,
    fHz: corrected[i]!.fHz,
    zetaPercent: 100 * corrected[i]!.zeta,
    estimated: { fHz: m.fHz, zetaPercent: 100 * m.zeta },
    mpc: m.mpc,
    pole: body.poles[i],
    shape: model.responses.map((dof, j) => ({ dof, re: m.shape.re[j]!, im: m.shape.im[j]!, real: m.realShape[j]! })),
    massShape: mass.shapes[i] ?? null,
  }));
  const warnings = [...mpcWarnings(table), ...synthesisWarnings(fit2.map((x) => ({ response: x.response, reference: x.reference, errorPercent: x.errorPercent })).filter((x): x is { response: string; reference: string; errorPercent: number } => x.errorPercent !== null))];
  const chosenAt = new Date().toISOString();
  const modes = { table, mac, synthesisFrac: fit2, correction, massNote: mass.note, warnings, axisConvention: AXIS_CONVENTION, model: storeModel(model), chosenBy: me.name, chosenAt };
  await db.transaction(async (tx) => {
    await tx.update(modalFit).set({ modes, draft: { poles: body.poles }, draftVersion: fit.draftVersion + 1 }).where(eq(modalFit.id, fit.id));
    await audit(tx, { campaignId: access.campaignId, actorId: me.id, entity: 'modal-fit', entityId: fit.id, action: 'choose-modes', after: table.map((t) => ({ fHz: t.fHz, zetaPercent: t.zetaPercent })) });
  });
  return { modes: { table, mac, synthesisFrac: fit2, correction, massNote: mass.note, warnings, axisConvention: AXIS_CONVENTION, chosenBy: me.name, chosenAt }, draft: { poles: body.poles, version: fit.draftVersion + 1 } };
}
