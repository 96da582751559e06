// Kit: hammers and accelerometers, calibration records, the channel map, and versioned
// acquisition settings (design.md, "Kit").
import { sql } from 'drizzle-orm';
import { date, doublePrecision, index, integer, jsonb, pgTable, smallint, text, timestamp, uniqueIndex, uuid, boolean } from 'drizzle-orm/pg-core';
import { user } from './auth.ts';
import { campaign } from './campaign.ts';
import { labItem, type AxisSensitivities } from './lab.ts';

export const kitKinds = ['hammer', 'accelerometer'] as const;

export const kitItem = pgTable(
  'kit_item',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    campaignId: uuid('campaign_id')
      .notNull()
      .references(() => campaign.id, { onDelete: 'cascade' }),
    kind: text('kind', { enum: kitKinds }).notNull(),
    model: text('model').notNull(),
    serial: text('serial').notNull(),
    /** As entered, in `sensitivity_unit`. */
    sensitivity: doublePrecision('sensitivity').notNull(),
    sensitivityUnit: text('sensitivity_unit').notNull(),
    /** Converted exactly to mV/N (hammer) or mV/(m/s²) (accelerometer). */
    sensitivityBase: doublePrecision('sensitivity_base').notNull(),
    tips: text('tips').array().notNull().default([]),
    axes: text('axes').array().notNull().default([]),
    massG: doublePrecision('mass_g'),
    /** The lab inventory item this was borrowed from (null: registered in this campaign only). */
    labItemId: uuid('lab_item_id').references(() => labItem.id, { onDelete: 'set null' }),
    /** Per-axis sensitivities of a triaxial sensor in mV/(m/s²); an axis not listed uses sensitivity_base. */
    axisSensitivities: jsonb('axis_sensitivities').$type<AxisSensitivities>().notNull().default({}),
    notes: text('notes').notNull().default(''),
    retired: boolean('retired').notNull().default(false),
    version: integer('version').notNull().default(1),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
    updatedAt: timestamp('updated_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [index('kit_item_campaign_idx').on(t.campaignId), uniqueIndex('kit_item_identity_uq').on(t.campaignId, t.kind, sql`lower(${t.model})`, sql`lower(${t.serial})`)],
);

export const calibrationRecord = pgTable(
  'calibration_record',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    kitItemId: uuid('kit_item_id')
      .notNull()
      .references(() => kitItem.id, { onDelete: 'cascade' }),
    calibratedOn: date('calibrated_on', { mode: 'string' }).notNull(),
    dueOn: date('due_on', { mode: 'string' }).notNull(),
    certificateRef: text('certificate_ref').notNull(),
    performedBy: text('performed_by').notNull(),
    sensitivity: doublePrecision('sensitivity'),
    /** Unit of `sensitivity` as the certificate states it (the item's unit at that time). */
    sensitivityUnit: text('sensitivity_unit'),
    recordedBy: text('recorded_by').references(() => user.id, { onDelete: 'set null' }),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [index('calibration_item_idx').on(t.kitItemId)],
);

export const channel = pgTable(
  'channel',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    campaignId: uuid('campaign_id')
      .notNull()
      .references(() => campaign.id, { onDelete: 'cascade' }),
    channel: smallint('channel').notNull(),
    kitItemId: uuid('kit_item_id')
      .notNull()
      .references(() => kitItem.id, { onDelete: 'restrict' }),
    axis: text('axis'),
    dof: text('dof'),
    sign: smallint('sign').notNull().default(1),
    label: text('label').notNull().default(''),
    version: integer('version').notNull().default(1),
    updatedAt: timestamp('updated_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [uniqueIndex('channel_campaign_number_uq').on(t.campaignId, t.channel)],
);

export const acquisitionSettings = pgTable(
  'acquisition_settings',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    campaignId: uuid('campaign_id')
      .notNull()
      .references(() => campaign.id, { onDelete: 'cascade' }),
    version: integer('version').notNull(),
    settings: jsonb('settings').notNull(),
    reason: text('reason').notNull().default(''),
    createdBy: text('created_by').references(() => user.id, { onDelete: 'set null' }),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [uniqueIndex('settings_campaign_version_uq').on(t.campaignId, t.version)],
);
