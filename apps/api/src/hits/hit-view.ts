// What a reader sees of stored hits: the summary of a hit (verdict, reasons, metrics; no samples)
// and one hit in full — time traces, windows and its force spectrum.
import { and, eq } from 'drizzle-orm';
import { forcePulseSpectrum } from '@resonote/dsp';
import { uuidSchema } from '@resonote/contracts';
import { hit } from '@resonote/db/schema';
import type { Db } from '@resonote/db/client';
import { notFound } from '../errors.ts';
import type { ChannelSnapshot } from './channel-map.ts';
import { currentSettings } from './current-settings.ts';
import { exponentialWindowOf, forceWindowOf } from './settings-to-dsp.ts';
import { unpackSamples } from './samples-codec.ts';
import { judge, type HitRow } from './intake.ts';

/** A hit as every hit list and answer shows it; `names` maps user ids to names (else recordedBy is null). */
export function hitSummary(h: HitRow, names?: Map<string, string>) {
  return {
    id: h.id,
    sequence: h.sequence,
    verdict: h.verdict,
    autoVerdict: h.autoVerdict,
    overridden: h.verdict !== h.autoVerdict,
    reasons: h.reasons,
    metrics: h.metrics,
    overrideNote: h.overrideNote,
    source: h.source,
    settingsVersion: h.settingsVersion,
    recordedBy: h.recordedBy ? (names?.get(h.recordedBy) ?? null) : null,
    recordedAt: h.recordedAt,
    version: h.version,
  };
}

/** One hit of the campaign with its traces decimated to at most `maxPoints` points; 404 for an unknown id or another campaign's. */
export async function hitDetail(db: Db, campaignId: string, hitId: string, maxPoints: number) {
  if (!uuidSchema.safeParse(hitId).success) throw notFound('That hit');
  const [h] = await db.select().from(hit).where(and(eq(hit.id, hitId), eq(hit.campaignId, campaignId)));
  if (!h) throw notFound('That hit');
  const { settings: s } = await currentSettings(db, campaignId);
  const channels = h.channels as ChannelSnapshot[];
  const raw = unpackSamples(h.samples, channels.length, h.samplesPerChannel);
  const step = Math.max(1, Math.ceil(h.samplesPerChannel / maxPoints));
  const t: number[] = [];
  for (let i = 0; i < h.samplesPerChannel; i += step) t.push(i / h.sampleRateHz);
  // The force spectrum the roll-off check reads (dsp forcePulseSpectrum: offset removed, the pulse
  // gated, docs/methods.md#roll-off), under the current settings, so the −10/−20 dB marks sit on it.
  const check = judge(raw, h.sampleRateHz, s);
  const spectrum = check.forceGate ? forcePulseSpectrum(raw[0]!, h.sampleRateHz, check.forceGate) : null;
  const f: number[] = [];
  const esdDb: number[] = [];
  const fMax = Math.min(h.sampleRateHz / 2, s.bandHz.high * 2);
  for (let k = 0; spectrum && k < spectrum.f.length && spectrum.f[k]! <= fMax; k++) {
    f.push(spectrum.f[k]!);
    esdDb.push(Math.max(spectrum.levelDb[k]!, -300));
  }
  return {
    hit: hitSummary(h),
    sampleRateHz: h.sampleRateHz,
    samples: h.samplesPerChannel,
    decimation: step,
    t,
    channels: channels.map((c, i) => ({ channel: c.channel, role: c.role, dof: c.dof, unit: c.unit, sign: c.sign, kitItem: `${c.model} SN ${c.serial}`, sensitivity: c.sensitivityBase, calibration: c.calibration, values: t.map((_, j) => raw[i]![j * step]!) })),
    triggerTimeS: s.preTriggerS,
    forceWindow: forceWindowOf(s),
    exponentialWindow: exponentialWindowOf(s),
    forceSpectrum: { f, levelDb: esdDb, reference: '|F(f)|² of the pulse (offset removed, gated to ±4 pulse widths) relative to |F(0)|² (dB), the curve the roll-off check reads', bandHz: s.bandHz, rollOffDb: s.rollOffDb, rollOff10dBHz: check.rollOff10dBHz, rollOff20dBHz: check.rollOff20dBHz },
  };
}
