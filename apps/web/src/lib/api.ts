// Fetch wrapper for the Resonote API: JSON in and out, cookies included, and the API's one error
// shape ({ error: { code, message, details } }) turned into an ApiError the screens can show.
export class ApiError extends Error {
  constructor(
    readonly status: number,
    readonly code: string,
    message: string,
    readonly details?: unknown,
    /** Seconds the server asked to wait before a retry (its Retry-After header), when it said. */
    readonly retryAfterS?: number,
  ) {
    super(message);
  }
}

/** A Retry-After header in seconds (the HTTP-date form is not used by this API); undefined when absent or unreadable. */
export function retryAfterSeconds(header: string | null | undefined): number | undefined {
  if (!header) return undefined;
  const s = Number(header.trim());
  return Number.isFinite(s) && s >= 0 ? s : undefined;
}

export async function api<T>(path: string, init: { method?: string; body?: unknown; signal?: AbortSignal } = {}): Promise<T> {
  let response: Response;
  try {
    response = await fetch(`/api${path}`, {
      method: init.method ?? (init.body === undefined ? 'GET' : 'POST'),
      headers: init.body === undefined ? undefined : { 'content-type': 'application/json' },
      body: init.body === undefined ? undefined : JSON.stringify(init.body),
      credentials: 'same-origin',
      signal: init.signal,
    });
  } catch {
    throw new ApiError(0, 'offline', 'The server cannot be reached. Check the connection; nothing was saved.');
  }
  const text = await response.text();
  let data: unknown = undefined;
  if (text) {
    try {
      data = JSON.parse(text);
    } catch {
      data = undefined;
    }
  }
  if (!response.ok) {
    const err = (data as { error?: { code?: string; message?: string; details?: unknown } } | undefined)?.error;
    throw new ApiError(response.status, err?.code ?? 'http-' + response.status, err?.message ?? `The server answered ${response.status}.`, err?.details, retryAfterSeconds(response.headers.get('retry-after')));
  }
  return data as T;
}
