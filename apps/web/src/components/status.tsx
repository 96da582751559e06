// Status marks: every state has a colour AND a shape or icon, so nothing relies on colour alone.
import type { CampaignStatus, ScheduleStatus } from '@resonote/contracts';
import { statusLabels } from '@resonote/contracts';
import type { CalibrationStateName } from '../lib/campaign-data.ts';

/** Shape, plotly marker symbol and colour class of each schedule state (same shapes in the 3D view). */
export const scheduleLook: Record<ScheduleStatus, { label: string; glyph: string; symbol: string; cls: string; light: string; dark: string }> = {
  planned: { label: 'Planned', glyph: '○', symbol: 'circle-open', cls: 'text-[var(--muted)]', light: '#5b6664', dark: '#9aa6a4' },
  'in-progress': { label: 'In progress', glyph: '◆', symbol: 'diamond', cls: 'text-accent', light: '#0e6b67', dark: '#3fb3ac' },
  done: { label: 'Done', glyph: '●', symbol: 'circle', cls: 'text-ok', light: '#2f7d32', dark: '#5fb563' },
  flagged: { label: 'Flagged', glyph: '✕', symbol: 'x', cls: 'text-bad', light: '#b3261e', dark: '#e5675f' },
  skipped: { label: 'Skipped', glyph: '□', symbol: 'square-open', cls: 'text-warn', light: '#9a6700', dark: '#d19a2a' },
};

/**
 * The "worst" state first: a flagged entry needs attention most, then work under way, then work
 * not started; skipped and done are settled. A point shows the worst state of its entries.
 */
export const statusRank: ScheduleStatus[] = ['flagged', 'in-progress', 'planned', 'skipped', 'done'];
export function worstStatus(list: ScheduleStatus[]): ScheduleStatus | undefined {
  return statusRank.find((s) => list.includes(s));
}

export function ScheduleStatusBadge({ status }: { status: ScheduleStatus }) {
  const look = scheduleLook[status];
  return (
    <span className={`inline-flex items-center gap-1 whitespace-nowrap ${look.cls}`} data-status={status}>
      <span aria-hidden className="w-3 text-center">
        {look.glyph}
      </span>
      <span className="text-[var(--ink)]">{look.label}</span>
    </span>
  );
}

const campaignLook: Record<CampaignStatus, { glyph: string; cls: string }> = {
  planning: { glyph: '✎', cls: 'text-[var(--muted)]' },
  testing: { glyph: '▶', cls: 'text-accent' },
  analysis: { glyph: '◇', cls: 'text-warn' },
  'handed-over': { glyph: '✓', cls: 'text-ok' },
};

export function CampaignStatusBadge({ status }: { status: CampaignStatus }) {
  const look = campaignLook[status] ?? campaignLook.planning;
  return (
    <span className="inline-flex items-center gap-1.5 whitespace-nowrap">
      <span aria-hidden className={`${look.cls} w-3 text-center`}>
        {look.glyph}
      </span>
      {statusLabels[status] ?? status}
    </span>
  );
}

export function CalibrationBadge({ state, days }: { state: CalibrationStateName; days: number | null }) {
  const plural = (n: number) => `${n} day${n === 1 ? '' : 's'}`;
  const look = {
    ok: { glyph: '✓', cls: 'border-ok/50 text-ok', text: `Calibrated · ${plural(days ?? 0)} left` },
    'due-soon': { glyph: '!', cls: 'border-warn/60 text-warn', text: days === 0 ? 'Due today' : `Due soon · in ${plural(days ?? 0)}` },
    overdue: { glyph: '✕', cls: 'border-bad/60 text-bad', text: `Overdue · by ${plural(-(days ?? 0))}` },
    none: { glyph: '–', cls: 'border-[var(--line)] text-[var(--muted)]', text: 'No calibration record' },
  }[state];
  return (
    <span className={`inline-flex items-center gap-1.5 rounded-full border px-2 py-0.5 text-xs font-medium whitespace-nowrap ${look.cls}`} data-calibration={state}>
      <span aria-hidden className="font-bold">
        {look.glyph}
      </span>
      <span className="num">{look.text}</span>
    </span>
  );
}

/** Progress bar with the numbers beside it (the bar alone would be colour and length only). */
export function ProgressBar({ done, total }: { done: number; total: number }) {
  const pct = total ? Math.round((done / total) * 100) : 0;
  return (
    <div className="flex min-w-28 items-center gap-2">
      <div className="h-2 flex-1 overflow-hidden rounded-full bg-[var(--line)]" role="progressbar" aria-valuemin={0} aria-valuemax={total} aria-valuenow={done} aria-label="DOFs done">
        <div className="h-full rounded-full bg-ok" style={{ width: `${pct}%` }} />
      </div>
      <span className="num text-xs whitespace-nowrap text-[var(--muted)]">{total ? `${done}/${total}` : 'no schedule'}</span>
    </div>
  );
}
