// Campaigns, members and invitations (design.md, "Who uses it" and "Plan").
import { z } from 'zod';
import { dofLabelSchema, versionSchema } from './common.ts';

export const campaignRoles = ['lead', 'engineer', 'viewer'] as const;
export type CampaignRole = (typeof campaignRoles)[number];
export const campaignStatuses = ['planning', 'testing', 'analysis', 'handed-over'] as const;
export type CampaignStatus = (typeof campaignStatuses)[number];
export const campaignPurposes = ['calibrated-frf', 'quick-survey'] as const;
export const testTypes = ['roving-hammer', 'roving-response'] as const;
/** Structure behind the simulated rig: the demo bar, the demo baseplate, or a beam-like model built from the geometry. */
export const simulatorModels = ['steel-bar', 'pump-skid', 'generic'] as const;
export type TestType = (typeof testTypes)[number];

export const statusLabels: Record<CampaignStatus, string> = {
  planning: 'Planning',
  testing: 'Testing',
  analysis: 'Analysis',
  'handed-over': 'Handed over',
};

const name = z.string().trim().min(1, 'give the campaign a name').max(120);

export const campaignCreateSchema = z.strictObject({
  name,
  structure: z.string().trim().max(200).default(''),
  client: z.string().trim().max(200).default(''),
  purpose: z.enum(campaignPurposes).default('calibrated-frf'),
  testType: z.enum(testTypes).default('roving-hammer'),
  referenceDofs: z.array(dofLabelSchema).max(12).default([]),
  notes: z.string().max(10_000).default(''),
  simulator: z.enum(simulatorModels).default('generic'),
});
export type CampaignCreate = z.infer<typeof campaignCreateSchema>;

export const campaignPatchSchema = z.strictObject({
  version: versionSchema,
  name: name.optional(),
  structure: z.string().trim().max(200).optional(),
  client: z.string().trim().max(200).optional(),
  purpose: z.enum(campaignPurposes).optional(),
  status: z.enum(campaignStatuses).optional(),
  testType: z.enum(testTypes).optional(),
  referenceDofs: z.array(dofLabelSchema).max(12).optional(),
  notes: z.string().max(10_000).optional(),
  simulator: z.enum(simulatorModels).optional(),
});
export type CampaignPatch = z.infer<typeof campaignPatchSchema>;

export const memberPatchSchema = z.strictObject({ version: versionSchema, role: z.enum(campaignRoles) });

export const invitationCreateSchema = z.strictObject({
  email: z.email('enter a valid e-mail address').trim().toLowerCase(),
  role: z.enum(campaignRoles),
});
