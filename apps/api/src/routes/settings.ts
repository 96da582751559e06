// Acquisition settings of a campaign, versioned: every change makes a new version with a reason,
// hits record the version they were taken under, and the history lists what changed
// (design.md, "Kit"; docs/methods.md#traceability).
import { desc, eq } from 'drizzle-orm';
import { acquisitionSettingsSchema, applySettingsPatch, defaultAcquisitionSettings, settingsPatchSchema, settingsUpdateSchema, type AcquisitionSettings } from '@resonote/contracts';
import { acquisitionSettings, campaign, user } from '@resonote/db/schema';
import type { Deps } from './deps.ts';
import { audit, type Tx } from '../http/audit.ts';
import { staleWrite } from '../http/concurrency.ts';
import { conflict, HttpError, notFound, zodDetails, zodMessage } from '../errors.ts';

export interface SettingsChange {
  /** Dotted path, e.g. `bandHz.high` or `exponentialWindow.mode`. */
  field: string;
  before: unknown;
  after: unknown;
}

const isPlainObject = (v: unknown): v is Record<string, unknown> => typeof v === 'object' && v !== null && !Array.isArray(v);

/**
 * Fields that differ between two settings objects, as dotted paths. A field present on one side
 * only (say `exponentialWindow.tauS` after a change of window mode) shows null on the other side.
 */
export function diffSettings(before: unknown, after: unknown, prefix = ''): SettingsChange[] {
  if (isPlainObject(before) && isPlainObject(after)) {
    const keys = [...new Set([...Object.keys(before), ...Object.keys(after)])];
    return keys.flatMap((k) => diffSettings(before[k], after[k], prefix ? `${prefix}.${k}` : k));
  }
  if (isPlainObject(before) || isPlainObject(after)) {
    // One side is an object and the other is not: list the object's leaves against null.
    const obj = (isPlainObject(before) ? before : after) as Record<string, unknown>;
    return Object.keys(obj).flatMap((k) =>
      diffSettings(isPlainObject(before) ? before[k] : null, isPlainObject(after) ? after[k] : null, prefix ? `${prefix}.${k}` : k),
    );
  }
  const b = before === undefined ? null : before;
  const a = after === undefined ? null : after;
  if (JSON.stringify(b) === JSON.stringify(a)) return [];
  return [{ field: prefix, before: b, after: a }];
}

