// Redo a schedule entry: its hits so far are set aside (kept, never deleted, with who and why) and
// a new set of hits starts at the same DOF. Audited; the averaged FRF and the status then read the
// new hits only (hits/exclusion.ts).
import { randomUUID } from 'node:crypto';
import { and, eq } from 'drizzle-orm';
import { z } from 'zod';
import { hit, hitExclusion, scheduleEntry } from '@resonote/db/schema';
import type { Deps } from './deps.ts';
import { audit } from '../http/audit.ts';
import { staleWrite } from '../http/concurrency.ts';
import { HttpError } from '../errors.ts';
import { notExcluded } from '../hits/exclusion.ts';
import { loadScheduleEntry } from '../hits/schedule-entry.ts';
import { listScheduleEntries } from '../plan/schedule-list.ts';
import { withFlagReasons } from '../hits/entry-flags.ts';

export const redoBodySchema = z.strictObject({
  reason: z.string().trim().min(3, 'say why in a few words').max(1000),
  /** The entry's version as read, so two people do not redo one DOF twice. */
  version: z.number().int().positive(),
});

export function registerRedoRoutes({ routes, db, events }: Deps): void {
  routes.add({
    method: 'post',
    path: '/campaigns/:campaignId/schedule/:entryId/redo',
    tag: 'Schedule',
    access: 'engineer',
    summary: 'Redo a DOF: set its hits so far aside (kept, with who and why; audited) and start a new set. Send the entry version you read; a concurrent change answers 409',
    body: redoBodySchema,
    returns: '{ entry, setAside: { redoId, hits, by, reason } }',
    handler: async ({ body, params, campaign: access, user: me }) => {
      const entry = await loadScheduleEntry(db, access.campaignId, params.entryId!);
      const redoId = randomUUID();
      const setAside = await db.transaction(async (tx) => {
        const [before] = await tx.select().from(scheduleEntry).where(eq(scheduleEntry.id, entry.id)).for('update');
        if (!before) throw new HttpError(404, 'not-found', 'That schedule entry was not found.');
        if (before.version !== body.version) throw staleWrite('The schedule entry', before);
        if (before.status === 'skipped') throw new HttpError(409, 'entry-skipped', 'This DOF is skipped; set it back to planned before redoing it.');
        const hits = await tx.select({ id: hit.id, sequence: hit.sequence, verdict: hit.verdict }).from(hit).where(and(eq(hit.scheduleEntryId, entry.id), notExcluded));
        if (hits.length === 0) throw new HttpError(409, 'nothing-to-redo', `There is no hit at ${entry.excitationDof} → ${entry.responseDof} to set aside: take the hits as usual.`);
        await tx.insert(hitExclusion).values(hits.map((h) => ({ hitId: h.id, campaignId: access.campaignId, scheduleEntryId: entry.id, redoId, excludedBy: me.id, reason: body.reason })));
        const [after] = await tx.update(scheduleEntry).set({ status: 'in-progress', version: before.version + 1, updatedAt: new Date() }).where(eq(scheduleEntry.id, entry.id)).returning();
        await audit(tx, {
          campaignId: access.campaignId,
          actorId: me.id,
          entity: 'schedule-entry',
          entityId: entry.id,
          action: 'redo',
          before: { status: before.status, version: before.version, hits: hits.map((h) => ({ id: h.id, sequence: h.sequence, verdict: h.verdict })) },
          after: { status: after!.status, version: after!.version, redoId, reason: body.reason, setAside: hits.length },
        });
        return hits;
      });
      void events.publish(access.campaignId, { type: 'schedule', entryId: entry.id });
      const [listed] = await withFlagReasons(db, access.campaignId, await listScheduleEntries(db, access.campaignId, [entry.id]));
      return { entry: listed, setAside: { redoId, hits: setAside.map((h) => h.sequence).sort((a, b) => a - b), by: me.name, reason: body.reason } };
    },
  });
}
