// Campaign invitations: the only way a person gets a role in a campaign they did not create. The
// row keeps a SHA-256 of the token; the token itself travels only in the mailed link, and the
// invited person accepts it signed in with the invited address (POST /api/invitations/:token/accept).
import { createHash, randomBytes } from 'node:crypto';
import type { CampaignRole } from '@resonote/db/schema';
import type { Mailer } from './mail.ts';

export const INVITATION_DAYS = 14;

export const hashToken = (token: string) => createHash('sha256').update(token).digest('hex');

/** A fresh invitation token (for the mail) and its hash (for the row). */
export function newInvitationToken(): { token: string; tokenHash: string } {
  const token = randomBytes(24).toString('base64url');
  return { token, tokenHash: hashToken(token) };
}

export interface InvitationMail {
  to: string;
  token: string;
  role: CampaignRole;
  inviterName: string;
  campaign: { name: string; structure?: string | null };
  /** A sentence on why this person is invited (e.g. a restore from a backup). */
  context?: string;
}

export async function mailInvitation(mailer: Mailer, publicUrl: string, m: InvitationMail): Promise<void> {
  const link = `${publicUrl}/invitations/${m.token}`;
  await mailer.send({
    to: m.to,
    subject: `${m.inviterName} invites you to the Resonote campaign “${m.campaign.name}”`,
    text: `Hello,\n\n${m.inviterName} invites you to the test campaign “${m.campaign.name}”${m.campaign.structure ? ` (${m.campaign.structure})` : ''} as ${m.role}.${m.context ? ` ${m.context}` : ''}\n\nOpen this link to sign up or sign in and join. It is valid for ${INVITATION_DAYS} days:\n\n${link}\n`,
  });
}
