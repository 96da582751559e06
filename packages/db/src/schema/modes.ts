// Modal fits: a background job over chosen FRFs and a band, its stabilization diagram, and the
// modes the lead picked from it (design.md, "Modes").
import { index, integer, jsonb, pgTable, real, text, timestamp, uuid } from 'drizzle-orm/pg-core';
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
    createdBy: text('created_by').references(() => user.id, { onDelete: 'set null' }),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
    finishedAt: timestamp('finished_at', { withTimezone: true }),
    elapsedMs: integer('elapsed_ms'),
  },
  (t) => [index('modal_fit_campaign_idx').on(t.campaignId, t.createdAt)],
);
