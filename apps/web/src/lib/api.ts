// Fetch wrapper for the Resonote API: JSON in and out, cookies included, and the API's one error
// shape ({ error: { code, message, details } }) turned into an ApiError the screens can show.
import { errorBodySchema, HttpError } from '@resonote/contracts';

/** A failed call: the API's error class (packages/contracts, the one shape on both sides) with the Retry-After it was given. */
export class ApiError extends HttpError {
  constructor(
    status: number,
    code: string,
    message: string,
    details?: unknown,
    /** Seconds the server asked to wait before a retry (its Retry-After header), when it said. */
    readonly retryAfterS?: number,
  ) {
    super(status, code, message, details);
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
    const parsed = errorBodySchema.safeParse(data);
    const err = parsed.success ? parsed.data.error : undefined;
    throw new ApiError(response.status, err?.code ?? 'http-' + response.status, err?.message ?? `The server answered ${response.status}.`, err?.details, retryAfterSeconds(response.headers.get('retry-after')));
  }
  return data as T;
}
