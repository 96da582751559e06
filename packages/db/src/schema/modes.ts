// Modal fits: a background job over chosen FRFs and a band, its stabilization diagram, and the
// modes the lead picked from it (design.md, "Modes").
import { boolean, doublePrecision, index, integer, jsonb, pgTable, real, text, timestamp, uuid } from 'drizzle-orm/pg-core';
import { user } from './auth.ts';
import { campaign } from './campaign.ts';

export const fitStatuses = ['queued', 'running', 'done', 'failed'] as const;

export const modalFit = pgTable(
  'modal_fit',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    campaignId: uuid('campaign_id')
      .notNull()
      .references(() => campaign.id, { onDelete: 'cascade' }),
    status: text('status', { enum: fitStatuses }).notNull().default('queued'),
    progress: real('progress').notNull().default(0),
    message: text('message').notNull().default(''),
    /** Hash of the settings version, the FRF results used and the options: an identical request reuses the fit. */
    inputHash: text('input_hash').notNull(),
    /** { entryIds, bandHz, orders, tolerances, kind, settingsVersion, resultHashes }. */
    request: jsonb('request').notNull(),
    /** { cmif, diagram } once done. */
    result: jsonb('result'),
    /** The modes chosen from the diagram, with shapes, MPC, MAC matrix and the window correction applied. */
    modes: jsonb('modes'),
    /** The poles the lead has chosen but not yet computed shapes for ({ order, index }[]), kept so a reload loses nothing. */
    draft: jsonb('draft'),
    /** Optimistic concurrency of the draft. */
    draftVersion: integer('draft_version').notNull().default(1),
    createdBy: text('created_by').references(() => user.id, { onDelete: 'set null' }),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
    finishedAt: timestamp('finished_at', { withTimezone: true }),
    elapsedMs: integer('elapsed_ms'),
  },
  (t) => [index('modal_fit_campaign_idx').on(t.campaignId, t.createdAt)],
);

/** One mode table per campaign (design.md, "Mode table"): its version guards every add and remove. */
export const modeTable = pgTable('mode_table', {
  campaignId: uuid('campaign_id')
    .primaryKey()
    .references(() => campaign.id, { onDelete: 'cascade' }),
  version: integer('version').notNull().default(1),
  updatedAt: timestamp('updated_at', { withTimezone: true }).notNull().defaultNow(),
});

/**
 * A row of the campaign's mode table: one mode taken from one fit's computed modes, with what makes it
 * traceable (fit, band, references, order, input hash) and what the hand-over shows. Shapes are on the
 * positive axis of each point (contracts/axis.ts).
 */
export const modeTableRow = pgTable(
  'mode_table_row',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    campaignId: uuid('campaign_id')
      .notNull()
      .references(() => campaign.id, { onDelete: 'cascade' }),
    /** The fit the mode was taken from; the row stays if that fit is gone (its number is kept in trace). */
    fitId: uuid('fit_id').references(() => modalFit.id, { onDelete: 'set null' }),
    bandLowHz: doublePrecision('band_low_hz').notNull(),
    bandHighHz: doublePrecision('band_high_hz').notNull(),
    references: jsonb('references').notNull().$type<string[]>(),
    modelOrder: integer('model_order').notNull(),
    poleIndex: integer('pole_index').notNull(),
    /** The fit's input hash (settings version, FRF input hashes and options). */
    inputHash: text('input_hash').notNull(),
    fHz: doublePrecision('f_hz').notNull(),
    /** Damping ratio in % of critical as estimated and after the exponential-window correction. */
    zetaPercentRaw: doublePrecision('zeta_percent_raw').notNull(),
    zetaPercent: doublePrecision('zeta_percent').notNull(),
    mpc: doublePrecision('mpc').notNull(),
    /** Unit-normalised shape: [{ dof, re, im, real }] with the largest entry 1. */
    shape: jsonb('shape').notNull(),
    /** Mass-normalised shape (unit modal mass, 1/√kg) where the fit had a driving point, else null. */
    massShape: jsonb('mass_shape'),
    massNote: text('mass_note').notNull().default(''),
    /** The fitted pole and residues of this mode, for synthesis over the whole band. */
    model: jsonb('model').notNull(),
    /** Set when another row holds the same mode (frequency within tolerance and MAC ≥ 0.9). */
    duplicate: boolean('duplicate').notNull().default(false),
    duplicateOf: uuid('duplicate_of'),
    duplicateNote: text('duplicate_note').notNull().default(''),
    addedBy: text('added_by').references(() => user.id, { onDelete: 'set null' }),
    addedAt: timestamp('added_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [index('mode_table_row_campaign_idx').on(t.campaignId, t.fHz)],
);
