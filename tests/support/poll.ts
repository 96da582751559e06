// Waiting for a state the server reaches in its own time (a background job done, a mail sent, a
// process listening): read it again every `everyMs` until it is there, fail with `what` after
// `timeoutMs`. Polling a state, never sleeping for a guessed time and then asserting.

/** Resolves with the first truthy value `read` gives; throws `${what}: not within ${timeoutMs} ms` otherwise. */
export async function until<T>(what: string, read: () => Promise<T | undefined | null | false> | T | undefined | null | false, timeoutMs: number, everyMs = 100): Promise<T> {
  const end = Date.now() + timeoutMs;
  for (;;) {
    const v = await read();
    if (v) return v;
    if (Date.now() >= end) throw new Error(`${what}: not within ${timeoutMs} ms`);
    await new Promise((r) => setTimeout(r, everyMs));
  }
}
