// Everything the hand-over needs from one campaign, read once: the campaign, geometry, schedule,
// kit with calibrations, settings history, hit statistics, the averaged FRFs (through the same
// entryResult the Review screens use, so every number carries its input hash), the validity
// checks and the current modes. The report, the bundles and the shared link all render this.
import { aliasedTable, and, asc, desc, eq, inArray, sql } from 'drizzle-orm';
import { AXIS_CONVENTION, calibrationState, type AcquisitionSettings, type CalibrationState } from '@resonote/contracts';
import { notesForHandover, type HandoverNote } from './notes.ts';
import { acquisitionSettings, calibrationRecord, campaign, campaignMember, channel, hit, kitItem, line, modalFit, noiseCheck, point, scheduleEntry, user } from '@resonote/db/schema';
import type { Db } from '@resonote/db/client';
import { notFound } from '../errors.ts';
import type { ChannelSnapshot } from '../hits/channel-map.ts';
import { entriesWithResults, validityChecks, type EntryWithResult, type ValidityChecks } from '../hits/campaign-checks.ts';
import { listScheduleEntries } from '../plan/schedule-list.ts';
import { correlate, testModesForCorrelation, type Correlation } from '../fe/correlation.ts';
import { latestModelId, loadModel } from '../fe/store.ts';
import { DUPLICATE_RULE, rowView, tableMac, tableRows } from '../modes/mode-table.ts';
import { currentSettings, type CurrentSettings } from '../hits/current-settings.ts';

const responsePoint = aliasedTable(point, 'response_point');
const excitationPoint = aliasedTable(point, 'excitation_point');

export interface HandoverEntry {
  id: string;
  position: number;
  responseDof: string;
  excitationDof: string;
  drivingPoint: boolean;
  status: string;
  requiredHits: number;
  assignee: string | null;
  note: string;
  acceptedHits: number;
  rejectedHits: number;
}

export type HandoverFrf = EntryWithResult<HandoverEntry>;

export interface HandoverKitItem {
  id: string;
  kind: 'hammer' | 'accelerometer';
  model: string;
  serial: string;
  sensitivity: number;
  sensitivityUnit: string;
  sensitivityBase: number;
  sensitivityBaseUnit: 'mV/N' | 'mV/(m/s²)';
  tips: string[];
  axes: string[];
  retired: boolean;
  latest: { calibratedOn: string; dueOn: string; certificateRef: string; performedBy: string } | null;
  calibrationCount: number;
  /** Calibration state on the day of the last recorded hit (or today when nothing was recorded). */
  stateAtTest: { state: CalibrationState; days: number | null; on: string };
  stateToday: { state: CalibrationState; days: number | null; on: string };
}

export type ModeRow = ReturnType<typeof rowView>;

/** The campaign's mode table for the hand-over: rows from one or several fits, and where each fit came from. */
export interface HandoverModes {
  table: ModeRow[];
  mac: number[][];
  fits: { fitId: string; inputHash: string; bandHz: [number, number]; settingsVersion: number; resultHashes: string[]; entryIds: string[]; frfCount: number; correction: string; chosenBy: string; chosenAt: string }[];
  duplicateRule: string;
  axisConvention: string;
}

export interface HandoverCorrelation {
  model: { id: string; name: string; versionLabel: string; normalisation: string; uploadedAt: Date; nodeCount: number; modeCount: number };
  result: Correlation;
}

/** The newest model version against the mode table (fe/correlation.ts), or null when there is no model. */
export async function correlationOf(db: Db, campaignId: string): Promise<HandoverCorrelation | null> {
  const id = await latestModelId(db, campaignId);
  if (!id) return null;
  const s = await loadModel(db, campaignId, id);
  const r = s.row;
  return { model: { id: r.id, name: r.name, versionLabel: r.versionLabel, normalisation: r.normalisation, uploadedAt: r.uploadedAt, nodeCount: r.nodeCount, modeCount: r.modeCount }, result: correlate(s.model, s.links, await testModesForCorrelation(db, campaignId)) };
}

export type HandoverChecks = ValidityChecks;

