// Your account: personal API tokens for the watched-folder bridge (issue 16). A token is for one
// campaign and a role no higher than yours there; its secret is shown once, right after creation.
import { useQuery, useQueryClient } from '@tanstack/react-query';
import { useState, type FormEvent } from 'react';
import { apiTokenCreateSchema, type CampaignRole } from '@resonote/contracts';
import { api, ApiError } from '../lib/api.ts';
import { roleLabel, type MyRole } from '../lib/campaign-data.ts';
import { useMe } from '../lib/session.ts';
import { useToast } from '../lib/toast.tsx';
import { Button, Field, Notice, Panel, Spinner } from '../components/ui.tsx';
import { Select } from '../components/form-controls.tsx';
import { formatWhen } from '../lib/format-date.ts';
import { DataTable } from '../components/data-table.tsx';
import { FormActions, FormFailure } from '../components/form-parts.tsx';

interface TokenRow {
  id: string;
  name: string;
  campaignId: string;
  campaignName: string | null;
  role: CampaignRole;
  prefix: string;
  createdAt: string;
  expiresAt: string | null;
  lastUsedAt: string | null;
  revokedAt: string | null;
  state: 'active' | 'revoked' | 'expired';
}

const rank: Record<MyRole, number> = { viewer: 1, engineer: 2, lead: 3, admin: 3 };
const when = (iso: string | null) => formatWhen(iso);

