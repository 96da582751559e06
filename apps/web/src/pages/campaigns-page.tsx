// The campaigns the signed-in person belongs to (every campaign for an admin), with progress,
// a search box (?q=) and, for admins and leads, a form for a new campaign.
import { useEffect, useState, type FormEvent } from 'react';
import { Link, useNavigate, useSearchParams } from 'react-router';
import { useQuery, useQueryClient } from '@tanstack/react-query';
import { campaignCreateSchema, campaignListFilterLabels, campaignListFilters, type CampaignListFilter, type CampaignStatus } from '@resonote/contracts';
import { MyInvitations, useMyInvitations } from '../components/my-invitations.tsx';
import { emptyListNextStep } from './campaigns-empty.ts';
import { formatWhen } from '../lib/format-date.ts';
import { api, ApiError } from '../lib/api.ts';
import { useMe } from '../lib/session.ts';
import { useToast } from '../lib/toast.tsx';
import { issuesToErrors, type FieldErrors } from '../lib/forms.ts';
import { purposeLabel, roleLabel, simulatorLabel, testTypeLabel, type MyRole } from '../lib/campaign-data.ts';
import { Button, Field, Notice, Panel, Spinner } from '../components/ui.tsx';
import { Select } from '../components/form-controls.tsx';
import { CampaignStatusBadge, ProgressBar } from '../components/status.tsx';
import { DataTable } from '../components/data-table.tsx';
import { FormActions, FormFailure } from '../components/form-parts.tsx';

interface CampaignRow {
  id: string;
  name: string;
  structure: string;
  client: string;
  status: CampaignStatus;
  myRole: MyRole | null;
  updatedAt: string;
  leads: string[];
  progress: { planned: number; 'in-progress': number; done: number; flagged: number; skipped: number; total: number };
  archivedAt: string | null;
}

const listCampaigns = (q: string, status: CampaignListFilter) => {
  const params = new URLSearchParams({ status });
  if (q) params.set('q', q);
  return api<{ campaigns: CampaignRow[] }>(`/campaigns?${params}`);
};
const isFilter = (v: string | null): v is CampaignListFilter => v !== null && (campaignListFilters as readonly string[]).includes(v);

export function CampaignsPage() {
  const me = useMe();
  const [params, setParams] = useSearchParams();
  const q = params.get('q') ?? '';
  const rawStatus = params.get('status');
  const status: CampaignListFilter = isFilter(rawStatus) ? rawStatus : 'active';
  const [typed, setTyped] = useState(q);
  const [creating, setCreating] = useState(false);
  const setFilter = (next: { q?: string; status?: CampaignListFilter }) => {
    const nq = next.q ?? q;
    const ns = next.status ?? status;
    setParams({ ...(nq ? { q: nq } : {}), ...(ns !== 'active' ? { status: ns } : {}) }, { replace: true });
  };
  useEffect(() => {
    const t = setTimeout(() => {
      if (typed.trim() !== q) setFilter({ q: typed.trim() });
    }, 250);
    return () => clearTimeout(t);
  });

  const campaigns = useQuery({ queryKey: ['campaigns', q, status], queryFn: () => listCampaigns(q, status) });
  // Unfiltered list, to know whether the caller leads any campaign (and so may create one).
  const all = useQuery({ queryKey: ['campaigns', '', 'all'], queryFn: () => listCampaigns('', 'all') });
  const isAdmin = me.data?.user.role === 'admin';
  const canCreate = isAdmin || Boolean(all.data?.campaigns.some((c) => c.myRole === 'lead'));
  const invitations = useMyInvitations().data?.invitations ?? [];
  const nextStep = emptyListNextStep({ isAdmin, canCreate, email: me.data?.user.email, invitations });

  return (
    <div className="space-y-4">
      <div className="flex flex-wrap items-end justify-between gap-3">
        <div>
          <h1 className="text-2xl font-semibold">Campaigns</h1>
          <p className="text-sm text-[var(--muted)]">Test campaigns you take part in, with your role in each.</p>
        </div>
        <div className="flex flex-wrap items-end gap-2">
          <label className="flex flex-col gap-1 text-sm font-medium">
            <span className="sr-only">Search campaigns</span>
            <input
              type="search"
              value={typed}
              onChange={(e) => setTyped(e.target.value)}
              placeholder="Search by name, structure or client"
              aria-label="Search campaigns"
              className="min-h-10 w-72 max-w-full rounded-md border border-[var(--line)] bg-[var(--panel)] px-3 text-sm outline-none focus:border-accent focus:ring-2 focus:ring-accent/30"
            />
          </label>
          <label className="flex flex-col gap-1 text-sm font-medium">
            <span className="sr-only">Show campaigns</span>
            <select
              aria-label="Show campaigns"
              value={status}
              onChange={(e) => setFilter({ status: e.target.value as CampaignListFilter })}
              className="min-h-10 rounded-md border border-[var(--line)] bg-[var(--panel)] px-2 text-sm"
            >
              {campaignListFilters.map((f) => (
                <option key={f} value={f}>
                  {campaignListFilterLabels[f]}
                </option>
              ))}
            </select>
          </label>
          {canCreate && !creating && <Button onClick={() => setCreating(true)}>New campaign</Button>}
        </div>
      </div>
      <MyInvitations />
      {creating && <NewCampaignForm onClose={() => setCreating(false)} />}
      <Panel>
        {campaigns.isPending && <Spinner label="Loading campaigns…" />}
        {campaigns.isError && <Notice tone="error">The campaigns could not be loaded: {campaigns.error.message}</Notice>}
        {campaigns.data && campaigns.data.campaigns.length === 0 && (
          <div className="py-10 text-center" data-testid="campaigns-empty">
            {q || status !== 'active' ? (
              <>
                <p className="text-base font-medium">{q ? `No campaign matches “${q}”` : `No campaigns under “${campaignListFilterLabels[status]}”`}</p>
                <p className="mt-1 text-sm text-[var(--muted)]">
                  {q ? 'Search looks at the name, the structure and the client. ' : ''}
                  {status !== 'all' ? 'Choose “All” to see every campaign, archived ones too.' : ''}
                </p>
              </>
            ) : (
              <>
                <p className="text-base font-medium">{nextStep.title}</p>
                <p className="mx-auto mt-1 max-w-md text-sm text-[var(--muted)]" data-testid="next-step">
                  {nextStep.text}
                </p>
              </>
            )}
          </div>
        )}
        {campaigns.data && campaigns.data.campaigns.length > 0 && (
          <DataTable
            frame="-mx-4 overflow-x-auto px-4"
            table="w-full min-w-[640px] text-sm"
            head="text-left text-xs text-[var(--muted)] uppercase"
            columns={['Campaign', 'Client', 'Status', 'DOFs done', 'Leads', 'Your role']}
          >
                {campaigns.data.campaigns.map((c) => (
                  <tr key={c.id} className="border-t border-[var(--line)] align-top hover:bg-accent-soft/40">
                    <td className="py-2.5 pr-3">
                      <Link to={`/campaigns/${c.id}`} className="font-medium text-accent-strong hover:underline">
                        {c.name}
                      </Link>
                      <div className="text-xs text-[var(--muted)]">{c.structure || '—'}</div>
                    </td>
                    <td className="py-2.5 pr-3">{c.client || '—'}</td>
                    <td className="py-2.5 pr-3">
                      <CampaignStatusBadge status={c.status} />
                      {c.archivedAt && <span className="ml-1.5 rounded border border-[var(--line)] px-1.5 py-0.5 text-xs" title={`Archived on ${formatWhen(c.archivedAt, 'date')}: read-only`}>Archived</span>}
                    </td>
                    <td className="py-2.5 pr-3">
                      <ProgressBar done={c.progress.done} total={c.progress.total} />
                    </td>
                    <td className="py-2.5 pr-3">{c.leads.length ? c.leads.join(', ') : '—'}</td>
                    <td className="py-2.5">{c.myRole ? roleLabel[c.myRole] : '—'}</td>
                  </tr>
                ))}
          </DataTable>
        )}
      </Panel>
    </div>
  );
}

