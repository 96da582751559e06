// A panel of Tap that folds away to its title line; folded or not is remembered per user.
import { useId, type ReactNode } from 'react';
import { useRememberedFlag } from '../../lib/remembered.ts';

export function FoldPanel({ name, title, summary, children, defaultOpen = false }: { name: string; title: ReactNode; summary?: ReactNode; children: ReactNode; defaultOpen?: boolean }) {
  const [open, setOpen] = useRememberedFlag(`tap-fold:${name}`, defaultOpen);
  const id = useId();
  return (
    <section className="rounded-lg border border-[var(--line)] bg-[var(--panel)]" data-testid={`fold-${name}`} data-open={open}>
      <button type="button" aria-expanded={open} aria-controls={id} onClick={() => setOpen(!open)} className="flex min-h-11 w-full items-center gap-2 px-4 py-2 text-left text-sm">
        <span aria-hidden className="num w-3 text-[var(--muted)]">
          {open ? '▾' : '▸'}
        </span>
        <span className="font-semibold">{title}</span>
        {summary && <span className="min-w-0 truncate text-xs text-[var(--muted)]">{summary}</span>}
        <span className="ml-auto shrink-0 text-xs text-accent">{open ? 'Fold away' : 'Show'}</span>
      </button>
      {open && (
        <div id={id} className="border-t border-[var(--line)] p-4">
          {children}
        </div>
      )}
    </section>
  );
}
