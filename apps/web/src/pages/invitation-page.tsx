// An invitation link: what it offers, and Join for the invited address (outside the signed-in frame).
import { useState } from 'react';
import { Link, useNavigate, useParams } from 'react-router';
import { useQuery, useQueryClient } from '@tanstack/react-query';
import { api, ApiError } from '../lib/api.ts';
import { useMe, useSignOut } from '../lib/session.ts';
import { roleLabel } from '../lib/campaign-data.ts';
import { useToast } from '../lib/toast.tsx';
import { Button, Notice, Spinner } from '../components/ui.tsx';
import { AuthLayout } from './auth/auth-layout.tsx';
import { formatWhen } from '../lib/format-date.ts';

interface InvitationView {
  campaignName: string;
  structure: string;
  role: 'lead' | 'engineer' | 'viewer';
  email: string;
  expiresAt: string;
}

export function InvitationPage() {
  const { token = '' } = useParams();
  const me = useMe();
  const navigate = useNavigate();
  const client = useQueryClient();
  const toast = useToast();
  const signOut = useSignOut();
  const invitation = useQuery({ queryKey: ['invitation', token], queryFn: () => api<InvitationView>(`/invitations/${token}`), retry: false });
  const [error, setError] = useState<string>();
  const [busy, setBusy] = useState(false);
  const here = `/invitations/${token}`;

  async function join() {
    setBusy(true);
    setError(undefined);
    try {
      const joined = await api<{ campaignId: string }>(`/invitations/${token}/accept`, { body: {} });
      await client.invalidateQueries({ queryKey: ['campaigns'] });
      toast('ok', `You joined “${invitation.data?.campaignName}”.`);
      navigate(`/campaigns/${joined.campaignId}`, { replace: true });
    } catch (err) {
      setError(err instanceof ApiError ? err.message : 'Joining failed.');
    } finally {
      setBusy(false);
    }
  }

  if (invitation.isPending || me.isPending) {
    return (
      <AuthLayout title="Invitation">
        <Spinner label="Reading the invitation…" />
      </AuthLayout>
    );
  }
  if (invitation.isError) {
    const gone = invitation.error instanceof ApiError && invitation.error.status === 404;
    return (
      <AuthLayout title="Invitation">
        <Notice tone="error">{gone ? 'This invitation does not exist or was withdrawn. Ask the lead for a new one.' : invitation.error.message}</Notice>
        <Link to="/campaigns" className="mt-4 inline-block text-sm text-accent hover:underline">
          Go to Resonote
        </Link>
      </AuthLayout>
    );
  }
  const inv = invitation.data;
  const user = me.data?.user;
  const sameAddress = user && user.email.toLowerCase() === inv.email.toLowerCase();

  return (
    <AuthLayout title={`Join “${inv.campaignName}”`} subtitle={inv.structure ? `Test campaign on ${inv.structure}` : undefined}>
      <div className="flex flex-col gap-4">
        <dl className="grid grid-cols-[auto_1fr] gap-x-4 gap-y-1 text-sm">
          <dt className="text-[var(--muted)]">Campaign</dt>
          <dd className="font-medium">{inv.campaignName}</dd>
          <dt className="text-[var(--muted)]">Role</dt>
          <dd>{roleLabel[inv.role]}</dd>
          <dt className="text-[var(--muted)]">For</dt>
          <dd>{inv.email}</dd>
          <dt className="text-[var(--muted)]">Valid until</dt>
          <dd className="num">{formatWhen(inv.expiresAt, 'date')}</dd>
        </dl>
        {error && <Notice tone="error">{error}</Notice>}
        {sameAddress && (
          <Button onClick={join} disabled={busy} className="min-h-12">
            {busy ? 'Joining…' : 'Join'}
          </Button>
        )}
        {user && !sameAddress && (
          <>
            <Notice tone="info">
              This invitation is for {inv.email}; you are signed in as {user.email}. Sign in with the invited address to join.
            </Notice>
            <Button
              variant="secondary"
              onClick={async () => {
                await signOut();
                navigate(`/sign-in?next=${encodeURIComponent(here)}`);
              }}
            >
              Sign out and sign in as {inv.email}
            </Button>
          </>
        )}
        {!user && (
          <div className="flex flex-col gap-2">
            <p className="text-sm text-[var(--muted)]">Sign in with {inv.email} to join, or create an account with that address first.</p>
            <Link to={`/sign-in?next=${encodeURIComponent(here)}`} className="inline-flex min-h-10 items-center justify-center rounded-md bg-accent px-4 text-sm font-medium text-white hover:bg-accent-strong">
              Sign in
            </Link>
            <Link
              to={`/sign-up?next=${encodeURIComponent(here)}&email=${encodeURIComponent(inv.email)}`}
              className="inline-flex min-h-10 items-center justify-center rounded-md border border-[var(--line)] px-4 text-sm font-medium hover:border-accent"
            >
              Create an account
            </Link>
          </div>
        )}
      </div>
    </AuthLayout>
  );
}
