// Short confirmations and failures after an action, read out by screen readers. They have a place
// of their own: a message bar along the bottom of the window whose height the page always keeps
// free (`--toast-bar` in index.css pads the body), so a message never covers a plot or a button —
// before, toasts stacked over Tap's plots and Reject on a tablet and over Modes' stabilization
// diagram. The newest message shows; the others wait behind it with a count.
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
  const latest = toasts[toasts.length - 1];
  const earlier = toasts.slice(0, -1);
  return (
    <ToastContext.Provider value={value}>
      {children}
      <div
        aria-live="polite"
        className="fixed inset-x-0 bottom-0 z-50 flex h-[var(--toast-bar)] items-center border-t border-[var(--line)] bg-[var(--panel)] px-4"
        data-testid="toast-bar"
      >
        <div className="mx-auto flex w-full max-w-7xl items-center gap-2" data-testid="toasts">
          {latest ? (
            <div
              key={latest.id}
              role={latest.tone === 'error' ? 'alert' : 'status'}
              data-testid="toast"
              className={`flex min-w-0 flex-1 items-center gap-2 text-sm ${latest.tone === 'error' ? 'text-bad' : latest.tone === 'ok' ? 'text-ok' : ''}`}
            >
              <span aria-hidden className="font-bold">
                {latest.tone === 'error' ? '✕' : latest.tone === 'ok' ? '✓' : 'i'}
              </span>
              <span className="line-clamp-2 leading-tight text-[var(--ink)]" title={latest.text}>
                {latest.text}
              </span>
            </div>
          ) : (
            <span className="text-xs text-[var(--muted)]">Messages about your actions appear here.</span>
          )}
          {earlier.length > 0 && (
            <span className="num shrink-0 text-xs text-[var(--muted)]" title={earlier.map((t) => t.text).join('\n')}>
              +{earlier.length} earlier
            </span>
          )}
        </div>
      </div>
    </ToastContext.Provider>
  );
}

export const useToast = () => useContext(ToastContext);
