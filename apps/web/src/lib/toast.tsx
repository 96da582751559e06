// Short confirmations and failures after an action, read out by screen readers.
import { createContext, useCallback, useContext, useMemo, useState, type ReactNode } from 'react';

type Tone = 'ok' | 'error' | 'info';
interface Toast {
  id: number;
  tone: Tone;
  text: string;
}
const ToastContext = createContext<(tone: Tone, text: string) => void>(() => undefined);

export function ToastProvider({ children }: { children: ReactNode }) {
  const [toasts, setToasts] = useState<Toast[]>([]);
  const push = useCallback((tone: Tone, text: string) => {
    const id = Date.now() + Math.random();
    setToasts((list) => [...list.slice(-3), { id, tone, text }]);
    setTimeout(() => setToasts((list) => list.filter((t) => t.id !== id)), tone === 'error' ? 8000 : 4500);
  }, []);
  const value = useMemo(() => push, [push]);
  return (
    <ToastContext.Provider value={value}>
      {children}
      <div aria-live="polite" className="pointer-events-none fixed right-4 bottom-4 z-50 flex max-w-sm flex-col gap-2" data-testid="toasts">
        {toasts.map((t) => (
          <div
            key={t.id}
            role={t.tone === 'error' ? 'alert' : 'status'}
            className={`pointer-events-auto flex items-start gap-2 rounded-md border bg-[var(--panel)] px-3 py-2 text-sm shadow-lg ${t.tone === 'error' ? 'border-bad/50 text-bad' : t.tone === 'ok' ? 'border-ok/50 text-ok' : 'border-[var(--line)]'}`}
          >
            <span aria-hidden className="font-bold">
              {t.tone === 'error' ? '✕' : t.tone === 'ok' ? '✓' : 'i'}
            </span>
            <span className="text-[var(--ink)]">{t.text}</span>
          </div>
        ))}
      </div>
    </ToastContext.Provider>
  );
}

export const useToast = () => useContext(ToastContext);
