// What the campaign list says when it is empty: the next step fits the caller — an admin, someone
// who may start a campaign, someone with an invitation shown right above the list (point to it),
// or someone who has to ask a lead.
import type { CampaignRole } from '@resonote/contracts';
import { roleLabel } from '../lib/campaign-data.ts';

export interface EmptyListCase {
  isAdmin: boolean;
  canCreate: boolean;
  email: string | undefined;
  invitations: { campaignName: string; role: CampaignRole }[];
}

export function emptyListNextStep({ isAdmin, canCreate, email, invitations }: EmptyListCase): { title: string; text: string } {
  if (isAdmin) return { title: 'No campaigns yet', text: 'As admin you see every campaign of this instance once one exists. Use “New campaign” to start one.' };
  if (invitations.length === 1) {
    const [inv] = invitations;
    return {
      title: 'No campaigns yet — one invitation waits for you',
      text: `Accept the invitation to “${inv!.campaignName}” above to join it as ${roleLabel[inv!.role].toLowerCase()}; it then shows in this list.${canCreate ? ' You can also start a campaign of your own with “New campaign”.' : ''}`,
    };
  }
  if (invitations.length > 1) {
    return {
      title: `No campaigns yet — ${invitations.length} invitations wait for you`,
      text: `Accept an invitation above to join that campaign with the role it names; each one you accept shows in this list.${canCreate ? ' You can also start a campaign of your own with “New campaign”.' : ''}`,
    };
  }
  if (canCreate) return { title: 'No campaigns yet', text: 'Use “New campaign” to start one; you will be its lead and can add your team on its Plan tab.' };
  return {
    title: 'No campaigns yet',
    text: `A test lead adds you to a campaign with a role (lead, engineer or viewer). Ask your lead to add ${email ?? 'your address'} on the campaign's Plan tab, or to send you an invitation; it shows above as soon as it is sent. Only admins and leads start new campaigns.`,
  };
}
