// Frame of one campaign: its name, structure, status and the caller's role, and the tabs.
import { Link, NavLink, Outlet, useMatch, useParams } from 'react-router';
import { ApiError } from '../../lib/api.ts';
import { roleLabel, useCampaign } from '../../lib/campaign-data.ts';
import { Notice, Spinner } from '../../components/ui.tsx';
import { CampaignStatusBadge } from '../../components/status.tsx';
import type { CampaignContext } from './campaign-context.ts';
import { ArchivedBanner } from './campaign-lifecycle.tsx';

const tabs = [
  { to: '', label: 'Overview', end: true },
  { to: 'plan', label: 'Plan' },
  { to: 'kit', label: 'Kit' },
  { to: 'tap', label: 'Tap' },
  { to: 'review', label: 'Review' },
  { to: 'modes', label: 'Modes' },
  { to: 'handover', label: 'Hand-over' },
];

export function CampaignLayout() {
  const { campaignId = '' } = useParams();
  const query = useCampaign(campaignId);
  // Tap must fit one screen at the structure: there the frame is one line (name and tabs).
  const onTap = useMatch('/campaigns/:campaignId/tap') !== null;

  if (query.isPending) return <Spinner label="Loading the campaign…" />;
  if (query.isError) {
    if (query.error instanceof ApiError && (query.error.status === 404 || query.error.status === 403)) {
      return (
        <div className="mx-auto max-w-lg py-16 text-center" data-testid="campaign-not-found">
          <h1 className="text-xl font-semibold">Campaign not found — it does not exist or you are not a member.</h1>
          <p className="mt-2 text-sm text-[var(--muted)]">If you expected to see it, ask the campaign's lead for an invitation.</p>
          <Link to="/campaigns" className="mt-4 inline-block text-accent hover:underline">
            Go to your campaigns
          </Link>
        </div>
      );
    }
    return <Notice tone="error">The campaign could not be loaded: {query.error.message}</Notice>;
  }
  const { campaign, myRole } = query.data;
  const isLead = myRole === 'lead' || myRole === 'admin';
  const archived = Boolean(campaign.archivedAt);
  const context: CampaignContext = { campaign, myRole, isLead, archived, canLead: isLead && !archived };

  const nav = (
    <nav aria-label="Campaign" className={`-mb-px flex gap-1 overflow-x-auto ${onTap ? '' : 'border-b border-[var(--line)]'}`}>
      {tabs.map((t) => (
        <NavLink
          key={t.label}
          to={t.to}
          end={t.end}
          className={({ isActive }) =>
            `${onTap ? 'min-h-10 px-3 py-2' : 'min-h-11 px-4 py-2.5'} border-b-2 text-sm font-medium whitespace-nowrap ${isActive ? 'border-accent text-accent-strong' : 'border-transparent text-[var(--muted)] hover:text-[var(--ink)]'}`
          }
        >
          {t.label}
        </NavLink>
      ))}
    </nav>
  );
  if (onTap) {
    return (
      <div className="-mt-3 space-y-3">
        <header className="flex items-end gap-x-4 border-b border-[var(--line)]">
          <h1 className="min-w-0 shrink truncate pb-2 text-base font-semibold" title={`${campaign.name} · ${campaign.structure}`}>
            {campaign.name}
          </h1>
          {archived && (
            <span className="mb-2 shrink-0 rounded border border-[var(--line)] px-1.5 py-0.5 text-xs" data-testid="tap-archived-badge">
              Archived · read-only
            </span>
          )}
          <div className="ml-auto min-w-0">{nav}</div>
        </header>
        <Outlet context={context} />
      </div>
    );
  }

  return (
    <div className="space-y-4">
      <header className="space-y-3">
        <div className="flex flex-wrap items-end justify-between gap-x-6 gap-y-2">
          <div className="min-w-0">
            <p className="text-xs text-[var(--muted)]">
              <Link to="/campaigns" className="hover:underline">
                Campaigns
              </Link>{' '}
              /
            </p>
            <h1 className="truncate text-2xl font-semibold">{campaign.name}</h1>
            <p className="text-sm text-[var(--muted)]">
              {campaign.structure || 'Structure not named yet'}
              {campaign.client ? ` · for ${campaign.client}` : ''}
            </p>
          </div>
          <dl className="flex flex-wrap gap-x-6 gap-y-1 text-sm">
            <div>
              <dt className="text-xs text-[var(--muted)]">Status</dt>
              <dd>
                <CampaignStatusBadge status={campaign.status} />
                {archived && <span className="ml-2 rounded border border-[var(--line)] px-1.5 py-0.5 text-xs">Archived</span>}
              </dd>
            </div>
            <div>
              <dt className="text-xs text-[var(--muted)]">Your role</dt>
              <dd data-testid="my-role">{roleLabel[myRole]}</dd>
            </div>
          </dl>
        </div>
        {nav}
      </header>
      {archived && <ArchivedBanner campaign={campaign} isLead={isLead} />}
      <Outlet context={context} />
    </div>
  );
}
