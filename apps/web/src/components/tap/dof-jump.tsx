// Jump to any DOF of the schedule: type part of a label ("P13", "P07 +Z", "13 z") and pick.
import { useMemo, useState } from 'react';
import type { ScheduleEntry } from '../../lib/campaign-data.ts';
import { ScheduleStatusBadge } from '../status.tsx';

const norm = (s: string) => s.toLowerCase().replace(/[\s:]+/g, ' ').trim();

/** Entries whose "excitation → response" label holds every word of the query, in schedule order. */
export function matchEntries(entries: ScheduleEntry[], query: string): ScheduleEntry[] {
  const words = norm(query).split(' ').filter(Boolean);
  if (words.length === 0) return [];
  return [...entries]
    .sort((a, b) => a.position - b.position)
    .filter((e) => {
      const label = norm(`${e.excitationLabel} ${e.excitationDirection} ${e.responseLabel} ${e.responseDirection}`);
      return words.every((w) => label.includes(w));
    });
}

export function DofJump({ entries, currentId, onJump }: { entries: ScheduleEntry[]; currentId: string; onJump: (entryId: string) => void }) {
  const [query, setQuery] = useState('');
  const [active, setActive] = useState(0);
  const matches = useMemo(() => matchEntries(entries, query).slice(0, 8), [entries, query]);
  const pick = (e: ScheduleEntry | undefined) => {
    if (!e) return;
    setQuery('');
    onJump(e.id);
  };
  return (
    <div className="relative w-56 max-w-full" data-testid="dof-jump">
      <label htmlFor="dof-jump-input" className="sr-only">
        Jump to a DOF
      </label>
      <input
        id="dof-jump-input"
        type="search"
        role="combobox"
        aria-expanded={matches.length > 0}
        aria-controls="dof-jump-list"
        autoComplete="off"
        value={query}
        placeholder="Jump to a DOF (e.g. P13)"
        onChange={(e) => {
          setQuery(e.target.value);
          setActive(0);
        }}
        onKeyDown={(e) => {
          if (e.key === 'ArrowDown') setActive((i) => Math.min(i + 1, matches.length - 1));
          else if (e.key === 'ArrowUp') setActive((i) => Math.max(i - 1, 0));
          else if (e.key === 'Enter') pick(matches[active]);
          else if (e.key === 'Escape') setQuery('');
          else return;
          e.preventDefault();
        }}
        className="min-h-11 w-full rounded-md border border-[var(--line)] bg-[var(--panel)] px-3 text-sm"
      />
      {query.trim() && (
        <ul id="dof-jump-list" role="listbox" className="absolute right-0 left-0 z-30 mt-1 max-h-72 overflow-auto rounded-md border border-[var(--line)] bg-[var(--panel)] py-1 text-sm shadow-lg">
          {matches.length === 0 && <li className="px-3 py-2 text-[var(--muted)]">No DOF of the schedule matches “{query.trim()}”.</li>}
          {matches.map((e, i) => (
            <li
              key={e.id}
              role="option"
              aria-selected={i === active}
              data-entry={e.id}
              onMouseDown={(ev) => {
                ev.preventDefault();
                pick(e);
              }}
              className={`flex min-h-10 cursor-pointer items-center justify-between gap-2 px-3 ${i === active ? 'bg-accent-soft' : ''}`}
            >
              <span className="num">
                {e.excitationLabel} {e.excitationDirection} → {e.responseLabel} {e.responseDirection}
                {e.id === currentId && <span className="ml-1 text-xs text-[var(--muted)]">(here)</span>}
              </span>
              <ScheduleStatusBadge status={e.status} />
            </li>
          ))}
        </ul>
      )}
    </div>
  );
}
