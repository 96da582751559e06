// Archive, un-archive and delete a campaign (leads). An archived campaign is read-only on every
// screen and in the API; its banner says since when and offers the lead the way back.
import { useState } from 'react';
import { useNavigate } from 'react-router';
import { useQueryClient } from '@tanstack/react-query';
import { api, ApiError } from '../../lib/api.ts';
import { keys, type Campaign } from '../../lib/campaign-data.ts';
import { formatWhen } from '../../lib/format-date.ts';
import { useFailure } from '../../lib/mutation.ts';
import { useToast } from '../../lib/toast.tsx';
import { Button, Panel } from '../../components/ui.tsx';

function useLifecycle(campaign: Campaign) {
  const client = useQueryClient();
  const toast = useToast();
  const fail = useFailure();
  const navigate = useNavigate();
  const [busy, setBusy] = useState(false);
  const refresh = () => Promise.all([client.invalidateQueries({ queryKey: keys.campaign(campaign.id) }), client.invalidateQueries({ queryKey: ['campaigns'] })]);

  async function run(what: () => Promise<unknown>, done: string) {
    setBusy(true);
    try {
      await what();
      await refresh();
      toast('ok', done);
    } catch (err) {
      fail(err, [keys.campaign(campaign.id)]);
    } finally {
      setBusy(false);
    }
  }
  return {
    busy,
    archive: (reason: string) => run(() => api(`/campaigns/${campaign.id}/archive`, { body: { version: campaign.version, reason } }), `“${campaign.name}” is archived: read-only, everything kept.`),
    unarchive: () => run(() => api(`/campaigns/${campaign.id}/unarchive`, { body: { version: campaign.version } }), `“${campaign.name}” is active again.`),
    remove: async () => {
      if (!window.confirm(`Delete “${campaign.name}” with its plan, kit and settings? This cannot be undone.`)) return;
      setBusy(true);
      try {
        await api(`/campaigns/${campaign.id}?version=${campaign.version}`, { method: 'DELETE' });
        await client.invalidateQueries({ queryKey: ['campaigns'] });
        toast('ok', `“${campaign.name}” deleted.`);
        navigate('/campaigns');
      } catch (err) {
        if (err instanceof ApiError && err.code === 'campaign-has-hits') toast('error', err.message);
        else fail(err, [keys.campaign(campaign.id)]);
      } finally {
        setBusy(false);
      }
    },
  };
}

/** Shown on every tab of an archived campaign. */
export function ArchivedBanner({ campaign, isLead }: { campaign: Campaign; isLead: boolean }) {
  const life = useLifecycle(campaign);
  return (
    <div data-testid="archived-banner" className="flex flex-wrap items-center justify-between gap-3 rounded-md border border-[var(--line)] bg-[var(--panel)] px-3 py-2 text-sm">
      <p>
        <span className="font-semibold">Archived</span> on <span className="num">{formatWhen(campaign.archivedAt, 'date')}</span>
        {campaign.archiveReason ? ` — ${campaign.archiveReason}` : ''}. Read-only: everything is kept and can be read and exported; nothing can be changed.
      </p>
      {isLead && (
        <div className="flex gap-2">
          <Button variant="secondary" disabled={life.busy} onClick={() => void life.unarchive()}>
            Un-archive
          </Button>
          <Button variant="ghost" className="text-bad" disabled={life.busy} onClick={() => void life.remove()}>
            Delete…
          </Button>
        </div>
      )}
    </div>
  );
}

/** Plan tab, leads: archive when the work is over, delete a campaign that never recorded anything. */
export function LifecycleCard({ campaign }: { campaign: Campaign }) {
  const life = useLifecycle(campaign);
  const [reason, setReason] = useState('');
  return (
    <Panel title="Archive or delete">
      <div className="grid gap-4 md:grid-cols-2">
        <div className="space-y-2 text-sm">
          <p>Archiving makes the campaign read-only for everyone: hits, results, plan and kit stay, reports and exports still work, and a lead can un-archive it later.</p>
          <label className="flex flex-col gap-1 font-medium">
            Reason (optional)
            <input value={reason} onChange={(e) => setReason(e.target.value)} maxLength={500} placeholder="e.g. handed over to the client" className="min-h-10 rounded-md border border-[var(--line)] bg-[var(--panel)] px-3 text-sm font-normal" />
          </label>
          <Button variant="secondary" disabled={life.busy} onClick={() => void life.archive(reason)}>
            Archive campaign
          </Button>
        </div>
        <div className="space-y-2 text-sm">
          <p>Deleting removes the campaign with its plan, kit, settings and members. It is possible only while no hit or noise check was recorded: recordings are never deleted, so such a campaign can only be archived.</p>
          <Button variant="ghost" className="text-bad" disabled={life.busy} onClick={() => void life.remove()}>
            Delete campaign…
          </Button>
        </div>
      </div>
    </Panel>
  );
}
