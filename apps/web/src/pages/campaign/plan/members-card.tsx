// Members with their roles, and invitations by e-mail. Leads change roles, remove people, invite
// and withdraw; everyone else sees the list only.
import { useState, type FormEvent } from 'react';
import { useQueryClient } from '@tanstack/react-query';
import { campaignRoles, invitationCreateSchema, type CampaignRole } from '@resonote/contracts';
import { api, ApiError } from '../../../lib/api.ts';
import { keys, roleLabel, useInvitations, type Member } from '../../../lib/campaign-data.ts';
import { issuesToErrors, type FieldErrors } from '../../../lib/forms.ts';
import { useFailure } from '../../../lib/mutation.ts';
import { useMe } from '../../../lib/session.ts';
import { useToast } from '../../../lib/toast.tsx';
import { Button, Field, Notice, Panel, Spinner } from '../../../components/ui.tsx';
import { Select } from '../../../components/form-controls.tsx';
import { formatWhen } from '../../../lib/format-date.ts';

const roleOptions = campaignRoles.map((r) => [r, roleLabel[r]] as [string, string]);

export function MembersCard({ campaignId, members, canLead }: { campaignId: string; members: Member[]; canLead: boolean }) {
  const client = useQueryClient();
  const toast = useToast();
  const fail = useFailure();
  const me = useMe();
  const invitations = useInvitations(campaignId, canLead);
  const [errors, setErrors] = useState<FieldErrors>({});
  const [busy, setBusy] = useState(false);
  const refresh = () => client.invalidateQueries({ queryKey: keys.members(campaignId) });

  async function changeRole(m: Member, role: CampaignRole) {
    try {
      await api(`/campaigns/${campaignId}/members/${m.userId}`, { method: 'PATCH', body: { version: m.version, role } });
      await refresh();
      if (m.userId === me.data?.user.id) void client.invalidateQueries({ queryKey: keys.campaign(campaignId) });
      toast('ok', `${m.name} is now ${roleLabel[role].toLowerCase()}.`);
    } catch (err) {
      fail(err, [keys.members(campaignId)]);
      void refresh();
    }
  }
  async function remove(m: Member) {
    if (!window.confirm(`Remove ${m.name} from this campaign? Their hits stay.`)) return;
    try {
      await api(`/campaigns/${campaignId}/members/${m.userId}`, { method: 'DELETE' });
      await refresh();
      toast('ok', `${m.name} removed from the campaign.`);
    } catch (err) {
      fail(err, [keys.members(campaignId)]);
    }
  }
  async function invite(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const el = event.currentTarget;
    const f = new FormData(el);
    // Two buttons: add an account that exists here at once, or mail an invitation link.
    const direct = ((event.nativeEvent as SubmitEvent).submitter as HTMLButtonElement | null)?.value === 'add';
    const parsed = invitationCreateSchema.safeParse({ email: String(f.get('email') ?? ''), role: f.get('role') });
    if (!parsed.success) return setErrors(issuesToErrors(parsed.error));
    setErrors({});
    setBusy(true);
    try {
      if (direct) {
        const added = await api<{ member: { name: string } }>(`/campaigns/${campaignId}/members`, { body: parsed.data });
        await Promise.all([refresh(), client.invalidateQueries({ queryKey: keys.invitations(campaignId) })]);
        toast('ok', `${added.member.name} added as ${roleLabel[parsed.data.role].toLowerCase()}.`);
      } else {
        await api(`/campaigns/${campaignId}/invitations`, { body: parsed.data });
        await client.invalidateQueries({ queryKey: keys.invitations(campaignId) });
        toast('ok', `Invitation sent to ${parsed.data.email} as ${roleLabel[parsed.data.role].toLowerCase()}.`);
      }
      el.reset();
    } catch (err) {
      if (err instanceof ApiError && err.code === 'no-account') setErrors({ email: err.message });
      else fail(err);
    } finally {
      setBusy(false);
    }
  }
  async function withdraw(id: string, email: string) {
    try {
      await api(`/campaigns/${campaignId}/invitations/${id}`, { method: 'DELETE' });
      await client.invalidateQueries({ queryKey: keys.invitations(campaignId) });
      toast('ok', `Invitation to ${email} withdrawn.`);
    } catch (err) {
      fail(err, [keys.invitations(campaignId)]);
    }
  }

  return (
    <Panel title="Members and invitations">
      <ul className="divide-y divide-[var(--line)]" data-testid="members">
        {members.map((m) => (
          <li key={m.userId} className="flex flex-wrap items-center gap-x-3 gap-y-1 py-2 text-sm">
            <div className="min-w-0 flex-1">
              <div className="font-medium">{m.name}</div>
              <div className="truncate text-xs text-[var(--muted)]">{m.email}</div>
            </div>
            {canLead ? (
              <>
                <select
                  aria-label={`Role of ${m.name}`}
                  value={m.role}
                  onChange={(e) => void changeRole(m, e.target.value as CampaignRole)}
                  className="min-h-10 rounded-md border border-[var(--line)] bg-[var(--panel)] px-2 text-sm"
                >
                  {roleOptions.map(([v, t]) => (
                    <option key={v} value={v}>
                      {t}
                    </option>
                  ))}
                </select>
                <Button variant="ghost" className="px-2 text-bad" onClick={() => void remove(m)} aria-label={`Remove ${m.name}`}>
                  Remove
                </Button>
              </>
            ) : (
              <span>{roleLabel[m.role]}</span>
            )}
          </li>
        ))}
      </ul>
      {canLead && (
        <div className="mt-4 space-y-3 border-t border-[var(--line)] pt-3">
          <form onSubmit={invite} noValidate className="grid items-start gap-3 sm:grid-cols-[1fr_10rem]" aria-label="Add or invite someone">
            <Field id="invite-email" name="email" type="email" label="E-mail address" placeholder="name@lab.example" error={errors.email} />
            <Select id="invite-role" name="role" label="Role" options={roleOptions} defaultValue="engineer" error={errors.role} />
            <div className="flex flex-wrap items-center gap-2 sm:col-span-2">
              <Button type="submit" name="mode" value="add" disabled={busy}>
                Add now
              </Button>
              <Button type="submit" name="mode" value="invite" variant="secondary" disabled={busy}>
                {busy ? 'Working…' : 'Send invitation'}
              </Button>
              <span className="text-xs text-[var(--muted)]">“Add now” needs an account with this address here; an invitation mails a link to sign up or join, and shows in the app once they sign in.</span>
            </div>
          </form>
          <div>
            <h3 className="mb-1 text-sm font-semibold">Open invitations</h3>
            {invitations.isPending && <Spinner label="Loading invitations…" />}
            {invitations.isError && <Notice tone="error">The invitations could not be loaded: {invitations.error.message}</Notice>}
            {invitations.data && invitations.data.invitations.length === 0 && <p className="text-sm text-[var(--muted)]">No open invitations.</p>}
            {invitations.data && invitations.data.invitations.length > 0 && (
              <ul className="divide-y divide-[var(--line)] text-sm">
                {invitations.data.invitations.map((i) => (
                  <li key={i.id} className="flex flex-wrap items-center gap-2 py-1.5">
                    <span className="min-w-0 flex-1 truncate">{i.email}</span>
                    <span className="text-xs">{roleLabel[i.role]}</span>
                    <span className="num text-xs text-[var(--muted)]">until {formatWhen(i.expiresAt, 'date')}</span>
                    <Button variant="ghost" className="px-2" onClick={() => void withdraw(i.id, i.email)}>
                      Withdraw
                    </Button>
                  </li>
                ))}
              </ul>
            )}
          </div>
        </div>
      )}
    </Panel>
  );
}
