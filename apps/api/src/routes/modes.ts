// Modes (design.md step 5): a background LSCF fit over chosen FRFs and a band gives the mode
// indicator and the stabilization diagram; the lead picks poles; residues give the shapes, MPC,
// the MAC matrix and synthesized FRFs. The exponential window's added damping is removed exactly.
import { createHash } from 'node:crypto';
import { and, desc, eq, inArray } from 'drizzle-orm';
import { z } from 'zod';
import { convertFrf, correctWindowDamping, estimateShapes, fitQuality, frac, macMatrix, synthesize, type Complex, type FrfSet, type ModalModel } from '@resonote/dsp';
import { AXIS_CONVENTION, canonicalLabel, frfAxisFactor, frfKindSchema, modeTableChangeSchema, uuidSchema } from '@resonote/contracts';
import { line, modalFit, modeTableRow, point, scheduleEntry } from '@resonote/db/schema';
import type { Deps } from './deps.ts';
import { audit } from '../http/audit.ts';
import { staleWrite } from '../http/concurrency.ts';
import { badRequest, conflict, notFound } from '../errors.ts';
import { currentSettings } from '../hits/current-settings.ts';
import { entriesWithAcceptedHits } from '../hits/schedule-status.ts';
import { entryResult } from '../hits/entry-result.ts';
import { defaultFitEntries } from '../modes/fit-selection.ts';
import { exponentialWindowOf } from '../hits/settings-to-dsp.ts';
import type { FitQueue } from '../modes/jobs.ts';
import type { FitResult } from '../modes/fit-types.ts';
import { loadModel, singleMode, storeModel, type StoredModel } from '../modes/model-store.ts';
import { bumpTable, DUPLICATE_RULE, refreshDuplicates, rowView, synthesizeFromTable, tableMac, tableRows, tableVersion, type ShapeEntry } from '../modes/mode-table.ts';
import { cmifWarnings, mpcWarnings, synthesisWarnings, QUALITY_LIMITS, type QualityWarning } from '../modes/quality.ts';
import { massShapesOf, suggestFromDiagram } from '../modes/suggest.ts';

const kindSchema = frfKindSchema.default('accelerance');
const units = { receptance: 'm/N', mobility: '(m/s)/N', accelerance: '(m/s²)/N' } as const;

