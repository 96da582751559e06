// The raw hits of the hand-over bundle: an index of every stored hit (SHA-256 from PostgreSQL, no
// samples loaded), each hit's values read one at a time, and a hit as CSV.
import { asc, eq, getTableColumns, sql } from 'drizzle-orm';
import { strToU8 } from 'fflate';
import { hit, user } from '@resonote/db/schema';
import type { Db } from '@resonote/db/client';
import type { ChannelSnapshot } from '../hits/channel-map.ts';
import { unpackSamples } from '../hits/samples-codec.ts';
import type { HandoverData } from './handover-data.ts';
import { f32Text, fileSafe } from './bundle-csv.ts';

export interface RawHit {
  file: string;
  hitId: string;
  entryId: string;
  sequence: number;
  verdict: string;
  reasons: { code: string; message?: string }[];
  settingsVersion: number;
  sampleRateHz: number;
  samples: number;
  recordedAt: string;
  recordedBy: string | null;
  sha256: string;
  channels: { channel: number; role: string; dof: string; unit: string; sign: number; model: string; serial: string; sensitivityBase: number; calibration: unknown }[];
  values?: number[][];
}

/** The raw-hit index, without sample values: the SHA-256 of each hit's stored bytes comes from PostgreSQL, so no samples are loaded here. */
export async function rawHitIndex(db: Db, d: HandoverData): Promise<RawHit[]> {
  const names = new Map((await db.select({ id: user.id, name: user.name }).from(user)).map((u) => [u.id, u.name]));
  const byEntry = new Map(d.schedule.map((e) => [e.id, e]));
  const { samples: _samples, ...columns } = getTableColumns(hit);
  const rows = await db
    .select({ ...columns, sha256: sql<string>`encode(sha256(${hit.samples}), 'hex')` })
    .from(hit)
    .where(eq(hit.campaignId, d.campaign.id))
    .orderBy(asc(hit.scheduleEntryId), asc(hit.sequence));
  return rows.map((h) => {
    const e = byEntry.get(h.scheduleEntryId);
    const folder = e ? `${fileSafe(e.responseDof)}_${fileSafe(e.excitationDof)}` : h.scheduleEntryId;
    const channels = (h.channels as ChannelSnapshot[]).map((c) => ({ channel: c.channel, role: c.role, dof: c.dof, unit: c.unit, sign: c.sign, model: c.model, serial: c.serial, sensitivityBase: c.sensitivityBase, calibration: c.calibration }));
    return {
      file: `hits/${folder}/${h.sequence}.csv`,
      hitId: h.id,
      entryId: h.scheduleEntryId,
      sequence: h.sequence,
      verdict: h.verdict,
      reasons: h.reasons as RawHit['reasons'],
      settingsVersion: h.settingsVersion,
      sampleRateHz: h.sampleRateHz,
      samples: h.samplesPerChannel,
      recordedAt: h.recordedAt.toISOString(),
      recordedBy: h.recordedBy ? (names.get(h.recordedBy) ?? null) : null,
      sha256: h.sha256,
      channels,
    } satisfies RawHit;
  });
}

/** One hit's stored samples, per channel (float32, engineering units), read on its own. */
export async function hitValues(db: Db, h: RawHit): Promise<Float32Array[]> {
  const [row] = await db.select({ samples: hit.samples }).from(hit).where(eq(hit.id, h.hitId));
  if (!row) throw new Error(`hit ${h.hitId} disappeared during the export`);
  return unpackSamples(row.samples, h.channels.length, h.samples);
}

/** The raw-hit index with every hit's values (the JSON bundle's form). */
export async function rawHits(db: Db, d: HandoverData): Promise<RawHit[]> {
  const index = await rawHitIndex(db, d);
  for (const h of index) h.values = (await hitValues(db, h)).map((ch) => Array.from(ch));
  return index;
}

/** A raw hit as CSV: time_s, then one column per channel in storage order, float32 values written exactly. */
export function hitCsv(h: RawHit, values: ArrayLike<number>[]): Uint8Array {
  const header = ['time_s', ...h.channels.map((c) => `ch${c.channel}_${c.role === 'force' ? 'force_N' : 'response_ms2'}_${fileSafe(c.dof)}`)];
  const lines: string[] = [header.join(',')];
  for (let i = 0; i < h.samples; i++) lines.push([i / h.sampleRateHz, ...values.map((ch) => f32Text(ch[i]!))].join(','));
  return strToU8(lines.join('\r\n') + '\r\n');
}
