// A model version as uploaded: the file read (CSV or JSON, docs/fe-model-format.md; every problem
// listed, nothing stored) and stored byte for byte with its nodes and modes in one transaction;
// and one version as the page reads it.
import type { z } from 'zod';
import { parseFeModelCsv, parseFeModelJson, type feModelUploadSchema } from '@resonote/contracts';
import { feMode, feModel } from '@resonote/db/schema';
import type { Db } from '@resonote/db/client';
import type { SessionUser } from '../context.ts';
import { audit } from '../http/audit.ts';
import { isUniqueViolation } from '../http/rows.ts';
import { conflict, HttpError } from '../errors.ts';
import { loadModel, modelSummary } from './store.ts';

function guessFormat(text: string, fileName?: string): 'csv' | 'json' {
  if (fileName && /\.json$/i.test(fileName)) return 'json';
  if (fileName && /\.csv$/i.test(fileName)) return 'csv';
  return /^\uFEFF?\s*[{[]/.test(text) ? 'json' : 'csv';
}

export async function storeModelVersion(db: Db, access: { campaignId: string }, body: z.infer<typeof feModelUploadSchema>, me: SessionUser) {
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
    if (isUniqueViolation(err)) throw conflict(`A model version labelled "${body.versionLabel}" already exists in this campaign; give the new one another label.`);
    throw err;
  }
}

export async function modelView(db: Db, campaignId: string, modelId: string) {
  const s = await loadModel(db, campaignId, modelId);
  return {
    model: modelSummary(s.row),
    nodes: s.model.nodes,
    modes: s.model.modes.map((m) => ({ number: m.number, frequencyHz: m.frequencyHz, modalMassKg: m.modalMassKg })),
    map: { version: s.row.mapVersion, links: s.links },
  };
}
