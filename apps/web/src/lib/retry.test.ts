import { describe, expect, it } from 'vitest';
import { ApiError } from './api.ts';
import { isTransient, retryDelayMs, sendUntilStored, type Waiting } from './retry.ts';

describe('sending a hit until the server has it', () => {
  it('sends the same request again after no answer and after 503, and returns the first success', async () => {
    const failures = [new ApiError(0, 'offline', 'The upload did not reach the server.'), new ApiError(503, 'database-unavailable', 'The database cannot be reached.', undefined, 3)];
    const keysSent: string[] = [];
    const waits: Waiting[] = [];
    const pauses: number[] = [];
    const key = 'k-0001-same-key';
    const answer = await sendUntilStored(
      async () => {
        keysSent.push(key);
        const f = failures.shift();
        if (f) throw f;
        return { stored: 1 };
      },
      { onWaiting: (w) => waits.push(w), sleep: async (ms) => void pauses.push(ms), now: () => 1_000 },
    );
    expect(answer).toEqual({ stored: 1 });
    expect(keysSent).toEqual([key, key, key]);
    expect(waits.map((w) => [w.reason, w.attempt])).toEqual([
      ['unreachable', 1],
      ['unavailable', 2],
    ]);
    // 1 s after the first failure; after the second the server's Retry-After of 3 s outweighs 2 s.
    expect(pauses).toEqual([1000, 3000]);
    expect(waits[1]!.nextTryAt).toBe(4_000);
    expect(waits[1]!.message).toMatch(/database/);
  });

  it('stops at once on an answer that a retry cannot change (4xx, 500)', async () => {
    let tries = 0;
    const refused = new ApiError(422, 'no-hit', 'No complete hit in the recording.');
    await expect(
      sendUntilStored(async () => {
        tries++;
        throw refused;
      }, { sleep: async () => undefined }),
    ).rejects.toBe(refused);
    expect(tries).toBe(1);
    expect(isTransient(new ApiError(500, 'internal', 'x'))).toBe(false);
    expect(isTransient(new Error('plain'))).toBe(false);
    expect([0, 502, 503, 504].map((s) => isTransient(new ApiError(s, 'c', 'm')))).toEqual([true, true, true, true]);
  });

  it('doubles the pause from 1 s up to a ceiling of 15 s and never waits less than Retry-After (capped too)', () => {
    expect([1, 2, 3, 4, 5, 6, 10].map((a) => retryDelayMs(a))).toEqual([1000, 2000, 4000, 8000, 15000, 15000, 15000]);
    expect(retryDelayMs(1, 3)).toBe(3000);
    expect(retryDelayMs(4, 3)).toBe(8000);
    expect(retryDelayMs(1, 3600)).toBe(15000);
  });
});
