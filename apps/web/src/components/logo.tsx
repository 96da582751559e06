export function Logo({ inverted = false }: { inverted?: boolean }) {
  return (
    <span className="inline-flex items-center gap-2 font-semibold tracking-tight">
      <svg aria-hidden viewBox="0 0 32 32" className="h-7 w-7">
        <rect width="32" height="32" rx="7" fill={inverted ? '#ffffff' : 'var(--color-accent)'} />
        <path d="M4 17h4l3-9 4 16 3-11 2 4h8" fill="none" stroke={inverted ? 'var(--color-accent)' : '#fff'} strokeWidth="2.4" strokeLinecap="round" strokeLinejoin="round" />
      </svg>
      <span className="text-lg">Resonote</span>
    </span>
  );
}
