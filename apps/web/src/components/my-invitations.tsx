// Open invitations to the signed-in address, answered in the app: accept (join with the role) or
// decline. Shown on the campaign list, so an invited person needs nothing from the mail but the
// address they sign in with.
import { useQuery, useQueryClient } from '@tanstack/react-query';
import { useNavigate } from 'react-router';
import { api } from '../lib/api.ts';
import { roleLabel } from '../lib/campaign-data.ts';
import { formatWhen } from '../lib/format-date.ts';
import { useFailure } from '../lib/mutation.ts';
import { useToast } from '../lib/toast.tsx';
import type { CampaignRole } from '@resonote/contracts';
import { Button, Notice, Panel } from './ui.tsx';

export interface MyInvitation {
  id: string;
  campaignId: string;
  campaignName: string;
  structure: string;
  role: CampaignRole;
  invitedBy: string | null;
  createdAt: string;
  expiresAt: string;
}

export const myInvitationsKey = ['account', 'invitations'] as const;

/** The open invitations to the signed-in address (one query, shared by the list and the campaign list's empty state). */
export function useMyInvitations() {
  return useQuery({ queryKey: myInvitationsKey, queryFn: () => api<{ invitations: MyInvitation[] }>('/account/invitations') });
}

export function MyInvitations() {
  const client = useQueryClient();
  const toast = useToast();
  const fail = useFailure();
  const navigate = useNavigate();
  const list = useMyInvitations();

  async function answer(inv: MyInvitation, accept: boolean) {
    try {
      await api(`/account/invitations/${inv.id}/${accept ? 'accept' : 'decline'}`, { body: {} });
      await Promise.all([client.invalidateQueries({ queryKey: myInvitationsKey }), client.invalidateQueries({ queryKey: ['campaigns'] })]);
      if (accept) {
        toast('ok', `You joined “${inv.campaignName}” as ${roleLabel[inv.role].toLowerCase()}.`);
        navigate(`/campaigns/${inv.campaignId}`);
      } else toast('info', `Invitation to “${inv.campaignName}” declined.`);
    } catch (err) {
      fail(err, [myInvitationsKey]);
    }
  }

  if (list.isError) return <Notice tone="error">Your invitations could not be loaded: {list.error.message}</Notice>;
  if (!list.data || list.data.invitations.length === 0) return null;
  return (
    <Panel title={`Invitations for you (${list.data.invitations.length})`}>
      <ul className="divide-y divide-[var(--line)]" data-testid="my-invitations">
        {list.data.invitations.map((inv) => (
          <li key={inv.id} className="flex flex-wrap items-center gap-x-4 gap-y-2 py-2 text-sm">
            <div className="min-w-0 flex-1">
              <div className="font-medium">{inv.campaignName}</div>
              <div className="text-xs text-[var(--muted)]">
                {inv.structure ? `${inv.structure} · ` : ''}as {roleLabel[inv.role].toLowerCase()}
                {inv.invitedBy ? `, invited by ${inv.invitedBy}` : ''} · open until <span className="num">{formatWhen(inv.expiresAt, 'date')}</span>
              </div>
            </div>
            <div className="flex gap-2">
              <Button onClick={() => void answer(inv, true)} aria-label={`Accept the invitation to ${inv.campaignName}`}>
                Accept
              </Button>
              <Button variant="secondary" onClick={() => void answer(inv, false)} aria-label={`Decline the invitation to ${inv.campaignName}`}>
                Decline
              </Button>
            </div>
          </li>
        ))}
      </ul>
    </Panel>
  );
}
