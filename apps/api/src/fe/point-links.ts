// The test point ↔ node map of a model version: linked automatically (by label or the nearest node
// within a tolerance) or by hand, after the units and axes check (geometry-check.ts); every change
// bumps the map's version and is audited.
import { and, eq, isNull, sql } from 'drizzle-orm';
import type { z } from 'zod';
import { mapPointsToNodes, type feAutoMapSchema, type feMapEditSchema } from '@resonote/contracts';
import { feModel, fePointLink, point } from '@resonote/db/schema';
import type { Db } from '@resonote/db/client';
import type { SessionUser } from '../context.ts';
import { audit, type Tx } from '../http/audit.ts';
import { staleWrite } from '../http/concurrency.ts';
import { HttpError } from '../errors.ts';
import { checkGeometryAgainstModel } from './geometry-check.ts';
import { loadLinks, modelRow } from './store.ts';

const sqlExcluded = (col: string) => sql.raw(`excluded.${col}`);

/** The campaign's points that are not retired, as the map and the proposal read them. */
export const activePoints = (tx: Db | Tx, campaignId: string) =>
  tx.select({ id: point.id, label: point.label, x: point.x, y: point.y, z: point.z, directions: point.directions }).from(point).where(and(eq(point.campaignId, campaignId), isNull(point.retiredAt)));

export async function writeLinks(tx: Tx, campaignId: string, modelId: string, links: { point: string; node: string | null; distanceMm: number | null; source: 'label' | 'nearest' | 'manual' }[]) {
  if (!links.length) return;
  for (let i = 0; i < links.length; i += 1000) {
    await tx
      .insert(fePointLink)
      .values(links.slice(i, i + 1000).map((l) => ({ campaignId, modelId, pointLabel: l.point, nodeLabel: l.node, distanceMm: l.distanceMm, source: l.source })))
      .onConflictDoUpdate({ target: [fePointLink.modelId, fePointLink.pointLabel], set: { nodeLabel: sqlExcluded('node_label'), distanceMm: sqlExcluded('distance_mm'), source: sqlExcluded('source') } });
  }
}

export async function autoMap(db: Db, access: { campaignId: string }, modelId: string, body: z.infer<typeof feAutoMapSchema>, me: SessionUser) {
  if (body.by === 'nearest' && body.toleranceMm === undefined) throw new HttpError(400, 'invalid-input', 'Give toleranceMm (mm) for a map by nearest node.');
  return db.transaction(async (tx) => {
    const row = await modelRow(tx, access.campaignId, modelId, true);
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
}

export async function editMap(db: Db, access: { campaignId: string }, modelId: string, body: z.infer<typeof feMapEditSchema>, me: SessionUser) {
  return db.transaction(async (tx) => {
    const row = await modelRow(tx, access.campaignId, modelId, true);
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
}
