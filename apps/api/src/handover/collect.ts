// Everything the hand-over needs from one campaign, read once: the campaign, geometry, schedule,
// kit with calibrations (collect-kit.ts), settings history, hit statistics (collect-hits.ts), the
// averaged FRFs (through the same entryResult the Review screens use, so every number carries its
// input hash), the validity checks and the current modes (collect-modes.ts). The report, the
// bundles and the shared link all render this; its shape is handover-data.ts.
import { and, asc, eq } from 'drizzle-orm';
import type { AcquisitionSettings } from '@resonote/contracts';
import { acquisitionSettings, campaign, campaignMember, line, noiseCheck, point, user } from '@resonote/db/schema';
import type { Db } from '@resonote/db/client';
import { notFound } from '../errors.ts';
import { entriesWithResults, validityChecks } from '../hits/campaign-checks.ts';
import { currentSettings, type CurrentSettings } from '../hits/current-settings.ts';
import { listScheduleEntries } from '../plan/schedule-list.ts';
import { notesForHandover } from './notes.ts';
import { hitsOf } from './collect-hits.ts';
import { channelsOf, kitOf } from './collect-kit.ts';
import { correlationOf, modesOf } from './collect-modes.ts';
import type { HandoverData, HandoverEntry, HandoverFrf } from './handover-data.ts';

export type * from './handover-data.ts';
export { correlationOf, modesOf } from './collect-modes.ts';

export async function scheduleOf(db: Db, campaignId: string): Promise<HandoverEntry[]> {
  const rows = await listScheduleEntries(db, campaignId);
  return rows.map((r) => ({
    id: r.id,
    position: r.position,
    drivingPoint: r.drivingPoint,
    status: r.status,
    requiredHits: r.requiredHits,
    assignee: r.assigneeName ?? null,
    note: r.note,
    acceptedHits: r.acceptedHits,
    rejectedHits: r.rejectedHits,
    responseDof: r.responseDof,
    excitationDof: r.excitationDof,
  }));
}

/** The averaged FRFs of every entry with accepted hits, in schedule order. */
export function frfsOf(db: Db, campaignId: string, schedule: HandoverEntry[], settings: CurrentSettings): Promise<HandoverFrf[]> {
  return entriesWithResults(db, campaignId, settings, schedule);
}

async function leadsOf(db: Db, campaignId: string): Promise<string[]> {
  const rows = await db
    .select({ name: user.name })
    .from(campaignMember)
    .innerJoin(user, eq(user.id, campaignMember.userId))
    .where(and(eq(campaignMember.campaignId, campaignId), eq(campaignMember.role, 'lead')))
    .orderBy(asc(user.name));
  return rows.map((r) => r.name);
}

async function pointsOf(db: Db, campaignId: string): Promise<HandoverData['points']> {
  const rows = await db
    .select({ id: point.id, label: point.label, x: point.x, y: point.y, z: point.z, directions: point.directions, retiredAt: point.retiredAt })
    .from(point)
    .where(eq(point.campaignId, campaignId));
  return rows.map(({ retiredAt, ...p }) => ({ ...p, directions: [...p.directions] as string[], retired: retiredAt !== null })).sort((a, b) => a.label.localeCompare(b.label, 'en', { numeric: true }));
}

async function noiseOf(db: Db, campaignId: string): Promise<HandoverData['noise']> {
  const rows = await db
    .select({ at: noiseCheck.recordedAt, by: user.name, source: noiseCheck.source, results: noiseCheck.results })
    .from(noiseCheck)
    .leftJoin(user, eq(user.id, noiseCheck.recordedBy))
    .where(eq(noiseCheck.campaignId, campaignId))
    .orderBy(asc(noiseCheck.recordedAt));
  return rows.map((r) => {
    const results = r.results as { durationS: number; channels: HandoverData['noise'][number]['channels'] };
    return { at: r.at, by: r.by ?? null, source: r.source, durationS: results.durationS, channels: results.channels.map(({ channel, role, dof, unit, rmsInBand, peak, status, message }) => ({ channel, role, dof, unit, rmsInBand, peak, status, message })) };
  });
}

export async function collectHandover(db: Db, campaignId: string, options: { checks?: boolean } = {}): Promise<HandoverData> {
  const [c] = await db.select().from(campaign).where(eq(campaign.id, campaignId));
  if (!c) throw notFound('That campaign');
  const leads = await leadsOf(db, campaignId);
  const points = await pointsOf(db, campaignId);
  const lines = await db.select({ id: line.id, pointA: line.pointA, pointB: line.pointB }).from(line).where(eq(line.campaignId, campaignId)).orderBy(asc(line.createdAt));
  const schedule = await scheduleOf(db, campaignId);
  const hits = await hitsOf(db, campaignId);
  const kit = await kitOf(db, campaignId, hits.lastAt);
  const channels = await channelsOf(db, campaignId);

  const current = await currentSettings(db, campaignId);
  const history = await db
    .select({ version: acquisitionSettings.version, settings: acquisitionSettings.settings, reason: acquisitionSettings.reason, createdAt: acquisitionSettings.createdAt, createdBy: user.name })
    .from(acquisitionSettings)
    .leftJoin(user, eq(user.id, acquisitionSettings.createdBy))
    .where(eq(acquisitionSettings.campaignId, campaignId))
    .orderBy(asc(acquisitionSettings.version));
  const noise = await noiseOf(db, campaignId);

  const frfs = await frfsOf(db, campaignId, schedule, current);
  const checks = options.checks === false ? null : await validityChecks(db, frfs, current);
  const modes = await modesOf(db, campaignId);
  const correlation = await correlationOf(db, campaignId);

  return {
    generatedAt: new Date(),
    campaign: c,
    leads,
    points,
    lines,
    schedule,
    kit,
    channels,
    settings: { ...current, history: history.map((h) => ({ ...h, createdBy: h.createdBy ?? null })) },
    hits,
    noise,
    frfs,
    checks,
    modes,
    correlation,
    notes: await notesForHandover(db, campaignId),
  };
}

export type { AcquisitionSettings };
