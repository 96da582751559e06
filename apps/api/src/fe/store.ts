// Reading stored FE model versions back into the canonical form of packages/contracts (mm, Hz, kg).
import { and, asc, desc, eq } from 'drizzle-orm';
import { uuidSchema, type FeModel, type PointNodeLink } from '@resonote/contracts';
import { feMode, feModel, fePointLink } from '@resonote/db/schema';
import type { Db } from '@resonote/db/client';
import type { Tx } from '../http/audit.ts';
import { notFound } from '../errors.ts';

export type FeModelRow = typeof feModel.$inferSelect;

export interface StoredFeModel {
  row: FeModelRow;
  model: FeModel;
  links: (PointNodeLink & { source: 'label' | 'nearest' | 'manual' })[];
}

export function modelSummary(r: FeModelRow) {
  return {
    id: r.id,
    name: r.name,
    versionLabel: r.versionLabel,
    fileUnits: r.fileUnits,
    units: { length: 'mm', frequency: 'Hz', mass: 'kg' },
    normalisation: r.normalisation,
    sourceFormat: r.sourceFormat,
    sourceFileName: r.sourceFileName,
    sourceBytes: r.source.length,
    nodeCount: r.nodeCount,
    modeCount: r.modeCount,
    mapVersion: r.mapVersion,
    uploadedBy: r.uploadedBy,
    uploadedAt: r.uploadedAt,
  };
}

export async function modelRow(db: Db | Tx, campaignId: string, modelId: string, lock = false): Promise<FeModelRow> {
  if (!uuidSchema.safeParse(modelId).success) throw notFound('That model version');
  const q = db.select().from(feModel).where(and(eq(feModel.id, modelId), eq(feModel.campaignId, campaignId)));
  const [row] = lock ? await q.for('update') : await q;
  if (!row) throw notFound('That model version');
  return row;
}

export async function loadLinks(db: Db | Tx, modelId: string): Promise<StoredFeModel['links']> {
  const rows = await db.select().from(fePointLink).where(eq(fePointLink.modelId, modelId)).orderBy(asc(fePointLink.pointLabel));
  const byNode = new Map<string, string[]>();
  for (const l of rows) if (l.nodeLabel) byNode.set(l.nodeLabel.toLowerCase(), [...(byNode.get(l.nodeLabel.toLowerCase()) ?? []), l.pointLabel]);
  return rows.map((l) => ({
    point: l.pointLabel,
    node: l.nodeLabel,
    distanceMm: l.distanceMm,
    source: l.source,
    sharedWith: l.nodeLabel ? byNode.get(l.nodeLabel.toLowerCase())!.filter((p) => p !== l.pointLabel) : [],
  }));
}

export async function loadModel(db: Db | Tx, campaignId: string, modelId: string): Promise<StoredFeModel> {
  const row = await modelRow(db, campaignId, modelId);
  const modes = await db.select().from(feMode).where(eq(feMode.modelId, row.id)).orderBy(asc(feMode.frequencyHz), asc(feMode.number));
  const model: FeModel = {
    name: row.name,
    normalisation: row.normalisation,
    fileUnits: row.fileUnits as FeModel['fileUnits'],
    nodes: row.nodes,
    modes: modes.map((m) => ({ number: m.number, frequencyHz: m.frequencyHz, modalMassKg: m.modalMassKg, shape: m.shape })),
  };
  return { row, model, links: await loadLinks(db, row.id) };
}

/** The campaign's most recent model version, or null (the report and bundle correlate against it). */
export async function latestModelId(db: Db | Tx, campaignId: string): Promise<string | null> {
  const [r] = await db.select({ id: feModel.id }).from(feModel).where(eq(feModel.campaignId, campaignId)).orderBy(desc(feModel.uploadedAt)).limit(1);
  return r?.id ?? null;
}
