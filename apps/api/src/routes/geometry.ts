// Geometry of a campaign: points (mm) with measured directions, lines, CSV import and export.
import { and, eq, inArray, or, sql } from 'drizzle-orm';
import type { RequestHandler } from 'express';
import { geometryCheckSchema, geometryImportSchema, lineCreateSchema, MAX_IMPORT_BYTES, pointCreateSchema, pointPatchSchema, uuidSchema } from '@resonote/contracts';
import { campaign, channel, hit, line, point, scheduleEntry } from '@resonote/db/schema';
import type { Deps } from './deps.ts';
import { audit, type Tx } from '../http/audit.ts';
import { staleWrite } from '../http/concurrency.ts';
import { conflict, HttpError, notFound } from '../errors.ts';
import { singleFileUpload } from '../http/multipart.ts';
import { geometryToCsv, labelCollator, parseGeometryCsv } from '../plan/geometry-csv.ts';

const uniqueViolation = (err: unknown) => (err as { code?: string; cause?: { code?: string } })?.code === '23505' || (err as { cause?: { code?: string } })?.cause?.code === '23505';

const parseCsvForm = singleFileUpload({ fileSize: MAX_IMPORT_BYTES, fields: 5, tooLarge: `The file is larger than ${MAX_IMPORT_BYTES / 1024 / 1024} MB; nothing was imported.`, nothingDone: 'nothing was imported' });

/** Multipart upload of the CSV as field `file`; the other fields (mode, directions) come as text. */
const csvUpload: RequestHandler = (req, res, next) => {
  if (!req.is('multipart/form-data')) return next();
  parseCsvForm(req, res, (err: unknown) => {
    if (err) return next(err);
    if (!req.file) return next(new HttpError(400, 'invalid-input', 'Attach the CSV as the form field "file".'));
    const fields = (req.body ?? {}) as Record<string, string>;
    req.body = {
      csv: req.file.buffer.toString('utf8'),
      ...(fields.mode ? { mode: fields.mode } : {}),
      ...(fields.directions ? { directions: fields.directions.split(/[\s,;]+/).filter(Boolean) } : {}),
    };
    next();
  });
};

export async function pointHasHits(db: Deps['db'] | Tx, pointId: string): Promise<boolean> {
  const [row] = await db
    .select({ n: sql<number>`count(*)::int` })
    .from(hit)
    .innerJoin(scheduleEntry, eq(scheduleEntry.id, hit.scheduleEntryId))
    .where(or(eq(scheduleEntry.responsePointId, pointId), eq(scheduleEntry.excitationPointId, pointId)));
  return (row?.n ?? 0) > 0;
}

