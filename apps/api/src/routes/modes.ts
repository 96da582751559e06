// Modal fits (design.md step 5): a background LSCF fit over chosen FRFs and a band gives the mode
// indicator and the stabilization diagram (modes/start-fit.ts); the lead picks poles (the draft);
// "compute shapes" gives shapes, MPC, MAC and synthesized FRFs (modes/compute-shapes.ts), with the
// exponential window's added damping removed exactly. The mode table: routes/mode-table.ts.
import { and, desc, eq } from 'drizzle-orm';
import { z } from 'zod';
import { modalFit } from '@resonote/db/schema';
import type { Deps } from './deps.ts';
import { audit } from '../http/audit.ts';
import { staleWrite } from '../http/concurrency.ts';
import { badRequest, conflict } from '../errors.ts';
import { computeShapes, computeShapesSchema } from '../modes/compute-shapes.ts';
import { loadFit } from '../modes/frf-set.ts';
import type { FitQueue } from '../modes/jobs.ts';
import type { FitResult } from '../modes/fit-types.ts';
import { cmifWarnings, type QualityWarning } from '../modes/quality.ts';
import { startFit, startFitSchema } from '../modes/start-fit.ts';
import { suggestFromDiagram } from '../modes/suggest.ts';
import { fitSynthesis, synthesisQuerySchema } from '../modes/synthesis-view.ts';

export function registerModeRoutes({ routes, db }: Deps, queue: FitQueue): void {
  routes.add({
    method: 'post',
    path: '/campaigns/:campaignId/modes/fits',
    tag: 'Modes',
    access: 'lead',
    summary: 'Start a modal fit (background job): CMIF and the LSCF stabilization diagram over the chosen FRFs (default: the FRFs of the current plan with accepted hits, flagged ones and ones from an earlier reference left out and listed in leftOut) and band. An identical request returns the earlier fit',
    body: startFitSchema,
    status: 202,
    returns: '{ fit: { id, status, progress }, leftOut: [{ id, responseDof, excitationDof, reason }] } — poll GET …/modes/fits/:fitId',
    handler: async ({ body, res, campaign: access, user: me }) => {
      const { reused, answer } = await startFit(db, queue, access, body, me);
      if (reused) res.locals.status = 200;
      return answer;
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
      const fit = await loadFit(db, access.campaignId, params.fitId!);
      const { inputHash: _h, result, draft, draftVersion, ...rest } = fit;
      // The pole shape estimates stay on the server (the suggestion uses them); the diagram is drawn without.
      const r = result as FitResult | null;
      const slim = r ? { ...r, diagram: { ...r.diagram, orders: r.diagram.orders.map((o) => ({ order: o.order, poles: o.poles.map(({ shape: _s, ...p }) => p) })) } } : null;
      const modes = fit.modes as { warnings?: QualityWarning[] } | null;
      const warnings = [...cmifWarnings(r?.cmifPeaksWithoutColumn ?? []), ...(modes?.warnings ?? [])];
      return { fit: { ...rest, result: slim, draft: { poles: (draft as { poles?: unknown[] } | null)?.poles ?? null, version: draftVersion }, warnings } };
    },
  });

  routes.add({
    method: 'get',
    path: '/campaigns/:campaignId/modes/fits/:fitId/suggestion',
    tag: 'Modes',
    access: 'viewer',
    summary: 'Suggested modes of a finished fit: poles clustered across model orders (frequency and shape), each with its representative pole (order, index) to choose',
    handler: async ({ params, campaign: access }) => {
      const fit = await loadFit(db, access.campaignId, params.fitId!);
      if (fit.status !== 'done' || !fit.result) throw conflict(`The fit is ${fit.status}; a suggestion needs a finished fit.`);
      return suggestFromDiagram((fit.result as FitResult).diagram);
    },
  });

  routes.add({
    method: 'put',
    path: '/campaigns/:campaignId/modes/fits/:fitId/draft',
    tag: 'Modes',
    access: 'lead',
    summary: 'Keep the poles chosen so far in a fit (before shapes are computed), so a reload or a colleague sees the same choice. baseVersion is the draft version last read',
    body: z.strictObject({ poles: z.array(z.strictObject({ order: z.number().int().min(1), index: z.number().int().min(0) })).max(200), baseVersion: z.number().int().positive() }),
    handler: async ({ body, params, campaign: access, user: me }) => {
      const fit = await loadFit(db, access.campaignId, params.fitId!);
      if (fit.status !== 'done' || !fit.result) throw conflict(`The fit is ${fit.status}; choose poles once it is done.`);
      const orders = (fit.result as FitResult).diagram.orders;
      body.poles.forEach((p, i) => {
        if (!orders.find((o) => o.order === p.order)?.poles[p.index]) throw badRequest(`poles[${i}]: the diagram has no pole ${p.index} at order ${p.order}.`);
      });
      const poles = body.poles.filter((p, i) => body.poles.findIndex((q) => q.order === p.order && q.index === p.index) === i);
      return db.transaction(async (tx) => {
        const [row] = await tx.update(modalFit).set({ draft: { poles }, draftVersion: fit.draftVersion + 1 }).where(and(eq(modalFit.id, fit.id), eq(modalFit.draftVersion, body.baseVersion))).returning({ draftVersion: modalFit.draftVersion });
        if (!row) throw staleWrite('The chosen poles of this fit', { poles: (fit.draft as { poles?: unknown[] } | null)?.poles ?? null, version: fit.draftVersion });
        await audit(tx, { campaignId: access.campaignId, actorId: me.id, entity: 'modal-fit', entityId: fit.id, action: 'draft-poles', before: fit.draft, after: { poles } });
        return { draft: { poles, version: row.draftVersion } };
      });
    },
  });

  routes.add({
    method: 'post',
    path: '/campaigns/:campaignId/modes/fits/:fitId/modes',
    tag: 'Modes',
    access: 'lead',
    summary: 'Choose poles from the stabilization diagram ({ order, index } each); computes the shapes (residues with residual terms), MPC, the MAC matrix and the window-corrected damping',
    body: computeShapesSchema,
    handler: async ({ body, params, campaign: access, user: me }) => computeShapes(db, await loadFit(db, access.campaignId, params.fitId), access, body, me),
  });

  routes.add({
    method: 'get',
    path: '/campaigns/:campaignId/modes/fits/:fitId/synthesis',
    tag: 'Modes',
    access: 'viewer',
    summary: 'A measured FRF against the one synthesized from the chosen modes (with residual terms), in the requested kind',
    query: synthesisQuerySchema,
    handler: async ({ params, query, campaign: access }) => fitSynthesis(db, await loadFit(db, access.campaignId, params.fitId), access, query),
  });
}
