// Starting a modal fit: the FRFs chosen (or the default selection), the band and model orders
// checked, an identical earlier request reused, else a fit row and a background job.
import { createHash } from 'node:crypto';
import { and, desc, eq, inArray } from 'drizzle-orm';
import { z } from 'zod';
import { uuidSchema } from '@resonote/contracts';
import { modalFit } from '@resonote/db/schema';
import type { Db } from '@resonote/db/client';
import type { SessionUser } from '../context.ts';
import { badRequest } from '../errors.ts';
import { audit } from '../http/audit.ts';
import { frfSetFor } from './frf-set.ts';
import type { FitQueue } from './jobs.ts';

export const startFitSchema = z.strictObject({
      entryIds: z.array(uuidSchema).max(500).optional(),
      bandHz: z.strictObject({ low: z.number().min(0), high: z.number().positive() }).optional(),
      maxOrder: z.number().int().min(2).max(160).default(40),
      orderStep: z.number().int().min(1).max(10).default(2),
      tolerances: z.strictObject({ freqPercent: z.number().positive().max(20).default(1), dampingPercent: z.number().positive().max(100).default(5), macPercent: z.number().min(0).max(100).default(98) }).default({ freqPercent: 1, dampingPercent: 5, macPercent: 98 }),
    });

/** `reused`: an identical request (same input hash) was queued, running or done already, and is answered instead. */
export async function startFit(db: Db, queue: FitQueue, access: { campaignId: string }, body: z.infer<typeof startFitSchema>, me: SessionUser) {
  const { set, settings, resultHashes, entryIds, leftOut } = await frfSetFor(db, access.campaignId, body.entryIds);
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
    return { reused: true, answer: { fit: { id: earlier.id, status: earlier.status, progress: earlier.progress, reused: true }, leftOut } };
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
  return { reused: false, answer: { fit: { id: fit!.id, status: fit!.status, progress: fit!.progress, reused: false }, leftOut } };
}
