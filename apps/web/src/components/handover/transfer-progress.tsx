// Progress of one download or upload: a bar with the bytes beside it, or an indeterminate bar
// when the size is not known (the words say so too, so the bar is never the only sign).
import { formatBytes, type Progress } from '../../lib/transfer.ts';

export function TransferProgress({ progress, label }: { progress: Progress; label: string }) {
  const pct = progress.total ? Math.min(100, Math.round((progress.loaded / progress.total) * 100)) : null;
  return (
    <div className="space-y-1" data-testid="transfer-progress">
      <div className="flex justify-between gap-2 text-xs">
        <span>{label}</span>
        <span className="num text-[var(--muted)]">{pct === null ? `${formatBytes(progress.loaded)} so far` : `${formatBytes(progress.loaded)} of ${formatBytes(progress.total!)} · ${pct} %`}</span>
      </div>
      <div
        className="relative h-2 overflow-hidden rounded-full bg-[var(--line)]"
        role="progressbar"
        aria-label={label}
        aria-valuemin={0}
        aria-valuemax={100}
        aria-valuenow={pct ?? undefined}
        aria-valuetext={pct === null ? `${formatBytes(progress.loaded)} received, size unknown` : `${pct} %`}
      >
        {pct === null ? <div className="absolute inset-y-0 left-0 w-1/3 animate-pulse rounded-full bg-accent" /> : <div className="h-full rounded-full bg-accent" style={{ width: `${pct}%` }} />}
      </div>
    </div>
  );
}
