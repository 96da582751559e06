// Redo a DOF: the hits so far are set aside (kept, not counted) and a new set starts. Asks why.
import { useState } from 'react';
import { useQueryClient } from '@tanstack/react-query';
import { api, ApiError } from '../../lib/api.ts';
import { invalidateTestData } from '../../lib/hits-data.ts';
import { Dialog } from '../dialog.tsx';
import { Button } from '../ui.tsx';

export function RedoDialog({ campaignId, entryId, version, label, hitCount, onDone, onCancel }: { campaignId: string; entryId: string; version: number; label: string; hitCount: number; onDone: (message: string) => void; onCancel: () => void }) {
  const client = useQueryClient();
  const [reason, setReason] = useState('');
  const [busy, setBusy] = useState(false);
  const [error, setError] = useState<string | null>(null);
  const submit = async () => {
    setBusy(true);
    setError(null);
    try {
      const answer = await api<{ setAside: { hits: number[] } }>(`/campaigns/${campaignId}/schedule/${entryId}/redo`, { method: 'POST', body: { reason: reason.trim(), version } });
      await invalidateTestData(client, campaignId);
      onDone(`${answer.setAside.hits.length} earlier hit${answer.setAside.hits.length === 1 ? '' : 's'} at ${label} set aside (kept, not counted). Take the new set of hits.`);
    } catch (err) {
      if (err instanceof ApiError && err.status === 409) void invalidateTestData(client, campaignId);
      setError(err instanceof Error ? err.message : String(err));
      setBusy(false);
    }
  };
  const short = reason.trim().length < 3;
  return (
    <Dialog
      title={`Redo ${label}?`}
      onCancel={onCancel}
      testId="redo-dialog"
      actions={
        <>
          <Button variant="secondary" onClick={onCancel} className="min-h-11">
            Keep the hits
          </Button>
          <Button onClick={() => void submit()} disabled={busy || short} className="min-h-11" data-testid="redo-confirm">
            {busy ? 'Setting aside…' : 'Redo this DOF'}
          </Button>
        </>
      }
    >
      <p>
        The <span className="num">{hitCount}</span> hit{hitCount === 1 ? '' : 's'} taken here so far are set aside: kept with your name and reason, shown as set aside, and no longer counted in the average or the status. Then a new set of hits starts.
      </p>
      <label className="flex flex-col gap-1 font-medium">
        Why redo it?
        <textarea value={reason} onChange={(e) => setReason(e.target.value)} rows={2} maxLength={1000} placeholder="e.g. the accelerometer wax had let go" className="rounded-md border border-[var(--line)] bg-[var(--panel)] px-3 py-2 font-normal" data-testid="redo-reason" />
      </label>
      {short && <p className="text-xs text-[var(--muted)]">Say why in a few words (3 characters at least).</p>}
      {error && (
        <p role="alert" className="text-bad">
          {error}
        </p>
      )}
    </Dialog>
  );
}
