// Schedule entries a lead added beside the generated plan, e.g. the reciprocal of an entry for a
// reciprocity check (H_ji beside H_ij). "Generate" keeps them: they are not in the plan it builds
// from the test type, so without this mark it would remove them as stale.
import { pgTable, text, timestamp, uuid } from 'drizzle-orm/pg-core';
import { user } from './auth.ts';
import { scheduleEntry } from './plan.ts';

export const scheduleExtra = pgTable('schedule_extra', {
  entryId: uuid('entry_id')
    .primaryKey()
    .references(() => scheduleEntry.id, { onDelete: 'cascade' }),
  /** Why the entry is there: 'reciprocal' (of `ofEntryId`). */
  purpose: text('purpose', { enum: ['reciprocal'] }).notNull(),
  ofEntryId: uuid('of_entry_id').references(() => scheduleEntry.id, { onDelete: 'set null' }),
  addedBy: text('added_by').references(() => user.id, { onDelete: 'set null' }),
  addedAt: timestamp('added_at', { withTimezone: true }).notNull().defaultNow(),
});