export function registerSettingsRoutes({ routes, db }: Deps): void {
  async function versions(q: Tx | typeof db, campaignId: string, limit?: number) {
    const query = q
      .select({
        version: acquisitionSettings.version,
        settings: acquisitionSettings.settings,
        reason: acquisitionSettings.reason,
        createdAt: acquisitionSettings.createdAt,
        createdById: acquisitionSettings.createdBy,
        createdBy: user.name,
      })
      .from(acquisitionSettings)
      .leftJoin(user, eq(user.id, acquisitionSettings.createdBy))
      .where(eq(acquisitionSettings.campaignId, campaignId))
      .orderBy(desc(acquisitionSettings.version));
    return limit === undefined ? query : query.limit(limit);
  }

  type VersionRow = Awaited<ReturnType<typeof versions>>[number];

  const currentOf = (row: VersionRow | undefined) =>
    row
      ? { version: row.version, settings: row.settings as AcquisitionSettings, reason: row.reason, createdAt: row.createdAt, createdBy: row.createdBy ?? null }
      : { version: 0, settings: defaultAcquisitionSettings, reason: '', createdAt: null, createdBy: null };

  /** The newest version only, read inside the transaction that holds the campaign lock. */
  async function latest(tx: Tx, campaignId: string) {
    const [row] = await versions(tx, campaignId, 1);
    return row;
  }

  routes.add({
    method: 'get',
    path: '/campaigns/:campaignId/settings',
    tag: 'Settings',
    access: 'viewer',
    tokenAccess: true,
    summary: 'Current acquisition settings, their version history with the fields each version changed, and the defaults',
    returns:
      '{ current: { version, settings, reason, createdAt, createdBy }, history: [{ version, createdAt, createdBy, reason, changes: [{ field, before, after }] }] newest first, defaults }; version 0 means the defaults, never saved',
    handler: async ({ campaign: access }) => {
      const rows = await versions(db, access.campaignId);
      const history = rows.map((row, i) => {
        // The first version is compared with the defaults it started from.
        const previous = rows[i + 1]?.settings ?? defaultAcquisitionSettings;
        return { version: row.version, createdAt: row.createdAt, createdBy: row.createdBy ?? null, reason: row.reason, changes: diffSettings(previous, row.settings) };
      });
      return { current: currentOf(rows[0]), history, defaults: defaultAcquisitionSettings };
    },
  });

  /**
   * Stores `next` as a new version based on `baseVersion`, in one transaction that holds the
   * campaign row as its lock. `make` turns the current settings into the wanted ones (PUT: the body;
   * PATCH: the patch laid over the current ones and checked as a whole).
   */
  async function saveVersion(campaignId: string, me: { id: string; name: string }, baseVersion: number, reason: string, make: (current: AcquisitionSettings) => AcquisitionSettings) {
    try {
      return await db.transaction(async (tx) => {
        // One writer per campaign at a time: the campaign row is the lock.
        const [locked] = await tx.select({ id: campaign.id }).from(campaign).where(eq(campaign.id, campaignId)).for('no key update');
        if (!locked) throw notFound('That campaign');
        const row = await latest(tx, campaignId);
        const current = currentOf(row);
        if (baseVersion !== current.version) throw staleWrite('The acquisition settings', current);
        const settings = make(current.settings);
        if (diffSettings(current.settings, settings).length === 0) return { current, unchanged: true };
        const version = current.version + 1;
        const [created] = await tx.insert(acquisitionSettings).values({ campaignId, version, settings, reason, createdBy: me.id }).returning();
        await audit(tx, {
          campaignId,
          actorId: me.id,
          entity: 'settings',
          entityId: campaignId,
          action: 'update',
          before: { version: current.version, settings: current.settings },
          after: { version, settings, reason },
        });
        return {
          current: { version, settings: created!.settings as AcquisitionSettings, reason: created!.reason, createdAt: created!.createdAt, createdBy: me.name },
          unchanged: false,
        };
      });
    } catch (err) {
      // The unique (campaign, version) index is the last guard against a concurrent save.
      const e = err as { code?: string; cause?: { code?: string } };
      if (e?.code === '23505' || e?.cause?.code === '23505') throw conflict('The acquisition settings were saved by someone else at the same moment; reload and try again.');
      throw err;
    }
  }

  routes.add({
    method: 'put',
    path: '/campaigns/:campaignId/settings',
    tag: 'Settings',
    access: 'lead',
    summary: 'Save the acquisition settings as a new version (based on the version you read)',
    body: settingsUpdateSchema,
    returns: '{ current, unchanged } — unchanged: true when the settings equal the current ones (no new version)',
    handler: ({ body, campaign: access, user: me }) => saveVersion(access.campaignId, me, body.baseVersion, body.reason, () => body.settings),
  });

  routes.add({
    method: 'patch',
    path: '/campaigns/:campaignId/settings',
    tag: 'Settings',
    access: 'lead',
    summary: 'Change some acquisition settings (only the fields sent; forceWindow and bandHz may be sent in part) as a new version based on the version you read',
    body: settingsPatchSchema,
    returns: '{ current, unchanged } — as PUT; 400 invalid-input when the merged settings break a rule (the field named in details)',
    handler: ({ body, campaign: access, user: me }) =>
      saveVersion(access.campaignId, me, body.baseVersion, body.reason, (current) => {
        const merged = acquisitionSettingsSchema.safeParse(applySettingsPatch(current, body.settings));
        if (!merged.success) throw new HttpError(400, 'invalid-input', `With this change the settings would not hold: ${zodMessage(merged.error)}`, zodDetails(merged.error));
        return merged.data;
      }),
  });
}
