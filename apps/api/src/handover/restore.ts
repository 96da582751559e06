// Restores a campaign backup (read and checked by backup-read.ts) as a NEW campaign with new ids
// everywhere, in one transaction; raw samples are written back byte-identical. Who is named and
// invited: restore-people.ts.
import { randomUUID } from 'node:crypto';
import { inArray } from 'drizzle-orm';
import { z } from 'zod';
import { campaignInvitation, campaignMember, labItem, type CampaignRole } from '@resonote/db/schema';
import type { Db } from '@resonote/db/client';
import { audit } from '../http/audit.ts';
import { HttpError } from '../errors.ts';
import { INVITATION_DAYS, newInvitationToken } from '../invitations.ts';
import type { Mailer } from '../mail.ts';
import { columnsOf, corrupt, timestampOf } from './backup-format.ts';
import { readBackup } from './backup-read.ts';
import { TABLES, type Row } from './backup-tables.ts';
import { knownAccounts, mailRestoreInvitations, membersToInvite, type Invitee, type NotInvited, type Restorer } from './restore-people.ts';

export { mayRestore, type Restorer } from './restore-people.ts';

export interface RestoreResult {
  campaignId: string;
  name: string;
  counts: Record<string, number>;
  /** The backup's members (other than the restorer) who were sent an invitation, with the backup's role. */
  invited: Invitee[];
  /** Members not invited, and why (a malformed address, a mail that could not be sent): never because of an account. */
  notInvited: NotInvited[];
  sourceCampaignId: string;
}

/** Replaces every string that is an old id (anywhere in a JSON value) with its new id. */
function remap(value: unknown, ids: Map<string, string>): unknown {
  if (typeof value === 'string') return ids.get(value) ?? value;
  if (Array.isArray(value)) return value.map((v) => remap(v, ids));
  if (value && typeof value === 'object' && !Buffer.isBuffer(value) && !(value instanceof Date)) {
    return Object.fromEntries(Object.entries(value as Row).map(([k, v]) => [k, remap(v, ids)]));
  }
  return value;
}

function isDbInputError(err: unknown): string | null {
  const e = err as { code?: string; message?: string; cause?: { code?: string; message?: string; detail?: string } } | null;
  const code = e?.cause?.code ?? e?.code;
  if (typeof code === 'string' && /^(22|23)/.test(code)) return e?.cause?.detail ?? e?.cause?.message ?? e?.message ?? code;
  return null;
}

/** The backup's rows as this instance's rows: new ids, user columns matched or null, timestamps and bytea decoded. */
function prepareRows(tables: Record<string, Row[]>, blobs: Map<string, Buffer>, ids: Map<string, string>, userMap: Map<string, string>): Record<string, Row[]> {
  const prepared: Record<string, Row[]> = {};
  for (const spec of TABLES) {
    const cols = columnsOf(spec.table);
    prepared[spec.name] = tables[spec.name]!.map((row) => {
      const out: Row = {};
      for (const { key, type } of cols) {
        if (!(key in row) && !(spec.name === 'hit' && key === 'samples')) continue;
        if (spec.name === 'audit_event' && key === 'id') continue; // a new serial id
        const v = row[key];
        if (spec.userCols.includes(key)) out[key] = typeof v === 'string' ? (userMap.get(v) ?? null) : null;
        else if (spec.name === 'hit' && key === 'samples') out[key] = blobs.get(row.id as string)!;
        else if (type === 'PgTimestamp') out[key] = v === null || v === undefined ? v : timestampOf(v, spec.name, key);
        else if (type === 'PgCustomColumn') out[key] = typeof v === 'string' ? Buffer.from(v, 'base64') : v;
        else out[key] = remap(v, ids);
      }
      return out;
    });
  }
  return prepared;
}

