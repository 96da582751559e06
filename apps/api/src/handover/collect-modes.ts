// The hand-over's modes: the campaign's mode table with the fits its rows came from, and the
// correlation of that table with the newest FE model version.
import { inArray } from 'drizzle-orm';
import { AXIS_CONVENTION } from '@resonote/contracts';
import { modalFit } from '@resonote/db/schema';
import type { Db } from '@resonote/db/client';
import { correlate, testModesForCorrelation } from '../fe/correlation.ts';
import { latestModelId, loadModel } from '../fe/store.ts';
import { DUPLICATE_RULE, rowView, tableMac, tableRows } from '../modes/mode-table.ts';
import type { HandoverCorrelation, HandoverModes } from './handover-data.ts';

/** The campaign's mode table (null when it has no rows) with the fits its rows came from. */
export async function modesOf(db: Db, campaignId: string): Promise<HandoverModes | null> {
  const rows = await tableRows(db, campaignId);
  if (rows.length === 0) return null;
  const fitIds = [...new Set(rows.map((r) => r.fitId).filter((x): x is string => Boolean(x)))];
  const fits = fitIds.length ? await db.select().from(modalFit).where(inArray(modalFit.id, fitIds)) : [];
  return {
    table: rows.map((r, i) => rowView(r, i + 1, rows)),
    mac: tableMac(rows),
    fits: fits.map((fit) => {
      const request = fit.request as { bandHz: [number, number]; settingsVersion: number; resultHashes: string[]; entryIds: string[]; frfCount: number };
      const modes = (fit.modes ?? {}) as { correction?: string; chosenBy?: string; chosenAt?: string };
      return { fitId: fit.id, inputHash: fit.inputHash, bandHz: request.bandHz, settingsVersion: request.settingsVersion, resultHashes: request.resultHashes ?? [], entryIds: request.entryIds ?? [], frfCount: request.frfCount, correction: modes.correction ?? '', chosenBy: modes.chosenBy ?? '', chosenAt: modes.chosenAt ?? '' };
    }),
    duplicateRule: `The same mode twice: frequencies within ${DUPLICATE_RULE.freqPercent} % and MAC ≥ ${DUPLICATE_RULE.mac} over the DOFs both shapes share (common practice).`,
    axisConvention: AXIS_CONVENTION,
  };
}

/** The newest model version against the mode table (fe/correlation.ts), or null when there is no model. */
export async function correlationOf(db: Db, campaignId: string): Promise<HandoverCorrelation | null> {
  const id = await latestModelId(db, campaignId);
  if (!id) return null;
  const s = await loadModel(db, campaignId, id);
  const r = s.row;
  return { model: { id: r.id, name: r.name, versionLabel: r.versionLabel, normalisation: r.normalisation, uploadedAt: r.uploadedAt, nodeCount: r.nodeCount, modeCount: r.modeCount }, result: correlate(s.model, s.links, await testModesForCorrelation(db, campaignId)) };
}

