// The usual cautions of impact testing (design.md "Safety"), always in view on Tap.
export function SafetyNote() {
  return (
    <aside aria-label="Safety" className="rounded-md border border-warn/50 bg-warn/8 px-3 py-2 text-xs" data-testid="safety-note">
      <p className="flex items-center gap-1.5 font-semibold text-warn">
        <span aria-hidden className="inline-flex h-4 w-4 items-center justify-center rounded-sm border border-current text-[10px]">!</span>
        Before you strike
      </p>
      <ul className="mt-1 list-disc space-y-0.5 pl-5 text-[var(--ink)]">
        <li>Secure the structure and the hammer; keep the hammer on its lanyard or in hand.</li>
        <li>Wear eye protection.</li>
        <li>Keep clear of rotating or energised machinery.</li>
        <li>Do not test a structure in service without the owner's procedures.</li>
      </ul>
      <p className="mt-1 text-[var(--muted)]">Any structural judgement drawn from these results follows local codes and licensed practice.</p>
    </aside>
  );
}
