// The schedule as a pick list: a row opens that DOF; the box adds it to the overlay. "All done"
// picks every finished entry at once (up to 100).
import type { ScheduleEntry } from '../../lib/campaign-data.ts';
import { ScheduleStatusBadge } from '../status.tsx';

export const OVERLAY_LIMIT = 100;

export function EntryList({ entries, current, onOpen, picked, onPick, onPickMany, room }: { entries: ScheduleEntry[]; current: string | null; onOpen: (id: string) => void; picked: string[]; onPick: (id: string, on: boolean) => void; onPickMany: (ids: string[]) => void; room: number }) {
  const done = entries.filter((e) => e.status === 'done').map((e) => e.id);
  const withFrf = entries.filter((e) => e.acceptedHits > 0).map((e) => e.id);
  const chip = 'min-h-9 rounded-md border border-[var(--line)] px-2.5 text-xs font-medium hover:border-accent disabled:opacity-50';
  return (
    <div className="space-y-2">
      <div className="flex flex-wrap items-center gap-1.5">
        <span className="text-xs text-[var(--muted)]">Overlay:</span>
        <button type="button" className={chip} onClick={() => onPickMany(done.slice(0, room))} disabled={done.length === 0} data-testid="pick-all-done">
          All done <span className="num">({done.length})</span>
        </button>
        <button type="button" className={chip} onClick={() => onPickMany(withFrf.slice(0, room))} disabled={withFrf.length === 0}>
          All with an FRF <span className="num">({withFrf.length})</span>
        </button>
        <button type="button" className={chip} onClick={() => onPickMany([])} disabled={picked.length === 0}>
          Clear
        </button>
      </div>
      <div className="max-h-[28rem] overflow-y-auto rounded-md border border-[var(--line)] lg:max-h-[40rem]">
        <table className="w-full text-sm" data-testid="entry-list">
          <thead className="sticky top-0 bg-[var(--panel)] text-left text-xs text-[var(--muted)]">
            <tr>
              <th className="w-10 py-1.5 pl-2 font-medium">
                <span className="sr-only">In the overlay</span>
              </th>
              <th className="py-1.5 font-medium">Response / excitation</th>
              <th className="font-medium">Status</th>
              <th className="pr-2 text-right font-medium">Hits</th>
            </tr>
          </thead>
          <tbody>
            {entries.map((e) => {
              const on = picked.includes(e.id);
              const label = `${e.responseDof} / ${e.excitationDof}`;
              return (
                <tr key={e.id} data-entry={e.id} className={`border-t border-[var(--line)] ${e.id === current ? 'bg-accent-soft' : ''}`}>
                  <td className="pl-2">
                    <input
                      type="checkbox"
                      className="h-5 w-5 accent-[var(--color-accent)]"
                      checked={on}
                      disabled={e.acceptedHits === 0 || (!on && room <= 0)}
                      onChange={(ev) => onPick(e.id, ev.target.checked)}
                      aria-label={`Overlay ${label}`}
                      title={e.acceptedHits === 0 ? 'No accepted hit yet, so no FRF' : undefined}
                    />
                  </td>
                  <td className="py-1">
                    <button type="button" onClick={() => onOpen(e.id)} className="num min-h-9 text-left text-xs hover:underline" aria-current={e.id === current ? 'true' : undefined}>
                      {label}
                      {e.drivingPoint && <span className="ml-1 text-accent" title="Driving point">◎</span>}
                    </button>
                  </td>
                  <td className="text-xs">
                    <ScheduleStatusBadge status={e.status} />
                  </td>
                  <td className="num pr-2 text-right text-xs whitespace-nowrap">
                    {e.acceptedHits}/{e.requiredHits}
                    {e.rejectedHits > 0 && <span className="text-bad"> ✕{e.rejectedHits}</span>}
                  </td>
                </tr>
              );
            })}
          </tbody>
        </table>
      </div>
    </div>
  );
}