export function AccountPage() {
  const me = useMe();
  const tokens = useQuery({ queryKey: ['api-tokens'], queryFn: () => api<{ tokens: TokenRow[] }>('/account/tokens') });
  const campaigns = useQuery({ queryKey: ['campaigns', ''], queryFn: () => api<{ campaigns: { id: string; name: string; myRole: MyRole | null }[] }>('/campaigns') });
  const client = useQueryClient();
  const toast = useToast();
  const [secret, setSecret] = useState<{ name: string; value: string }>();
  const [errors, setErrors] = useState<Record<string, string>>({});
  const [failure, setFailure] = useState<string>();
  const [busy, setBusy] = useState(false);
  const [campaignId, setCampaignId] = useState('');

  const mine = (campaigns.data?.campaigns ?? []).filter((c) => c.myRole);
  const chosen = mine.find((c) => c.id === (campaignId || mine[0]?.id));
  const roles = (['lead', 'engineer', 'viewer'] as const).filter((r) => chosen?.myRole && rank[r] <= rank[chosen.myRole]);

  async function create(e: FormEvent<HTMLFormElement>) {
    e.preventDefault();
    const f = new FormData(e.currentTarget);
    const days = String(f.get('expiresInDays') ?? '').trim();
    const parsed = apiTokenCreateSchema.safeParse({ name: f.get('name'), campaignId: f.get('campaignId'), role: f.get('role'), ...(days ? { expiresInDays: Number(days) } : {}) });
    if (!parsed.success) {
      setErrors(Object.fromEntries(parsed.error.issues.map((i) => [String(i.path[0]), i.message])));
      return;
    }
    setErrors({});
    setFailure(undefined);
    setBusy(true);
    try {
      const made = await api<{ token: TokenRow; secret: string }>('/account/tokens', { body: parsed.data });
      setSecret({ name: made.token.name, value: made.secret });
      await client.invalidateQueries({ queryKey: ['api-tokens'] });
      (e.target as HTMLFormElement).reset();
    } catch (err) {
      setFailure(err instanceof ApiError ? err.message : 'The token could not be created.');
    } finally {
      setBusy(false);
    }
  }

  async function revoke(t: TokenRow) {
    if (!window.confirm(`Revoke the token “${t.name}”? A bridge using it stops at once.`)) return;
    try {
      await api(`/account/tokens/${t.id}`, { method: 'DELETE' });
      await client.invalidateQueries({ queryKey: ['api-tokens'] });
      toast('ok', `Token “${t.name}” revoked.`);
    } catch (err) {
      toast('error', err instanceof ApiError ? err.message : 'The token could not be revoked.');
    }
  }

  return (
    <div className="space-y-4">
      <div>
        <h1 className="text-2xl font-semibold">Your account</h1>
        <p className="text-sm text-[var(--muted)]">
          {me.data?.user.name} · {me.data?.user.email}
        </p>
      </div>

      <Panel title="Personal API tokens">
        <p className="mb-3 text-sm text-[var(--muted)]">
          A token lets the watched-folder bridge on an acquisition PC upload hits as you, in one campaign. It never has more rights than you hold there now: if your role is lowered or you leave the campaign, the token follows. Start the bridge with <code className="num">pnpm bridge --url {window.location.origin} --token rn_… --folder ./hits</code>.
        </p>
        {secret && (
          <div className="mb-4 space-y-2" data-testid="new-token">
            <Notice tone="ok">
              Token “{secret.name}” created. Copy it now: this is the only time it is shown. Resonote keeps only a fingerprint of it.
            </Notice>
            <div className="flex flex-wrap items-center gap-2">
              <code className="num rounded-md bg-[var(--surface)] px-3 py-2 text-sm break-all" aria-label="New token">
                {secret.value}
              </code>
              <Button variant="secondary" onClick={() => void navigator.clipboard?.writeText(secret.value).then(() => toast('ok', 'Token copied.'))}>
                Copy
              </Button>
              <Button variant="ghost" onClick={() => setSecret(undefined)}>
                I have copied it
              </Button>
            </div>
          </div>
        )}

        {campaigns.isPending && <Spinner label="Loading your campaigns…" />}
        {campaigns.isError && <Notice tone="error">{campaigns.error.message}</Notice>}
        {campaigns.data && mine.length === 0 && <Notice tone="info">You are not a member of any campaign yet, so there is nothing a token could be for.</Notice>}
        {mine.length > 0 && (
          <form onSubmit={create} noValidate className="grid gap-4 md:grid-cols-5 md:items-start">
            <FormFailure message={failure} span="md:col-span-5" />
            <Field id="token-name" name="name" label="Name" placeholder="bridge on the test PC" error={errors.name} />
            <Select id="token-campaign" name="campaignId" label="Campaign" value={chosen?.id ?? ''} onChange={(e) => setCampaignId(e.target.value)} options={mine.map((c) => [c.id, c.name])} error={errors.campaignId} />
            <Select id="token-role" name="role" label="Role" options={roles.map((r) => [r, roleLabel[r]])} hint="At most your role in that campaign." />
            <Field id="token-expiry" name="expiresInDays" label="Expires after (days)" inputMode="numeric" placeholder="never" error={errors.expiresInDays} />
            <FormActions busy={busy} submit="Create token" busyLabel="Creating…" className="md:pt-6" />
          </form>
        )}
      </Panel>

      <Panel title="Your tokens">
        {tokens.isPending && <Spinner label="Loading your tokens…" />}
        {tokens.isError && <Notice tone="error">{tokens.error.message}</Notice>}
        {tokens.data && tokens.data.tokens.length === 0 && <p className="py-6 text-center text-sm text-[var(--muted)]">You have no API tokens yet.</p>}
        {tokens.data && tokens.data.tokens.length > 0 && (
          <DataTable th="py-2 pr-3 font-medium" body="divide-y divide-[var(--line)]" columns={['Name', 'Campaign', 'Role', 'Starts with', 'Expires', 'Last used', 'State', { label: <span className="sr-only">Actions</span>, className: '' }]}>
                {tokens.data.tokens.map((t) => (
                  <tr key={t.id}>
                    <td className="py-2.5 font-medium">{t.name}</td>
                    <td>{t.campaignName ?? '—'}</td>
                    <td>{roleLabel[t.role]}</td>
                    <td className="num">{t.prefix}…</td>
                    <td className="num">{t.expiresAt ? when(t.expiresAt) : 'never'}</td>
                    <td className="num">{t.lastUsedAt ? when(t.lastUsedAt) : 'not yet'}</td>
                    <td>{t.state === 'active' ? 'Active' : t.state === 'expired' ? 'Expired' : `Revoked ${when(t.revokedAt)}`}</td>
                    <td className="text-right">
                      {t.state === 'active' && (
                        <Button variant="secondary" onClick={() => void revoke(t)} aria-label={`Revoke ${t.name}`}>
                          Revoke
                        </Button>
                      )}
                    </td>
                  </tr>
                ))}
          </DataTable>
        )}
      </Panel>
    </div>
  );
}
