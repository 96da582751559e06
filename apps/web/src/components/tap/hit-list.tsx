// The hits of one DOF, newest last: sequence, verdict (icon + colour + word) with its reasons in
// short words underneath (so the table fits the narrow Tap column), peak force and pulse width. A row can be chosen to see its traces (and, on Tap, to override its verdict).
import type { HitSummary } from '../../lib/hits-data.ts';
import { VerdictBadge } from './verdict.tsx';

/** Short words for the reason codes; the full sentence is in the tooltip and in the verdict panel. */
const shortReason: Record<string, string> = {
  'double-hit': 'double hit',
  overload: 'force overload',
  weak: 'too weak',
  'roll-off': 'force roll-off',
  'response-overload': 'response overload',
  'not-decayed': 'not decayed',
};

export function HitList({ hits, selectedId, onSelect }: { hits: HitSummary[]; selectedId: string | null; onSelect: (id: string) => void }) {
  if (hits.length === 0) return <p className="text-sm text-[var(--muted)]">No hits at this DOF yet.</p>;
  return (
    <div className="overflow-x-auto">
      <table className="w-full text-sm" data-testid="hit-list">
        <thead className="text-left text-xs text-[var(--muted)]">
          <tr>
            <th className="py-1 pr-2 font-medium">#</th>
            <th className="pr-2 font-medium">Verdict · reasons</th>
            <th className="pr-2 text-right font-medium">Peak force</th>
            <th className="text-right font-medium">Pulse width</th>
          </tr>
        </thead>
        <tbody>
          {hits.map((h) => {
            const selected = h.id === selectedId;
            return (
              <tr
                key={h.id}
                data-hit={h.sequence}
                data-verdict={h.verdict}
                aria-selected={selected}
                onClick={() => onSelect(h.id)}
                className={`cursor-pointer border-t border-[var(--line)] align-top ${selected ? 'bg-accent-soft' : 'hover:bg-[var(--surface)]'}`}
              >
                <td className="num py-1.5 pr-2">
                  <button type="button" className="min-h-8 min-w-8 text-left underline-offset-2 hover:underline" onClick={() => onSelect(h.id)} aria-label={`Show hit ${h.sequence}`}>
                    {h.sequence}
                  </button>
                </td>
                <td className="py-1.5 pr-2" title={[...h.reasons.map((r) => r.message), h.overridden && h.overrideNote ? `note: ${h.overrideNote}` : ''].filter(Boolean).join('\n')}>
                  <VerdictBadge verdict={h.verdict} overridden={h.overridden} />
                  <div className="mt-0.5 text-xs text-[var(--muted)]">{h.reasons.length ? h.reasons.map((r) => shortReason[r.code] ?? r.code).join(', ') : 'checks passed'}</div>
                </td>
                <td className="num py-1.5 pr-2 text-right whitespace-nowrap">{h.metrics.peakForceN.toFixed(1)} N</td>
                <td className="num py-1.5 text-right whitespace-nowrap">{h.metrics.pulseWidthS === null ? '–' : `${(h.metrics.pulseWidthS * 1000).toFixed(2)} ms`}</td>
              </tr>
            );
          })}
        </tbody>
      </table>
    </div>
  );
}
