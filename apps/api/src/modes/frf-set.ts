// What a fit reads: the accelerance FRFs (H1) of the chosen schedule entries, each on the positive
// axis of both points, with the settings and input hashes they came from; and one stored fit.
import { and, eq } from 'drizzle-orm';
import { canonicalLabel, frfAxisFactor } from '@resonote/contracts';
import type { FrfSet } from '@resonote/dsp';
import { modalFit, scheduleEntry } from '@resonote/db/schema';
import type { Db } from '@resonote/db/client';
import { badRequest, notFound } from '../errors.ts';
import { oneOr404, pathId } from '../http/rows.ts';
import { currentSettings } from '../hits/current-settings.ts';
import { entriesWithAcceptedHits } from '../hits/schedule-status.ts';
import { entryResult } from '../hits/entry-result.ts';
import { defaultFitEntries } from './fit-selection.ts';

/** The accelerance FRFs (H1) of the chosen entries, one per (response DOF, excitation DOF) pair. */
export async function frfSetFor(db: Db, campaignId: string, entryIds: string[] | undefined, every = false) {
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

export function loadFit(db: Db, campaignId: string, rawFitId: string | undefined) {
  const fitId = pathId(rawFitId, 'That modal fit');
  return oneOr404(db.select().from(modalFit).where(and(eq(modalFit.id, fitId), eq(modalFit.campaignId, campaignId))), 'That modal fit');
}

export type FitRow = Awaited<ReturnType<typeof loadFit>>;
