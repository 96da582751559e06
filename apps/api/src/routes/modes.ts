// Modes (design.md step 5): a background LSCF fit over chosen FRFs and a band gives the mode
// indicator and the stabilization diagram; the lead picks poles; residues give the shapes, MPC,
// the MAC matrix and synthesized FRFs. The exponential window's added damping is removed exactly.
import { createHash } from 'node:crypto';
import { and, desc, eq, inArray } from 'drizzle-orm';
import { z } from 'zod';
import { convertFrf, correctWindowDamping, estimateShapes, frac, macMatrix, synthesize, type Complex, type FrfSet, type ModalModel } from '@resonote/dsp';
import { uuidSchema } from '@resonote/contracts';
import { line, modalFit, point, scheduleEntry } from '@resonote/db/schema';
import type { Deps } from './deps.ts';
import { audit } from '../http/audit.ts';
import { badRequest, conflict, notFound } from '../errors.ts';
import { currentSettings, entriesWithAcceptedHits, entryResult, exponentialWindowOf } from '../hits/processing.ts';
import type { FitQueue } from '../modes/jobs.ts';
import type { FitResult } from '../modes/fit-types.ts';

const kindSchema = z.enum(['receptance', 'mobility', 'accelerance']).default('accelerance');
const units = { receptance: 'm/N', mobility: '(m/s)/N', accelerance: '(m/s²)/N' } as const;

interface StoredModel {
  kind: ModalModel['kind'];
  bandHz: [number, number];
  responses: string[];
  references: string[];
  transposed: boolean;
  modes: { fHz: number; zeta: number; lambda: { re: number; im: number }; residues: { re: number[]; im: number[] }[]; shape: { re: number[]; im: number[] }; shapeReference: string; mpc: number; realShape: number[] }[];
  residuals: { upper: number[][]; lower: number[][] } | null;
}

