// Hits: the raw record of the test. Never deleted; a rejected hit keeps its reason.
import { customType, index, integer, jsonb, pgTable, primaryKey, text, timestamp, uniqueIndex, uuid, doublePrecision } from 'drizzle-orm/pg-core';
import { user } from './auth.ts';
import { campaign } from './campaign.ts';
import { scheduleEntry } from './plan.ts';

export const bytea = customType<{ data: Buffer; driverData: Buffer }>({
  dataType: () => 'bytea',
});

export const verdicts = ['accept', 'reject'] as const;

export const hit = pgTable(
  'hit',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    campaignId: uuid('campaign_id')
      .notNull()
      .references(() => campaign.id, { onDelete: 'restrict' }),
    scheduleEntryId: uuid('schedule_entry_id')
      .notNull()
      .references(() => scheduleEntry.id, { onDelete: 'restrict' }),
    sequence: integer('sequence').notNull(),
    settingsVersion: integer('settings_version').notNull(),
    sampleRateHz: doublePrecision('sample_rate_hz').notNull(),
    samplesPerChannel: integer('samples_per_channel').notNull(),
    /** Snapshot of the channel map and calibration used: channel, kit item, sensitivity, DOF, sign, unit. */
    channels: jsonb('channels').notNull(),
    /** float32 little-endian, channel after channel (force first), engineering units. */
    samples: bytea('samples').notNull(),
    source: text('source').notNull(),
    idempotencyKey: text('idempotency_key').notNull(),
    autoVerdict: text('auto_verdict', { enum: verdicts }).notNull(),
    verdict: text('verdict', { enum: verdicts }).notNull(),
    reasons: jsonb('reasons').notNull(),
    metrics: jsonb('metrics').notNull(),
    overrideNote: text('override_note'),
    overriddenBy: text('overridden_by').references(() => user.id, { onDelete: 'set null' }),
    version: integer('version').notNull().default(1),
    recordedBy: text('recorded_by').references(() => user.id, { onDelete: 'set null' }),
    recordedAt: timestamp('recorded_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [uniqueIndex('hit_idempotency_uq').on(t.campaignId, t.idempotencyKey), index('hit_entry_idx').on(t.scheduleEntryId, t.sequence)],
);

/**
 * Averaged spectra of one schedule entry, recomputable from its accepted hits and the settings.
 * `inputHash` covers the accepted hit ids (and their verdict versions) and the settings version,
 * so a stale result is never served. Arrays are float64 little-endian (see apps/api/src/hits/results.ts).
 */
export const frfResult = pgTable(
  'frf_result',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    campaignId: uuid('campaign_id')
      .notNull()
      .references(() => campaign.id, { onDelete: 'cascade' }),
    scheduleEntryId: uuid('schedule_entry_id')
      .notNull()
      .references(() => scheduleEntry.id, { onDelete: 'cascade' }),
    inputHash: text('input_hash').notNull(),
    settingsVersion: integer('settings_version').notNull(),
    hitIds: uuid('hit_ids').array().notNull(),
    averages: integer('averages').notNull(),
    sampleRateHz: doublePrecision('sample_rate_hz').notNull(),
    samples: integer('samples').notNull(),
    /** Per response channel: DOF, sign, unit, mean coherence over the band. */
    channels: jsonb('channels').notNull(),
    data: bytea('data').notNull(),
    computedAt: timestamp('computed_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [uniqueIndex('frf_result_entry_uq').on(t.scheduleEntryId)],
);

/**
 * A background-noise check: seconds recorded with nobody touching the structure, before or between
 * hits. Kept like a hit (raw samples, channel map snapshot, who and when), never deleted; `results`
 * holds the per-channel reading (RMS in the band, peak, tones, the words shown on Tap).
 */
export const noiseCheck = pgTable(
  'noise_check',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    campaignId: uuid('campaign_id')
      .notNull()
      .references(() => campaign.id, { onDelete: 'restrict' }),
    settingsVersion: integer('settings_version').notNull(),
    sampleRateHz: doublePrecision('sample_rate_hz').notNull(),
    samplesPerChannel: integer('samples_per_channel').notNull(),
    /** Snapshot of the channel map and calibration used, as for a hit. */
    channels: jsonb('channels').notNull(),
    /** float32 little-endian, channel after channel (force first), engineering units. */
    samples: bytea('samples').notNull(),
    source: text('source').notNull(),
    idempotencyKey: text('idempotency_key').notNull(),
    /** Band (Hz) and per-channel reading: mean, RMS, RMS in band, peak, tones, status and message. */
    results: jsonb('results').notNull(),
    recordedBy: text('recorded_by').references(() => user.id, { onDelete: 'set null' }),
    recordedAt: timestamp('recorded_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [uniqueIndex('noise_check_idempotency_uq').on(t.campaignId, t.idempotencyKey), index('noise_check_campaign_idx').on(t.campaignId, t.recordedAt)],
);

export const uploadKeyPurposes = ['hits', 'noise-check'] as const;

/**
 * One Idempotency-Key per campaign, matched exactly: what it stored (the hits of one recording, or
 * one background-noise check), for which schedule entry, and the SHA-256 of the request that
 * carried it. A retry with the same key and the same request replays the first answer; the same
 * key with another recording or another entry is refused. `request_sha256` is null for keys
 * stored before it was recorded (those replay by key and entry only).
 */
export const uploadKey = pgTable(
  'upload_key',
  {
    campaignId: uuid('campaign_id')
      .notNull()
      .references(() => campaign.id, { onDelete: 'cascade' }),
    key: text('key').notNull(),
    purpose: text('purpose', { enum: uploadKeyPurposes }).notNull(),
    scheduleEntryId: uuid('schedule_entry_id').references(() => scheduleEntry.id, { onDelete: 'cascade' }),
    requestSha256: text('request_sha256'),
    /** The hits the key stored, in sequence order (purpose hits). */
    hitIds: uuid('hit_ids').array().notNull().default([]),
    /** The check the key stored (purpose noise-check). */
    noiseCheckId: uuid('noise_check_id').references(() => noiseCheck.id, { onDelete: 'cascade' }),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [primaryKey({ name: 'upload_key_pk', columns: [t.campaignId, t.key] })],
);
