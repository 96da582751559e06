// The validity checks of a campaign (docs/methods.md#validity-checks), computed in one place for
// GET …/checks and the hand-over: reciprocity pairs H_ij / H_ji on the H1 of the main channels,
// both on the positive axes; linearity splits each entry's accepted hits by peak force
// (hits/checks.ts `entryLinearity`).
import { AXIS_CONVENTION } from '@resonote/contracts';
import type { Db } from '@resonote/db/client';
import { listScheduleEntries } from '../plan/schedule-list.ts';
import { compareFrfs, entryLinearity, isReciprocal, onPositiveAxis, type Comparison, type Linearity } from './checks.ts';
import { currentSettings, type CurrentSettings } from './current-settings.ts';
import { entryResult, mainChannel, type EntryResult } from './entry-result.ts';

/** Why there is no pass/fail line, said beside every check report. */
export const VALIDITY_CHECKS_NOTE =
  'No normative pass/fail threshold exists for these checks (reciprocity and linearity checks as in Ewins 2000, Modal Testing, ch. 3); each lab sets its own. FRAC is blind to a constant factor, so read it together with the dB differences.';

type DofPair = { response: string; excitation: string };

export interface ValidityChecks {
  reciprocity: ({ a: DofPair; b: DofPair; axisConvention: string } & Comparison)[];
  linearity: ({ entry: DofPair } & Linearity)[];
  note: string;
}

type EntryDofs = { id: string; responseDof: string; excitationDof: string };

/** An entry with its averaged FRF and the index of its main channel. */
export interface EntryWithResult<E extends EntryDofs = EntryDofs> {
  entry: E;
  result: EntryResult;
  /** Index of the response channel that measures the entry's own response DOF. */
  main: number;
}

/** Both checks over entries that have a result, in schedule order. */
export async function validityChecks(db: Db, frfs: readonly EntryWithResult[], settings: CurrentSettings): Promise<ValidityChecks> {
  const s = settings.settings;
  const label = (e: EntryWithResult['entry']) => ({ response: e.responseDof, excitation: e.excitationDof });
  const positive = (x: EntryWithResult) => onPositiveAxis(x.result.frf.h1[x.main]!, x.entry.responseDof, x.entry.excitationDof);
  const reciprocity: ValidityChecks['reciprocity'] = [];
  for (const a of frfs) {
    // The reciprocal pair by physical axis, whatever the written signs (contracts/axis.ts).
    const b = frfs.find((x) => isReciprocal(a.entry, x.entry) && x.entry.id !== a.entry.id);
    if (!b || a.entry.id > b.entry.id || a.result.samples !== b.result.samples) continue;
    // Both FRFs on the positive axes before they are compared: H(i,−d) = −H(i,+d).
    reciprocity.push({ a: label(a.entry), b: label(b.entry), axisConvention: AXIS_CONVENTION, ...compareFrfs(positive(a), positive(b), a.result.frf.f, s.bandHz) });
  }
  const linearity: ValidityChecks['linearity'] = [];
  for (const x of frfs) {
    const result = await entryLinearity(db, x.entry.id, x.entry.responseDof, settings);
    if (result) linearity.push({ entry: label(x.entry), ...result });
  }
  return { reciprocity, linearity, note: VALIDITY_CHECKS_NOTE };
}

/** The entries of `schedule` (in its order) that have a result, with that result. */
export async function entriesWithResults<E extends EntryDofs & { acceptedHits: number }>(db: Db, campaignId: string, settings: CurrentSettings, schedule: readonly E[]): Promise<EntryWithResult<E>[]> {
  const out: EntryWithResult<E>[] = [];
  for (const entry of schedule) {
    if (entry.acceptedHits === 0) continue;
    const result = await entryResult(db, campaignId, entry.id, settings);
    if (result) out.push({ entry, result, main: mainChannel(result.channels, entry.responseDof) });
  }
  return out;
}

/** GET …/checks: both checks over the campaign's whole schedule. */
export async function campaignChecks(db: Db, campaignId: string): Promise<ValidityChecks> {
  const settings = await currentSettings(db, campaignId);
  return validityChecks(db, await entriesWithResults(db, campaignId, settings, await listScheduleEntries(db, campaignId)), settings);
}
