// Mail captured by the local SMTP fake (development and test); an admin reads it in the app.
import { pgTable, text, timestamp, uuid } from 'drizzle-orm/pg-core';

export const capturedMail = pgTable('captured_mail', {
  id: uuid('id').primaryKey().defaultRandom(),
  fromAddress: text('from_address').notNull(),
  toAddresses: text('to_addresses').array().notNull(),
  subject: text('subject').notNull(),
  text: text('text').notNull(),
  html: text('html'),
  receivedAt: timestamp('received_at', { withTimezone: true }).notNull().defaultNow(),
});
