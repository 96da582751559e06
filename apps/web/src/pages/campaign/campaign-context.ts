// What every campaign tab gets from the campaign layout.
import { useOutletContext } from 'react-router';
import type { Campaign, MyRole } from '../../lib/campaign-data.ts';

export interface CampaignContext {
  campaign: Campaign;
  myRole: MyRole;
  /** Leads and admins change the plan and the kit; everyone else reads. */
  canLead: boolean;
}

export const useCampaignContext = () => useOutletContext<CampaignContext>();
