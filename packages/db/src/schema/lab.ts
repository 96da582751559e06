// The lab's own kit (instance-wide inventory of hammers with tips, accelerometers with per-axis
// sensitivities, and conditioners, each with its calibration history), the bookings by which a
// campaign borrows an item, the campaign's calibration policy, and notes and photos per DOF.
import { sql } from 'drizzle-orm';
import { check, date, doublePrecision, index, integer, jsonb, pgTable, primaryKey, text, timestamp, uniqueIndex, uuid, boolean } from 'drizzle-orm/pg-core';
import { user } from './auth.ts';
import { campaign } from './campaign.ts';
import { scheduleEntry } from './plan.ts';
import { bytea } from './hits.ts';

export const labKinds = ['hammer', 'accelerometer', 'conditioner'] as const;

/** Sensitivity per axis of a triaxial sensor, in base units mV/(m/s²): { X?: n, Y?: n, Z?: n }. */
export type AxisSensitivities = Partial<Record<'X' | 'Y' | 'Z', number>>;

export const labItem = pgTable(
  'lab_item',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    kind: text('kind', { enum: labKinds }).notNull(),
    model: text('model').notNull(),
    serial: text('serial').notNull(),
    /** As entered, in `sensitivity_unit`; null for a conditioner. */
    sensitivity: doublePrecision('sensitivity'),
    sensitivityUnit: text('sensitivity_unit'),
    /** Converted exactly to mV/N (hammer) or mV/(m/s²) (accelerometer). */
    sensitivityBase: doublePrecision('sensitivity_base'),
    /** Per-axis sensitivities of a triaxial accelerometer in mV/(m/s²), when they differ. */
    axisSensitivities: jsonb('axis_sensitivities').$type<AxisSensitivities>().notNull().default({}),
    tips: text('tips').array().notNull().default([]),
    axes: text('axes').array().notNull().default([]),
    notes: text('notes').notNull().default(''),
    retired: boolean('retired').notNull().default(false),
    version: integer('version').notNull().default(1),
    createdBy: text('created_by').references(() => user.id, { onDelete: 'set null' }),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
    updatedAt: timestamp('updated_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [uniqueIndex('lab_item_identity_uq').on(t.kind, sql`lower(${t.model})`, sql`lower(${t.serial})`)],
);

export const labCalibration = pgTable(
  'lab_calibration',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    labItemId: uuid('lab_item_id')
      .notNull()
      .references(() => labItem.id, { onDelete: 'cascade' }),
    calibratedOn: date('calibrated_on', { mode: 'string' }).notNull(),
    dueOn: date('due_on', { mode: 'string' }).notNull(),
    certificateRef: text('certificate_ref').notNull(),
    performedBy: text('performed_by').notNull(),
    sensitivity: doublePrecision('sensitivity'),
    sensitivityUnit: text('sensitivity_unit'),
    axisSensitivities: jsonb('axis_sensitivities').$type<AxisSensitivities>().notNull().default({}),
    recordedBy: text('recorded_by').references(() => user.id, { onDelete: 'set null' }),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [index('lab_calibration_item_idx').on(t.labItemId)],
);

export const labBooking = pgTable(
  'lab_booking',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    labItemId: uuid('lab_item_id')
      .notNull()
      .references(() => labItem.id, { onDelete: 'cascade' }),
    campaignId: uuid('campaign_id')
      .notNull()
      .references(() => campaign.id, { onDelete: 'cascade' }),
    fromOn: date('from_on', { mode: 'string' }).notNull(),
    toOn: date('to_on', { mode: 'string' }).notNull(),
    /** The campaign kit item made from the lab item when it was borrowed. */
    kitItemId: uuid('kit_item_id'),
    bookedBy: text('booked_by').references(() => user.id, { onDelete: 'set null' }),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [index('lab_booking_item_idx').on(t.labItemId), index('lab_booking_campaign_idx').on(t.campaignId), check('lab_booking_dates', sql`${t.toOn} >= ${t.fromOn}`)],
);

export const calibrationPolicies = ['warn', 'block'] as const;

/** What Tap and the hit intake do about an overdue or missing calibration, per campaign. */
export const kitPolicy = pgTable('kit_policy', {
  campaignId: uuid('campaign_id')
    .primaryKey()
    .references(() => campaign.id, { onDelete: 'cascade' }),
  calibration: text('calibration', { enum: calibrationPolicies }).notNull().default('warn'),
  /** A new sensitivity differing from the previous by more than this asks for confirmation (%). */
  changeTolerancePct: doublePrecision('change_tolerance_pct').notNull().default(5),
  version: integer('version').notNull().default(1),
  updatedAt: timestamp('updated_at', { withTimezone: true }).notNull().defaultNow(),
});

/** A note (sensor mounting, tip, anything odd) at a schedule entry, with an optional photo. */
export const dofNote = pgTable(
  'dof_note',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    campaignId: uuid('campaign_id')
      .notNull()
      .references(() => campaign.id, { onDelete: 'cascade' }),
    /** Null once the entry is removed from the plan; the DOF labels below keep the note readable. */
    entryId: uuid('entry_id').references(() => scheduleEntry.id, { onDelete: 'set null' }),
    excitationDof: text('excitation_dof').notNull(),
    responseDof: text('response_dof').notNull(),
    topic: text('topic').notNull().default('other'),
    text: text('text').notNull().default(''),
    authorId: text('author_id').references(() => user.id, { onDelete: 'set null' }),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
    /** Optimistic concurrency for edits (routes/dof-notes-edit.ts); 1 until first edited. */
    version: integer('version').notNull().default(1),
    /** When the text or topic was last edited; null while never edited. */
    editedAt: timestamp('edited_at', { withTimezone: true }),
  },
  (t) => [index('dof_note_entry_idx').on(t.campaignId, t.entryId)],
);

/** The photo of a note, apart so listing notes never reads image bytes. */
export const dofPhoto = pgTable(
  'dof_photo',
  {
    noteId: uuid('note_id')
      .notNull()
      .references(() => dofNote.id, { onDelete: 'cascade' }),
    mime: text('mime').notNull(),
    bytes: bytea('bytes').notNull(),
    size: integer('size').notNull(),
    sha256: text('sha256').notNull(),
  },
  (t) => [primaryKey({ columns: [t.noteId] })],
);