function NewCampaignForm({ onClose }: { onClose: () => void }) {
  const navigate = useNavigate();
  const client = useQueryClient();
  const toast = useToast();
  const [errors, setErrors] = useState<FieldErrors>({});
  const [failure, setFailure] = useState<string>();
  const [busy, setBusy] = useState(false);

  async function submit(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const f = new FormData(event.currentTarget);
    const parsed = campaignCreateSchema.safeParse({
      name: String(f.get('name') ?? ''),
      structure: String(f.get('structure') ?? ''),
      client: String(f.get('client') ?? ''),
      purpose: f.get('purpose'),
      testType: f.get('testType'),
      simulator: f.get('simulator'),
    });
    if (!parsed.success) return setErrors(issuesToErrors(parsed.error));
    setErrors({});
    setBusy(true);
    setFailure(undefined);
    try {
      const made = await api<{ campaign: { id: string; name: string } }>('/campaigns', { body: parsed.data });
      await client.invalidateQueries({ queryKey: ['campaigns'] });
      toast('ok', `Campaign “${made.campaign.name}” created. You are its lead.`);
      navigate(`/campaigns/${made.campaign.id}/plan`);
    } catch (err) {
      setFailure(err instanceof ApiError ? err.message : 'The campaign could not be created.');
    } finally {
      setBusy(false);
    }
  }

  return (
    <Panel title="New campaign">
      <form onSubmit={submit} noValidate className="grid gap-4 md:grid-cols-3">
        <FormFailure message={failure} span="md:col-span-3" />
        <Field id="new-name" name="name" label="Name" required error={errors.name} autoFocus />
        <Field id="new-structure" name="structure" label="Structure" placeholder="e.g. pump-skid baseplate" error={errors.structure} />
        <Field id="new-client" name="client" label="Client" error={errors.client} />
        <Select id="new-purpose" name="purpose" label="Purpose" options={Object.entries(purposeLabel)} />
        <Select id="new-test-type" name="testType" label="Test type" options={Object.entries(testTypeLabel)} />
        <Select id="new-simulator" name="simulator" label="Simulated rig model" options={Object.entries(simulatorLabel)} defaultValue="generic" hint="Structure model behind simulated hits." />
        <FormActions busy={busy} submit="Create campaign" busyLabel="Creating…" onCancel={onClose} cancelVariant="secondary" className="flex gap-2 md:col-span-3" />
      </form>
    </Panel>
  );
}
