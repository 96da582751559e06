// Finite-element model versions of a campaign (issue 19): the uploaded file kept byte for byte, its
// nodes (mm) and modes (Hz, shapes per node and axis), and the stored, editable test point ↔ node map.
import { doublePrecision, index, integer, jsonb, pgTable, text, timestamp, uniqueIndex, uuid } from 'drizzle-orm/pg-core';
import { user } from './auth.ts';
import { campaign } from './campaign.ts';
import { bytea } from './hits.ts';

export const feNormalisationValues = ['mass', 'none'] as const;

/** One uploaded model version. Coordinates and shapes are stored in mm, Hz and kg whatever the file used. */
export const feModel = pgTable(
  'fe_model',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    campaignId: uuid('campaign_id')
      .notNull()
      .references(() => campaign.id, { onDelete: 'cascade' }),
    name: text('name').notNull(),
    /** The lead's label for this version, unique in the campaign ("v1", "after joint update"). */
    versionLabel: text('version_label').notNull(),
    /** { length: 'mm' | 'm', frequency: 'Hz', mass: 'kg' | 't' } as the file stated them. */
    fileUnits: jsonb('file_units').notNull().$type<{ length: string; frequency: string; mass: string }>(),
    normalisation: text('normalisation', { enum: feNormalisationValues }).notNull(),
    sourceFormat: text('source_format', { enum: ['csv', 'json'] }).notNull(),
    sourceFileName: text('source_file_name').notNull().default(''),
    /** The file as uploaded. */
    source: bytea('source').notNull(),
    /** [{ label, x, y, z }] in mm, in file order (the shapes' node order). */
    nodes: jsonb('nodes').notNull().$type<{ label: string; x: number; y: number; z: number }[]>(),
    nodeCount: integer('node_count').notNull(),
    modeCount: integer('mode_count').notNull(),
    /** Version of the point ↔ node map (optimistic concurrency of its edits). */
    mapVersion: integer('map_version').notNull().default(1),
    uploadedBy: text('uploaded_by').references(() => user.id, { onDelete: 'set null' }),
    uploadedAt: timestamp('uploaded_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [uniqueIndex('fe_model_campaign_version_uq').on(t.campaignId, t.versionLabel), index('fe_model_campaign_idx').on(t.campaignId, t.uploadedAt)],
);

/** One mode of a model version. */
export const feMode = pgTable(
  'fe_mode',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    campaignId: uuid('campaign_id')
      .notNull()
      .references(() => campaign.id, { onDelete: 'cascade' }),
    modelId: uuid('model_id')
      .notNull()
      .references(() => feModel.id, { onDelete: 'cascade' }),
    number: integer('number').notNull(),
    frequencyHz: doublePrecision('frequency_hz').notNull(),
    /** φᵀMφ in kg for the shape as stored; null when the file gave none (always null for 'mass'). */
    modalMassKg: doublePrecision('modal_mass_kg'),
    /** Translations per node in node order, [X, Y, Z] each (kg^-½ for normalisation 'mass'). */
    shape: jsonb('shape').notNull().$type<number[]>(),
  },
  (t) => [uniqueIndex('fe_mode_model_number_uq').on(t.modelId, t.number)],
);

/** The stored map of one test point (by label) to one model node, made automatically or edited by the lead. */
export const fePointLink = pgTable(
  'fe_point_link',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    campaignId: uuid('campaign_id')
      .notNull()
      .references(() => campaign.id, { onDelete: 'cascade' }),
    modelId: uuid('model_id')
      .notNull()
      .references(() => feModel.id, { onDelete: 'cascade' }),
    pointLabel: text('point_label').notNull(),
    /** Null: the point has no node in this model. */
    nodeLabel: text('node_label'),
    distanceMm: doublePrecision('distance_mm'),
    /** 'label', 'nearest' or 'manual'. */
    source: text('source', { enum: ['label', 'nearest', 'manual'] }).notNull(),
  },
  (t) => [uniqueIndex('fe_point_link_model_point_uq').on(t.modelId, t.pointLabel)],
);
