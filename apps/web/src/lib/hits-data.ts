// Types and queries of the test day: hits, their traces, averaged FRFs, overlays and checks
// (apps/api/src/routes/hits.ts), and the live link that keeps every member's screen current.
import { useEffect, useState } from 'react';
import { useQuery, useQueryClient, type QueryClient } from '@tanstack/react-query';
import type { FlagReason, ScheduleStatus } from '@resonote/contracts';
import type { ChecksAnswer, EntryFrfAnswer, EntryHits, FrfJson, HitDetail, HitsAnswer, OverlayAnswer } from '@resonote/contracts';
import { api, ApiError, retryAfterSeconds } from './api.ts';
import type { FrfKind } from '@resonote/contracts';
import { keys, type ScheduleEntry } from './campaign-data.ts';
import { readNotice, refreshChecksAfter, type CampaignNotice } from './checks-refresh.ts';

// The answers' types come from the schemas the API declares on its routes (packages/contracts/src/hits.ts).
export type {
  Verdict,
  HitReason,
  HitMetrics,
  HitSummary,
  EntryHits,
  HitDetail,
  ComplexJson,
  HitsAnswer,
  OverlayFrf,
  OverlayAnswer,
  PeakDifference,
  DofPair,
  ChecksAnswer,
} from '@resonote/contracts';
/** An entry's averaged FRF: all channels from GET …/frf, the main one in a hit answer (`channelCount` says how many there are). */
export type FrfAnswer = FrfJson;
export type TraceChannel = HitDetail['channels'][number];

export interface CampaignListItem {
  id: string;
  name: string;
  myRole: string | null;
}

export const hitKeys = {
  next: (id: string) => ['campaign', id, 'schedule-next'] as const,
  entryHits: (id: string, entryId: string) => ['campaign', id, 'hits', entryId] as const,
  hit: (id: string, hitId: string) => ['campaign', id, 'hit', hitId] as const,
  frf: (id: string, entryId: string, kind: FrfKind) => ['campaign', id, 'frf', entryId, kind] as const,
  frfs: (id: string, entryIds: string[], kind: FrfKind) => ['campaign', id, 'frfs', kind, entryIds.join(',')] as const,
  checks: (id: string) => ['campaign', id, 'checks'] as const,
};

export const useNextEntry = (id: string, enabled = true) =>
  useQuery({ queryKey: hitKeys.next(id), queryFn: () => api<{ next: ScheduleEntry | null; remaining: number }>(`/campaigns/${id}/schedule/next`), enabled });

export const useEntryHits = (id: string, entryId: string | null | undefined) =>
  useQuery({ queryKey: hitKeys.entryHits(id, entryId ?? ''), queryFn: () => api<EntryHits>(`/campaigns/${id}/schedule/${entryId}/hits`), enabled: Boolean(entryId) });

/** One hit with its traces; maxPoints high enough that a 2 ms pulse keeps every sample. */
export const useHitDetail = (id: string, hitId: string | null | undefined) =>
  useQuery({ queryKey: hitKeys.hit(id, hitId ?? ''), queryFn: () => api<HitDetail>(`/campaigns/${id}/hits/${hitId}?maxPoints=40000`), enabled: Boolean(hitId), staleTime: 60_000 });

/** The averaged FRF of an entry; null (not an error) while it has no accepted hit. */
export const useEntryFrf = (id: string, entryId: string | null | undefined, kind: FrfKind) =>
  useQuery({
    queryKey: hitKeys.frf(id, entryId ?? '', kind),
    queryFn: async () => {
      const answer = await api<EntryFrfAnswer>(`/campaigns/${id}/schedule/${entryId}/frf?kind=${kind}`);
      return answer.status === 'no-accepted-hit' ? null : answer;
    },
    enabled: Boolean(entryId),
  });

/** The campaign's checks; `enabled` false while no screen shows them (they read every entry's result). */
export const useChecks = (id: string, enabled = true) => useQuery({ queryKey: hitKeys.checks(id), queryFn: () => api<ChecksAnswer>(`/campaigns/${id}/checks`), enabled });

export const useMyCampaigns = () => useQuery({ queryKey: ['campaigns', 'mine-for-overlay'], queryFn: () => api<{ campaigns: CampaignListItem[] }>('/campaigns') });

/** Overlay data; `receivedAt` (performance.now() once the JSON is parsed) starts the draw timer. */
export async function fetchOverlay(path: string): Promise<OverlayAnswer & { receivedAt: number }> {
  const answer = await api<OverlayAnswer>(path);
  return { ...answer, receivedAt: performance.now() };
}

/**
 * Hit versions ("id:version") whose answer this tab has applied already: the campaign event of the
 * same change (which carries them) then refreshes nothing a second time.
 */
const appliedHere = new Set<string>();
export function markApplied(hits: readonly { id: string; version: number }[]): void {
  for (const h of hits) appliedHere.add(`${h.id}:${h.version}`);
  // A bounded memory: the oldest go first (a Set keeps insertion order).
  while (appliedHere.size > 500) appliedHere.delete(appliedHere.values().next().value!);
}
/** True for the event of a change this tab made and applied (every hit it names is known here). */
function appliedAlready(data: string): boolean {
  try {
    const e = JSON.parse(data) as { hits?: string[] };
    return Array.isArray(e.hits) && e.hits.length > 0 && e.hits.every((h) => appliedHere.has(h));
  } catch {
    return false;
  }
}

