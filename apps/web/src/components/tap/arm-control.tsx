// Arm / Disarm the DOF on screen (issue 16): while it is armed, the files your watched-folder
// bridge sends go to it. Everyone on the campaign sees who has armed which DOF; the list follows
// the campaign's event stream (useLiveCampaign refreshes the 'arming' query).
import { useQuery, useQueryClient } from '@tanstack/react-query';
import { useState } from 'react';
import { api } from '../../lib/api.ts';
import { useFailure } from '../../lib/mutation.ts';
import { Button, Notice, Spinner } from '../ui.tsx';
import { formatWhen } from '../../lib/format-date.ts';

interface Armed {
  userId: string;
  name: string;
  entryId: string;
  responseDof: string;
  excitationDof: string;
  armedAt: string;
}

const armingKey = (campaignId: string) => ['campaign', campaignId, 'arming'];

export function ArmControl({ campaignId, entryId, label, canAct }: { campaignId: string; entryId: string | undefined; label: string; canAct: boolean }) {
  const arming = useQuery({ queryKey: armingKey(campaignId), queryFn: () => api<{ armed: Armed[]; mine: Armed | null }>(`/campaigns/${campaignId}/arming`) });
  const client = useQueryClient();
  const fail = useFailure();
  const [busy, setBusy] = useState(false);
  const mine = arming.data?.mine ?? null;
  const armedHere = mine?.entryId === entryId;

  async function change(arm: boolean) {
    setBusy(true);
    try {
      const next = await api<{ armed: Armed[]; mine: Armed | null }>(`/campaigns/${campaignId}/arming`, arm ? { method: 'PUT', body: { entryId } } : { method: 'DELETE' });
      client.setQueryData(armingKey(campaignId), next);
    } catch (err) {
      fail(err, [armingKey(campaignId)]);
    } finally {
      setBusy(false);
    }
  }

  return (
    <div className="space-y-2" data-testid="arm-control">
      {canAct && entryId && (
        <div className="flex flex-wrap items-center gap-2">
          {armedHere ? (
            <Button variant="secondary" disabled={busy} onClick={() => void change(false)}>
              Disarm
            </Button>
          ) : (
            <Button disabled={busy} onClick={() => void change(true)}>
              Arm {label}
            </Button>
          )}
          <span className="text-xs text-[var(--muted)]" data-testid="arm-state">
            {armedHere ? `Armed: your bridge’s files go to ${label}.` : mine ? `You have ${mine.excitationDof} → ${mine.responseDof} armed.` : 'Nothing armed: a bridge leaves files waiting.'}
          </span>
        </div>
      )}
      {arming.isPending && <Spinner label="Loading who has armed what…" />}
      {arming.isError && <Notice tone="error">Armed DOFs could not be loaded: {arming.error.message}</Notice>}
      {arming.data && (
        <ul className="text-xs text-[var(--muted)]" aria-label="Armed DOFs">
          {arming.data.armed.length === 0 && <li>No one has armed a DOF.</li>}
          {arming.data.armed.map((a) => (
            <li key={a.userId} className="num">
              {a.name}: {a.excitationDof} → {a.responseDof} since {formatWhen(a.armedAt, 'time')}
            </li>
          ))}
        </ul>
      )}
    </div>
  );
}
