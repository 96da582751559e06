// An archived campaign: read-only everywhere, everything kept. One row while archived; un-archiving
// deletes the row (the audit trail keeps both events). A table of its own rather than a column so
// the campaign's workflow status (planning … handed-over) stays what it was and comes back as is.
import { pgTable, text, timestamp, uuid } from 'drizzle-orm/pg-core';
import { user } from './auth.ts';
import { campaign } from './campaign.ts';

export const campaignArchive = pgTable('campaign_archive', {
  campaignId: uuid('campaign_id')
    .primaryKey()
    .references(() => campaign.id, { onDelete: 'cascade' }),
  archivedAt: timestamp('archived_at', { withTimezone: true }).notNull().defaultNow(),
  archivedBy: text('archived_by').references(() => user.id, { onDelete: 'set null' }),
  reason: text('reason').notNull().default(''),
});
