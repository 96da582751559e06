// The campaigns the signed-in person belongs to (every campaign for an admin).
import { useQuery } from '@tanstack/react-query';
import { api } from '../lib/api.ts';
import { useMe } from '../lib/session.ts';
import { Notice, Panel, Spinner } from '../components/ui.tsx';

interface CampaignRow {
  id: string;
  name: string;
  structure: string;
  client: string;
  status: string;
  myRole: string;
  updatedAt: string;
}

const statusLabel: Record<string, string> = { planning: 'Planning', testing: 'Testing', analysis: 'Analysis', 'handed-over': 'Handed over' };

export function CampaignsPage() {
  const me = useMe();
  const campaigns = useQuery({ queryKey: ['campaigns'], queryFn: () => api<{ campaigns: CampaignRow[] }>('/campaigns') });

  return (
    <div className="space-y-4">
      <div className="flex items-end justify-between">
        <div>
          <h1 className="text-2xl font-semibold">Campaigns</h1>
          <p className="text-sm text-[var(--muted)]">Test campaigns you take part in, with your role in each.</p>
        </div>
      </div>
      <Panel>
        {campaigns.isPending && <Spinner label="Loading campaigns…" />}
        {campaigns.isError && <Notice tone="error">{campaigns.error.message}</Notice>}
        {campaigns.data && campaigns.data.campaigns.length === 0 && (
          <div className="py-10 text-center" data-testid="campaigns-empty">
            <p className="text-base font-medium">No campaigns yet</p>
            <p className="mx-auto mt-1 max-w-md text-sm text-[var(--muted)]">
              {me.data?.user.role === 'admin'
                ? 'As admin you see every campaign of this instance once one exists.'
                : 'A test lead adds you to a campaign with a role: lead, engineer or viewer. Ask your lead for an invitation.'}
            </p>
          </div>
        )}
        {campaigns.data && campaigns.data.campaigns.length > 0 && (
          <table className="w-full text-sm">
            <thead className="text-left text-xs text-[var(--muted)] uppercase">
              <tr>
                <th className="py-2">Campaign</th>
                <th>Structure</th>
                <th>Client</th>
                <th>Status</th>
                <th>Your role</th>
              </tr>
            </thead>
            <tbody>
              {campaigns.data.campaigns.map((c) => (
                <tr key={c.id} className="border-t border-[var(--line)]">
                  <td className="py-2 font-medium">{c.name}</td>
                  <td>{c.structure}</td>
                  <td>{c.client}</td>
                  <td>{statusLabel[c.status] ?? c.status}</td>
                  <td className="capitalize">{c.myRole}</td>
                </tr>
              ))}
            </tbody>
          </table>
        )}
      </Panel>
    </div>
  );
}
