// Measurement validity checks (docs/methods.md#validity-checks): reciprocity H_ij against H_ji, and
// linearity — the same DOF pair at two force levels. Both report FRAC over the band (docs/methods.md#frac) and
// the dB and phase differences at the peaks, since FRAC alone is blind to a constant factor.
import { and, asc, eq } from 'drizzle-orm';
import { frac, type Complex } from '@resonote/dsp';
import { frfAxisFactor } from '@resonote/contracts';
import { hit } from '@resonote/db/schema';
import type { Db } from '@resonote/db/client';
import type { ChannelSnapshot } from './channel-map.ts';
import { averageHits, entryInputHash, mainChannel } from './entry-result.ts';
import { recordSamples, type CurrentSettings } from './current-settings.ts';
import { hitSamples, rememberCheck, rememberedCheck } from './result-cache.ts';
import { notExcluded } from './exclusion.ts';

export interface PeakDifference {
  fHz: number;
  /** 20·log10(|Ha|/|Hb|), dB. */
  dbDifference: number;
  /** arg(Ha) − arg(Hb), degrees wrapped to (−180, 180]. */
  phaseDifferenceDeg: number;
  /** Frequency of the nearest peak of Hb minus that of Ha, Hz (within ±5 %). */
  peakShiftHz: number;
}

export interface Comparison {
  frac: number;
  peaks: PeakDifference[];
}

function bandSlice(h: Complex, f: Float64Array, lo: number, hi: number): { h: Complex; f: Float64Array } {
  let a = 0;
  while (a < f.length && f[a]! < Math.max(lo, f[1] ?? 0)) a++;
  let b = a;
  while (b < f.length && f[b]! <= hi) b++;
  return { h: { re: h.re.slice(a, b), im: h.im.slice(a, b) }, f: f.slice(a, b) };
}

const mag = (h: Complex, k: number) => Math.hypot(h.re[k]!, h.im[k]!);

/** Local maxima of |H| in the band, largest first (at most `count`). */
export function peaksOf(h: Complex, count = 3): number[] {
  const idx: number[] = [];
  for (let k = 1; k + 1 < h.re.length; k++) {
    const m = mag(h, k);
    if (m > mag(h, k - 1) && m >= mag(h, k + 1)) idx.push(k);
  }
  return idx.sort((x, y) => mag(h, y) - mag(h, x)).slice(0, count);
}

export function compareFrfs(ha: Complex, hb: Complex, f: Float64Array, band: { low: number; high: number }): Comparison {
  const a = bandSlice(ha, f, band.low, band.high);
  const b = bandSlice(hb, f, band.low, band.high);
  const peaks = peaksOf(a.h).map((k) => {
    const span = Math.max(1, Math.round((0.05 * a.f[k]!) / ((a.f[1]! - a.f[0]!) || 1)));
    let best = k;
    for (let j = Math.max(0, k - span); j <= Math.min(b.f.length - 1, k + span); j++) if (mag(b.h, j) > mag(b.h, best)) best = j;
    const phase = (Math.atan2(a.h.im[k]!, a.h.re[k]!) - Math.atan2(b.h.im[k]!, b.h.re[k]!)) * (180 / Math.PI);
    const wrapped = phase - 360 * Math.ceil((phase - 180) / 360);
    return {
      fHz: a.f[k]!,
      dbDifference: 20 * Math.log10(mag(a.h, k) / Math.max(mag(b.h, k), 1e-300)),
      phaseDifferenceDeg: wrapped,
      peakShiftHz: b.f[best]! - a.f[k]!,
    };
  });
  return { frac: frac(a.h, b.h), peaks };
}

/**
 * Linearity of one schedule entry (docs/methods.md#validity-checks): its accepted hits split into the
 * lighter and the heavier half by peak force; when the medians differ by 1.5× or more, the two
 * halves are averaged separately and compared (heavier against lighter). Null when there are
 * fewer than 4 usable hits or the force levels are too close. Kept in memory under the input hash
 * of the hits it used (as the entry's FRF is), so a campaign's checks re-read no samples until an
 * entry's hits or the settings change.
 */
export async function entryLinearity(db: Db, entryId: string, responseDof: string, settings: CurrentSettings): Promise<Linearity | null> {
  const s = settings.settings;
  const n = recordSamples(s);
  const rows = await db
    .select({ id: hit.id, version: hit.version, metrics: hit.metrics, channels: hit.channels, fs: hit.sampleRateHz, len: hit.samplesPerChannel })
    .from(hit)
    .where(and(eq(hit.scheduleEntryId, entryId), eq(hit.verdict, 'accept'), notExcluded))
    .orderBy(asc(hit.sequence));
  const sameRecord = rows.filter((r) => r.fs === s.sampleRateHz && r.len === n);
  // Only hits with the channel layout of the first one can be averaged together (as in entryResult).
  const layout = (sameRecord[0]?.channels ?? []) as ChannelSnapshot[];
  const usable = sameRecord.filter((r) => {
    const ch = r.channels as ChannelSnapshot[];
    return ch.length === layout.length && ch.every((c, i) => c.dof === layout[i]!.dof);
  });
  if (usable.length < 4) return null;
  const key = `linearity:${entryId}:${responseDof}`;
  const hash = entryInputHash(settings.version, usable);
  const remembered = rememberedCheck<Linearity | null>(db, key, hash);
  if (remembered !== undefined) return remembered;
  const value = await linearityOf(db, usable, responseDof, s, n);
  rememberCheck(db, key, hash, value);
  return value;
}

export type Linearity = { lowForceN: number; highForceN: number; forceRatio: number; hitsPerLevel: number } & Comparison;

async function linearityOf(db: Db, usable: { id: string; metrics: unknown; channels: unknown }[], responseDof: string, s: CurrentSettings['settings'], n: number): Promise<Linearity | null> {
  const peak = (r: (typeof usable)[number]) => (r.metrics as { peakForceN: number }).peakForceN;
  const sorted = [...usable].sort((x, y) => peak(x) - peak(y));
  const half = Math.floor(sorted.length / 2);
  const low = sorted.slice(0, half);
  const high = sorted.slice(sorted.length - half);
  const median = (g: typeof sorted) => peak(g[Math.floor(g.length / 2)]!);
  const ratio = median(high) / Math.max(median(low), 1e-9);
  if (ratio < 1.5) return null;
  // The same averaging as the entry's FRF, over the samples the result cache holds (hits/entry-result.ts).
  const channelCount = (usable[0]!.channels as ChannelSnapshot[]).length;
  const frfOf = async (g: typeof sorted) => averageHits(await hitSamples(db, g.map((r) => r.id), channelCount, n), s);
  const lo = await frfOf(low);
  const hi = await frfOf(high);
  const ch = mainChannel((usable[0]!.channels as ChannelSnapshot[]).filter((c) => c.role === 'response'), responseDof);
  return { lowForceN: median(low), highForceN: median(high), forceRatio: ratio, hitsPerLevel: half, ...compareFrfs(hi.h1[ch]!, lo.h1[ch]!, lo.f, s.bandHz) };
}

/**
 * An FRF measured along the written directions, put on the positive axis of both points
 * (contracts/axis.ts): H(i,−d) = −H(i,+d). Reciprocity compares both FRFs of a pair this way.
 */
export function onPositiveAxis(h: Complex, responseDof: string, excitationDof: string): Complex {
  return frfAxisFactor(responseDof, excitationDof) === 1 ? h : { re: h.re.map((v) => -v), im: h.im.map((v) => -v) };
}

/** True when b is the reciprocal of a (one definition, in contracts, shared with the web). */
export { isReciprocal } from '@resonote/contracts';
