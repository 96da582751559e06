// The few API calls the bridge makes, all with the personal API token as a bearer token.
import type { AcquisitionSettings } from '@resonote/contracts';

export class ApiError extends Error {
  constructor(
    readonly status: number,
    readonly code: string,
    message: string,
  ) {
    super(message);
  }
}

export interface ScheduleEntry {
  id: string;
  responseDof: string;
  excitationDof: string;
  status: string;
}

export interface HitVerdict {
  sequence: number;
  verdict: 'accept' | 'reject';
  reasons: { code: string; message: string }[];
}

export interface UploadAnswer {
  replayed: boolean;
  hits: HitVerdict[];
  skipped: { timeS: number; reason: string }[];
  entry: { id: string; status: string; acceptedHits: number; totalHits: number };
  resampled?: { fromHz: number; toHz: number };
}

export class BridgeClient {
  constructor(
    private readonly baseUrl: string,
    private readonly token: string,
  ) {}

  private async call<T>(method: string, path: string, init: { body?: FormData; headers?: Record<string, string> } = {}): Promise<T> {
    const res = await fetch(`${this.baseUrl}/api${path}`, { method, body: init.body, headers: { authorization: `Bearer ${this.token}`, ...(init.headers ?? {}) } });
    const text = await res.text();
    let json: unknown = null;
    try {
      json = text ? JSON.parse(text) : null;
    } catch {
      // not JSON: reported below with the status
    }
    if (!res.ok) {
      const err = (json as { error?: { code?: string; message?: string } } | null)?.error;
      throw new ApiError(res.status, err?.code ?? 'http-error', err?.message ?? `HTTP ${res.status} from ${path}`);
    }
    return json as T;
  }

  whoAmI() {
    return this.call<{ token: { id: string; name: string; role: string }; campaign: { id: string; name: string }; user: { name: string; email: string } }>('GET', '/tokens/current');
  }
  settings(campaignId: string) {
    return this.call<{ current: { settings: AcquisitionSettings } }>('GET', `/campaigns/${campaignId}/settings`);
  }
  schedule(campaignId: string) {
    return this.call<{ entries: ScheduleEntry[] }>('GET', `/campaigns/${campaignId}/schedule`);
  }
  arming(campaignId: string) {
    return this.call<{ mine: { entryId: string; responseDof: string; excitationDof: string } | null }>('GET', `/campaigns/${campaignId}/arming`);
  }
  upload(campaignId: string, entryId: string, file: { name: string; bytes: Buffer }, fields: Record<string, string>, idempotencyKey: string) {
    const form = new FormData();
    for (const [k, v] of Object.entries(fields)) form.set(k, v);
    form.set('file', new Blob([new Uint8Array(file.bytes)]), file.name);
    return this.call<UploadAnswer>('POST', `/campaigns/${campaignId}/schedule/${entryId}/hits`, { body: form, headers: { 'idempotency-key': idempotencyKey } });
  }
}
