import { boolean, doublePrecision, index, integer, jsonb, pgTable, text, timestamp, uuid } from 'drizzle-orm/pg-core';
import { RUN_STATUSES } from '@shared/domain/scenarios';
import type { Block, Charger, BlockResult } from '@shared/domain/service-days';
import { BATTERY_AGES, DAY_TYPES } from '@shared/domain/service-days';
import { SEASONS } from '@shared/domain/vehicle-profiles';
import { deletion, timestamps } from './columns';
import { users } from './people';

/**
 * Service days: what every vehicle of the network does on one kind of day in one season.
 *
 * Blocks and chargers are one jsonb document each, parsed with the shared zod contract on every
 * read: a block is always read, edited and replaced whole (the editor saves the day, a GTFS import
 * replaces its blocks), a day holds at most 500 blocks of 60 trips, and nothing queries inside a
 * trip. The routes and vehicle profiles a trip names are checked when the day is saved and again
 * when it runs (a route deleted since then makes the run fail with the reason).
 */
export const serviceDays = pgTable(
  'service_days',
  {
    id: uuid().primaryKey().defaultRandom(),
    name: text().notNull(),
    dayType: text({ enum: DAY_TYPES }).notNull(),
    season: text({ enum: SEASONS }).notNull(),
    batteryAge: text({ enum: BATTERY_AGES }).notNull(),
    reserveSoc: doublePrecision().notNull(),
    inService: boolean().notNull().default(false),
    chargers: jsonb().$type<Charger[]>().notNull(),
    blocks: jsonb().$type<Block[]>().notNull(),
    /** Counts every saved change; a result computed for an older revision is stale. */
    revision: integer().notNull().default(1),
    /** Stable key of service days loaded by the demo seed; null otherwise. */
    seedKey: text().unique(),
    createdById: uuid().references(() => users.id, { onDelete: 'set null' }),
    createdByName: text().notNull(),
    ...timestamps,
    ...deletion,
  },
  (table) => [index('service_days_day_type_season_idx').on(table.dayType, table.season)],
);
export type ServiceDayRow = typeof serviceDays.$inferSelect;

/** What a stored result was computed from: compared with the current state to tell staleness. */
export interface ServiceDayRunProvenance {
  revision: number;
  engineVersion: string;
  /** Route id → the version each trip of that route ran on. */
  routeVersions: Record<string, number[]>;
  /** Vehicle profile id → its updatedAt when the run read it. */
  vehicleProfiles: Record<string, string>;
  /**
   * The network's safety settings the descents' worst case ran with (network settings); absent
   * for runs stored before they were recorded.
   */
  safetySettings?: Record<string, number>;
}

/** The stored result of a service day: the per-block results and the charging peaks. */
export interface StoredServiceDayResult {
  blocks: BlockResult[];
  peakChargingPowerW: { chargerKey: string; powerW: number }[];
  caution: string;
}

/**
 * The last run of each service day, run through the job queue. A worker claims the run with a
 * token and beats a heartbeat while it computes; the maintenance sweep re-queues a run whose
 * heartbeat stopped, and only the holder of the current token may record the outcome. A failed
 * run keeps the last good result beside its reason.
 */
export const serviceDayResults = pgTable('service_day_results', {
  serviceDayId: uuid()
    .primaryKey()
    .references(() => serviceDays.id, { onDelete: 'cascade' }),
  status: text({ enum: RUN_STATUSES }).notNull().default('queued'),
  failureReason: text(),
  jobId: text(),
  claimToken: uuid(),
  heartbeatAt: timestamp({ withTimezone: true }),
  queuedAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
  startedAt: timestamp({ withTimezone: true }),
  engineVersion: text(),
  computedAt: timestamp({ withTimezone: true }),
  provenance: jsonb().$type<ServiceDayRunProvenance>(),
  result: jsonb().$type<StoredServiceDayResult>(),
});
export type ServiceDayResultRow = typeof serviceDayResults.$inferSelect;