export function registerGeometryRoutes({ routes, db }: Deps): void {
  async function pointOf(tx: Deps['db'] | Tx, campaignId: string, pointId: string, lock = false) {
    if (!uuidSchema.safeParse(pointId).success) throw notFound('That point');
    const q = tx.select().from(point).where(and(eq(point.id, pointId), eq(point.campaignId, campaignId)));
    const [row] = lock ? await q.for('update') : await q;
    if (!row) throw notFound('That point');
    return row;
  }

  async function listGeometry(campaignId: string) {
    const points = await db
      .select({
        id: point.id,
        label: point.label,
        x: point.x,
        y: point.y,
        z: point.z,
        directions: point.directions,
        retired: sql<boolean>`${point.retiredAt} IS NOT NULL`,
        version: point.version,
        // Written out in SQL: drizzle leaves columns unqualified in a one-table select.
        hasHits: sql<boolean>`EXISTS (SELECT 1 FROM hit h JOIN schedule_entry s ON s.id = h.schedule_entry_id WHERE s.response_point_id = "point"."id" OR s.excitation_point_id = "point"."id")`,
      })
      .from(point)
      .where(eq(point.campaignId, campaignId));
    points.sort((a, b) => labelCollator.compare(a.label, b.label));
    const lines = await db.select({ id: line.id, pointA: line.pointA, pointB: line.pointB }).from(line).where(eq(line.campaignId, campaignId));
    return { points, lines, unit: 'mm' };
  }

  routes.add({
    method: 'get',
    path: '/campaigns/:campaignId/points',
    tag: 'Geometry',
    access: 'viewer',
    summary: 'Points (mm) with their measured directions, and the lines between them',
    returns: '{ points: [{ id, label, x, y, z, directions, retired, hasHits, version }], lines: [{ id, pointA, pointB }], unit: "mm" }',
    handler: ({ campaign: access }) => listGeometry(access.campaignId),
  });

  routes.add({
    method: 'post',
    path: '/campaigns/:campaignId/points',
    tag: 'Geometry',
    access: 'lead',
    summary: 'Add a point',
    body: pointCreateSchema,
    status: 201,
    handler: async ({ body, campaign: access, user: me }) => {
      try {
        return await db.transaction(async (tx) => {
          const [row] = await tx.insert(point).values({ ...body, campaignId: access.campaignId }).returning();
          await audit(tx, { campaignId: access.campaignId, actorId: me.id, entity: 'point', entityId: row!.id, action: 'create', after: row });
          return { point: row };
        });
      } catch (err) {
        if (uniqueViolation(err)) throw conflict(`A point labelled "${body.label}" already exists in this campaign.`);
        throw err;
      }
    },
  });

  routes.add({
    method: 'patch',
    path: '/campaigns/:campaignId/points/:pointId',
    tag: 'Geometry',
    access: 'lead',
    summary: 'Change a point: label, coordinates, directions, or retire/restore it',
    body: pointPatchSchema,
    handler: async ({ body, params, campaign: access, user: me }) => {
      const { version, retired, ...changes } = body;
      try {
        return await db.transaction(async (tx) => {
          const before = await pointOf(tx, access.campaignId, params.pointId!, true);
          if (before.version !== version) throw staleWrite('The point', before);
          if (changes.label !== undefined && changes.label !== before.label) {
            if (await pointHasHits(tx, before.id)) throw conflict(`Point ${before.label} has recorded hits, so its label stays; add a new point instead.`);
            const [c] = await tx.select({ refs: campaign.referenceDofs }).from(campaign).where(eq(campaign.id, access.campaignId));
            const named = (c?.refs ?? []).some((d) => d.split(':')[0] === before.label);
            const [ch] = await tx.select({ n: sql<number>`count(*)::int` }).from(channel).where(and(eq(channel.campaignId, access.campaignId), sql`split_part(${channel.dof}, ':', 1) = ${before.label}`));
            if (named || (ch?.n ?? 0) > 0) throw conflict(`Point ${before.label} is named in the reference DOFs or the channel map; change those first.`);
          }
          const [after] = await tx
            .update(point)
            .set({ ...changes, ...(retired === undefined ? {} : { retiredAt: retired ? (before.retiredAt ?? new Date()) : null }), version: before.version + 1, updatedAt: new Date() })
            .where(eq(point.id, before.id))
            .returning();
          await audit(tx, { campaignId: access.campaignId, actorId: me.id, entity: 'point', entityId: before.id, action: retired === true ? 'retire' : retired === false ? 'restore' : 'update', before, after });
          return { point: after };
        });
      } catch (err) {
        if (uniqueViolation(err)) throw conflict(`A point labelled "${changes.label}" already exists in this campaign.`);
        throw err;
      }
    },
  });

  routes.add({
    method: 'delete',
    path: '/campaigns/:campaignId/points/:pointId',
    tag: 'Geometry',
    access: 'lead',
    summary: 'Delete a point without hits (its lines and planned schedule entries go with it); a point with hits answers 409: retire it instead',
    handler: async ({ params, campaign: access, user: me }) => {
      await db.transaction(async (tx) => {
        const before = await pointOf(tx, access.campaignId, params.pointId!, true);
        if (await pointHasHits(tx, before.id)) throw conflict(`Point ${before.label} has recorded hits: it can be retired but never deleted.`);
        const removed = await tx.delete(scheduleEntry).where(or(eq(scheduleEntry.responsePointId, before.id), eq(scheduleEntry.excitationPointId, before.id))).returning({ id: scheduleEntry.id });
        await tx.delete(point).where(eq(point.id, before.id));
        await audit(tx, { campaignId: access.campaignId, actorId: me.id, entity: 'point', entityId: before.id, action: 'delete', before: { ...before, scheduleEntriesRemoved: removed.length } });
      });
      return undefined;
    },
  });

  routes.add({
    method: 'post',
    path: '/campaigns/:campaignId/lines',
    tag: 'Geometry',
    access: 'lead',
    summary: 'Draw a line between two points',
    body: lineCreateSchema,
    status: 201,
    handler: async ({ body, campaign: access, user: me }) => {
      const ends = await db.select({ id: point.id }).from(point).where(and(eq(point.campaignId, access.campaignId), inArray(point.id, [body.pointA, body.pointB])));
      if (ends.length !== 2) throw notFound('One of the two points');
      try {
        return await db.transaction(async (tx) => {
          const [row] = await tx.insert(line).values({ campaignId: access.campaignId, pointA: body.pointA, pointB: body.pointB }).returning();
          await audit(tx, { campaignId: access.campaignId, actorId: me.id, entity: 'line', entityId: row!.id, action: 'create', after: row });
          return { line: row };
        });
      } catch (err) {
        if (uniqueViolation(err)) throw conflict('These two points are already joined by a line.');
        throw err;
      }
    },
  });

  routes.add({
    method: 'delete',
    path: '/campaigns/:campaignId/lines/:lineId',
    tag: 'Geometry',
    access: 'lead',
    summary: 'Remove a line',
    handler: async ({ params, campaign: access, user: me }) => {
      if (!uuidSchema.safeParse(params.lineId).success) throw notFound('That line');
      const [row] = await db.delete(line).where(and(eq(line.id, params.lineId!), eq(line.campaignId, access.campaignId))).returning();
      if (!row) throw notFound('That line');
      await audit(db, { campaignId: access.campaignId, actorId: me.id, entity: 'line', entityId: row.id, action: 'delete', before: row });
      return undefined;
    },
  });

  routes.add({
    method: 'post',
    path: '/campaigns/:campaignId/geometry/import/check',
    tag: 'Geometry',
    access: 'lead',
    summary: 'Check a geometry CSV before importing it: which rows would be refused and why. Stores nothing',
    body: geometryCheckSchema,
    bodyLimit: `${Math.ceil((MAX_IMPORT_BYTES * 1.2) / 1024 / 1024)}mb`,
    returns: '{ ok, rows, goodRows, badRows, message, problems: [{ line, message }] } — ok: the file imports as it is; problems lists the first 50',
    handler: ({ body }) => {
      const r = parseGeometryCsv(body.csv);
      if (r.ok) return { ok: true, rows: r.points.length, goodRows: r.points.length, badRows: 0, message: null, problems: [] };
      return { ok: false, rows: r.rows, goodRows: r.points.length, badRows: r.badRows, message: r.message, problems: r.problems };
    },
  });

  routes.add({
    method: 'post',
    path: '/campaigns/:campaignId/geometry/import',
    tag: 'Geometry',
    access: 'lead',
    summary: 'Import points from a CSV (`label,x,y,z` header, mm; optional `directions` column), as JSON { csv, mode, directions } or a multipart upload (field "file"). All or nothing, in one transaction',
    body: geometryImportSchema,
    bodyLimit: `${Math.ceil((MAX_IMPORT_BYTES * 1.2) / 1024 / 1024)}mb`,
    before: [csvUpload],
    returns: "{ added, updated, removed, retired, total, skipped: [{ line, message }] }; 400 with details: [{ line, message }] when any line is wrong (nothing written), unless badRows: 'skip' asks for the good rows only",
    handler: async ({ body, campaign: access, user: me }) => {
      const parsed = parseGeometryCsv(body.csv);
      // With badRows 'skip' the lead asked for the good rows only; a file unreadable as a whole, or with no good row, is still refused.
      const skipping = !parsed.ok && body.badRows === 'skip' && parsed.points.length > 0;
      if (!parsed.ok && !skipping) throw new HttpError(400, 'invalid-csv', parsed.message, parsed.problems);
      if (!parsed.ok && skipping && body.mode === 'replace') throw new HttpError(400, 'invalid-csv', 'Replace needs a file without bad rows: skipping rows would delete the points they name. Fix the rows or use merge.', parsed.problems);
      const result = { points: parsed.points };
      const skipped = parsed.ok ? [] : parsed.problems;
      const defaultDirections = body.directions;
      const hasDirections = result.points.some((p) => p.directions !== null);
      return db.transaction(async (tx) => {
        // One import at a time per campaign.
        await tx.select({ id: campaign.id }).from(campaign).where(eq(campaign.id, access.campaignId)).for('update');
        const existing = await tx.select({ id: point.id, label: point.label }).from(point).where(eq(point.campaignId, access.campaignId));
        const existingByLabel = new Map(existing.map((p) => [p.label.toLowerCase(), p]));
        let added = 0;
        let updated = 0;
        const CHUNK = 1000;
        for (let i = 0; i < result.points.length; i += CHUNK) {
          const chunk = result.points.slice(i, i + CHUNK);
          for (const p of chunk) (existingByLabel.has(p.label.toLowerCase()) ? updated++ : added++);
          await tx
            .insert(point)
            .values(chunk.map((p) => ({ campaignId: access.campaignId, label: p.label, x: p.x, y: p.y, z: p.z, directions: p.directions ?? defaultDirections })))
            .onConflictDoUpdate({
              target: [point.campaignId, point.label],
              set: {
                x: sql`excluded.x`,
                y: sql`excluded.y`,
                z: sql`excluded.z`,
                // Directions in the file replace the stored ones; without that column they stay.
                directions: hasDirections ? sql`excluded.directions` : sql`${point.directions}`,
                retiredAt: sql`NULL`,
                version: sql`${point.version} + 1`,
                updatedAt: new Date(),
              },
            });
        }
        let removed = 0;
        let retired = 0;
        if (body.mode === 'replace') {
          const inFile = new Set(result.points.map((p) => p.label.toLowerCase()));
          for (const p of existing.filter((e) => !inFile.has(e.label.toLowerCase()))) {
            if (await pointHasHits(tx, p.id)) {
              await tx.update(point).set({ retiredAt: new Date(), version: sql`${point.version} + 1` }).where(eq(point.id, p.id));
              retired++;
            } else {
              await tx.delete(scheduleEntry).where(or(eq(scheduleEntry.responsePointId, p.id), eq(scheduleEntry.excitationPointId, p.id)));
              await tx.delete(point).where(eq(point.id, p.id));
              removed++;
            }
          }
        }
        const summary = { added, updated, removed, retired, total: result.points.length, mode: body.mode, skippedRows: parsed.ok ? 0 : parsed.badRows, skipped };
        await audit(tx, { campaignId: access.campaignId, actorId: me.id, entity: 'geometry', entityId: access.campaignId, action: 'import', after: summary });
        return summary;
      });
    },
  });

  routes.add({
    method: 'get',
    path: '/campaigns/:campaignId/geometry/export.csv',
    tag: 'Geometry',
    access: 'viewer',
    summary: 'The points as CSV (`label,x,y,z,directions`, mm); imports back unchanged',
    produces: 'text/csv',
    handler: async ({ res, campaign: access }) => {
      const { points } = await listGeometry(access.campaignId);
      res.setHeader('content-disposition', 'attachment; filename="geometry.csv"');
      res.type('text/csv').send(geometryToCsv(points.filter((p) => !p.retired)));
    },
  });
}
