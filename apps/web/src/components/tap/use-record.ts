// Recording hits at one entry (simulated rig or upload) and overriding verdicts, with the caches
// brought up to date from the answer at once and every related query refreshed after.
import { useRef, useState } from 'react';
import { useQueryClient } from '@tanstack/react-query';
import { api, ApiError } from '../../lib/api.ts';
import { hitKeys, invalidateTestData, markApplied, newIdempotencyKey, uploadRecording, type EntryHits, type HitsAnswer, type HitSummary, type Verdict } from '../../lib/hits-data.ts';
import { useToast } from '../../lib/toast.tsx';
import { sendUntilStored, type Waiting } from '../../lib/retry.ts';

/** A strike's tip: the rig's hardness, and the registered tip's name when one was chosen. */
export interface Tip {
  hardness: 'soft' | 'medium' | 'hard';
  name: string | null;
}
export interface UploadFields {
  file: File;
  units: 'volts' | 'engineering';
  sampleRateHz: string;
  fullScaleVolts: string;
}

/**
 * A failure the engineer may retry by hand with the same key (the key is kept). No answer and
 * 502/503/504 never get here: those are retried automatically (lib/retry.ts).
 */
function retryable(err: unknown) {
  return err instanceof ApiError && (err.status === 0 || err.status >= 500);
}

function summary(answer: HitsAnswer): string {
  const parts = answer.hits.map((h) => `hit ${h.sequence} ${h.verdict === 'accept' ? '✓ accepted' : `✕ rejected (${h.reasons.map((r) => r.message).join('; ')})`}`);
  const skipped = answer.skipped.length ? ` ${answer.skipped.length} trigger${answer.skipped.length === 1 ? '' : 's'} skipped: ${answer.skipped.map((s) => s.reason).join('; ')}.` : '';
  return `${parts.join(', ')}.${skipped}`;
}

export function useRecordHits(campaignId: string, entryId: string | null, onRecorded: (answer: HitsAnswer) => void) {
  const client = useQueryClient();
  const toast = useToast();
  const [busy, setBusy] = useState<'strike' | 'upload' | 'verdict' | null>(null);
  const [progress, setProgress] = useState<number | null>(null);
  const pendingKey = useRef<{ what: string; key: string } | null>(null);
  const [failedUpload, setFailedUpload] = useState<UploadFields | null>(null);
  // A hit waiting for the server (no answer, or 503 while its database restarts): said in words
  // on the Tap screen, and sent again with the same key until it is stored.
  const [waiting, setWaiting] = useState<Waiting | null>(null);
  const wake = useRef<(() => void) | null>(null);
  const sleep = (ms: number) =>
    new Promise<void>((resolve) => {
      const done = () => {
        clearTimeout(timer);
        wake.current = null;
        resolve();
      };
      const timer = setTimeout(done, ms);
      wake.current = done;
    });
  /** Sends the waiting hit now instead of at the end of the pause. */
  const tryNow = () => wake.current?.();

  function keyFor(what: string) {
    if (pendingKey.current?.what === what) return pendingKey.current.key;
    const key = newIdempotencyKey();
    pendingKey.current = { what, key };
    return key;
  }

  function apply(answer: HitsAnswer) {
    if (!entryId) return;
    // The answer's FRF is the main channel only; the entry's FRF (every channel) is fetched once,
    // by the refresh below. The campaign event of this same change then refreshes nothing again.
    markApplied(answer.hits);
    client.setQueryData<EntryHits>(hitKeys.entryHits(campaignId, entryId), (old) => {
      if (!old) return old;
      const byId = new Map(old.hits.map((h) => [h.id, h]));
      for (const h of answer.hits) byId.set(h.id, { ...byId.get(h.id), ...h } as HitSummary);
      return { ...old, entry: { ...old.entry, status: answer.entry.status }, hits: [...byId.values()].sort((a, b) => a.sequence - b.sequence) };
    });
    void invalidateTestData(client, campaignId);
  }

  async function run(kind: 'strike' | 'upload', what: string, call: (key: string) => Promise<HitsAnswer>) {
    if (!entryId || busy) return;
    setBusy(kind);
    const key = keyFor(what);
    try {
      const answer = await sendUntilStored(() => call(key), { onWaiting: setWaiting, sleep });
      pendingKey.current = null;
      setFailedUpload(null);
      apply(answer);
      onRecorded(answer);
      toast(answer.hits.every((h) => h.verdict === 'accept') ? 'ok' : 'info', `${answer.replayed ? 'Already stored: ' : ''}${summary(answer)}`);
    } catch (err) {
      if (!retryable(err)) pendingKey.current = null;
      toast('error', `${err instanceof Error ? err.message : 'The hit could not be recorded.'}${retryable(err) ? ' Try again: the retry is safe.' : ''}`);
      throw err;
    } finally {
      setWaiting(null);
      setBusy(null);
      setProgress(null);
    }
  }

  const strike = (tip: Tip) =>
    run('strike', `strike:${entryId}:${tip.hardness}:${tip.name ?? ''}`, (key) =>
      api<HitsAnswer>(`/campaigns/${campaignId}/schedule/${entryId}/simulate`, { body: { count: 1, tip: tip.hardness, ...(tip.name ? { tipName: tip.name } : {}), idempotencyKey: key, kind: 'accelerance' } }),
    ).catch(() => undefined);

  const upload = (fields: UploadFields) => {
    const form = new FormData();
    form.append('units', fields.units);
    if (fields.sampleRateHz.trim()) form.append('sampleRateHz', fields.sampleRateHz.trim());
    if (fields.fullScaleVolts.trim()) form.append('fullScaleVolts', fields.fullScaleVolts.trim());
    form.append('kind', 'accelerance');
    form.append('file', fields.file);
    setProgress(0);
    const what = `upload:${entryId}:${fields.file.name}:${fields.file.size}:${fields.file.lastModified}:${fields.units}`;
    return run('upload', what, (key) => uploadRecording(`/campaigns/${campaignId}/schedule/${entryId}/hits`, form, key, setProgress)).catch((err) => {
      if (retryable(err)) setFailedUpload(fields);
    });
  };

  async function override(hit: HitSummary, verdict: Verdict, note: string) {
    if (busy) return;
    if (hit.verdict === verdict) {
      toast('info', `Hit ${hit.sequence} is already ${verdict === 'accept' ? 'accepted' : 'rejected'}.`);
      return;
    }
    setBusy('verdict');
    try {
      const answer = await api<HitsAnswer>(`/campaigns/${campaignId}/hits/${hit.id}/verdict`, { body: { verdict, note, version: hit.version, kind: 'accelerance' } });
      apply(answer);
      toast('ok', `Hit ${hit.sequence} ${verdict === 'accept' ? '✓ accepted' : '✕ rejected'} by hand. ${answer.entry.acceptedHits} good hit${answer.entry.acceptedHits === 1 ? '' : 's'} at this DOF.`);
    } catch (err) {
      if (err instanceof ApiError && err.status === 409) {
        toast('info', `${err.message} Reloaded: check hit ${hit.sequence} and decide again.`);
        void invalidateTestData(client, campaignId);
      } else {
        toast('error', err instanceof Error ? err.message : 'The verdict could not be changed.');
      }
    } finally {
      setBusy(null);
    }
  }

  return { busy, progress, strike, upload, override, failedUpload, waiting, tryNow };
}
