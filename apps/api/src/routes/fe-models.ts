// FE model versions of a campaign (issue 19): upload (CSV or JSON, docs/fe-model-format.md), list,
// read, delete; the test point ↔ node map (automatic by label or nearest node, edited by hand, with a
// units and axes check); the pre-test plan proposal and its acceptance into geometry and schedule;
// correlation of the mode table against a model version.
import multer from 'multer';
import { and, eq, isNull, sql } from 'drizzle-orm';
import type { RequestHandler } from 'express';
import {
  feAcceptSchema,
  feAutoMapSchema,
  feCorrelationQuerySchema,
  feMapEditSchema,
  feModelUploadSchema,
  feProposalSchema,
  mapPointsToNodes,
  MAX_FE_CHARS,
  parseDof,
  parseFeModelCsv,
  parseFeModelJson,
  type Direction,
} from '@resonote/contracts';
import { campaign, feMode, feModel, fePointLink, point } from '@resonote/db/schema';
import type { Deps } from './deps.ts';
import { audit, type Tx } from '../http/audit.ts';
import { staleWrite } from '../http/concurrency.ts';
import { conflict, HttpError } from '../errors.ts';
import { loadLinks, loadModel, modelRow, modelSummary } from '../fe/store.ts';
import { checkGeometryAgainstModel } from '../fe/geometry-check.ts';
import { proposePlan } from '../fe/proposal.ts';
import { correlate, testModesForCorrelation } from '../fe/correlation.ts';
import { generateSchedule } from '../plan/schedule-generate.ts';
import { moveReferenceChannel } from '../fe/reference-channel.ts';
import { listScheduleEntries } from '../plan/schedule-list.ts';

const uniqueViolation = (err: unknown) => (err as { code?: string; cause?: { code?: string } })?.code === '23505' || (err as { cause?: { code?: string } })?.cause?.code === '23505';

/** Multipart upload: the file as field `file`, `versionLabel` and `name` as text fields. */
const modelUpload: RequestHandler = (req, res, next) => {
  if (!req.is('multipart/form-data')) return next();
  multer({ storage: multer.memoryStorage(), limits: { fileSize: MAX_FE_CHARS, files: 1, fields: 5 } }).single('file')(req, res, (err: unknown) => {
    if (err) {
      const e = err as { code?: string };
      if (e.code === 'LIMIT_FILE_SIZE') return next(new HttpError(413, 'too-large', `The model file is larger than ${MAX_FE_CHARS / 1024 / 1024} MB; nothing was stored.`));
      return next(new HttpError(400, 'bad-upload', `The upload could not be read: ${(err as Error).message}`));
    }
    if (!req.file) return next(new HttpError(400, 'invalid-input', 'Attach the model file as the form field "file".'));
    const fields = (req.body ?? {}) as Record<string, string>;
    req.body = {
      text: req.file.buffer.toString('utf8'),
      fileName: req.file.originalname,
      ...(fields.versionLabel !== undefined ? { versionLabel: fields.versionLabel } : {}),
      ...(fields.name ? { name: fields.name } : {}),
      ...(fields.format ? { format: fields.format } : {}),
    };
    next();
  });
};

const sqlExcluded = (col: string) => sql.raw(`excluded.${col}`);

