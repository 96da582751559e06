// Accepting a model-based plan can move the reference (fe-models accept). In a roving-hammer test the
// accelerometer sits at the reference: its channel carries that DOF (hits/channel-map.ts takes the
// channel's DOF over the entry's), so a channel left at the old reference would record the new entries'
// hits at the old point under the old label — the schedule would say one DOF and the recording another,
// and the fit would drop them as repeats of the old entries. So the channel moves with the reference,
// in the same transaction, audited; the lead is told to move the sensor.
import { and, eq } from 'drizzle-orm';
import { canonicalDof, canonicalLabel } from '@resonote/contracts';
import { channel, kitItem } from '@resonote/db/schema';
import { audit, type Tx } from '../http/audit.ts';

export interface ChannelMove {
  channel: number;
  from: string;
  to: string;
}

/**
 * Moves the one accelerometer channel fixed at a former reference DOF to `next` (roving hammer only).
 * Leaves the map as it is, and says why, when no channel or several are at the former references or the
 * axis would change (then the lead sets the channel map in Kit).
 */
export async function moveReferenceChannel(tx: Tx, input: { campaignId: string; actorId: string; testType: string; before: readonly string[]; next: string }): Promise<{ moved: ChannelMove[]; note: string | null }> {
  const none = { moved: [], note: null };
  if (input.testType !== 'roving-hammer') return none;
  const old = new Set(input.before.map(canonicalLabel));
  const to = canonicalDof(input.next);
  if (!to || old.has(to.canonical)) return none;
  const rows = await tx
    .select({ ch: channel })
    .from(channel)
    .innerJoin(kitItem, eq(kitItem.id, channel.kitItemId))
    .where(and(eq(channel.campaignId, input.campaignId), eq(kitItem.kind, 'accelerometer')));
  if (rows.some((r) => r.ch.dof && canonicalLabel(r.ch.dof) === to.canonical)) return none;
  const atOld = rows.filter((r) => r.ch.dof && old.has(canonicalLabel(r.ch.dof)));
  if (atOld.length !== 1) {
    return atOld.length === 0 ? none : { moved: [], note: `${atOld.length} accelerometer channels are at the former reference DOFs; set the one for ${input.next} in Kit → channels before testing.` };
  }
  const before = atOld[0]!.ch;
  const from = before.dof!;
  if (before.axis && before.axis !== to.axis) return { moved: [], note: `Channel ${before.channel} measures along ${before.axis}, the new reference ${input.next} along ${to.axis}: set the channel map in Kit before testing.` };
  const [after] = await tx
    .update(channel)
    .set({ dof: input.next, label: before.label.includes(from) ? before.label.replace(from, input.next) : before.label, version: before.version + 1, updatedAt: new Date() })
    .where(eq(channel.id, before.id))
    .returning();
  await audit(tx, { campaignId: input.campaignId, actorId: input.actorId, entity: 'channel', entityId: before.id, action: 'update', before, after });
  return { moved: [{ channel: before.channel, from, to: input.next }], note: `Channel ${before.channel} (accelerometer) now measures at ${input.next}: move the sensor from ${from} before the next hit.` };
}
