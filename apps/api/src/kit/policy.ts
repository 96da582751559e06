// The campaign's calibration policy (warn or block on an overdue or missing calibration) and the
// confirmation a large sensitivity change needs (design.md "Kit"; docs/methods.md#units).
import { desc, eq, inArray } from 'drizzle-orm';
import { calibrationState, DEFAULT_CHANGE_TOLERANCE_PCT, largeSensitivityChange, type CalibrationPolicy, type CalibrationState, type SensitivityChange } from '@resonote/contracts';
import { calibrationRecord, channel, kitItem, kitPolicy } from '@resonote/db/schema';
import type { Db } from '@resonote/db/client';
import type { Tx } from '../http/audit.ts';
import { HttpError } from '../errors.ts';
import type { ChannelSnapshot } from '../hits/channel-map.ts';

export interface KitPolicy {
  calibration: CalibrationPolicy;
  changeTolerancePct: number;
  /** 0 while the campaign has the defaults (no row yet). */
  version: number;
}

export const DEFAULT_KIT_POLICY: KitPolicy = { calibration: 'warn', changeTolerancePct: DEFAULT_CHANGE_TOLERANCE_PCT, version: 0 };

export async function kitPolicyOf(db: Db | Tx, campaignId: string): Promise<KitPolicy> {
  const [row] = await db.select().from(kitPolicy).where(eq(kitPolicy.campaignId, campaignId));
  return row ? { calibration: row.calibration, changeTolerancePct: row.changeTolerancePct, version: row.version } : DEFAULT_KIT_POLICY;
}

/** Today as YYYY-MM-DD (UTC), the reference day for calibration states. */
const todayISO = () => new Date().toISOString().slice(0, 10);

const plural = (n: number, word: string) => `${n} ${word}${n === 1 ? '' : 's'}`;

export interface ChannelCalibration {
  channel: number;
  kitItemId: string;
  kind: 'hammer' | 'accelerometer';
  model: string;
  serial: string;
  axis: string | null;
  state: CalibrationState;
  days: number | null;
  dueOn: string | null;
  /** In words, for an overdue or missing calibration; null otherwise. */
  problem: string | null;
}

function problemOf(c: Omit<ChannelCalibration, 'problem'>): string | null {
  const who = `Channel ${c.channel} (${c.kind} ${c.model}, SN ${c.serial})`;
  if (c.state === 'none') return `${who} has no calibration record.`;
  if (c.state === 'overdue') return `${who}: calibration overdue by ${plural(-c.days!, 'day')} (due ${c.dueOn}).`;
  return null;
}

/** Every channel of the campaign with its sensor's newest calibration and its state today. */
export async function channelCalibrations(db: Db | Tx, campaignId: string, today = todayISO()): Promise<ChannelCalibration[]> {
  const rows = await db
    .select({ channel: channel.channel, axis: channel.axis, kitItemId: kitItem.id, kind: kitItem.kind, model: kitItem.model, serial: kitItem.serial })
    .from(channel)
    .innerJoin(kitItem, eq(kitItem.id, channel.kitItemId))
    .where(eq(channel.campaignId, campaignId))
    .orderBy(channel.channel);
  if (!rows.length) return [];
  const records = await db
    .select({ kitItemId: calibrationRecord.kitItemId, dueOn: calibrationRecord.dueOn })
    .from(calibrationRecord)
    .where(inArray(calibrationRecord.kitItemId, [...new Set(rows.map((r) => r.kitItemId))]))
    .orderBy(desc(calibrationRecord.calibratedOn), desc(calibrationRecord.createdAt));
  const due = new Map<string, string>();
  for (const r of records) if (!due.has(r.kitItemId)) due.set(r.kitItemId, r.dueOn);
  return rows.map((r) => {
    const dueOn = due.get(r.kitItemId) ?? null;
    const { state, days } = calibrationState(dueOn, today);
    const base = { ...r, state, days, dueOn };
    return { ...base, problem: problemOf(base) };
  });
}

/**
 * With the campaign's policy at "block", refuses a hit while any channel of the recording has an
 * overdue or missing calibration: 409 `calibration-blocked`, the channels in details. Nothing is
 * stored. With "warn" it lets the hit through (Tap shows the warning before the first hit).
 */
export async function refuseUncalibrated(db: Db, campaignId: string, map: ChannelSnapshot[], today = todayISO()): Promise<void> {
  const policy = await kitPolicyOf(db, campaignId);
  if (policy.calibration !== 'block') return;
  const problems = map
    .map((m) => {
      const { state, days } = calibrationState(m.calibration?.dueOn ?? null, today);
      const kind = m.role === 'force' ? 'hammer' : 'accelerometer';
      const problem = problemOf({ channel: m.channel, kitItemId: m.kitItemId, kind, model: m.model, serial: m.serial, axis: null, state, days, dueOn: m.calibration?.dueOn ?? null });
      return problem ? { channel: m.channel, kitItemId: m.kitItemId, state, dueOn: m.calibration?.dueOn ?? null, message: problem } : null;
    })
    .filter((p) => p !== null);
  if (!problems.length) return;
  throw new HttpError(
    409,
    'calibration-blocked',
    `This campaign does not take hits with an overdue or missing calibration (the lead's setting in Kit). ${problems.map((p) => p.message).join(' ')} Record the new certificate in Kit, or ask the lead to switch the policy to "warn". Nothing was stored.`,
    { policy: 'block', channels: problems },
  );
}

const sig = (v: number) => Number(v.toPrecision(4)).toString();
const both = (values: SensitivityChange['previous']) => `${sig(values[0]!.value)} ${values[0]!.unit} = ${sig(values[1]!.value)} ${values[1]!.unit}`;

/**
 * Refuses a new sensitivity that differs from the previous by more than the tolerance unless the
 * caller confirms it: 409 `large-sensitivity-change` with both values in both units in details.
 */
export function refuseLargeChange(name: string, kind: 'hammer' | 'accelerometer', previousBase: number, nextBase: number, tolerancePct: number, confirmed: boolean | undefined): SensitivityChange | null {
  const change = largeSensitivityChange(previousBase, nextBase, kind, tolerancePct);
  if (!change || confirmed === true) return change;
  throw new HttpError(
    409,
    'large-sensitivity-change',
    `${name}: the new sensitivity ${both(change.next)} differs from the previous ${both(change.previous)} by ${change.changePct.toFixed(1)} %, more than the ${sig(tolerancePct)} % tolerance. Check the value and its unit; to store it anyway, send it again with confirmLargeChange: true. Nothing was changed.`,
    change,
  );
}
