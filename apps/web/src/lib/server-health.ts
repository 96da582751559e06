// Whether the server and its database answer, for screens used at the structure (Tap): asks
// /api/health every 10 s, and every 3 s while something is wrong, so the screen can say so even
// when no hit is waiting.
import { useEffect, useState } from 'react';

export type ServerHealth =
  | { state: 'ok' }
  | { state: 'unreachable' }
  /** The server answers but its database does not (503), since `since` when it said. */
  | { state: 'unavailable'; since: string | null };

export async function checkHealth(signal?: AbortSignal): Promise<ServerHealth> {
  try {
    const res = await fetch('/api/health', { credentials: 'same-origin', signal, cache: 'no-store' });
    if (res.ok) return { state: 'ok' };
    if (res.status >= 500) {
      const body = (await res.json().catch(() => ({}))) as { database?: { since?: string | null } };
      return { state: 'unavailable', since: body.database?.since ?? null };
    }
    return { state: 'ok' };
  } catch (err) {
    if ((err as Error).name === 'AbortError') throw err;
    return { state: 'unreachable' };
  }
}

export function useServerHealth(): ServerHealth {
  const [health, setHealth] = useState<ServerHealth>({ state: 'ok' });
  useEffect(() => {
    const controller = new AbortController();
    let timer: ReturnType<typeof setTimeout> | undefined;
    const tick = async () => {
      try {
        const h = await checkHealth(controller.signal);
        setHealth((old) => (old.state === h.state && (h.state !== 'unavailable' || (old as { since: string | null }).since === h.since) ? old : h));
        timer = setTimeout(() => void tick(), h.state === 'ok' ? 10_000 : 3_000);
      } catch {
        /* aborted: the screen closed */
      }
    };
    void tick();
    return () => {
      controller.abort();
      clearTimeout(timer);
    };
  }, []);
  return health;
}
