// The campaign's mode table (design.md, "Mode table"): modes taken from one or several fits, each
// row keeping its fit, band, references, order and input hash. Shapes of rows from different fits
// are compared over the DOFs they share (all on the positive axis of each point, contracts/axis.ts).
import { asc, eq, sql } from 'drizzle-orm';
import { mac, synthesize, type Complex, type ModalFrfKind } from '@resonote/dsp';
import { modeTable, modeTableRow } from '@resonote/db/schema';
import type { Db } from '@resonote/db/client';
import type { Tx } from '../http/audit.ts';
import { loadModel, type StoredModel } from './model-store.ts';

/** The same mode found twice: frequency within 1 % and MAC ≥ 0.9 over the shared DOFs (Resonote's default, common practice). */
export const DUPLICATE_RULE = { freqPercent: 1, mac: 0.9 } as const;

export interface ShapeEntry {
  dof: string;
  re: number;
  im: number;
  real: number;
}
export type TableRow = typeof modeTableRow.$inferSelect;

export async function tableVersion(db: Db | Tx, campaignId: string): Promise<number> {
  const [t] = await db.select({ version: modeTable.version }).from(modeTable).where(eq(modeTable.campaignId, campaignId));
  return t?.version ?? 0;
}

export async function tableRows(db: Db | Tx, campaignId: string): Promise<TableRow[]> {
  return db.select().from(modeTableRow).where(eq(modeTableRow.campaignId, campaignId)).orderBy(asc(modeTableRow.fHz), asc(modeTableRow.addedAt));
}

/** MAC of two complex shapes over the DOFs they share; null when they share fewer than 2. */
export function sharedMac(a: readonly ShapeEntry[], b: readonly ShapeEntry[]): number | null {
  const bBy = new Map(b.map((s) => [s.dof, s]));
  const common = a.filter((s) => bBy.has(s.dof));
  if (common.length < 2) return null;
  const va: Complex = { re: Float64Array.from(common, (s) => s.re), im: Float64Array.from(common, (s) => s.im) };
  const vb: Complex = { re: Float64Array.from(common, (s) => bBy.get(s.dof)!.re), im: Float64Array.from(common, (s) => bBy.get(s.dof)!.im) };
  return mac(va, vb);
}

/** The MAC matrix of the table's shapes over shared DOFs (0 where two rows share fewer than 2 DOFs). */
export function tableMac(rows: readonly { shape: unknown }[]): number[][] {
  return rows.map((a) => rows.map((b) => sharedMac(a.shape as ShapeEntry[], b.shape as ShapeEntry[]) ?? 0));
}

/**
 * Marks, in the order rows were added, each row whose mode an earlier row already holds: frequency
 * within DUPLICATE_RULE.freqPercent and MAC ≥ DUPLICATE_RULE.mac (or frequency alone when the two
 * shapes share fewer than 2 DOFs, said in the note). Run after every add and remove.
 */
export async function refreshDuplicates(tx: Tx, campaignId: string): Promise<void> {
  const rows = (await tableRows(tx, campaignId)).sort((a, b) => a.addedAt.getTime() - b.addedAt.getTime() || a.id.localeCompare(b.id));
  for (let i = 0; i < rows.length; i++) {
    const r = rows[i]!;
    let found: { of: TableRow; note: string } | null = null;
    for (let j = 0; j < i && !found; j++) {
      const e = rows[j]!;
      const df = (100 * Math.abs(r.fHz - e.fHz)) / e.fHz;
      if (df > DUPLICATE_RULE.freqPercent) continue;
      const m = sharedMac(r.shape as ShapeEntry[], e.shape as ShapeEntry[]);
      if (m !== null && m < DUPLICATE_RULE.mac) continue;
      found = {
        of: e,
        note:
          m === null
            ? `Possibly the same mode as the row at ${e.fHz.toFixed(2)} Hz: frequencies ${df.toFixed(2)} % apart; the shapes share fewer than 2 DOFs, so only the frequency was compared.`
            : `Same mode as the row at ${e.fHz.toFixed(2)} Hz (fit band ${e.bandLowHz}–${e.bandHighHz} Hz, order ${e.modelOrder}): frequencies ${df.toFixed(2)} % apart, MAC ${m.toFixed(3)}. Keep one of the two.`,
      };
    }
    const next = { duplicate: Boolean(found), duplicateOf: found?.of.id ?? null, duplicateNote: found?.note ?? '' };
    if (next.duplicate !== r.duplicate || next.duplicateOf !== r.duplicateOf || next.duplicateNote !== r.duplicateNote) {
      await tx.update(modeTableRow).set(next).where(eq(modeTableRow.id, r.id));
    }
  }
}

/** Bumps (or creates) the table's version; returns the new version. */
export async function bumpTable(tx: Tx, campaignId: string): Promise<number> {
  const [t] = await tx
    .insert(modeTable)
    .values({ campaignId, version: 1 })
    .onConflictDoUpdate({ target: modeTable.campaignId, set: { version: sqlIncrement(), updatedAt: new Date() } })
    .returning({ version: modeTable.version });
  return t!.version;
}

const sqlIncrement = () => sql`${modeTable.version} + 1`;

/**
 * FRF synthesised from every row of the table whose fit holds the pair (response, reference), or its
 * reciprocal: the pole–residue sum of each row's mode (dsp synthesize), without residual terms, which
 * belong to one fitted band only. Rows whose fit lacks the pair are named in `missing`.
 */
export function synthesizeFromTable(rows: readonly TableRow[], f: Float64Array, response: string, reference: string, kind: ModalFrfKind) {
  const re = new Float64Array(f.length);
  const im = new Float64Array(f.length);
  const used: string[] = [];
  const missing: string[] = [];
  for (const r of rows) {
    if (r.duplicate) continue;
    const model = loadModel(r.model as StoredModel);
    let h: Complex;
    try {
      h = synthesize(model, f, response, reference, kind);
    } catch (err) {
      if (err instanceof RangeError) {
        missing.push(r.id);
        continue;
      }
      throw err;
    }
    for (let k = 0; k < f.length; k++) {
      re[k]! += h.re[k]!;
      im[k]! += h.im[k]!;
    }
    used.push(r.id);
  }
  return { h: { re, im }, used, missing };
}

/** One row of the mode table as the page and the hand-over read it. */
export function rowView(r: TableRow, mode: number, rows: readonly TableRow[]) {
  const number = (id: string | null) => (id ? rows.findIndex((x) => x.id === id) + 1 || null : null);
  return {
    id: r.id,
    mode,
    fHz: r.fHz,
    zetaPercent: r.zetaPercent,
    estimated: { fHz: (r.model as StoredModel).modes[0]?.fHz ?? r.fHz, zetaPercent: r.zetaPercentRaw },
    mpc: r.mpc,
    pole: { order: r.modelOrder, index: r.poleIndex },
    source: { fitId: r.fitId, bandHz: [r.bandLowHz, r.bandHighHz] as [number, number], references: r.references, order: r.modelOrder, poleIndex: r.poleIndex, inputHash: r.inputHash },
    shape: r.shape as ShapeEntry[],
    massShape: (r.massShape as { dof: string; re: number; im: number; real: number }[] | null) ?? null,
    massNote: r.massNote,
    duplicate: r.duplicate ? { of: number(r.duplicateOf), ofId: r.duplicateOf, note: r.duplicateNote } : null,
    addedAt: r.addedAt,
  };
}
