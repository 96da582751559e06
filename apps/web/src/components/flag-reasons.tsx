// Why a DOF is flagged, in words with numbers and what to try (the API's `flagReasons`,
// packages/contracts/src/flag-reasons.ts). Shown on Tap, Review and Overview.
import type { FlagReason } from '@resonote/contracts';

export function FlagReasons({ reasons, compact = false }: { reasons: FlagReason[]; compact?: boolean }) {
  if (reasons.length === 0) return null;
  return (
    <ul className={`space-y-1 rounded-md border border-bad/40 bg-bad/5 px-3 py-1.5 ${compact ? 'text-xs' : 'text-sm'}`} data-testid="flag-reasons" aria-label="Why this DOF is flagged">
      {reasons.map((r) => (
        <li key={r.code} data-code={r.code}>
          <span className="font-semibold text-bad">Why flagged: </span>
          <span className="num">{r.message}.</span> <span className="text-[var(--muted)]">Try: {r.advice}</span>
        </li>
      ))}
    </ul>
  );
}
