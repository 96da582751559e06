// The banner of the Tap screen when the server cannot take hits: in words, above the plots (not a
// toast over them), with what happens to the hit being sent and when the next try goes out.
import { useEffect, useState } from 'react';
import type { Waiting } from '../../lib/retry.ts';
import type { ServerHealth } from '../../lib/server-health.ts';
import { Button } from '../ui.tsx';
import { formatWhen } from '../../lib/format-date.ts';

function useSecondsUntil(at: number | null): number | null {
  const [now, setNow] = useState(() => Date.now());
  useEffect(() => {
    if (at === null) return;
    setNow(Date.now());
    const t = setInterval(() => setNow(Date.now()), 500);
    return () => clearInterval(t);
  }, [at]);
  return at === null ? null : Math.max(0, Math.ceil((at - now) / 1000));
}

function clock(iso: string | null): string {
  const when = formatWhen(iso, 'time', { fallback: '' });
  return when ? ` since ${when}` : '';
}

export function ServerBanner({ waiting, health, onTryNow }: { waiting: Waiting | null; health: ServerHealth; onTryNow: () => void }) {
  const seconds = useSecondsUntil(waiting?.nextTryAt ?? null);
  if (!waiting && health.state === 'ok') return null;
  const unreachable = waiting ? waiting.reason === 'unreachable' : health.state === 'unreachable';
  const headline = unreachable ? 'The server cannot be reached.' : `The server cannot store hits right now: its database is not answering${health.state === 'unavailable' ? clock(health.since) : ''} (it may be restarting).`;
  return (
    <div role="alert" data-testid="server-banner" data-reason={unreachable ? 'unreachable' : 'unavailable'} className="flex flex-wrap items-center justify-between gap-3 rounded-lg border-2 border-warn/60 bg-warn/10 px-4 py-3 text-sm text-[var(--ink)]">
      <div className="space-y-1">
        <p className="font-semibold">{headline}</p>
        {waiting ? (
          <p data-testid="server-banner-retry">
            Your hit is kept and sent again automatically with the same key, so it is stored exactly once. Next try{' '}
            <span className="num">{seconds === 0 ? 'now' : `in ${seconds} s`}</span> (try <span className="num">{waiting.attempt + 1}</span>). Stay on this screen until it is stored.
          </p>
        ) : (
          <p>Hits you record now are kept and sent as soon as the server answers again. This message goes away by itself.</p>
        )}
      </div>
      {waiting && (
        <Button variant="secondary" onClick={onTryNow} className="min-h-11" data-testid="server-banner-try-now">
          Try now
        </Button>
      )}
    </div>
  );
}
