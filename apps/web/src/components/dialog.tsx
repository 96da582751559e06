// A modal question: a title, what it is about, and the buttons. Escape or the backdrop answers
// "cancel"; focus goes to the first button.
import { useEffect, useId, useRef, type ReactNode } from 'react';

export function Dialog({ title, children, actions, onCancel, testId }: { title: string; children: ReactNode; actions: ReactNode; onCancel: () => void; testId?: string }) {
  const id = useId();
  const box = useRef<HTMLDivElement>(null);
  useEffect(() => {
    const focusable = box.current?.querySelector<HTMLElement>('textarea, input, button');
    focusable?.focus();
    const onKey = (e: KeyboardEvent) => {
      if (e.key === 'Escape') onCancel();
    };
    window.addEventListener('keydown', onKey);
    return () => window.removeEventListener('keydown', onKey);
  }, [onCancel]);
  return (
    <div className="fixed inset-0 z-40 flex items-center justify-center bg-black/40 p-4" onMouseDown={(e) => e.target === e.currentTarget && onCancel()}>
      <div ref={box} role="dialog" aria-modal="true" aria-labelledby={id} className="w-full max-w-md space-y-3 rounded-lg border border-[var(--line)] bg-[var(--panel)] p-5 shadow-xl" data-testid={testId}>
        <h2 id={id} className="text-lg font-semibold">
          {title}
        </h2>
        <div className="space-y-2 text-sm">{children}</div>
        <div className="flex flex-wrap justify-end gap-2">{actions}</div>
      </div>
    </div>
  );
}
