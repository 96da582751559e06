// Personal API tokens, armed DOFs and the recordings kept as made when an upload was resampled
// (issue 16: hits from an acquisition program through the watched-folder bridge).
import { index, integer, pgTable, primaryKey, text, timestamp, uniqueIndex, uuid } from 'drizzle-orm/pg-core';
import { user } from './auth.ts';
import { campaign, campaignRoles } from './campaign.ts';
import { scheduleEntry } from './plan.ts';
import { bytea } from './hits.ts';

/**
 * A personal API token: one campaign, a role no higher than the user's there. Only the SHA-256
 * of the secret is stored (docs/decisions/bridge-and-api-tokens.md); `prefix` is the first
 * characters of the secret, shown in lists so the user can tell tokens apart.
 */
export const apiToken = pgTable(
  'api_token',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    userId: text('user_id')
      .notNull()
      .references(() => user.id, { onDelete: 'cascade' }),
    campaignId: uuid('campaign_id')
      .notNull()
      .references(() => campaign.id, { onDelete: 'cascade' }),
    name: text('name').notNull(),
    role: text('role', { enum: campaignRoles }).notNull(),
    secretHash: text('secret_hash').notNull(),
    prefix: text('prefix').notNull(),
    expiresAt: timestamp('expires_at', { withTimezone: true }),
    lastUsedAt: timestamp('last_used_at', { withTimezone: true }),
    revokedAt: timestamp('revoked_at', { withTimezone: true }),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [uniqueIndex('api_token_hash_uq').on(t.secretHash), index('api_token_user_idx').on(t.userId)],
);

/** The schedule entry an engineer has armed on Tap: where their next hits (and the bridge's files) go. */
export const armedDof = pgTable(
  'armed_dof',
  {
    campaignId: uuid('campaign_id')
      .notNull()
      .references(() => campaign.id, { onDelete: 'cascade' }),
    userId: text('user_id')
      .notNull()
      .references(() => user.id, { onDelete: 'cascade' }),
    scheduleEntryId: uuid('schedule_entry_id')
      .notNull()
      .references(() => scheduleEntry.id, { onDelete: 'cascade' }),
    armedAt: timestamp('armed_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [primaryKey({ columns: [t.campaignId, t.userId] })],
);

/**
 * An uploaded recording exactly as it was made, kept when its samples were resampled to the
 * campaign's rate before they became hits. `idempotencyKey` is the upload's key: the hits of that
 * upload carry the same key (or key#n).
 */
export const originalRecording = pgTable(
  'original_recording',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    campaignId: uuid('campaign_id')
      .notNull()
      .references(() => campaign.id, { onDelete: 'restrict' }),
    idempotencyKey: text('idempotency_key').notNull(),
    fileName: text('file_name').notNull(),
    sampleRateHz: integer('sample_rate_hz').notNull(),
    resampledToHz: integer('resampled_to_hz').notNull(),
    sha256: text('sha256').notNull(),
    bytes: bytea('bytes').notNull(),
    storedBy: text('stored_by').references(() => user.id, { onDelete: 'set null' }),
    storedAt: timestamp('stored_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [uniqueIndex('original_recording_key_uq').on(t.campaignId, t.idempotencyKey)],
);
