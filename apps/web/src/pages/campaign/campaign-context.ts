// What every campaign tab gets from the campaign layout.
import { useOutletContext } from 'react-router';
import type { Campaign, MyRole } from '../../lib/campaign-data.ts';

export interface CampaignContext {
  campaign: Campaign;
  myRole: MyRole;
  /** Leads and admins change the plan and the kit; everyone else reads. False while the campaign is archived. */
  canLead: boolean;
  /** The caller leads the campaign (or is admin), archived or not: exports and the archive controls. */
  isLead: boolean;
  /** Archived: read-only for everyone. */
  archived: boolean;
}

export const useCampaignContext = () => useOutletContext<CampaignContext>();
