// Form controls beyond ui.tsx: select, text area, a number field with its unit, toggle chips.
import type { InputHTMLAttributes, ReactNode, SelectHTMLAttributes } from 'react';

const control = 'min-h-10 rounded-md border border-[var(--line)] bg-[var(--panel)] px-3 text-sm outline-none focus:border-accent focus:ring-2 focus:ring-accent/30 aria-invalid:border-bad';

function Note({ id, hint, error }: { id: string; hint?: ReactNode; error?: string }) {
  if (!hint && !error) return null;
  return (
    <p id={`${id}-note`} className={`text-xs ${error ? 'text-bad' : 'text-[var(--muted)]'}`}>
      {error ?? hint}
    </p>
  );
}

export function Select({ id, label, options, hint, error, ...rest }: SelectHTMLAttributes<HTMLSelectElement> & { id: string; label: string; options: [string, string][]; hint?: ReactNode; error?: string }) {
  return (
    <div className="flex flex-col gap-1">
      <label htmlFor={id} className="text-sm font-medium">
        {label}
      </label>
      <select id={id} className={control} aria-invalid={error ? true : undefined} aria-describedby={hint || error ? `${id}-note` : undefined} {...rest}>
        {options.map(([value, text]) => (
          <option key={value} value={value}>
            {text}
          </option>
        ))}
      </select>
      <Note id={id} hint={hint} error={error} />
    </div>
  );
}

/** A number with its unit written beside the box (never only in the label). */
export function NumberField({ id, label, unit, hint, error, ...rest }: InputHTMLAttributes<HTMLInputElement> & { id: string; label: string; unit?: string; hint?: ReactNode; error?: string }) {
  return (
    <div className="flex flex-col gap-1">
      <label htmlFor={id} className="text-sm font-medium">
        {label}
      </label>
      <div className="flex items-center gap-2">
        <input id={id} inputMode="decimal" className={`${control} num w-full min-w-0`} aria-invalid={error ? true : undefined} aria-describedby={hint || error ? `${id}-note` : undefined} {...rest} />
        {unit && <span className="num w-16 shrink-0 text-xs text-[var(--muted)]">{unit}</span>}
      </div>
      <Note id={id} hint={hint} error={error} />
    </div>
  );
}

export function TextArea({ id, label, hint, error, ...rest }: InputHTMLAttributes<HTMLTextAreaElement> & { id: string; label: string; hint?: ReactNode; error?: string }) {
  return (
    <div className="flex flex-col gap-1">
      <label htmlFor={id} className="text-sm font-medium">
        {label}
      </label>
      <textarea id={id} rows={2} className={`${control} py-2`} aria-invalid={error ? true : undefined} {...(rest as object)} />
      <Note id={id} hint={hint} error={error} />
    </div>
  );
}

/** Toggle chips for a set of values (directions, axes). Read-only chips when onToggle is absent. */
export function Chips<T extends string>({ all, value, onToggle, label, disabled }: { all: readonly T[]; value: readonly T[]; onToggle?: (v: T) => void; label: string; disabled?: boolean }) {
  return (
    <div role="group" aria-label={label} className="flex flex-wrap gap-1">
      {all.map((v) => {
        const on = value.includes(v);
        const cls = `num inline-flex min-h-8 min-w-9 items-center justify-center rounded-md border px-1.5 text-xs ${on ? 'border-accent bg-accent-soft font-semibold text-accent-strong' : 'border-[var(--line)] text-[var(--muted)]'}`;
        if (!onToggle) return on ? <span key={v} className={cls}>{v}</span> : null;
        return (
          <button key={v} type="button" aria-pressed={on} disabled={disabled} onClick={() => onToggle(v)} className={`${cls} hover:border-accent disabled:opacity-50`}>
            {v}
          </button>
        );
      })}
    </div>
  );
}
