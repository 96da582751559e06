// Campaigns and per-campaign roles (design.md, "Who uses it"). A person's role is per campaign;
// the instance role (admin) lives on the user row.
import { index, integer, pgTable, primaryKey, text, timestamp, uuid } from 'drizzle-orm/pg-core';
import { user } from './auth.ts';

export const campaignRoles = ['lead', 'engineer', 'viewer'] as const;
export type CampaignRole = (typeof campaignRoles)[number];

export const campaignStatuses = ['planning', 'testing', 'analysis', 'handed-over'] as const;
export const campaignPurposes = ['calibrated-frf', 'quick-survey'] as const;
export const testTypes = ['roving-hammer', 'roving-response'] as const;
export const simulatorModels = ['steel-bar', 'pump-skid', 'generic'] as const;

export const campaign = pgTable('campaign', {
  id: uuid('id').primaryKey().defaultRandom(),
  name: text('name').notNull(),
  structure: text('structure').notNull().default(''),
  client: text('client').notNull().default(''),
  purpose: text('purpose', { enum: campaignPurposes }).notNull().default('calibrated-frf'),
  status: text('status', { enum: campaignStatuses }).notNull().default('planning'),
  testType: text('test_type', { enum: testTypes }).notNull().default('roving-hammer'),
  referenceDofs: text('reference_dofs').array().notNull().default([]),
  lengthUnit: text('length_unit').notNull().default('mm'),
  notes: text('notes').notNull().default(''),
  /** Structure model behind the "simulated rig" hit source. */
  simulator: text('simulator', { enum: simulatorModels }).notNull().default('generic'),
  version: integer('version').notNull().default(1),
  createdBy: text('created_by').references(() => user.id, { onDelete: 'set null' }),
  createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  updatedAt: timestamp('updated_at', { withTimezone: true }).notNull().defaultNow(),
});

export const campaignMember = pgTable(
  'campaign_member',
  {
    campaignId: uuid('campaign_id')
      .notNull()
      .references(() => campaign.id, { onDelete: 'cascade' }),
    userId: text('user_id')
      .notNull()
      .references(() => user.id, { onDelete: 'cascade' }),
    role: text('role', { enum: campaignRoles }).notNull(),
    version: integer('version').notNull().default(1),
    addedAt: timestamp('added_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [primaryKey({ columns: [t.campaignId, t.userId] })],
);

/** An invitation mailed by a lead: a link that signs up or joins. Only a hash of the token is stored. */
export const campaignInvitation = pgTable(
  'campaign_invitation',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    campaignId: uuid('campaign_id')
      .notNull()
      .references(() => campaign.id, { onDelete: 'cascade' }),
    email: text('email').notNull(),
    role: text('role', { enum: campaignRoles }).notNull(),
    tokenHash: text('token_hash').notNull().unique(),
    invitedBy: text('invited_by').references(() => user.id, { onDelete: 'set null' }),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
    expiresAt: timestamp('expires_at', { withTimezone: true }).notNull(),
    acceptedAt: timestamp('accepted_at', { withTimezone: true }),
    acceptedBy: text('accepted_by').references(() => user.id, { onDelete: 'set null' }),
    revokedAt: timestamp('revoked_at', { withTimezone: true }),
  },
  (t) => [index('campaign_invitation_campaign_idx').on(t.campaignId)],
);