export interface HandoverData {
  generatedAt: Date;
  campaign: typeof campaign.$inferSelect;
  leads: string[];
  points: { id: string; label: string; x: number; y: number; z: number; directions: string[]; retired: boolean }[];
  lines: { id: string; pointA: string; pointB: string }[];
  schedule: HandoverEntry[];
  kit: HandoverKitItem[];
  channels: { channel: number; kind: string; model: string; serial: string; axis: string | null; dof: string | null; sign: number; label: string }[];
  settings: CurrentSettings & { history: { version: number; settings: unknown; reason: string; createdAt: Date; createdBy: string | null }[] };
  hits: {
    total: number;
    accepted: number;
    rejected: number;
    overridden: number;
    byReason: { code: string; n: number }[];
    byEngineer: { name: string; hits: number; accepted: number; rejected: number }[];
    firstAt: Date | null;
    lastAt: Date | null;
  };
  /** Background-noise checks, oldest first: per channel the RMS in the band, the peak and the reading in words. */
  noise: { at: Date; by: string | null; source: string; durationS: number; channels: { channel: number; role: 'force' | 'response'; dof: string; unit: string; rmsInBand: number; peak: number; status: 'ok' | 'caution'; message: string }[] }[];
  frfs: HandoverFrf[];
  checks: HandoverChecks | null;
  modes: HandoverModes | null;
  /** Correlation of the mode table with the campaign's newest FE model version; null without a model. */
  correlation: HandoverCorrelation | null;
  /** Notes and photos per DOF, oldest first. */
  notes: HandoverNote[];
}

const day = (d: Date) => d.toISOString().slice(0, 10);

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

/** The campaign's mode table (null when it has no rows) with the fits its rows came from. */
export async function modesOf(db: Db, campaignId: string): Promise<HandoverModes | null> {
  const rows = await tableRows(db, campaignId);
  if (rows.length === 0) return null;
  const fitIds = [...new Set(rows.map((r) => r.fitId).filter((x): x is string => Boolean(x)))];
  const fits = fitIds.length ? await db.select().from(modalFit).where(inArray(modalFit.id, fitIds)) : [];
  return {
    table: rows.map((r, i) => rowView(r, i + 1, rows)),
    mac: tableMac(rows),
    fits: fits.map((fit) => {
      const request = fit.request as { bandHz: [number, number]; settingsVersion: number; resultHashes: string[]; entryIds: string[]; frfCount: number };
      const modes = (fit.modes ?? {}) as { correction?: string; chosenBy?: string; chosenAt?: string };
      return { fitId: fit.id, inputHash: fit.inputHash, bandHz: request.bandHz, settingsVersion: request.settingsVersion, resultHashes: request.resultHashes ?? [], entryIds: request.entryIds ?? [], frfCount: request.frfCount, correction: modes.correction ?? '', chosenBy: modes.chosenBy ?? '', chosenAt: modes.chosenAt ?? '' };
    }),
    duplicateRule: `The same mode twice: frequencies within ${DUPLICATE_RULE.freqPercent} % and MAC ≥ ${DUPLICATE_RULE.mac} over the DOFs both shapes share (common practice).`,
    axisConvention: AXIS_CONVENTION,
  };
}

