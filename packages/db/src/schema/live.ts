// Live input (issue "Live capture"): the scaling of each acquisition channel of an audio-class
// interface (volts at digital full scale, the interface's AC-coupling low cut-off) and the
// calibrator checks of a sensor's sensitivity made through it (docs/methods.md#input-scaling).
import { doublePrecision, index, integer, pgTable, text, timestamp, uniqueIndex, uuid } from 'drizzle-orm/pg-core';
import { user } from './auth.ts';
import { campaign } from './campaign.ts';
import { channel, kitItem } from './kit.ts';

/** One row per channel of the channel map that has been given an input scaling. */
export const channelInput = pgTable(
  'channel_input',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    campaignId: uuid('campaign_id')
      .notNull()
      .references(() => campaign.id, { onDelete: 'cascade' }),
    channelId: uuid('channel_id')
      .notNull()
      .references(() => channel.id, { onDelete: 'cascade' }),
    /** Volts at digital full scale (sample value ±1.0). */
    fullScaleVolts: doublePrecision('full_scale_volts').notNull(),
    /** The interface's AC-coupling low cut-off (−3 dB), Hz; null when not known. */
    acLowCutHz: doublePrecision('ac_low_cut_hz'),
    version: integer('version').notNull().default(1),
    updatedAt: timestamp('updated_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [uniqueIndex('channel_input_channel_uq').on(t.channelId)],
);

/** A handheld-calibrator check of a response sensor's sensitivity, recorded through the live input. */
export const sensitivityCheck = pgTable(
  'sensitivity_check',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    campaignId: uuid('campaign_id')
      .notNull()
      .references(() => campaign.id, { onDelete: 'cascade' }),
    channelId: uuid('channel_id').references(() => channel.id, { onDelete: 'set null' }),
    channelNumber: integer('channel_number').notNull(),
    kitItemId: uuid('kit_item_id').references(() => kitItem.id, { onDelete: 'set null' }),
    /** The calibrator's level (m/s² RMS) and frequency (Hz) as entered. */
    referenceMs2Rms: doublePrecision('reference_ms2_rms').notNull(),
    referenceHz: doublePrecision('reference_hz').notNull(),
    /** What the recording gave: RMS volts at the calibrator's frequency, and the frequency found. */
    measuredVoltsRms: doublePrecision('measured_volts_rms').notNull(),
    measuredHz: doublePrecision('measured_hz').notNull(),
    fullScaleVolts: doublePrecision('full_scale_volts').notNull(),
    sampleRateHz: doublePrecision('sample_rate_hz').notNull(),
    durationS: doublePrecision('duration_s').notNull(),
    /** mV/(m/s²): measured, the kit's at the time, deviation (measured − kit)/kit in % and dB. */
    measuredSensitivity: doublePrecision('measured_sensitivity').notNull(),
    kitSensitivity: doublePrecision('kit_sensitivity').notNull(),
    deviationPercent: doublePrecision('deviation_percent').notNull(),
    deviationDb: doublePrecision('deviation_db').notNull(),
    note: text('note').notNull().default(''),
    checkedBy: text('checked_by').references(() => user.id, { onDelete: 'set null' }),
    checkedAt: timestamp('checked_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [index('sensitivity_check_campaign_idx').on(t.campaignId, t.checkedAt)],
);
