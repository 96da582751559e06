// The hits a redo of the DOF set aside: kept and listed, not counted — who, when and why.
import type { HitSummary } from '../../lib/hits-data.ts';

export function SetAsideNote({ hits }: { hits: HitSummary[] }) {
  const groups = new Map<string, { by: string | null; reason: string; at: string; sequences: number[] }>();
  for (const h of hits) {
    if (!h.setAside) continue;
    const g = groups.get(h.setAside.redoId) ?? { by: h.setAside.by, reason: h.setAside.reason, at: h.setAside.at, sequences: [] };
    g.sequences.push(h.sequence);
    groups.set(h.setAside.redoId, g);
  }
  if (groups.size === 0) return null;
  return (
    <ul className="space-y-0.5 text-xs text-[var(--muted)]" data-testid="set-aside">
      {[...groups.values()].map((g) => (
        <li key={g.at + g.sequences[0]}>
          <span className="num">
            {g.sequences.length === 1 ? `Hit ${g.sequences[0]}` : `Hits ${g.sequences.join(', ')}`}
          </span>{' '}
          set aside by a redo{g.by ? ` (${g.by}` : ' ('}
          {g.by ? ', ' : ''}
          {new Date(g.at).toLocaleString()}): “{g.reason}”. Kept, not counted.
        </li>
      ))}
    </ul>
  );
}
