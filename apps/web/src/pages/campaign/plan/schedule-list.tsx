// The point schedule in working order: H(response DOF / excitation DOF), status, hits and
// assignee; leads generate it, reorder it with up/down and assign people.
import { useState } from 'react';
import { useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api.ts';
import { keys, type Member, type ScheduleEntry } from '../../../lib/campaign-data.ts';
import { useFailure } from '../../../lib/mutation.ts';
import { useToast } from '../../../lib/toast.tsx';
import { Button, Notice, Panel } from '../../../components/ui.tsx';
import { ScheduleStatusBadge } from '../../../components/status.tsx';

export function ScheduleList({ campaignId, entries, members, canLead }: { campaignId: string; entries: ScheduleEntry[]; members: Member[]; canLead: boolean }) {
  const client = useQueryClient();
  const toast = useToast();
  const fail = useFailure();
  const [busy, setBusy] = useState(false);
  const [generateError, setGenerateError] = useState<string>();
  const put = (list: ScheduleEntry[]) => client.setQueryData(keys.schedule(campaignId), { entries: list });

  async function generate() {
    setBusy(true);
    setGenerateError(undefined);
    try {
      const r = await api<{ added: number; removed: number; kept: number; entries: ScheduleEntry[] }>(`/campaigns/${campaignId}/schedule/generate`, { body: {} });
      put(r.entries);
      void client.invalidateQueries({ queryKey: ['campaigns'] });
      toast('ok', `Schedule generated: ${r.added} added, ${r.removed} removed, ${r.kept} kept.`);
    } catch (err) {
      setGenerateError(err instanceof Error ? err.message : 'The schedule could not be generated.');
    } finally {
      setBusy(false);
    }
  }
  async function move(index: number, by: -1 | 1) {
    const order = entries.map((e) => e.id);
    const j = index + by;
    if (j < 0 || j >= order.length) return;
    [order[index], order[j]] = [order[j]!, order[index]!];
    setBusy(true);
    try {
      const r = await api<{ entries: ScheduleEntry[] }>(`/campaigns/${campaignId}/schedule/reorder`, { body: { order } });
      put(r.entries);
      toast('ok', `Moved ${entries[index]!.responseDof} / ${entries[index]!.excitationDof} to position ${j + 1}.`);
    } catch (err) {
      fail(err, [keys.schedule(campaignId)]);
      void client.invalidateQueries({ queryKey: keys.schedule(campaignId) });
    } finally {
      setBusy(false);
    }
  }
  async function assign(entry: ScheduleEntry, assigneeId: string) {
    try {
      const r = await api<{ entry: ScheduleEntry }>(`/campaigns/${campaignId}/schedule/${entry.id}`, { method: 'PATCH', body: { version: entry.version, assigneeId: assigneeId || null } });
      put(entries.map((e) => (e.id === entry.id ? r.entry : e)));
      toast('ok', `${entry.responseDof} / ${entry.excitationDof}: ${r.entry.assigneeName ? `assigned to ${r.entry.assigneeName}` : 'not assigned'}.`);
    } catch (err) {
      fail(err, [keys.schedule(campaignId)]);
    }
  }
  const assignable = members.filter((m) => m.role !== 'viewer');
  const pairs = new Set(entries.map((e) => `${e.responseDof}|${e.excitationDof}`));
  async function addReciprocal(entry: ScheduleEntry) {
    setBusy(true);
    try {
      const r = await api<{ entry: ScheduleEntry }>(`/campaigns/${campaignId}/schedule/${entry.id}/reciprocal`, { body: {} });
      put([...entries, r.entry]);
      toast('ok', `Added ${r.entry.responseDof} / ${r.entry.excitationDof} at the end: with ${entry.responseDof} / ${entry.excitationDof} it makes a reciprocity pair for Review.`);
    } catch (err) {
      fail(err, [keys.schedule(campaignId)]);
    } finally {
      setBusy(false);
    }
  }

  return (
    <Panel
      title={
        <>
          Schedule <span className="num font-normal text-[var(--muted)]">({entries.length} DOF pair{entries.length === 1 ? '' : 's'})</span>
        </>
      }
      actions={
        canLead && (
          <Button onClick={generate} disabled={busy}>
            Generate schedule
          </Button>
        )
      }
    >
      {generateError && (
        <div className="mb-3">
          <Notice tone="error">{generateError}</Notice>
        </div>
      )}
      {entries.length === 0 && (
        <p className="py-4 text-center text-sm text-[var(--muted)]" data-testid="schedule-empty">
          No schedule yet.{' '}
          {canLead ? 'Set the test type and the reference DOFs above, give the points their directions, then generate the schedule.' : 'The lead generates it from the test type and the reference DOFs.'}
        </p>
      )}
      {entries.length > 0 && (
        <div className="-mx-4 max-h-[560px] overflow-auto px-4">
          <table className="w-full min-w-[620px] text-sm" data-testid="schedule-table">
            <thead className="sticky top-0 z-10 bg-[var(--panel)] text-left text-xs text-[var(--muted)]">
              <tr>
                <th className="py-2 pr-2 text-right font-medium">#</th>
                <th className="pr-2 font-medium">H(response / excitation)</th>
                <th className="pr-2 font-medium">Status</th>
                <th className="pr-2 text-right font-medium">Accepted / required</th>
                <th className="pr-2 text-right font-medium">Rejected</th>
                <th className="pr-2 font-medium">Assignee</th>
                {canLead && <th className="font-medium"><span className="sr-only">Order</span></th>}
              </tr>
            </thead>
            <tbody>
              {entries.map((e, i) => (
                <tr key={e.id} className="border-t border-[var(--line)]" data-entry={`${e.responseDof} / ${e.excitationDof}`}>
                  <td className="num py-1 pr-2 text-right text-[var(--muted)]">{e.position}</td>
                  <td className="num pr-2 whitespace-nowrap">
                    {e.responseDof} / {e.excitationDof}
                    {e.drivingPoint && (
                      <span className="ml-2 inline-flex items-center gap-1 rounded border border-accent/50 px-1 font-sans text-xs text-accent-strong" title="Driving point: response and excitation at the same DOF">
                        <span aria-hidden>⊙</span> driving point
                      </span>
                    )}
                  </td>
                  <td className="pr-2">
                    <ScheduleStatusBadge status={e.status} />
                  </td>
                  <td className="num pr-2 text-right whitespace-nowrap">
                    {e.acceptedHits} / {e.requiredHits} hits
                  </td>
                  <td className="num pr-2 text-right whitespace-nowrap">{e.rejectedHits}</td>
                  <td className="pr-2">
                    {canLead ? (
                      <select
                        aria-label={`Assignee of ${e.responseDof} / ${e.excitationDof}`}
                        value={e.assigneeId ?? ''}
                        onChange={(ev) => void assign(e, ev.target.value)}
                        className="min-h-9 max-w-44 rounded border border-[var(--line)] bg-[var(--panel)] px-2 text-sm"
                      >
                        <option value="">Not assigned</option>
                        {assignable.map((m) => (
                          <option key={m.userId} value={m.userId}>
                            {m.name}
                          </option>
                        ))}
                      </select>
                    ) : (
                      (e.assigneeName ?? <span className="text-[var(--muted)]">Not assigned</span>)
                    )}
                  </td>
                  {canLead && (
                    <td className="py-1 text-right whitespace-nowrap">
                      {!e.drivingPoint && !pairs.has(`${e.excitationDof}|${e.responseDof}`) && (
                        <button
                          type="button"
                          disabled={busy}
                          onClick={() => void addReciprocal(e)}
                          className="mr-1 h-10 rounded-md border border-[var(--line)] px-2 text-xs hover:border-accent disabled:opacity-30"
                          title={`Add ${e.excitationDof} / ${e.responseDof}, the reciprocal, for a reciprocity check`}
                          aria-label={`Add the reciprocal of ${e.responseDof} / ${e.excitationDof}`}
                        >
                          ⇄ reciprocal
                        </button>
                      )}
                      {pairs.has(`${e.excitationDof}|${e.responseDof}`) && !e.drivingPoint && (
                        <span className="mr-2 text-xs text-[var(--muted)]" title="The reciprocal entry is in the schedule">
                          ⇄ pair
                        </span>
                      )}
                      <button type="button" disabled={busy || i === 0} onClick={() => void move(i, -1)} className="h-10 w-10 rounded-md border border-[var(--line)] hover:border-accent disabled:opacity-30" aria-label={`Move ${e.responseDof} / ${e.excitationDof} up`}>
                        ↑
                      </button>
                      <button
                        type="button"
                        disabled={busy || i === entries.length - 1}
                        onClick={() => void move(i, 1)}
                        className="ml-1 h-10 w-10 rounded-md border border-[var(--line)] hover:border-accent disabled:opacity-30"
                        aria-label={`Move ${e.responseDof} / ${e.excitationDof} down`}
                      >
                        ↓
                      </button>
                    </td>
                  )}
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      )}
    </Panel>
  );
}
