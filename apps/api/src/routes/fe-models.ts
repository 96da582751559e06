// FE model versions of a campaign (issue 19): upload (CSV or JSON, docs/fe-model-format.md,
// fe/model-upload.ts), list, read, the file as uploaded, delete. The point ↔ node map:
// routes/fe-map.ts; the plan proposal and the correlation: routes/fe-plan.ts.
import multer from 'multer';
import { eq } from 'drizzle-orm';
import type { RequestHandler } from 'express';
import { feModelUploadSchema, MAX_FE_CHARS } from '@resonote/contracts';
import { feModel } from '@resonote/db/schema';
import type { Deps } from './deps.ts';
import { audit } from '../http/audit.ts';
import { HttpError } from '../errors.ts';
import { modelView, storeModelVersion } from '../fe/model-upload.ts';
import { modelRow, modelSummary } from '../fe/store.ts';

/** Multipart upload: the file as field `file`, `versionLabel` and `name` as text fields. */
const modelUpload: RequestHandler = (req, res, next) => {
  if (!req.is('multipart/form-data')) return next();
  multer({ storage: multer.memoryStorage(), limits: { fileSize: MAX_FE_CHARS, files: 1, fields: 5 } }).single('file')(req, res, (err: unknown) => {
    if (err) {
      const e = err as { code?: string };
      if (e.code === 'LIMIT_FILE_SIZE') return next(new HttpError(413, 'too-large', `The model file is larger than ${MAX_FE_CHARS / 1024 / 1024} MB; nothing was stored.`));
      return next(new HttpError(400, 'bad-upload', `The upload could not be read: ${(err as Error).message}`));
    }
    if (!req.file) return next(new HttpError(400, 'invalid-input', 'Attach the model file as the form field "file".'));
    const fields = (req.body ?? {}) as Record<string, string>;
    req.body = {
      text: req.file.buffer.toString('utf8'),
      fileName: req.file.originalname,
      ...(fields.versionLabel !== undefined ? { versionLabel: fields.versionLabel } : {}),
      ...(fields.name ? { name: fields.name } : {}),
      ...(fields.format ? { format: fields.format } : {}),
    };
    next();
  });
};

export function registerFeModelRoutes({ routes, db }: Deps): void {
  routes.add({
    method: 'post',
    path: '/campaigns/:campaignId/fe-models',
    tag: 'Model',
    access: 'lead',
    summary: 'Upload a finite-element model version (Resonote FE-modes CSV or JSON, docs/fe-model-format.md) as JSON { text, versionLabel, format?, name? } or multipart (field "file"). The file is kept byte for byte',
    body: feModelUploadSchema,
    bodyLimit: `${Math.ceil((MAX_FE_CHARS * 1.2) / 1024 / 1024)}mb`,
    before: [modelUpload],
    status: 201,
    returns: '{ model }; 400 invalid-model with details: [{ row, column, path, message }] and truncated when the file has problems (nothing stored); 413 for a file over the limit',
    handler: ({ body, campaign: access, user: me }) => storeModelVersion(db, access, body, me),
  });

  routes.add({
    method: 'get',
    path: '/campaigns/:campaignId/fe-models',
    tag: 'Model',
    access: 'viewer',
    summary: "The campaign's model versions, newest first",
    returns: '{ models: [{ id, name, versionLabel, fileUnits, normalisation, nodeCount, modeCount, uploadedBy, uploadedAt, ... }] }',
    handler: async ({ campaign: access }) => {
      const rows = await db.select().from(feModel).where(eq(feModel.campaignId, access.campaignId));
      rows.sort((a, b) => b.uploadedAt.getTime() - a.uploadedAt.getTime());
      return { models: rows.map(modelSummary) };
    },
  });

  routes.add({
    method: 'get',
    path: '/campaigns/:campaignId/fe-models/:modelId',
    tag: 'Model',
    access: 'viewer',
    summary: 'One model version: nodes (mm), modes (Hz, modal mass kg) and the point ↔ node map',
    handler: ({ params, campaign: access }) => modelView(db, access.campaignId, params.modelId!),
  });

  routes.add({
    method: 'get',
    path: '/campaigns/:campaignId/fe-models/:modelId/source',
    tag: 'Model',
    access: 'viewer',
    summary: 'The model file as it was uploaded, byte for byte',
    produces: 'application/octet-stream',
    handler: async ({ res, params, campaign: access }) => {
      const row = await modelRow(db, access.campaignId, params.modelId!);
      const name = (row.sourceFileName || `model-${row.versionLabel}.${row.sourceFormat}`).replace(/[^A-Za-z0-9._-]/g, '_');
      res.setHeader('content-disposition', `attachment; filename="${name}"`);
      res.type(row.sourceFormat === 'json' ? 'application/json' : 'text/csv').send(row.source);
    },
  });

  routes.add({
    method: 'delete',
    path: '/campaigns/:campaignId/fe-models/:modelId',
    tag: 'Model',
    access: 'lead',
    summary: 'Delete a model version with its modes and map (the audit keeps its summary)',
    handler: async ({ params, campaign: access, user: me }) => {
      await db.transaction(async (tx) => {
        const row = await modelRow(tx, access.campaignId, params.modelId!, true);
        await tx.delete(feModel).where(eq(feModel.id, row.id));
        await audit(tx, { campaignId: access.campaignId, actorId: me.id, entity: 'fe-model', entityId: row.id, action: 'delete', before: modelSummary(row) });
      });
      return undefined;
    },
  });
}