function storeModel(m: ModalModel): StoredModel {
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

function loadModel(s: StoredModel): ModalModel {
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

export function registerModeRoutes({ routes, db }: Deps, queue: FitQueue): void {
  /** The accelerance FRFs (H1) of the chosen entries, one per (response DOF, excitation DOF) pair. */
  async function frfSetFor(campaignId: string, entryIds: string[] | undefined) {
    const settings = await currentSettings(db, campaignId);
    const ids = entryIds?.length
      ? entryIds
      : await entriesWithAcceptedHits(db, campaignId);
    const frfs: FrfSet['frfs'] = [];
    const seen = new Set<string>();
    const hashes: string[] = [];
    let f: Float64Array | null = null;
    for (const id of ids) {
      const [own] = await db.select({ id: scheduleEntry.id }).from(scheduleEntry).where(and(eq(scheduleEntry.id, id), eq(scheduleEntry.campaignId, campaignId)));
      if (!own) throw notFound('One of the chosen schedule entries');
      const result = await entryResult(db, campaignId, id, settings);
      if (!result) continue;
      if (f && f.length !== result.frf.f.length) throw badRequest('The chosen FRFs were measured with different frequency lines; pick FRFs of one record length.');
      f = result.frf.f;
      hashes.push(result.inputHash);
      result.channels.forEach((c, i) => {
        const key = `${c.dof}|${result.excitationDof}`;
        if (seen.has(key)) return;
        seen.add(key);
        frfs.push({ response: c.dof, reference: result.excitationDof, h: result.frf.h1[i]! });
      });
    }
    return { set: { f: f ?? new Float64Array(0), frfs, kind: 'accelerance' as const }, settings, resultHashes: hashes, entryIds: ids };
  }

  async function loadFit(campaignId: string, fitId: string) {
    if (!uuidSchema.safeParse(fitId).success) throw notFound('That modal fit');
    const [fit] = await db.select().from(modalFit).where(and(eq(modalFit.id, fitId), eq(modalFit.campaignId, campaignId)));
    if (!fit) throw notFound('That modal fit');
    return fit;
  }

  routes.add({
    method: 'post',
    path: '/campaigns/:campaignId/modes/fits',
    tag: 'Modes',
    access: 'lead',
    summary: 'Start a modal fit (background job): CMIF and the LSCF stabilization diagram over the chosen FRFs (default: every FRF with accepted hits) and band. An identical request returns the earlier fit',
    body: z.strictObject({
      entryIds: z.array(uuidSchema).max(500).optional(),
      bandHz: z.strictObject({ low: z.number().min(0), high: z.number().positive() }).optional(),
      maxOrder: z.number().int().min(2).max(80).default(40),
      orderStep: z.number().int().min(1).max(10).default(2),
      tolerances: z.strictObject({ freqPercent: z.number().positive().max(20).default(1), dampingPercent: z.number().positive().max(100).default(5), macPercent: z.number().min(0).max(100).default(98) }).default({ freqPercent: 1, dampingPercent: 5, macPercent: 98 }),
    }),
    status: 202,
    returns: '{ fit: { id, status, progress } } — poll GET …/modes/fits/:fitId',
    handler: async ({ body, res, campaign: access, user: me }) => {
      const { set, settings, resultHashes, entryIds } = await frfSetFor(access.campaignId, body.entryIds);
      if (set.frfs.length < 2) throw badRequest(`A modal fit needs at least 2 FRFs with accepted hits; this selection has ${set.frfs.length}.`);
      const band = body.bandHz ?? settings.settings.bandHz;
      if (band.low >= band.high) throw badRequest(`The band ${band.low}–${band.high} Hz is empty.`);
      const lines = Array.from(set.f).filter((x) => x >= band.low && x <= band.high).length;
      if (lines < 10) throw badRequest(`The band ${band.low}–${band.high} Hz holds ${lines} frequency lines of the data; a fit needs at least 10.`);
      const orders: number[] = [];
      for (let o = Math.max(2, body.orderStep); o <= body.maxOrder; o += body.orderStep) orders.push(o);
      const tolerances = { freq: body.tolerances.freqPercent / 100, damping: body.tolerances.dampingPercent / 100, mac: body.tolerances.macPercent / 100 };
      const request = { entryIds, bandHz: [band.low, band.high] as [number, number], orders, tolerances, kind: set.kind, settingsVersion: settings.version, resultHashes, frfCount: set.frfs.length };
      const inputHash = createHash('sha256').update(JSON.stringify({ ...request, resultHashes: [...resultHashes].sort() })).digest('hex');
      const [earlier] = await db.select().from(modalFit).where(and(eq(modalFit.campaignId, access.campaignId), eq(modalFit.inputHash, inputHash), inArray(modalFit.status, ['queued', 'running', 'done']))).orderBy(desc(modalFit.createdAt)).limit(1);
      if (earlier) {
        res.locals.status = 200;
        return { fit: { id: earlier.id, status: earlier.status, progress: earlier.progress, reused: true } };
      }
      const [fit] = await db.insert(modalFit).values({ campaignId: access.campaignId, inputHash, request, createdBy: me.id }).returning();
      await audit(db, { campaignId: access.campaignId, actorId: me.id, entity: 'modal-fit', entityId: fit!.id, action: 'start', after: { bandHz: request.bandHz, orders: `${orders[0]}–${orders.at(-1)}`, frfs: set.frfs.length } });
      queue.enqueue(fit!.id, {
        f: set.f,
        kind: set.kind,
        frfs: set.frfs.map((x) => ({ response: x.response, reference: x.reference, re: x.h.re, im: x.h.im })),
        bandHz: request.bandHz,
        orders,
        tolerances,
      });
      return { fit: { id: fit!.id, status: fit!.status, progress: fit!.progress, reused: false } };
    },
  });

  routes.add({
    method: 'get',
    path: '/campaigns/:campaignId/modes/fits',
    tag: 'Modes',
    access: 'viewer',
    summary: 'Modal fits of the campaign, newest first',
    handler: async ({ campaign: access }) => {
      const rows = await db
        .select({ id: modalFit.id, status: modalFit.status, progress: modalFit.progress, message: modalFit.message, request: modalFit.request, createdAt: modalFit.createdAt, finishedAt: modalFit.finishedAt, elapsedMs: modalFit.elapsedMs, modes: modalFit.modes })
        .from(modalFit)
        .where(eq(modalFit.campaignId, access.campaignId))
        .orderBy(desc(modalFit.createdAt))
        .limit(50);
      return {
        fits: rows.map(({ request, modes, ...r }) => {
          const q = request as { bandHz: [number, number]; orders: number[]; frfCount: number };
          return { ...r, bandHz: q.bandHz, maxOrder: q.orders.at(-1), frfCount: q.frfCount, modeCount: (modes as { table?: unknown[] } | null)?.table?.length ?? 0 };
        }),
      };
    },
  });

  routes.add({
    method: 'get',
    path: '/campaigns/:campaignId/modes/fits/:fitId',
    tag: 'Modes',
    access: 'viewer',
    summary: 'One modal fit: status and progress, and once done the CMIF, the stabilization diagram and the chosen modes',
    handler: async ({ params, campaign: access }) => {
      const fit = await loadFit(access.campaignId, params.fitId!);
      const { inputHash: _h, ...rest } = fit;
      return { fit: rest };
    },
  });

  routes.add({
    method: 'post',
    path: '/campaigns/:campaignId/modes/fits/:fitId/modes',
    tag: 'Modes',
    access: 'lead',
    summary: 'Choose poles from the stabilization diagram ({ order, index } each); computes the shapes (residues with residual terms), MPC, the MAC matrix and the window-corrected damping',
    body: z.strictObject({ poles: z.array(z.strictObject({ order: z.number().int().min(1), index: z.number().int().min(0) })).min(1, 'pick at least one pole').max(60) }),
    handler: async ({ body, params, campaign: access, user: me }) => {
      const fit = await loadFit(access.campaignId, params.fitId!);
      if (fit.status !== 'done' || !fit.result) throw conflict(`The fit is ${fit.status}; choose poles once it is done.`);
      const request = fit.request as { entryIds: string[]; bandHz: [number, number]; resultHashes: string[]; settingsVersion: number };
      const result = fit.result as FitResult;
      const picked = body.poles.map((p, i) => {
        const order = result.diagram.orders.find((o) => o.order === p.order);
        const pole = order?.poles[p.index];
        if (!pole) throw badRequest(`poles[${i}]: the diagram has no pole ${p.index} at order ${p.order}.`);
        return pole;
      });
      const { set, settings, resultHashes } = await frfSetFor(access.campaignId, request.entryIds);
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
      const shapes = model.modes.map((m) => m.shape);
      const mac = macMatrix(shapes, shapes).map((row) => Array.from(row));
      // How well the model reproduces each FRF: FRAC of measured against synthesized over the band.
      const inBand = Array.from(set.f).map((x, k) => [x, k] as const).filter(([x]) => x >= request.bandHz[0] && x <= request.bandHz[1]).map(([, k]) => k);
      const fit2 = set.frfs.map((x) => {
        const syn = synthesize(model, set.f, x.response, x.reference, set.kind);
        const pick = (c: Complex) => ({ re: Float64Array.from(inBand, (k) => c.re[k]!), im: Float64Array.from(inBand, (k) => c.im[k]!) });
        return { response: x.response, reference: x.reference, frac: frac(pick(x.h), pick(syn)) };
      });
      const table = model.modes.map((m, i) => ({
        mode: i + 1,
        fHz: corrected[i]!.fHz,
        zetaPercent: 100 * corrected[i]!.zeta,
        estimated: { fHz: m.fHz, zetaPercent: 100 * m.zeta },
        mpc: m.mpc,
        pole: body.poles[i],
        shape: model.responses.map((dof, j) => ({ dof, re: m.shape.re[j]!, im: m.shape.im[j]!, real: m.realShape[j]! })),
      }));
      const modes = { table, mac, synthesisFrac: fit2, correction, model: storeModel(model), chosenBy: me.name, chosenAt: new Date().toISOString() };
      await db.update(modalFit).set({ modes }).where(eq(modalFit.id, fit.id));
      await audit(db, { campaignId: access.campaignId, actorId: me.id, entity: 'modal-fit', entityId: fit.id, action: 'choose-modes', after: table.map((t) => ({ fHz: t.fHz, zetaPercent: t.zetaPercent })) });
      return { modes: { table, mac, synthesisFrac: fit2, correction } };
    },
  });

  routes.add({
    method: 'get',
    path: '/campaigns/:campaignId/modes/fits/:fitId/synthesis',
    tag: 'Modes',
    access: 'viewer',
    summary: 'A measured FRF against the one synthesized from the chosen modes (with residual terms), in the requested kind',
    query: z.strictObject({ response: z.string().min(3).max(80), reference: z.string().min(3).max(80), kind: kindSchema }),
    handler: async ({ params, query, campaign: access }) => {
      const fit = await loadFit(access.campaignId, params.fitId!);
      const modes = fit.modes as { model: StoredModel } | null;
      if (!modes) throw conflict('No modes have been chosen from this fit yet.');
      const request = fit.request as { entryIds: string[]; bandHz: [number, number] };
      const { set } = await frfSetFor(access.campaignId, request.entryIds);
      const measured = set.frfs.find((x) => x.response === query.response && x.reference === query.reference);
      if (!measured) throw notFound(`The FRF ${query.response} / ${query.reference}`);
      const model = loadModel(modes.model);
      const syn = synthesize(model, set.f, query.response, query.reference, query.kind);
      const meas = query.kind === 'accelerance' ? measured.h : convertFrf(measured.h, set.f, 'accelerance', query.kind);
      const ks = Array.from(set.f).map((x, k) => [x, k] as const).filter(([x]) => x >= request.bandHz[0] && x <= request.bandHz[1]).map(([, k]) => k);
      const pick = (c: Complex) => ({ re: ks.map((k) => c.re[k]!), im: ks.map((k) => c.im[k]!) });
      return { kind: query.kind, unit: units[query.kind], f: ks.map((k) => set.f[k]!), measured: pick(meas), synthesized: pick(syn) };
    },
  });

  routes.add({
    method: 'get',
    path: '/campaigns/:campaignId/modes',
    tag: 'Modes',
    access: 'viewer',
    summary: 'The current modes of the campaign (from the newest fit with chosen modes) with the geometry, for the mode table, animation and hand-over',
    handler: async ({ campaign: access }) => {
      const fits = await db.select().from(modalFit).where(eq(modalFit.campaignId, access.campaignId)).orderBy(desc(modalFit.createdAt));
      const fit = fits.find((f) => f.modes);
      const points = await db.select({ id: point.id, label: point.label, x: point.x, y: point.y, z: point.z }).from(point).where(eq(point.campaignId, access.campaignId));
      const lines = await db.select({ pointA: line.pointA, pointB: line.pointB }).from(line).where(eq(line.campaignId, access.campaignId));
      if (!fit) return { fitId: null, modes: [], mac: [], points, lines };
      const modes = fit.modes as { table: unknown[]; mac: number[][]; correction: string; chosenBy: string; chosenAt: string };
      const request = fit.request as { bandHz: [number, number]; frfCount: number };
      return { fitId: fit.id, bandHz: request.bandHz, frfCount: request.frfCount, modes: modes.table, mac: modes.mac, correction: modes.correction, chosenBy: modes.chosenBy, chosenAt: modes.chosenAt, points, lines };
    },
  });
}

