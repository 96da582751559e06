// Which FRFs a modal fit takes when the lead does not pick them (docs/methods.md#fit-selection): the
// entries with accepted hits that belong to the current plan and are not flagged. Shared by the API's
// default and the web form, so both say the same. A flagged entry has its hits in but a mean coherence
// below the campaign's threshold (a loose cable, a bad hit the checks let through); its FRF would enter a
// fit weighted like any other (the estimator scales each response to unit RMS), so it is left out until
// the lead picks it on purpose. Entries measured at a reference the plan no longer has (the reference
// moved after a model-based proposal was accepted) do not form a complete FRF matrix with the new
// reference's entries, so they are left out too.
import { canonicalLabel } from './axis.ts';

export interface FitCandidateEntry {
  id: string;
  responseDof: string;
  excitationDof: string;
  status: string;
  acceptedHits: number;
}

export type FitLeftOutReason = 'flagged' | 'other-reference';

export interface FitSelection {
  /** Entry ids in schedule order. */
  chosen: string[];
  leftOut: { id: string; responseDof: string; excitationDof: string; reason: FitLeftOutReason }[];
}

/**
 * The left-out entries in one sentence, grouped by reason, e.g. "2 flagged for low coherence (P13:+Z, P18:+Z);
 * 13 measured at an earlier reference (P07:+Z)".
 */
export function leftOutSummary(leftOut: FitSelection['leftOut'], testType: 'roving-hammer' | 'roving-response'): string {
  const roving = (e: FitSelection['leftOut'][number]) => (testType === 'roving-hammer' ? e.excitationDof : e.responseDof);
  const fixed = (e: FitSelection['leftOut'][number]) => (testType === 'roving-hammer' ? e.responseDof : e.excitationDof);
  const flagged = leftOut.filter((e) => e.reason === 'flagged');
  const other = leftOut.filter((e) => e.reason === 'other-reference');
  const parts: string[] = [];
  if (flagged.length) parts.push(`${flagged.length} flagged for low coherence (${flagged.map(roving).join(', ')})`);
  if (other.length) parts.push(`${other.length} measured at an earlier reference (${[...new Set(other.map(fixed))].join(', ')})`);
  return parts.join('; ');
}

export function defaultFitSelection(entries: readonly FitCandidateEntry[], campaign: { testType: 'roving-hammer' | 'roving-response'; referenceDofs: readonly string[] }): FitSelection {
  const refs = new Set(campaign.referenceDofs.map(canonicalLabel));
  const out: FitSelection = { chosen: [], leftOut: [] };
  for (const e of entries) {
    if (e.acceptedHits <= 0) continue;
    const referenceSide = campaign.testType === 'roving-hammer' ? e.responseDof : e.excitationDof;
    if (refs.size > 0 && !refs.has(canonicalLabel(referenceSide))) out.leftOut.push({ id: e.id, responseDof: e.responseDof, excitationDof: e.excitationDof, reason: 'other-reference' });
    else if (e.status === 'flagged') out.leftOut.push({ id: e.id, responseDof: e.responseDof, excitationDof: e.excitationDof, reason: 'flagged' });
    else out.chosen.push(e.id);
  }
  return out;
}
