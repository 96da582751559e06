// The chosen hit's verdict with its reasons, and the large Accept / Reject buttons that override
// the automatic verdict with a note. Shortcuts A and R are printed on the buttons.
import { useEffect, useState } from 'react';
import type { HitSummary } from '../../lib/hits-data.ts';
import { Button } from '../ui.tsx';
import { Kbd } from './strike-panel.tsx';
import { ReasonList, VerdictBadge } from './verdict.tsx';

export function noteFor(verdict: 'accept' | 'reject') {
  return verdict === 'accept' ? 'accepted by hand at the structure' : 'rejected by hand at the structure';
}

export function VerdictPanel({ hit, canAct, busy, onOverride }: { hit: HitSummary | null; canAct: boolean; busy: boolean; onOverride: (verdict: 'accept' | 'reject', note: string) => void }) {
  const [note, setNote] = useState('');
  useEffect(() => setNote(''), [hit?.id]);
  if (!hit) return <p className="text-sm text-[var(--muted)]">No hit at this DOF yet. Each hit is checked at once for a double hit, overload, a weak hit and the force spectrum's roll-off; its verdict and reasons appear here.</p>;
  const act = (verdict: 'accept' | 'reject') => onOverride(verdict, note.trim().length >= 3 ? note.trim() : noteFor(verdict));
  return (
    <div className="space-y-3" data-testid="verdict-panel" data-hit={hit.sequence}>
      <div className="flex flex-wrap items-center gap-2">
        <span className="num text-lg font-semibold">Hit {hit.sequence}</span>
        <VerdictBadge verdict={hit.verdict} overridden={hit.overridden} large />
        <span className="num text-sm text-[var(--muted)]">
          {hit.metrics.peakForceN.toFixed(1)} N · {hit.metrics.pulseWidthS === null ? '–' : `${(hit.metrics.pulseWidthS * 1000).toFixed(2)} ms`}
        </span>
      </div>
      <ReasonList hit={hit} />
      {canAct && (
        <>
          <div className="grid grid-cols-2 gap-2">
            <Button onClick={() => act('accept')} disabled={busy} className="min-h-16 !bg-ok text-lg hover:!bg-ok/90" data-testid="accept">
              <span aria-hidden>✓</span> Accept <Kbd>A</Kbd>
            </Button>
            <Button onClick={() => act('reject')} disabled={busy} className="min-h-16 !bg-bad text-lg hover:!bg-bad/90" data-testid="reject">
              <span aria-hidden>✕</span> Reject <Kbd>R</Kbd>
            </Button>
          </div>
          {/* The note is folded to one line so Accept / Reject stay on Tap's one screen. */}
          <details className="text-xs">
            <summary className="cursor-pointer text-[var(--muted)]">Note with a change by hand (optional)</summary>
            <label className="mt-1 flex flex-col gap-1 font-medium">
              <span className="sr-only">Note with a change by hand</span>
              <input
                value={note}
                onChange={(e) => setNote(e.target.value)}
                placeholder={hit.verdict === 'accept' ? noteFor('reject') : noteFor('accept')}
                className="min-h-10 rounded-md border border-[var(--line)] bg-[var(--panel)] px-3 text-sm font-normal"
              />
            </label>
          </details>
        </>
      )}
    </div>
  );
}
