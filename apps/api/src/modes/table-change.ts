// The campaign's mode table as served and as changed: the answer of GET …/modes, adding computed
// modes of a fit (a mode already in the table refused, duplicates pointed out), removing a row;
// every change names the table version it read (409 when stale) and is audited.
import { and, eq } from 'drizzle-orm';
import { z } from 'zod';
import { AXIS_CONVENTION } from '@resonote/contracts';
import { line, modeTableRow, point } from '@resonote/db/schema';
import type { Db } from '@resonote/db/client';
import type { SessionUser } from '../context.ts';
import { badRequest, conflict, notFound } from '../errors.ts';
import { audit, type Tx } from '../http/audit.ts';
import { staleWrite } from '../http/concurrency.ts';
import { pathId } from '../http/rows.ts';
import type { FitRow } from './frf-set.ts';
import { singleMode, type StoredModel } from './model-store.ts';
import { bumpTable, DUPLICATE_RULE, refreshDuplicates, rowView, tableMac, tableRows, tableVersion, type ShapeEntry } from './mode-table.ts';
import { mpcWarnings, QUALITY_LIMITS } from './quality.ts';

/** The campaign's mode table as served to the page and the hand-over: rows by frequency, numbered 1…n. */
export async function tableView(db: Db | Tx, campaignId: string) {
  const rows = await tableRows(db, campaignId);
  const version = await tableVersion(db, campaignId);
  return { version, rows, view: rows.map((r, i) => rowView(r, i + 1, rows)), mac: tableMac(rows) };
}

export async function modeTableAnswer(db: Db, access: { campaignId: string }) {
  const t = await tableView(db, access.campaignId);
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
}

export const addToTableSchema = z.strictObject({ fitId: z.string().min(1).max(64), modes: z.array(z.number().int().min(1)).min(1, 'pick at least one mode').max(60), baseVersion: z.number().int().min(0) });

export async function addToTable(db: Db, fit: FitRow, access: { campaignId: string }, body: z.infer<typeof addToTableSchema>, me: SessionUser) {
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
}

export async function removeFromTable(db: Db, access: { campaignId: string }, params: Record<string, string>, query: { baseVersion: number }, me: SessionUser) {
  const rowId = pathId(params.rowId, 'That mode-table row');
  return db.transaction(async (tx) => {
    const version = await tableVersion(tx, access.campaignId);
    const [row] = await tx.select().from(modeTableRow).where(and(eq(modeTableRow.id, rowId), eq(modeTableRow.campaignId, access.campaignId)));
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
}