export function registerModeRoutes({ routes, db }: Deps, queue: FitQueue): void {
  /** The accelerance FRFs (H1) of the chosen entries, one per (response DOF, excitation DOF) pair. */
  async function frfSetFor(campaignId: string, entryIds: string[] | undefined, every = false) {
    const settings = await currentSettings(db, campaignId);
    // Without a pick: the current plan's entries with accepted hits, flagged ones left out (modes/fit-selection.ts).
    // `every`: all FRFs with accepted hits (the synthesis reads any measured FRF).
    const selection = entryIds?.length || every ? null : await defaultFitEntries(db, campaignId);
    const ids = entryIds?.length ? entryIds : every ? await entriesWithAcceptedHits(db, campaignId) : selection!.chosen;
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
      // Every FRF on the positive axis of both points: H(i,−d) = −H(i,+d) (contracts/axis.ts), so
      // P:−Z struck next to P:+Z is the driving point and shapes share one sign convention.
      result.channels.forEach((c, i) => {
        const response = canonicalLabel(c.dof);
        const reference = canonicalLabel(result.excitationDof);
        const key = `${response}|${reference}`;
        if (seen.has(key)) return;
        seen.add(key);
        const h = result.frf.h1[i]!;
        const k = frfAxisFactor(c.dof, result.excitationDof);
        frfs.push({ response, reference, h: k === 1 ? h : { re: h.re.map((v) => -v), im: h.im.map((v) => -v) } });
      });
    }
    return { set: { f: f ?? new Float64Array(0), frfs, kind: 'accelerance' as const }, settings, resultHashes: hashes, entryIds: ids, leftOut: selection?.leftOut ?? [] };
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
    summary: 'Start a modal fit (background job): CMIF and the LSCF stabilization diagram over the chosen FRFs (default: the FRFs of the current plan with accepted hits, flagged ones and ones from an earlier reference left out and listed in leftOut) and band. An identical request returns the earlier fit',
    body: z.strictObject({
      entryIds: z.array(uuidSchema).max(500).optional(),
      bandHz: z.strictObject({ low: z.number().min(0), high: z.number().positive() }).optional(),
      maxOrder: z.number().int().min(2).max(160).default(40),
      orderStep: z.number().int().min(1).max(10).default(2),
      tolerances: z.strictObject({ freqPercent: z.number().positive().max(20).default(1), dampingPercent: z.number().positive().max(100).default(5), macPercent: z.number().min(0).max(100).default(98) }).default({ freqPercent: 1, dampingPercent: 5, macPercent: 98 }),
    }),
    status: 202,
    returns: '{ fit: { id, status, progress }, leftOut: [{ id, responseDof, excitationDof, reason }] } — poll GET …/modes/fits/:fitId',
    handler: async ({ body, res, campaign: access, user: me }) => {
      const { set, settings, resultHashes, entryIds, leftOut } = await frfSetFor(access.campaignId, body.entryIds);
      if (set.frfs.length < 2) throw badRequest(`A modal fit needs at least 2 FRFs with accepted hits; this selection has ${set.frfs.length}.${leftOut.length ? ` ${leftOut.length} flagged or earlier-reference FRF${leftOut.length > 1 ? 's were' : ' was'} left out; pick them by name to include them.` : ''}`);
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
        return { fit: { id: earlier.id, status: earlier.status, progress: earlier.progress, reused: true }, leftOut };
      }
      const [fit] = await db.insert(modalFit).values({ campaignId: access.campaignId, inputHash, request, createdBy: me.id }).returning();
      await audit(db, { campaignId: access.campaignId, actorId: me.id, entity: 'modal-fit', entityId: fit!.id, action: 'start', after: { bandHz: request.bandHz, orders: `${orders[0]}–${orders.at(-1)}`, frfs: set.frfs.length, leftOut: leftOut.map((e) => ({ entryId: e.id, reason: e.reason })) } });
      queue.enqueue(fit!.id, {
        f: set.f,
        kind: set.kind,
        frfs: set.frfs.map((x) => ({ response: x.response, reference: x.reference, re: x.h.re, im: x.h.im })),
        bandHz: request.bandHz,
        orders,
        tolerances,
      });
      return { fit: { id: fit!.id, status: fit!.status, progress: fit!.progress, reused: false }, leftOut };
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
      const fit = await loadFit(access.campaignId, params.fitId!);
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
      const fit = await loadFit(access.campaignId, params.fitId!);
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

  /** The campaign's mode table as served to the page and the hand-over: rows by frequency, numbered 1…n. */
  async function tableView(campaignId: string) {
    const rows = await tableRows(db, campaignId);
    const version = await tableVersion(db, campaignId);
    return { version, rows, view: rows.map((r, i) => rowView(r, i + 1, rows)), mac: tableMac(rows) };
  }

  routes.add({
    method: 'get',
    path: '/campaigns/:campaignId/modes',
    tag: 'Modes',
    access: 'viewer',
    summary: "The campaign's mode table (modes taken from one or several fits, each with its fit, band, references, order and input hash), the MAC matrix over shared DOFs, and the geometry for the animation",
    handler: async ({ campaign: access }) => {
      const t = await tableView(access.campaignId);
      const points = await db.select({ id: point.id, label: point.label, x: point.x, y: point.y, z: point.z }).from(point).where(eq(point.campaignId, access.campaignId));
      const lines = await db.select({ pointA: line.pointA, pointB: line.pointB }).from(line).where(eq(line.campaignId, access.campaignId));
      const bandHz = t.rows.length ? [Math.min(...t.rows.map((r) => r.bandLowHz)), Math.max(...t.rows.map((r) => r.bandHighHz))] : null;
      return {
        version: t.version,
        modes: t.view,
        mac: t.mac,
        bandHz,
        fitIds: [...new Set(t.rows.map((r) => r.fitId).filter(Boolean))],
        duplicateRule: `The same mode twice: frequencies within ${DUPLICATE_RULE.freqPercent} % and MAC ≥ ${DUPLICATE_RULE.mac} over the DOFs both shapes share (common practice).`,
        axisConvention: AXIS_CONVENTION,
        qualityLimits: QUALITY_LIMITS,
        warnings: mpcWarnings(t.rows.map((r) => ({ fHz: r.fHz, mpc: r.mpc }))),
        points,
        lines,
      };
    },
  });

  routes.add({
    method: 'post',
    path: '/campaigns/:campaignId/modes/table',
    tag: 'Modes',
    access: 'lead',
    summary: "Add modes of a fit (its computed modes, by number) to the campaign's mode table; the same mode found twice is pointed out. baseVersion is the table version last read (0 for a table not yet started)",
    body: z.strictObject({ fitId: z.string().min(1).max(64), modes: z.array(z.number().int().min(1)).min(1, 'pick at least one mode').max(60), baseVersion: z.number().int().min(0) }),
    status: 201,
    response: modeTableChangeSchema,
    handler: async ({ body, campaign: access, user: me }) => {
      const fit = await loadFit(access.campaignId, body.fitId);
      const computed = fit.modes as { table: { mode: number; fHz: number; zetaPercent: number; estimated: { fHz: number; zetaPercent: number }; mpc: number; pole?: { order: number; index: number }; shape: ShapeEntry[]; massShape?: { dof: string; re: number; im: number; real: number }[] | null }[]; model: StoredModel; massNote?: string } | null;
      if (!computed) throw conflict('No shapes have been computed in this fit yet: choose poles and compute shapes first.');
      const request = fit.request as { bandHz: [number, number] };
      const picked = [...new Set(body.modes)].map((n, i) => {
        const m = computed.table.find((x) => x.mode === n);
        if (!m) throw badRequest(`modes[${i}]: the fit has no computed mode ${n} (it has ${computed.table.length}).`);
        return m;
      });
      return db.transaction(async (tx) => {
        const version = await tableVersion(tx, access.campaignId);
        if (version !== body.baseVersion) throw staleWrite("The campaign's mode table", await tableRows(tx, access.campaignId));
        const existing = await tableRows(tx, access.campaignId);
        for (const m of picked) {
          const pole = m.pole ?? { order: 0, index: m.mode - 1 };
          const twin = existing.find((r) => r.fitId === fit.id && r.modelOrder === pole.order && r.poleIndex === pole.index);
          if (twin) throw conflict(`Mode ${m.mode} of this fit (${m.fHz.toFixed(2)} Hz, order ${pole.order}) is already in the mode table.`, { rowId: twin.id });
        }
        const inserted = await tx
          .insert(modeTableRow)
          .values(
            picked.map((m) => ({
              campaignId: access.campaignId,
              fitId: fit.id,
              bandLowHz: request.bandHz[0],
              bandHighHz: request.bandHz[1],
              references: computed.model.references,
              modelOrder: m.pole?.order ?? 0,
              poleIndex: m.pole?.index ?? m.mode - 1,
              inputHash: fit.inputHash,
              fHz: m.fHz,
              zetaPercentRaw: m.estimated.zetaPercent,
              zetaPercent: m.zetaPercent,
              mpc: m.mpc,
              shape: m.shape,
              massShape: m.massShape ?? null,
              massNote: computed.massNote ?? '',
              model: singleMode(computed.model, m.mode - 1),
              addedBy: me.id,
            })),
          )
          .returning();
        await refreshDuplicates(tx, access.campaignId);
        const next = await bumpTable(tx, access.campaignId);
        for (const r of inserted) await audit(tx, { campaignId: access.campaignId, actorId: me.id, entity: 'mode-table-row', entityId: r.id, action: 'add', after: { fitId: r.fitId, fHz: r.fHz, zetaPercent: r.zetaPercent, order: r.modelOrder, poleIndex: r.poleIndex, bandHz: [r.bandLowHz, r.bandHighHz] } });
        const rows = await tableRows(tx, access.campaignId);
        return { version: next, added: inserted.map((r) => r.id), modes: rows.map((r, i) => rowView(r, i + 1, rows)) };
      });
    },
  });

  routes.add({
    method: 'delete',
    path: '/campaigns/:campaignId/modes/table/:rowId',
    tag: 'Modes',
    access: 'lead',
    summary: "Remove a row from the campaign's mode table (the fit keeps its modes). ?baseVersion= is the table version last read",
    query: z.strictObject({ baseVersion: z.coerce.number().int().min(0) }),
    response: modeTableChangeSchema,
    handler: async ({ params, query, campaign: access, user: me }) => {
      if (!uuidSchema.safeParse(params.rowId).success) throw notFound('That mode-table row');
      return db.transaction(async (tx) => {
        const version = await tableVersion(tx, access.campaignId);
        const [row] = await tx.select().from(modeTableRow).where(and(eq(modeTableRow.id, params.rowId!), eq(modeTableRow.campaignId, access.campaignId)));
        if (!row) throw notFound('That mode-table row');
        if (version !== query.baseVersion) throw staleWrite("The campaign's mode table", await tableRows(tx, access.campaignId));
        await tx.delete(modeTableRow).where(eq(modeTableRow.id, row.id));
        await refreshDuplicates(tx, access.campaignId);
        const next = await bumpTable(tx, access.campaignId);
        const { model: _m, ...before } = row;
        await audit(tx, { campaignId: access.campaignId, actorId: me.id, entity: 'mode-table-row', entityId: row.id, action: 'remove', before });
        const rows = await tableRows(tx, access.campaignId);
        return { version: next, modes: rows.map((r, i) => rowView(r, i + 1, rows)) };
      });
    },
  });

  routes.add({
    method: 'get',
    path: '/campaigns/:campaignId/modes/synthesis',
    tag: 'Modes',
    access: 'viewer',
    summary: "A measured FRF against the one synthesized from every mode of the campaign's mode table (no residual terms), over the whole band the table's fits cover",
    query: z.strictObject({ response: z.string().min(3).max(80), reference: z.string().min(3).max(80), kind: kindSchema }),
    handler: async ({ query, campaign: access }) => {
      const rows = await tableRows(db, access.campaignId);
      if (rows.length === 0) throw conflict("The campaign's mode table is empty: add modes from a fit first.");
      const { set } = await frfSetFor(access.campaignId, undefined, true);
      const response = canonicalLabel(query.response);
      const reference = canonicalLabel(query.reference);
      const measured = set.frfs.find((x) => x.response === response && x.reference === reference);
      if (!measured) throw notFound(`The FRF ${query.response} / ${query.reference}`);
      const lo = Math.min(...rows.map((r) => r.bandLowHz));
      const hi = Math.max(...rows.map((r) => r.bandHighHz));
      const ks = Array.from(set.f).map((x, k) => [x, k] as const).filter(([x]) => x >= lo && x <= hi && x > 0).map(([, k]) => k);
      const f = Float64Array.from(ks, (k) => set.f[k]!);
      const syn = synthesizeFromTable(rows, f, response, reference, query.kind);
      const meas = query.kind === 'accelerance' ? measured.h : convertFrf(measured.h, set.f, 'accelerance', query.kind);
      const number = new Map(rows.map((r, i) => [r.id, i + 1]));
      return {
        kind: query.kind,
        unit: units[query.kind],
        bandHz: [lo, hi],
        f: Array.from(f),
        measured: { re: ks.map((k) => meas.re[k]!), im: ks.map((k) => meas.im[k]!) },
        synthesized: { re: Array.from(syn.h.re), im: Array.from(syn.h.im) },
        modesUsed: syn.used.map((id) => number.get(id)),
        modesWithoutThisFrf: syn.missing.map((id) => number.get(id)),
        note: 'Sum of the table’s modes without residual terms (those belong to one fitted band); modes marked as found twice are left out. Each FRF is on the positive axis of both points.',
      };
    },
  });
}

