// A redo of a schedule entry: its hits so far are set aside (never deleted) and a new set starts.
// One `hit_exclusion` row per hit set aside says who did it, when and why; the averaged FRF, the
// hit counts and the status then read only the hits without such a row.
import { index, pgTable, text, timestamp, uuid } from 'drizzle-orm/pg-core';
import { user } from './auth.ts';
import { campaign } from './campaign.ts';
import { hit } from './hits.ts';
import { scheduleEntry } from './plan.ts';

export const hitExclusion = pgTable(
  'hit_exclusion',
  {
    hitId: uuid('hit_id')
      .primaryKey()
      .references(() => hit.id, { onDelete: 'restrict' }),
    campaignId: uuid('campaign_id')
      .notNull()
      .references(() => campaign.id, { onDelete: 'restrict' }),
    scheduleEntryId: uuid('schedule_entry_id')
      .notNull()
      .references(() => scheduleEntry.id, { onDelete: 'restrict' }),
    /** The redo that set the hit aside: every hit of one redo shares it. */
    redoId: uuid('redo_id').notNull(),
    excludedBy: text('excluded_by').references(() => user.id, { onDelete: 'set null' }),
    reason: text('reason').notNull(),
    excludedAt: timestamp('excluded_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [index('hit_exclusion_entry_idx').on(t.scheduleEntryId)],
);