export async function collectHandover(db: Db, campaignId: string, options: { checks?: boolean } = {}): Promise<HandoverData> {
  const [c] = await db.select().from(campaign).where(eq(campaign.id, campaignId));
  if (!c) throw notFound('That campaign');
  const leads = (
    await db
      .select({ name: user.name })
      .from(campaignMember)
      .innerJoin(user, eq(user.id, campaignMember.userId))
      .where(and(eq(campaignMember.campaignId, campaignId), eq(campaignMember.role, 'lead')))
      .orderBy(asc(user.name))
  ).map((r) => r.name);
  const points = (
    await db
      .select({ id: point.id, label: point.label, x: point.x, y: point.y, z: point.z, directions: point.directions, retiredAt: point.retiredAt })
      .from(point)
      .where(eq(point.campaignId, campaignId))
  )
    .map(({ retiredAt, ...p }) => ({ ...p, directions: [...p.directions] as string[], retired: retiredAt !== null }))
    .sort((a, b) => a.label.localeCompare(b.label, 'en', { numeric: true }));
  const lines = await db.select({ id: line.id, pointA: line.pointA, pointB: line.pointB }).from(line).where(eq(line.campaignId, campaignId)).orderBy(asc(line.createdAt));
  const schedule = await scheduleOf(db, campaignId);

  const [span] = await db
    .select({
      total: sql<number>`count(*)::int`,
      accepted: sql<number>`count(*) FILTER (WHERE ${hit.verdict} = 'accept')::int`,
      rejected: sql<number>`count(*) FILTER (WHERE ${hit.verdict} = 'reject')::int`,
      overridden: sql<number>`count(*) FILTER (WHERE ${hit.verdict} <> ${hit.autoVerdict})::int`,
      firstAt: sql<string | null>`min(${hit.recordedAt})`,
      lastAt: sql<string | null>`max(${hit.recordedAt})`,
    })
    .from(hit)
    .where(eq(hit.campaignId, campaignId));
  const byEngineer = (
    await db
      .select({
        name: user.name,
        hits: sql<number>`count(*)::int`,
        accepted: sql<number>`count(*) FILTER (WHERE ${hit.verdict} = 'accept')::int`,
        rejected: sql<number>`count(*) FILTER (WHERE ${hit.verdict} = 'reject')::int`,
      })
      .from(hit)
      .leftJoin(user, eq(user.id, hit.recordedBy))
      .where(eq(hit.campaignId, campaignId))
      .groupBy(hit.recordedBy, user.name)
  ).map((r) => ({ ...r, name: r.name ?? '(account not on this instance)' }));
  const reasons = await db.execute<{ code: string; n: number }>(
    sql`SELECT r->>'code' AS code, count(*)::int AS n FROM ${hit}, jsonb_array_elements(${hit.reasons}) r WHERE ${hit.campaignId} = ${campaignId} AND ${hit.verdict} = 'reject' GROUP BY 1 ORDER BY 2 DESC, 1`,
  );
  const firstAt = span?.firstAt ? new Date(span.firstAt) : null;
  const lastAt = span?.lastAt ? new Date(span.lastAt) : null;

  const items = await db.select().from(kitItem).where(eq(kitItem.campaignId, campaignId)).orderBy(sql`case ${kitItem.kind} when 'hammer' then 0 else 1 end`, asc(kitItem.model), asc(kitItem.serial));
  const cals = items.length
    ? await db
        .select()
        .from(calibrationRecord)
        .innerJoin(kitItem, eq(kitItem.id, calibrationRecord.kitItemId))
        .where(eq(kitItem.campaignId, campaignId))
        .orderBy(desc(calibrationRecord.calibratedOn), desc(calibrationRecord.createdAt))
    : [];
  const today = day(new Date());
  const testDay = lastAt ? day(lastAt) : today;
  const kit: HandoverKitItem[] = items.map((item) => {
    const mine = cals.filter((r) => r.calibration_record.kitItemId === item.id).map((r) => r.calibration_record);
    const latest = mine[0] ?? null;
    // At test time: the newest calibration made on or before the last test day.
    const atTest = mine.find((r) => r.calibratedOn <= testDay) ?? null;
    return {
      id: item.id,
      kind: item.kind,
      model: item.model,
      serial: item.serial,
      sensitivity: item.sensitivity,
      sensitivityUnit: item.sensitivityUnit,
      sensitivityBase: item.sensitivityBase,
      sensitivityBaseUnit: item.kind === 'hammer' ? 'mV/N' : 'mV/(m/s²)',
      tips: item.tips,
      axes: item.axes,
      retired: item.retired,
      latest: latest ? { calibratedOn: latest.calibratedOn, dueOn: latest.dueOn, certificateRef: latest.certificateRef, performedBy: latest.performedBy } : null,
      calibrationCount: mine.length,
      stateAtTest: { ...calibrationState(atTest?.dueOn ?? null, testDay), on: testDay },
      stateToday: { ...calibrationState(latest?.dueOn ?? null, today), on: today },
    };
  });
  const channels = await db
    .select({ channel: channel.channel, kind: kitItem.kind, model: kitItem.model, serial: kitItem.serial, axis: channel.axis, dof: channel.dof, sign: channel.sign, label: channel.label })
    .from(channel)
    .innerJoin(kitItem, eq(kitItem.id, channel.kitItemId))
    .where(eq(channel.campaignId, campaignId))
    .orderBy(asc(channel.channel));

  const current = await currentSettings(db, campaignId);
  const history = await db
    .select({ version: acquisitionSettings.version, settings: acquisitionSettings.settings, reason: acquisitionSettings.reason, createdAt: acquisitionSettings.createdAt, createdBy: user.name })
    .from(acquisitionSettings)
    .leftJoin(user, eq(user.id, acquisitionSettings.createdBy))
    .where(eq(acquisitionSettings.campaignId, campaignId))
    .orderBy(asc(acquisitionSettings.version));

  const noiseRows = await db
    .select({ at: noiseCheck.recordedAt, by: user.name, source: noiseCheck.source, results: noiseCheck.results })
    .from(noiseCheck)
    .leftJoin(user, eq(user.id, noiseCheck.recordedBy))
    .where(eq(noiseCheck.campaignId, campaignId))
    .orderBy(asc(noiseCheck.recordedAt));
  const noise = noiseRows.map((r) => {
    const results = r.results as { durationS: number; channels: HandoverData['noise'][number]['channels'] };
    return { at: r.at, by: r.by ?? null, source: r.source, durationS: results.durationS, channels: results.channels.map(({ channel, role, dof, unit, rmsInBand, peak, status, message }) => ({ channel, role, dof, unit, rmsInBand, peak, status, message })) };
  });

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
    hits: {
      total: span?.total ?? 0,
      accepted: span?.accepted ?? 0,
      rejected: span?.rejected ?? 0,
      overridden: span?.overridden ?? 0,
      byReason: reasons.rows.map((r) => ({ code: r.code, n: Number(r.n) })),
      byEngineer,
      firstAt,
      lastAt,
    },
    noise,
    frfs,
    checks,
    modes,
    correlation,
    notes: await notesForHandover(db, campaignId),
  };
}

export type { AcquisitionSettings };