function guessFormat(text: string, fileName?: string): 'csv' | 'json' {
  if (fileName && /\.json$/i.test(fileName)) return 'json';
  if (fileName && /\.csv$/i.test(fileName)) return 'csv';
  return /^\uFEFF?\s*[{[]/.test(text) ? 'json' : 'csv';
}

export function registerFeModelRoutes({ routes, db }: Deps): void {
  const activePoints = (tx: Deps['db'] | Tx, campaignId: string) =>
    tx.select({ id: point.id, label: point.label, x: point.x, y: point.y, z: point.z, directions: point.directions }).from(point).where(and(eq(point.campaignId, campaignId), isNull(point.retiredAt)));

  async function modelView(campaignId: string, modelId: string) {
    const s = await loadModel(db, campaignId, modelId);
    return {
      model: modelSummary(s.row),
      nodes: s.model.nodes,
      modes: s.model.modes.map((m) => ({ number: m.number, frequencyHz: m.frequencyHz, modalMassKg: m.modalMassKg })),
      map: { version: s.row.mapVersion, links: s.links },
    };
  }

  routes.add({
    method: 'post',
    path: '/campaigns/:campaignId/fe-models',
    tag: 'Model',
    access: 'lead',
    summary: 'Upload a finite-element model version (Resonote FE-modes CSV or JSON, docs/fe-model-format.md) as JSON { text, versionLabel, format?, name? } or multipart (field "file"). The file is kept byte for byte',
    body: feModelUploadSchema,
    bodyLimit: `${Math.ceil((MAX_FE_CHARS * 1.2) / 1024 / 1024)}mb`,
    before: [modelUpload],
    status: 201,
    returns: '{ model }; 400 invalid-model with details: [{ row, column, path, message }] and truncated when the file has problems (nothing stored); 413 for a file over the limit',
    handler: async ({ body, campaign: access, user: me }) => {
      const format = body.format ?? guessFormat(body.text, body.fileName);
      const parsed = format === 'json' ? parseFeModelJson(body.text) : parseFeModelCsv(body.text);
      if (!parsed.ok) throw new HttpError(400, 'invalid-model', parsed.message, { problems: parsed.problems, truncated: parsed.truncated, format });
      const m = parsed.model;
      try {
        return await db.transaction(async (tx) => {
          const [row] = await tx
            .insert(feModel)
            .values({
              campaignId: access.campaignId,
              name: body.name ?? m.name ?? body.fileName ?? body.versionLabel,
              versionLabel: body.versionLabel,
              fileUnits: m.fileUnits,
              normalisation: m.normalisation,
              sourceFormat: format,
              sourceFileName: body.fileName ?? '',
              source: Buffer.from(body.text, 'utf8'),
              nodes: m.nodes,
              nodeCount: m.nodes.length,
              modeCount: m.modes.length,
              uploadedBy: me.id,
            })
            .returning();
          for (let i = 0; i < m.modes.length; i += 50) {
            await tx.insert(feMode).values(m.modes.slice(i, i + 50).map((md) => ({ campaignId: access.campaignId, modelId: row!.id, number: md.number, frequencyHz: md.frequencyHz, modalMassKg: md.modalMassKg, shape: md.shape })));
          }
          const summary = modelSummary(row!);
          await audit(tx, { campaignId: access.campaignId, actorId: me.id, entity: 'fe-model', entityId: row!.id, action: 'upload', after: summary });
          return { model: summary };
        });
      } catch (err) {
        if (uniqueViolation(err)) throw conflict(`A model version labelled "${body.versionLabel}" already exists in this campaign; give the new one another label.`);
        throw err;
      }
    },
  });

  routes.add({
    method: 'get',
    path: '/campaigns/:campaignId/fe-models',
    tag: 'Model',
    access: 'viewer',
    summary: "The campaign's model versions, newest first",
    returns: '{ models: [{ id, name, versionLabel, fileUnits, normalisation, nodeCount, modeCount, uploadedBy, uploadedAt, ... }] }',
    handler: async ({ campaign: access }) => {
      const rows = await db.select().from(feModel).where(eq(feModel.campaignId, access.campaignId));
      rows.sort((a, b) => b.uploadedAt.getTime() - a.uploadedAt.getTime());
      return { models: rows.map(modelSummary) };
    },
  });

  routes.add({
    method: 'get',
    path: '/campaigns/:campaignId/fe-models/:modelId',
    tag: 'Model',
    access: 'viewer',
    summary: 'One model version: nodes (mm), modes (Hz, modal mass kg) and the point ↔ node map',
    handler: ({ params, campaign: access }) => modelView(access.campaignId, params.modelId!),
  });

  routes.add({
    method: 'get',
    path: '/campaigns/:campaignId/fe-models/:modelId/source',
    tag: 'Model',
    access: 'viewer',
    summary: 'The model file as it was uploaded, byte for byte',
    produces: 'application/octet-stream',
    handler: async ({ res, params, campaign: access }) => {
      const row = await modelRow(db, access.campaignId, params.modelId!);
      const name = (row.sourceFileName || `model-${row.versionLabel}.${row.sourceFormat}`).replace(/[^A-Za-z0-9._-]/g, '_');
      res.setHeader('content-disposition', `attachment; filename="${name}"`);
      res.type(row.sourceFormat === 'json' ? 'application/json' : 'text/csv').send(row.source);
    },
  });

  routes.add({
    method: 'delete',
    path: '/campaigns/:campaignId/fe-models/:modelId',
    tag: 'Model',
    access: 'lead',
    summary: 'Delete a model version with its modes and map (the audit keeps its summary)',
    handler: async ({ params, campaign: access, user: me }) => {
      await db.transaction(async (tx) => {
        const row = await modelRow(tx, access.campaignId, params.modelId!, true);
        await tx.delete(feModel).where(eq(feModel.id, row.id));
        await audit(tx, { campaignId: access.campaignId, actorId: me.id, entity: 'fe-model', entityId: row.id, action: 'delete', before: modelSummary(row) });
      });
      return undefined;
    },
  });

  async function writeLinks(tx: Tx, campaignId: string, modelId: string, links: { point: string; node: string | null; distanceMm: number | null; source: 'label' | 'nearest' | 'manual' }[]) {
    if (!links.length) return;
    for (let i = 0; i < links.length; i += 1000) {
      await tx
        .insert(fePointLink)
        .values(links.slice(i, i + 1000).map((l) => ({ campaignId, modelId, pointLabel: l.point, nodeLabel: l.node, distanceMm: l.distanceMm, source: l.source })))
        .onConflictDoUpdate({ target: [fePointLink.modelId, fePointLink.pointLabel], set: { nodeLabel: sqlExcluded('node_label'), distanceMm: sqlExcluded('distance_mm'), source: sqlExcluded('source') } });
    }
  }

  routes.add({
    method: 'post',
    path: '/campaigns/:campaignId/fe-models/:modelId/map/auto',
    tag: 'Model',
    access: 'lead',
    summary: "Link every active test point to a model node, by label or by the nearest node within toleranceMm; replaces the stored map. Refuses (422) when the geometry and the model differ in size by more than 10× or are flat along different axes",
    body: feAutoMapSchema,
    returns: '{ map: { version, links: [{ point, node, distanceMm, source, sharedWith }] }, linked, unlinked }',
    handler: async ({ body, params, campaign: access, user: me }) => {
      if (body.by === 'nearest' && body.toleranceMm === undefined) throw new HttpError(400, 'invalid-input', 'Give toleranceMm (mm) for a map by nearest node.');
      return db.transaction(async (tx) => {
        const row = await modelRow(tx, access.campaignId, params.modelId!, true);
        const points = await activePoints(tx, access.campaignId);
        if (!points.length) throw new HttpError(400, 'no-points', 'The campaign has no points to map yet: import or accept a geometry first.');
        checkGeometryAgainstModel(points, row.nodes, row.fileUnits.length);
        const links = mapPointsToNodes(points, row.nodes, body.by === 'nearest' ? { by: 'nearest', toleranceMm: body.toleranceMm! } : { by: 'label' });
        await tx.delete(fePointLink).where(eq(fePointLink.modelId, row.id));
        await writeLinks(tx, access.campaignId, row.id, links.map((l) => ({ ...l, source: body.by })));
        await tx.update(feModel).set({ mapVersion: row.mapVersion + 1 }).where(eq(feModel.id, row.id));
        const linked = links.filter((l) => l.node).length;
        await audit(tx, { campaignId: access.campaignId, actorId: me.id, entity: 'fe-model', entityId: row.id, action: 'map-auto', after: { by: body.by, toleranceMm: body.toleranceMm ?? null, linked, unlinked: links.length - linked } });
        return { map: { version: row.mapVersion + 1, links: await loadLinks(tx, row.id) }, linked, unlinked: links.length - linked };
      });
    },
  });

  routes.add({
    method: 'patch',
    path: '/campaigns/:campaignId/fe-models/:modelId/map',
    tag: 'Model',
    access: 'lead',
    summary: 'Edit links of the map by hand: { version, links: [{ point, node | null }] }; the units and axes check applies',
    body: feMapEditSchema,
    handler: async ({ body, params, campaign: access, user: me }) => {
      return db.transaction(async (tx) => {
        const row = await modelRow(tx, access.campaignId, params.modelId!, true);
        if (row.mapVersion !== body.version) throw staleWrite('The map', { version: row.mapVersion, links: await loadLinks(tx, row.id) });
        const points = await activePoints(tx, access.campaignId);
        checkGeometryAgainstModel(points, row.nodes, row.fileUnits.length);
        const pointBy = new Map(points.map((p) => [p.label.toLowerCase(), p]));
        const nodeBy = new Map(row.nodes.map((n) => [n.label.toLowerCase(), n]));
        const problems: { index: number; message: string }[] = [];
        const links = body.links.map((l, index) => {
          const p = pointBy.get(l.point.toLowerCase());
          const n = l.node === null ? null : nodeBy.get(l.node.toLowerCase());
          if (!p) problems.push({ index, message: `point ${l.point} is not an active point of this campaign` });
          if (n === undefined) problems.push({ index, message: `node ${l.node} is not in model version ${row.versionLabel}` });
          return { point: p?.label ?? l.point, node: n ? n.label : null, distanceMm: p && n ? Math.hypot(p.x - n.x, p.y - n.y, p.z - n.z) : null, source: 'manual' as const };
        });
        if (problems.length) throw new HttpError(400, 'invalid-map', `The map was not changed: ${problems.length} link${problems.length > 1 ? 's are' : ' is'} wrong. First: ${problems[0]!.message}.`, problems);
        const before = await loadLinks(tx, row.id);
        await writeLinks(tx, access.campaignId, row.id, links);
        await tx.update(feModel).set({ mapVersion: row.mapVersion + 1 }).where(eq(feModel.id, row.id));
        await audit(tx, { campaignId: access.campaignId, actorId: me.id, entity: 'fe-model', entityId: row.id, action: 'map-edit', before: before.filter((b) => links.some((l) => l.point === b.point)), after: links });
        return { map: { version: row.mapVersion + 1, links: await loadLinks(tx, row.id) } };
      });
    },
  });

  routes.add({
    method: 'post',
    path: '/campaigns/:campaignId/fe-models/:modelId/proposal',
    tag: 'Model',
    access: 'viewer',
    // Computes and stores nothing, so an archived campaign answers it too.
    whileArchived: 'allowed',
    summary: 'Propose where to measure and where to put the reference: Effective Independence (Kammer 1991) over the candidate DOFs for the modes of interest, the driving-point measure, and the auto-MAC of the kept set against a threshold (0.2 default, common practice). Stores nothing',
    body: feProposalSchema,
    returns: '{ modes, kept: [{ dof, node, x, y, z, ed, rank }], ranking, informationKept, reference, referenceAlternatives, referenceWords, autoMac: { matrix, maxOffDiagonal, above, threshold, words } }',
    handler: async ({ body, params, campaign: access }) => {
      const s = await loadModel(db, access.campaignId, params.modelId!);
      const points = await activePoints(db, access.campaignId);
      return proposePlan(s.model, s.links, points, body);
    },
  });

  routes.add({
    method: 'post',
    path: '/campaigns/:campaignId/fe-models/:modelId/proposal/accept',
    tag: 'Model',
    access: 'lead',
    summary: "Accept a plan: points missing from the geometry are created at their model node's coordinates, each gets the chosen directions, the reference DOF is set (in a roving-hammer test the accelerometer channel at the former reference moves with it), points are linked to their nodes, and the schedule is generated. One transaction, audited",
    body: feAcceptSchema,
    returns: '{ pointsAdded, pointsUpdated, referenceDofs, schedule: { added, removed, kept }, channelsMoved: [{ channel, from, to }], channelNote, entries }',
    handler: async ({ body, params, campaign: access, user: me }) => {
      const result = await db.transaction(async (tx) => {
        const [c] = await tx.select().from(campaign).where(eq(campaign.id, access.campaignId)).for('update');
        if (c!.version !== body.campaignVersion) throw staleWrite('The campaign', c);
        const row = await modelRow(tx, access.campaignId, params.modelId!, true);
        const nodeBy = new Map(row.nodes.map((n) => [n.label.toLowerCase(), n]));
        const all = await tx.select().from(point).where(eq(point.campaignId, access.campaignId));
        const pointBy = new Map(all.map((p) => [p.label.toLowerCase(), p]));
        const wanted = new Map<string, Set<Direction>>();
        for (const dof of [...body.dofs, body.reference]) {
          const { point: label, direction } = parseDof(dof.trim());
          const key = label.toLowerCase();
          if (!pointBy.has(key) && !nodeBy.has(key)) throw new HttpError(400, 'cannot-accept', `DOF ${dof}: ${label} is neither a point of the campaign nor a node of model version ${row.versionLabel}. Nothing was changed.`);
          const existing = pointBy.get(key);
          if (existing?.retiredAt) throw new HttpError(409, 'conflict', `Point ${existing.label} is retired; restore it in the geometry first. Nothing was changed.`);
          wanted.set(key, (wanted.get(key) ?? new Set()).add(direction));
        }
        let pointsAdded = 0;
        let pointsUpdated = 0;
        const links: { point: string; node: string; distanceMm: number; source: 'label' }[] = [];
        for (const [key, dirs] of wanted) {
          const p = pointBy.get(key);
          const n = nodeBy.get(key);
          if (p) {
            const next = [...new Set([...(p.directions as Direction[]), ...dirs])];
            if (next.length !== p.directions.length) {
              const [after] = await tx.update(point).set({ directions: next, version: p.version + 1, updatedAt: new Date() }).where(eq(point.id, p.id)).returning();
              await audit(tx, { campaignId: access.campaignId, actorId: me.id, entity: 'point', entityId: p.id, action: 'update', before: p, after });
              pointsUpdated++;
            }
            if (n) links.push({ point: p.label, node: n.label, distanceMm: Math.hypot(p.x - n.x, p.y - n.y, p.z - n.z), source: 'label' });
          } else {
            const [created] = await tx.insert(point).values({ campaignId: access.campaignId, label: n!.label, x: n!.x, y: n!.y, z: n!.z, directions: [...dirs] }).returning();
            await audit(tx, { campaignId: access.campaignId, actorId: me.id, entity: 'point', entityId: created!.id, action: 'create', after: created });
            links.push({ point: n!.label, node: n!.label, distanceMm: 0, source: 'label' });
            pointsAdded++;
          }
        }
        const refPoint = parseDof(body.reference.trim()).point.toLowerCase();
        const refLabel = `${pointBy.get(refPoint)?.label ?? nodeBy.get(refPoint)!.label}:${parseDof(body.reference.trim()).direction}`;
        await tx.update(campaign).set({ referenceDofs: [refLabel], version: c!.version + 1, updatedAt: new Date() }).where(eq(campaign.id, c!.id));
        await audit(tx, { campaignId: c!.id, actorId: me.id, entity: 'campaign', entityId: c!.id, action: 'update', before: { referenceDofs: c!.referenceDofs }, after: { referenceDofs: [refLabel] } });
        const channels = await moveReferenceChannel(tx, { campaignId: c!.id, actorId: me.id, testType: c!.testType, before: c!.referenceDofs, next: refLabel });
        await writeLinks(tx, access.campaignId, row.id, links);
        await tx.update(feModel).set({ mapVersion: row.mapVersion + 1 }).where(eq(feModel.id, row.id));
        const schedule = await generateSchedule(tx, access.campaignId, me.id, body.requiredHits);
        const summary = { pointsAdded, pointsUpdated, referenceDofs: [refLabel], dofs: body.dofs, schedule, channelsMoved: channels.moved, channelNote: channels.note };
        await audit(tx, { campaignId: access.campaignId, actorId: me.id, entity: 'fe-model', entityId: row.id, action: 'accept-plan', after: summary });
        return summary;
      });
      return { ...result, entries: await listScheduleEntries(db, access.campaignId) };
    },
  });

  routes.add({
    method: 'get',
    path: '/campaigns/:campaignId/fe-models/:modelId/correlation',
    tag: 'Model',
    access: 'viewer',
    summary: "Correlate the campaign's mode table with this model version over the linked DOFs: pairs by MAC with frequency differences in %, the MAC matrix, cross-orthogonality where both sides are mass-normalised",
    query: feCorrelationQuerySchema,
    handler: async ({ query, params, campaign: access }) => {
      const s = await loadModel(db, access.campaignId, params.modelId!);
      const test = await testModesForCorrelation(db, access.campaignId);
      return { model: modelSummary(s.row), correlation: correlate(s.model, s.links, test, query.minMac ?? 0.6) };
    },
  });
}
