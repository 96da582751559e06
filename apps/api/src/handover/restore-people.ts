// Who a restore may name and whom it invites. A backup is a file its holder can edit, so a restore
// grants no role from it: the restorer leads the new campaign, and (when asked) the backup's other
// members are sent invitations, which each person accepts or not. Nothing in the answer depends on
// whether an address has an account here.
import { and, eq, inArray, sql } from 'drizzle-orm';
import { z } from 'zod';
import { campaignInvitation, campaignMember, user, type CampaignRole } from '@resonote/db/schema';
import type { Db } from '@resonote/db/client';
import { HttpError } from '../errors.ts';
import { mailInvitation } from '../invitations.ts';
import type { Mailer } from '../mail.ts';

/** Most invitations one restore sends (a backup is editable; a real campaign has far fewer members). */
export const RESTORE_MAX_INVITATIONS = 100;

export interface Restorer {
  id: string;
  email: string;
  name: string;
  role: 'admin' | 'member';
}

export interface Invitee {
  email: string;
  role: CampaignRole;
}

export interface NotInvited {
  email: string;
  reason: string;
}

/**
 * The accounts whose ids a restore may write into user columns (recorded by, created by, actor):
 * the restorer and the people who share a campaign with them — whose addresses the restorer sees
 * anyway — or everyone for an admin. Any other address in the backup's users.json is recorded as
 * nobody, so the restored campaign cannot show whether an address has an account here.
 */
export async function knownAccounts(db: Db, restorer: Restorer, emails: string[]): Promise<Map<string, string>> {
  if (!emails.length) return new Map();
  const rows =
    restorer.role === 'admin'
      ? await db.select({ id: user.id, email: user.email }).from(user).where(inArray(sql`lower(${user.email})`, emails))
      : await db
          .selectDistinct({ id: user.id, email: user.email })
          .from(user)
          .where(
            and(
              inArray(sql`lower(${user.email})`, emails),
              sql`(${user.id} = ${restorer.id} OR ${user.id} IN (SELECT theirs.user_id FROM ${campaignMember} theirs JOIN ${campaignMember} mine ON mine.campaign_id = theirs.campaign_id WHERE mine.user_id = ${restorer.id}))`,
            ),
          );
  return new Map(rows.map((u) => [u.email.toLowerCase(), u.id]));
}

/** The backup's members other than the restorer, one per address, checked before anything is written. */
export function membersToInvite(members: { email: string; role: CampaignRole }[], restorer: Restorer): { invitations: Invitee[]; notInvited: NotInvited[] } {
  const invitations: Invitee[] = [];
  const notInvited: NotInvited[] = [];
  const seen = new Set<string>([restorer.email.toLowerCase()]);
  for (const m of members) {
    const email = m.email.trim().toLowerCase();
    if (seen.has(email)) continue;
    seen.add(email);
    if (!z.email().safeParse(email).success) notInvited.push({ email: m.email.slice(0, 200), reason: 'not a valid e-mail address' });
    else invitations.push({ email, role: m.role });
  }
  if (invitations.length > RESTORE_MAX_INVITATIONS) throw new HttpError(400, 'too-many-members', `The backup lists ${invitations.length} members to invite; a restore invites at most ${RESTORE_MAX_INVITATIONS}. Restore without members and invite people from the restored campaign. Nothing was restored.`);
  return { invitations, notInvited };
}

/**
 * Mails the invitations stored by the restore, after its commit, one by one as POST …/invitations
 * does; an invitation whose mail did not go out is withdrawn so no dead invitation stays open.
 */
export async function mailRestoreInvitations(
  db: Db,
  pending: { id: string; email: string; role: CampaignRole; token: string }[],
  options: { mailer: Mailer; publicUrl: string; inviterName: string; campaign: { name: string; structure: string | null } },
  notInvited: NotInvited[],
): Promise<Invitee[]> {
  const invited: Invitee[] = [];
  for (const p of pending) {
    try {
      await mailInvitation(options.mailer, options.publicUrl, {
        to: p.email,
        token: p.token,
        role: p.role,
        inviterName: options.inviterName,
        campaign: options.campaign,
        context: 'The campaign was restored from a backup that lists you as a member; you join it only if you accept.',
      });
      invited.push({ email: p.email, role: p.role });
    } catch {
      await db.update(campaignInvitation).set({ revokedAt: new Date() }).where(eq(campaignInvitation.id, p.id));
      notInvited.push({ email: p.email, reason: 'the invitation mail could not be sent; invite this person from the campaign' });
    }
  }
  return invited;
}

/** Whether the user may restore: an admin, or someone who leads at least one campaign (like creating one). */
export async function mayRestore(db: Db, me: { id: string; role: string }): Promise<boolean> {
  if (me.role === 'admin') return true;
  const [row] = await db.select({ n: sql<number>`count(*)::int` }).from(campaignMember).where(and(eq(campaignMember.userId, me.id), eq(campaignMember.role, 'lead')));
  return (row?.n ?? 0) > 0;
}
