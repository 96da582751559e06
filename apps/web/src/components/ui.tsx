// Small building blocks shared by every screen.
import type { ButtonHTMLAttributes, InputHTMLAttributes, ReactNode } from 'react';

export function Button({ variant = 'primary', className = '', ...props }: ButtonHTMLAttributes<HTMLButtonElement> & { variant?: 'primary' | 'secondary' | 'ghost' }) {
  const styles = {
    primary: 'bg-accent text-white hover:bg-accent-strong disabled:opacity-60',
    secondary: 'border border-[var(--line)] bg-[var(--panel)] text-[var(--ink)] hover:border-accent disabled:opacity-60',
    ghost: 'text-[var(--ink)] hover:bg-accent-soft disabled:opacity-60',
  }[variant];
  return <button className={`inline-flex min-h-10 items-center justify-center gap-2 rounded-md px-4 text-sm font-medium transition-colors focus-visible:outline-2 focus-visible:outline-offset-2 focus-visible:outline-accent ${styles} ${className}`} {...props} />;
}

export function Field({ label, hint, error, id, ...input }: InputHTMLAttributes<HTMLInputElement> & { label: string; hint?: string; error?: string; id: string }) {
  return (
    <div className="flex flex-col gap-1">
      <label htmlFor={id} className="text-sm font-medium">
        {label}
      </label>
      <input
        id={id}
        aria-invalid={error ? true : undefined}
        aria-describedby={hint || error ? `${id}-note` : undefined}
        className="min-h-10 rounded-md border border-[var(--line)] bg-[var(--panel)] px-3 text-sm outline-none focus:border-accent focus:ring-2 focus:ring-accent/30 aria-invalid:border-bad"
        {...input}
      />
      {(hint || error) && (
        <p id={`${id}-note`} className={`text-xs ${error ? 'text-bad' : 'text-[var(--muted)]'}`}>
          {error ?? hint}
        </p>
      )}
    </div>
  );
}

/** A message box; the icon repeats the meaning of the colour. */
export function Notice({ tone, children }: { tone: 'error' | 'ok' | 'info'; children: ReactNode }) {
  const look = {
    error: { icon: '✕', cls: 'border-bad/40 bg-bad/8 text-bad' },
    ok: { icon: '✓', cls: 'border-ok/40 bg-ok/8 text-ok' },
    info: { icon: 'i', cls: 'border-[var(--line)] bg-[var(--panel)] text-[var(--ink)]' },
  }[tone];
  return (
    <div role={tone === 'error' ? 'alert' : 'status'} className={`flex items-start gap-2 rounded-md border px-3 py-2 text-sm ${look.cls}`}>
      <span aria-hidden className="mt-px inline-flex h-5 w-5 shrink-0 items-center justify-center rounded-full border border-current text-[11px] font-bold">
        {look.icon}
      </span>
      <div>{children}</div>
    </div>
  );
}

/** `dense`: a thinner title bar and padding, for screens that must fit one window (Tap). */
export function Panel({ title, actions, children, dense = false }: { title?: ReactNode; actions?: ReactNode; children: ReactNode; dense?: boolean }) {
  return (
    <section className="rounded-lg border border-[var(--line)] bg-[var(--panel)]">
      {(title || actions) && (
        <header className={`flex items-center justify-between gap-3 border-b border-[var(--line)] ${dense ? 'px-3 py-1.5' : 'px-4 py-3'}`}>
          <h2 className="text-sm font-semibold">{title}</h2>
          {actions}
        </header>
      )}
      <div className={dense ? 'p-3' : 'p-4'}>{children}</div>
    </section>
  );
}

export function Spinner({ label }: { label: string }) {
  return (
    <div role="status" className="flex items-center gap-2 text-sm text-[var(--muted)]">
      <span aria-hidden className="h-4 w-4 animate-spin rounded-full border-2 border-[var(--line)] border-t-accent" />
      {label}
    </div>
  );
}
