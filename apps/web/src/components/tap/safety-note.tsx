// The usual cautions of impact testing (design.md "Safety") on Tap. Shown in full until the user
// has read them once (remembered per user), then kept as a one-line caution header that opens
// again with one tap — never hidden.
import { useRememberedFlag } from '../../lib/remembered.ts';

const cautions = [
  'Secure the structure and the hammer; keep the hammer on its lanyard or in hand.',
  'Wear eye protection.',
  'Keep clear of rotating or energised machinery.',
  "Do not test a structure in service without the owner's procedures.",
];

export function SafetyNote() {
  const [read, setRead] = useRememberedFlag('tap-safety-read', false);
  const [open, setOpen] = useRememberedFlag('tap-safety-open', true);
  const expanded = !read || open;
  const mark = (
    <span aria-hidden className="inline-flex h-4 w-4 shrink-0 items-center justify-center rounded-sm border border-current text-[10px]">
      !
    </span>
  );
  if (!expanded) {
    return (
      <aside aria-label="Safety" className="rounded-md border border-warn/50 bg-warn/8 text-xs" data-testid="safety-note" data-expanded="false">
        <button type="button" aria-expanded={false} onClick={() => setOpen(true)} className="flex min-h-9 w-full items-center gap-1.5 px-3 text-left">
          <span className="flex shrink-0 items-center gap-1.5 font-semibold text-warn">
            {mark} Before you strike:
          </span>
          <span className="min-w-0 truncate text-[var(--ink)]">secure the structure and hammer, eye protection, clear of moving or energised machinery.</span>
          <span className="ml-auto shrink-0 text-accent">All cautions</span>
        </button>
      </aside>
    );
  }
  return (
    <aside aria-label="Safety" className="rounded-md border border-warn/50 bg-warn/8 px-3 py-2 text-xs" data-testid="safety-note" data-expanded="true">
      <p className="flex items-center gap-1.5 font-semibold text-warn">
        {mark}
        Before you strike
      </p>
      <ul className="mt-1 list-disc space-y-0.5 pl-5 text-[var(--ink)]">
        {cautions.map((c) => (
          <li key={c}>{c}</li>
        ))}
      </ul>
      <div className="mt-1 flex flex-wrap items-center justify-between gap-2">
        <p className="text-[var(--muted)]">Any structural judgement drawn from these results follows local codes and licensed practice.</p>
        <button
          type="button"
          className="min-h-9 rounded-md border border-warn/60 px-3 font-semibold text-warn hover:bg-warn/10"
          data-testid="safety-fold"
          onClick={() => {
            setRead(true);
            setOpen(false);
          }}
        >
          {read ? 'Fold to one line' : 'Read — fold to one line'}
        </button>
      </div>
    </aside>
  );
}
