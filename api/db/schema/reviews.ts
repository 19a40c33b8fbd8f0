import { sql } from 'drizzle-orm';
import { check, doublePrecision, index, integer, jsonb, pgTable, text, timestamp, uuid } from 'drizzle-orm/pg-core';
import type { Descent, RiskLevel } from '@shared/domain/analysis';
import { REVIEW_STATES, type Mitigation } from '@shared/domain/reviews';

/** One scenario's latest figures for a reviewed stretch (an item can be seen by several scenarios). */
export interface ReviewSource {
  scenarioId: string;
  scenarioName: string;
  /** The scenario's creator, told when the item is resolved. */
  createdById: string | null;
  computedAt: string;
  descent: Descent;
}

/**
 * Descent review items: one per route, direction, vehicle profile and stretch of road, kept
 * across reruns. The item's figures are those of the worst scenario that sees the stretch.
 *
 * No foreign keys to scenarios, routes or vehicle profiles on purpose: the safety record must
 * outlive them (and its audit events can never be deleted), so names are kept as snapshots.
 */
export const reviewItems = pgTable(
  'review_items',
  {
    id: uuid().primaryKey().defaultRandom(),
    state: text({ enum: REVIEW_STATES }).notNull().default('raised'),
    routeId: uuid().notNull(),
    routeName: text().notNull(),
    vehicleProfileId: uuid().notNull(),
    vehicleProfileName: text().notNull(),
    direction: text({ enum: ['outbound', 'inbound'] }).notNull(),
    /** The scenario whose figures the item shows (the worst source). */
    scenarioId: uuid().notNull(),
    scenarioName: text().notNull(),
    startM: doublePrecision().notNull(),
    endM: doublePrecision().notNull(),
    meanGradePercent: doublePrecision().notNull(),
    risk: text({ enum: ['low', 'elevated', 'high', 'critical'] })
      .$type<RiskLevel>()
      .notNull(),
    /** 0 low … 3 critical, for sorting and "worse than" comparisons in SQL. */
    riskRank: integer().notNull(),
    raisedRisk: text({ enum: ['low', 'elevated', 'high', 'critical'] })
      .$type<RiskLevel>()
      .notNull(),
    peakBrakeTempC: doublePrecision().notNull(),
    /** The shown descent record (of the worst source). */
    descent: jsonb().$type<Descent>().notNull(),
    /** Latest figures per scenario that sees this stretch, keyed by scenario id. */
    sources: jsonb().$type<Record<string, ReviewSource>>().notNull(),
    /**
     * Schema version of the stored descents (`descent`, `sources.*.descent`); read through
     * api/results/stored-result.ts, which upgrades older versions. 1 = before versioning.
     */
    resultVersion: integer().notNull().default(1),
    mitigation: jsonb().$type<Mitigation>(),
    mitigatedRisk: text({ enum: ['low', 'elevated', 'high', 'critical'] }).$type<RiskLevel>(),
    mitigatedPeakBrakeTempC: doublePrecision(),
    acceptanceReason: text(),
    /** The safety officer who proposed accepting the risk; a different one must sign it off. */
    acceptanceProposedById: uuid(),
    acceptanceProposedByName: text(),
    acceptanceProposedAt: timestamp({ withTimezone: true }),
    acceptanceSignedOffById: uuid(),
    acceptanceSignedOffByName: text(),
    acceptanceSignedOffAt: timestamp({ withTimezone: true }),
    raisedAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
    updatedAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
  },
  (table) => [
    index('review_items_key_idx').on(table.routeId, table.direction, table.vehicleProfileId),
    index('review_items_state_idx').on(table.state),
    check('review_items_stretch_check', sql`${table.endM} > ${table.startM}`),
  ],
);
export type ReviewItemRow = typeof reviewItems.$inferSelect;

/**
 * Append-only audit trail of review items. A trigger (migration guard_review_events_and_seed_settings) refuses
 * UPDATE and DELETE, so not even a bug in the API can rewrite history. The actor is kept by id
 * and name without a foreign key, so removing a person never touches the trail.
 */
export const reviewEvents = pgTable(
  'review_events',
  {
    id: uuid().primaryKey().defaultRandom(),
    reviewId: uuid()
      .notNull()
      .references(() => reviewItems.id),
    actorId: uuid(),
    actorName: text().notNull(),
    at: timestamp({ withTimezone: true }).notNull().defaultNow(),
    fromState: text({ enum: REVIEW_STATES }),
    toState: text({ enum: REVIEW_STATES }).notNull(),
    note: text(),
    details: jsonb().$type<Record<string, unknown>>(),
  },
  (table) => [index('review_events_review_id_idx').on(table.reviewId, table.at)],
);
export type ReviewEventRow = typeof reviewEvents.$inferSelect;
