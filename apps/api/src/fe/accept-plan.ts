// Accepting a plan proposal in one audited transaction: missing points created at their node's
// coordinates, the chosen directions added, the reference DOF set (in a roving-hammer test the
// accelerometer channel at the former reference moves with it, reference-channel.ts), points
// linked to their nodes, and the schedule regenerated.
import { eq } from 'drizzle-orm';
import type { z } from 'zod';
import { parseDof, type Direction, type feAcceptSchema } from '@resonote/contracts';
import { campaign, feModel, point } from '@resonote/db/schema';
import type { Db } from '@resonote/db/client';
import type { SessionUser } from '../context.ts';
import { audit } from '../http/audit.ts';
import { staleWrite } from '../http/concurrency.ts';
import { HttpError } from '../errors.ts';
import { generateSchedule } from '../plan/schedule-generate.ts';
import { listScheduleEntries } from '../plan/schedule-list.ts';
import { writeLinks } from './point-links.ts';
import { moveReferenceChannel } from './reference-channel.ts';
import { modelRow } from './store.ts';

export async function acceptPlan(db: Db, access: { campaignId: string }, modelId: string, body: z.infer<typeof feAcceptSchema>, me: SessionUser) {
  const result = await db.transaction(async (tx) => {
    const [c] = await tx.select().from(campaign).where(eq(campaign.id, access.campaignId)).for('update');
    if (c!.version !== body.campaignVersion) throw staleWrite('The campaign', c);
    const row = await modelRow(tx, access.campaignId, modelId, true);
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
}
