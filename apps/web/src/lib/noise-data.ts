// Background-noise checks (apps/api/src/routes/noise.ts): the readings of quiet recordings taken
// before or between hits, and the query that keeps the newest one on Tap.
import { useQuery } from '@tanstack/react-query';
import type { NoiseChannelReading } from '@resonote/contracts';
import { api } from './api.ts';

export type NoiseReading = NoiseChannelReading;

export interface NoiseCheck {
  id: string;
  recordedAt: string;
  recordedBy: string | null;
  source: string;
  sampleRateHz: number;
  durationS: number;
  settingsVersion: number;
  bandHz: { low: number; high: number };
  status: 'ok' | 'caution';
  channels: NoiseReading[];
  /** Each channel's PSD, dB re 1 unit²/Hz, up to 1.25 × the band's upper edge (detail and POST answers only). */
  spectra?: { channel: number; unit: string; f: number[]; levelDb: number[] }[];
}

export const noiseKeys = {
  list: (id: string) => ['campaign', id, 'noise-checks'] as const,
  one: (id: string, checkId: string) => ['campaign', id, 'noise-checks', checkId] as const,
};

/** The campaign's newest checks (readings only). */
export const useNoiseChecks = (campaignId: string) => useQuery({ queryKey: noiseKeys.list(campaignId), queryFn: () => api<{ checks: NoiseCheck[] }>(`/campaigns/${campaignId}/noise-checks?limit=5`) });

/** One check with its spectra, when asked for. */
export const useNoiseCheck = (campaignId: string, checkId: string | null, enabled: boolean) =>
  useQuery({
    queryKey: noiseKeys.one(campaignId, checkId ?? ''),
    queryFn: () => api<{ check: NoiseCheck }>(`/campaigns/${campaignId}/noise-checks/${checkId}`).then((a) => a.check),
    enabled: Boolean(checkId) && enabled,
    staleTime: Infinity,
  });
