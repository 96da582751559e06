// The verdict of a hit: colour AND icon AND words, never colour alone.
import type { HitReason, HitSummary, Verdict } from '../../lib/hits-data.ts';

const look: Record<Verdict, { glyph: string; text: string; cls: string }> = {
  accept: { glyph: '✓', text: 'Accepted', cls: 'text-ok border-ok/50 bg-ok/8' },
  reject: { glyph: '✕', text: 'Rejected', cls: 'text-bad border-bad/50 bg-bad/8' },
};

export function VerdictBadge({ verdict, overridden, large = false }: { verdict: Verdict; overridden?: boolean; large?: boolean }) {
  const l = look[verdict];
  return (
    <span className={`inline-flex items-center gap-1.5 rounded-full border whitespace-nowrap ${l.cls} ${large ? 'px-3 py-1 text-base font-semibold' : 'px-2 py-0.5 text-xs font-medium'}`} data-verdict={verdict}>
      <span aria-hidden className="font-bold">
        {l.glyph}
      </span>
      {l.text}
      {overridden && <span className="font-normal text-[var(--muted)]">· by hand</span>}
    </span>
  );
}

/** Reasons in plain words; an accepted hit with no reason says so. */
export function ReasonList({ hit, compact = false }: { hit: Pick<HitSummary, 'verdict' | 'reasons' | 'overridden' | 'overrideNote' | 'autoVerdict'>; compact?: boolean }) {
  const reasons: HitReason[] = hit.reasons ?? [];
  return (
    <div className={compact ? 'text-xs' : 'text-sm'}>
      {reasons.length === 0 ? (
        <p className="text-[var(--muted)]">All checks passed: no double hit, no overload, strong enough, force spectrum holds up across the band.</p>
      ) : (
        <ul className="space-y-0.5">
          {reasons.map((r) => (
            <li key={r.code + r.message} className="flex gap-1.5">
              <span aria-hidden className={hit.autoVerdict === 'reject' ? 'text-bad' : 'text-warn'}>
                {hit.autoVerdict === 'reject' ? '✕' : '!'}
              </span>
              <span>{r.message}</span>
            </li>
          ))}
        </ul>
      )}
      {hit.overridden && (
        <p className="mt-1 text-[var(--muted)]">
          Automatic verdict was {hit.autoVerdict === 'accept' ? 'accept' : 'reject'}; changed by hand{hit.overrideNote ? `: “${hit.overrideNote}”` : ''}.
        </p>
      )}
    </div>
  );
}
