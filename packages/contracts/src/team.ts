// The team around a campaign: adding an existing account, answering invitations in the app,
// archiving and deleting a campaign, and the campaign list's status filter.
import { z } from 'zod';
import { campaignRoles, campaignStatuses } from './campaign.ts';
import { versionSchema } from './common.ts';

/** A lead adds someone who already has an account here, by the address they sign in with. */
export const memberAddSchema = z.strictObject({
  email: z.email('enter a valid e-mail address').trim().toLowerCase(),
  role: z.enum(campaignRoles),
});

export const campaignArchiveSchema = z.strictObject({
  version: versionSchema,
  reason: z.string().trim().max(500).default(''),
});

export const campaignUnarchiveSchema = z.strictObject({ version: versionSchema });

/** `DELETE /campaigns/:id?version=` — the version read, so a campaign changed meanwhile is not deleted blind. */
export const campaignDeleteQuerySchema = z.strictObject({ version: z.coerce.number().int().positive() });

/** Filters of the campaign list: one workflow status, `active` (not archived, the default), `archived`, or `all`. */
export const campaignListFilters = ['active', 'archived', 'all', ...campaignStatuses] as const;
export type CampaignListFilter = (typeof campaignListFilters)[number];
export const campaignListFilterLabels: Record<CampaignListFilter, string> = {
  active: 'Active (not archived)',
  archived: 'Archived',
  all: 'All',
  planning: 'Planning',
  testing: 'Testing',
  analysis: 'Analysis',
  'handed-over': 'Handed over',
};
