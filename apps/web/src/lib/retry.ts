// Sending a hit until the server has it. A hit is sent with one Idempotency-Key; while the server
// cannot be reached (no answer) or answers that it cannot serve now (502/503/504, e.g. its database
// restarting), the same request with the same key goes again after a growing pause, so the hit is
// stored exactly once however many tries it takes. Any other answer ends the tries.
import { ApiError } from './api.ts';

/** What the engineer is told while a hit waits for the server. */
export interface Waiting {
  /** 'unreachable': no answer at all; 'unavailable': the server answered 502/503/504. */
  reason: 'unreachable' | 'unavailable';
  /** The server's own words, when it answered. */
  message: string;
  /** Tries so far (1 after the first failure). */
  attempt: number;
  /** When the next try goes out (ms since the epoch). */
  nextTryAt: number;
}

export const FIRST_DELAY_MS = 1000;
export const MAX_DELAY_MS = 15_000;

/** True for a failure after which the same request may simply be sent again. */
export function isTransient(err: unknown): err is ApiError {
  return err instanceof ApiError && (err.status === 0 || err.status === 502 || err.status === 503 || err.status === 504);
}

/**
 * The pause before try `attempt + 1`: 1 s doubling to at most 15 s, never shorter than the
 * server's Retry-After (itself capped at 15 s so a wrong header cannot park a hit for long).
 */
export function retryDelayMs(attempt: number, retryAfterS?: number): number {
  const backoff = Math.min(MAX_DELAY_MS, FIRST_DELAY_MS * 2 ** Math.max(0, attempt - 1));
  const asked = retryAfterS === undefined ? 0 : Math.min(MAX_DELAY_MS, retryAfterS * 1000);
  return Math.max(backoff, asked);
}

export interface RetryOptions {
  /** Called before each pause, so the screen can say what is happening. */
  onWaiting?: (w: Waiting) => void;
  /** Resolves after `ms` or earlier (e.g. "Try now"); tests pass their own. */
  sleep?: (ms: number) => Promise<void>;
  now?: () => number;
}

/** Runs `send` until it succeeds or fails for a reason other than a transient one. */
export async function sendUntilStored<T>(send: () => Promise<T>, options: RetryOptions = {}): Promise<T> {
  const sleep = options.sleep ?? ((ms: number) => new Promise<void>((r) => setTimeout(r, ms)));
  const now = options.now ?? Date.now;
  for (let attempt = 1; ; attempt++) {
    try {
      return await send();
    } catch (err) {
      if (!isTransient(err)) throw err;
      const delay = retryDelayMs(attempt, err.retryAfterS);
      options.onWaiting?.({ reason: err.status === 0 ? 'unreachable' : 'unavailable', message: err.message, attempt, nextTryAt: now() + delay });
      await sleep(delay);
    }
  }
}
