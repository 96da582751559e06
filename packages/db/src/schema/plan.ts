// Geometry and the point schedule (design.md, "Plan").
import { sql } from 'drizzle-orm';
import { boolean, doublePrecision, index, integer, pgTable, text, timestamp, uniqueIndex, uuid } from 'drizzle-orm/pg-core';
import { user } from './auth.ts';
import { campaign } from './campaign.ts';

export const directions = ['+X', '-X', '+Y', '-Y', '+Z', '-Z'] as const;
export const scheduleStatuses = ['planned', 'in-progress', 'done', 'flagged', 'skipped'] as const;

/** A point of the structure, coordinates in mm, with the directions measured there. */
export const point = pgTable(
  'point',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    campaignId: uuid('campaign_id')
      .notNull()
      .references(() => campaign.id, { onDelete: 'cascade' }),
    label: text('label').notNull(),
    x: doublePrecision('x').notNull(),
    y: doublePrecision('y').notNull(),
    z: doublePrecision('z').notNull(),
    directions: text('directions', { enum: directions }).array().notNull().default([]),
    /** A point with recorded hits is retired, never deleted. */
    retiredAt: timestamp('retired_at', { withTimezone: true }),
    version: integer('version').notNull().default(1),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
    updatedAt: timestamp('updated_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [uniqueIndex('point_campaign_label_uq').on(t.campaignId, t.label)],
);

export const line = pgTable(
  'line',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    campaignId: uuid('campaign_id')
      .notNull()
      .references(() => campaign.id, { onDelete: 'cascade' }),
    pointA: uuid('point_a')
      .notNull()
      .references(() => point.id, { onDelete: 'cascade' }),
    pointB: uuid('point_b')
      .notNull()
      .references(() => point.id, { onDelete: 'cascade' }),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [uniqueIndex('line_pair_uq').on(t.campaignId, sql`least(${t.pointA}, ${t.pointB})`, sql`greatest(${t.pointA}, ${t.pointB})`)],
);

/** One measured DOF pair: H(response, excitation). */
export const scheduleEntry = pgTable(
  'schedule_entry',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    campaignId: uuid('campaign_id')
      .notNull()
      .references(() => campaign.id, { onDelete: 'cascade' }),
    position: integer('position').notNull(),
    responsePointId: uuid('response_point_id')
      .notNull()
      .references(() => point.id, { onDelete: 'restrict' }),
    responseDirection: text('response_direction', { enum: directions }).notNull(),
    excitationPointId: uuid('excitation_point_id')
      .notNull()
      .references(() => point.id, { onDelete: 'restrict' }),
    excitationDirection: text('excitation_direction', { enum: directions }).notNull(),
    drivingPoint: boolean('driving_point').notNull().default(false),
    status: text('status', { enum: scheduleStatuses }).notNull().default('planned'),
    requiredHits: integer('required_hits').notNull().default(5),
    assigneeId: text('assignee_id').references(() => user.id, { onDelete: 'set null' }),
    note: text('note').notNull().default(''),
    version: integer('version').notNull().default(1),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
    updatedAt: timestamp('updated_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    uniqueIndex('schedule_pair_uq').on(t.campaignId, t.responsePointId, t.responseDirection, t.excitationPointId, t.excitationDirection),
    index('schedule_campaign_position_idx').on(t.campaignId, t.position),
  ],
);
