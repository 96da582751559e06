// The current DOF in large type, readable at arm's length with a hammer in the other hand.
import type { ReactNode } from 'react';
import type { ScheduleEntry } from '../../lib/campaign-data.ts';
import { ScheduleStatusBadge } from '../status.tsx';

/** `aside`: shown at the end of the good-hits row (Tap puts the jump to another DOF there). */
export function DofHeader({ entry, accepted, required, index, total, aside }: { entry: ScheduleEntry; accepted: number; required: number; index: number; total: number; aside?: ReactNode }) {
  const pct = Math.min(100, Math.round((accepted / Math.max(1, required)) * 100));
  return (
    <div className="min-w-0 space-y-1.5">
      <p className="flex flex-wrap items-center gap-x-3 gap-y-1 text-xs text-[var(--muted)]">
        <span className="num">
          Entry {index} of {total}
        </span>
        <ScheduleStatusBadge status={entry.status} />
        {entry.drivingPoint && (
          <span className="inline-flex items-center gap-1 rounded-full border border-accent/50 px-2 py-0.5 font-medium text-accent-strong" data-testid="driving-point">
            <span aria-hidden>◎</span> Driving point
          </span>
        )}
      </p>
      <h2 className="text-2xl leading-tight font-semibold xl:text-3xl" data-testid="current-dof">
        Hammer at{' '}
        <span className="num text-accent-strong">
          {entry.excitationLabel} {entry.excitationDirection}
        </span>
        <span className="text-[var(--muted)]"> · </span>
        <span className="whitespace-nowrap">
          accelerometer{' '}
          <span className="num text-accent-strong">
            {entry.responseLabel} {entry.responseDirection}
          </span>
        </span>
      </h2>
      <div className="flex flex-wrap items-center gap-x-3 gap-y-1">
        <div className="h-3 w-48 max-w-full overflow-hidden rounded-full bg-[var(--line)]" role="progressbar" aria-label="Good hits at this DOF" aria-valuemin={0} aria-valuemax={required} aria-valuenow={accepted}>
          <div className={`h-full rounded-full ${accepted >= required ? 'bg-ok' : 'bg-accent'}`} style={{ width: `${pct}%` }} />
        </div>
        <p className="num text-lg font-semibold" data-testid="good-hits">
          {accepted} of {required} good hits
          {accepted >= required && <span className="ml-2 text-ok">✓ enough</span>}
        </p>
        {aside && <div className="ml-auto">{aside}</div>}
      </div>
    </div>
  );
}