export async function restoreBackup(db: Db, file: Buffer, restorer: Restorer, options: { members: boolean; mailer: Mailer; publicUrl: string }): Promise<RestoreResult> {
  const { manifest, tables, users, members, blobs } = readBackup(file);
  const { invitations, notInvited } = options.members ? membersToInvite(members, restorer) : { invitations: [], notInvited: [] };

  // New ids everywhere; user references matched by e-mail among the accounts the restorer knows, else null.
  const ids = new Map<string, string>();
  for (const spec of TABLES) if (spec.hasUuidId) for (const row of tables[spec.name]!) ids.set(row.id as string, randomUUID());
  const emails = [...new Set(users.map((u) => u.email.toLowerCase()))];
  const localByEmail = await knownAccounts(db, restorer, emails);
  const userMap = new Map<string, string>();
  for (const u of users) {
    const mine = localByEmail.get(u.email.toLowerCase());
    if (mine) userMap.set(u.id, mine);
  }

  const source = tables.campaign![0]!;
  const newCampaignId = ids.get(source.id as string)!;
  const prepared = prepareRows(tables, blobs, ids, userMap);
  // Kit borrowed from a lab inventory stays linked only to an item of this instance's inventory.
  const labIds = [...new Set(prepared.kit_item!.map((k) => k.labItemId).filter((v): v is string => typeof v === 'string' && z.uuid().safeParse(v).success))];
  const localLab = new Set(labIds.length ? (await db.select({ id: labItem.id }).from(labItem).where(inArray(labItem.id, labIds))).map((r) => r.id) : []);
  for (const k of prepared.kit_item!) if (k.labItemId !== undefined && !localLab.has(k.labItemId as string)) k.labItemId = null;
  const c = prepared.campaign![0]!;
  c.name = `${String(source.name)} (restored)`;
  c.updatedAt = new Date();
  c.version = 1;
  for (const f of prepared.modal_fit!) {
    if (f.status === 'queued' || f.status === 'running') Object.assign(f, { status: 'failed', message: 'The fit was still running when the backup was taken; run it again.' });
  }

  const counts: Record<string, number> = {};
  const expiresAt = new Date(Date.now() + INVITATION_DAYS * 86_400_000);
  let pending: { id: string; email: string; role: CampaignRole; token: string }[] = [];
  try {
    await db.transaction(async (tx) => {
      for (const spec of TABLES) {
        const rows = prepared[spec.name]!;
        counts[spec.name] = rows.length;
        // Hits carry their samples: insert a few at a time to keep each statement small.
        const chunk = spec.name === 'hit' ? 8 : spec.name === 'noise_check' ? 1 : 200;
        for (let i = 0; i < rows.length; i += chunk) await tx.insert(spec.table).values(rows.slice(i, i + chunk) as never);
      }
      await tx.insert(campaignMember).values({ campaignId: newCampaignId, userId: restorer.id, role: 'lead' });
      pending = [];
      for (const inv of invitations) {
        const { token, tokenHash } = newInvitationToken();
        const [row] = await tx.insert(campaignInvitation).values({ campaignId: newCampaignId, email: inv.email, role: inv.role, tokenHash, invitedBy: restorer.id, expiresAt }).returning({ id: campaignInvitation.id });
        await audit(tx, { campaignId: newCampaignId, actorId: restorer.id, entity: 'invitation', entityId: row!.id, action: 'create', after: { email: inv.email, role: inv.role, expiresAt, via: 'restore' } });
        pending.push({ id: row!.id, email: inv.email, role: inv.role, token });
      }
      await audit(tx, {
        campaignId: newCampaignId,
        actorId: restorer.id,
        entity: 'campaign',
        entityId: newCampaignId,
        action: 'restore',
        after: { from: { campaignId: manifest.campaign.id, name: manifest.campaign.name, sourceUrl: manifest.sourceUrl, exportedAt: manifest.exportedAt }, counts, members: options.members ? { invited: invitations, notInvited } : 'not copied' },
      });
    });
  } catch (err) {
    if (err instanceof HttpError) throw err;
    const why = isDbInputError(err);
    if (why) throw corrupt(`its rows do not fit this instance's schema (${why})`);
    throw err;
  }

  const invited = await mailRestoreInvitations(db, pending, { mailer: options.mailer, publicUrl: options.publicUrl, inviterName: restorer.name, campaign: { name: String(c.name), structure: typeof c.structure === 'string' ? c.structure : null } }, notInvited);
  return { campaignId: newCampaignId, name: String(c.name), counts, invited, notInvited, sourceCampaignId: manifest.campaign.id };
}
