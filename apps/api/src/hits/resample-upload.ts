// An uploaded recording brought to the campaign's sample rate (issue 16). At the settings' rate
// it is read as before. At another rate it is refused, unless the lead allowed resampling in the
// acquisition settings (resampleUploads): then every channel goes through the same polyphase
// anti-aliased resampler (packages/dsp resamplePoly, the design of scipy.signal.resample_poly), so
// their ratio — the FRF — is unchanged in the band, and the file as made is kept beside the hits.
import { createHash } from 'node:crypto';
import { resamplePoly, resampleRatio } from '@resonote/dsp';
import type { AcquisitionSettings } from '@resonote/contracts';
import { originalRecording } from '@resonote/db/schema';
import type { Db } from '@resonote/db/client';
import { badRequest } from '../errors.ts';
import { decodedInEngineeringUnits, decodeUpload, type ChannelSnapshot, type UploadReading } from './channel-map.ts';

export interface ResampleNote {
  fromHz: number;
  toHz: number;
  up: number;
  down: number;
  method: string;
}

type UploadFile = { originalname: string; mimetype: string; buffer: Buffer };

export function uploadAtCampaignRate(file: UploadFile, map: ChannelSnapshot[], reading: UploadReading, settings: AcquisitionSettings): { channels: Float64Array[]; resampled: ResampleNote | null } {
  const decoded = decodeUpload(file);
  const target = settings.sampleRateHz;
  const fs = decoded.sampleRateHz ?? reading.sampleRateHz ?? null;
  const differs = fs !== null && Math.abs(fs - target) > 1e-3 * target;
  if (!differs || !settings.resampleUploads || decoded.channels.length !== map.length) {
    return { channels: decodedInEngineeringUnits(decoded, map, reading, target, settings), resampled: null };
  }
  const from = Math.round(fs);
  if (Math.abs(from - fs) > 1e-6 * fs || !Number.isInteger(target)) throw badRequest(`The recording is sampled at ${+fs.toFixed(3)} Hz; resampling needs whole-number rates (the settings ask for ${target} Hz). Nothing was stored.`);
  let ratio;
  try {
    ratio = resampleRatio(from, target);
  } catch (err) {
    if (err instanceof RangeError) throw badRequest(`The recording at ${from} Hz cannot be resampled to ${target} Hz: ${err.message}. Nothing was stored.`);
    throw err;
  }
  const channels = decoded.channels.map((c) => resamplePoly(c, ratio.up, ratio.down));
  return {
    channels: decodedInEngineeringUnits({ ...decoded, sampleRateHz: target, channels }, map, reading, target, settings),
    resampled: { fromHz: from, toHz: target, up: ratio.up, down: ratio.down, method: 'polyphase windowed-sinc (Kaiser β = 5), the design of scipy.signal.resample_poly; all channels alike' },
  };
}

/** Keeps the uploaded bytes of a resampled recording, once per upload key (a replay stores nothing new). */
export async function keepOriginal(db: Db, args: { campaignId: string; key: string; file: UploadFile; note: ResampleNote; userId: string }): Promise<string> {
  const sha256 = createHash('sha256').update(args.file.buffer).digest('hex');
  const [row] = await db
    .insert(originalRecording)
    .values({ campaignId: args.campaignId, idempotencyKey: args.key, fileName: args.file.originalname.slice(0, 200), sampleRateHz: args.note.fromHz, resampledToHz: args.note.toHz, sha256, bytes: args.file.buffer, storedBy: args.userId })
    .onConflictDoUpdate({ target: [originalRecording.campaignId, originalRecording.idempotencyKey], set: { sha256: originalRecording.sha256 } })
    .returning({ id: originalRecording.id });
  return row!.id;
}

export function resampledSource(name: string, note: ResampleNote | null): string {
  const base = `upload:${name.slice(0, 100)}`;
  return note ? `${base} (resampled ${note.fromHz} → ${note.toHz} Hz, polyphase; original kept)` : base;
}

/**
 * What GET …/frf says about resampling: the rates the entry's accepted hits were resampled from
 * (read back from the `source` that resampledSource wrote), so a reader of the averaged FRF knows
 * that part of it went through resamplePoly. Empty when none was.
 */
export function resampledFromOf(sources: string[]): { resampled: boolean; resampledFromHz: number | null; resampledHits: number } {
  const rates = new Set<number>();
  let count = 0;
  for (const s of sources) {
    const m = /\(resampled (\d+(?:\.\d+)?) → (\d+(?:\.\d+)?) Hz/.exec(s);
    if (m) {
      count += 1;
      rates.add(Number(m[1]));
    }
  }
  // One rate is the usual case; with several, the lowest names the narrowest original band.
  return { resampled: count > 0, resampledFromHz: rates.size ? Math.min(...rates) : null, resampledHits: count };
}