/** Everything a hit or a verdict can change, for one campaign. */
const liveParts = new Set(['arming', 'schedule', 'schedule-next', 'hits', 'frf', 'frfs', 'checks', 'progress', 'noise-checks']);
export function invalidateTestData(client: QueryClient, campaignId: string, options: { checks?: boolean } = {}) {
  const withChecks = options.checks ?? true;
  return client.invalidateQueries({ predicate: (q) => q.queryKey[0] === 'campaign' && q.queryKey[1] === campaignId && liveParts.has(String(q.queryKey[2])) && (withChecks || q.queryKey[2] !== 'checks') });
}

/**
 * Follows the campaign's Server-Sent Events and refreshes what changed, so other members see a
 * hit within about 2 s; when the stream cannot be held, polls every 5 s instead.
 */
export function useLiveCampaign(campaignId: string): 'live' | 'polling' | 'connecting' {
  const client = useQueryClient();
  const [state, setState] = useState<'live' | 'polling' | 'connecting'>('connecting');
  useEffect(() => {
    let source: EventSource | null = null;
    let poll: ReturnType<typeof setInterval> | undefined;
    let debounce: ReturnType<typeof setTimeout> | undefined;
    const notices: CampaignNotice[] = [];
    let applying: Promise<void> = Promise.resolve();
    const startPolling = () => {
      setState('polling');
      if (!poll) poll = setInterval(() => void invalidateTestData(client, campaignId), 5000);
    };
    if (typeof EventSource === 'undefined') {
      startPolling();
    } else {
      source = new EventSource(`/api/campaigns/${campaignId}/events`);
      source.onopen = () => {
        setState('live');
        if (poll) {
          clearInterval(poll);
          poll = undefined;
        }
      };
      source.addEventListener('change', (event) => {
        const data = (event as MessageEvent<string>).data;
        // This tab's own hit or verdict: its answer was applied and refreshed the data once already.
        if (appliedAlready(data)) return;
        notices.push(readNotice(data) ?? { type: 'schedule' });
        // Several hits of one recording arrive together: refresh once. The checks only when these
        // notices can have changed them (lib/checks-refresh.ts), one window after the other.
        clearTimeout(debounce);
        debounce = setTimeout(() => {
          const batch = notices.splice(0);
          applying = applying
            .then(() => refreshChecksAfter(client, { schedule: keys.schedule(campaignId), checks: hitKeys.checks(campaignId) }, batch, () => invalidateTestData(client, campaignId, { checks: false })))
            .catch(() => undefined);
        }, 250);
      });
      source.onerror = () => {
        // The browser reconnects by itself while readyState is CONNECTING; poll meanwhile.
        startPolling();
      };
    }
    return () => {
      source?.close();
      clearInterval(poll);
      clearTimeout(debounce);
    };
  }, [client, campaignId]);
  return state;
}

/** A fresh key per attempt (reused on retry). crypto.randomUUID needs a secure context; a tablet on plain http may lack it. */
export function newIdempotencyKey(): string {
  if (typeof crypto.randomUUID === 'function') return crypto.randomUUID();
  const b = crypto.getRandomValues(new Uint8Array(16));
  b[6] = (b[6]! & 0x0f) | 0x40;
  b[8] = (b[8]! & 0x3f) | 0x80;
  const h = Array.from(b, (x) => x.toString(16).padStart(2, '0')).join('');
  return `${h.slice(0, 8)}-${h.slice(8, 12)}-${h.slice(12, 16)}-${h.slice(16, 20)}-${h.slice(20)}`;
}

/**
 * Uploads a recording with XMLHttpRequest, which (unlike fetch) reports upload progress.
 * Errors come back as ApiError with the API's own message.
 */
export function uploadRecording<T = HitsAnswer>(path: string, form: FormData, key: string, onProgress: (fraction: number) => void): Promise<T> {
  return new Promise((resolve, reject) => {
    const xhr = new XMLHttpRequest();
    xhr.open('POST', `/api${path}`);
    xhr.withCredentials = true;
    xhr.setRequestHeader('Idempotency-Key', key);
    xhr.upload.onprogress = (e) => {
      if (e.lengthComputable) onProgress(e.loaded / e.total);
    };
    xhr.onerror = () => reject(new ApiError(0, 'offline', 'The upload did not reach the server. Check the connection and try again; a retry never stores the hits twice.'));
    xhr.onload = () => {
      let data: unknown;
      try {
        data = xhr.responseText ? JSON.parse(xhr.responseText) : undefined;
      } catch {
        data = undefined;
      }
      if (xhr.status >= 200 && xhr.status < 300) return resolve(data as T);
      const err = (data as { error?: { code?: string; message?: string } } | undefined)?.error;
      reject(new ApiError(xhr.status, err?.code ?? `http-${xhr.status}`, err?.message ?? `The server answered ${xhr.status}.`, undefined, retryAfterSeconds(xhr.getResponseHeader('retry-after'))));
    };
    xhr.send(form);
  });
}
