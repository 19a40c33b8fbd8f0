import { boolean, doublePrecision, index, integer, jsonb, pgTable, text, timestamp, uuid } from 'drizzle-orm/pg-core';
import type { Summary } from '@shared/domain/analysis';
import {
  DIRECTIONS,
  RUN_STATUSES,
  type DirectionResult,
  type ScenarioLoad,
  type ScenarioOptions,
  type ScenarioSeason,
} from '@shared/domain/scenarios';
import { deletion, timestamps } from './columns';
import { users } from './people';
import { roadRoutes } from './road-routes';
import { vehicleProfiles } from './vehicle-profiles';

/** What a stored result was computed from: compared with the current state to tell staleness. */
export interface ScenarioRunProvenance {
  routeVersion: number;
  routeVersionId: string;
  vehicleProfileUpdatedAt: string;
  engineVersion: string;
  /**
   * The network's safety settings the run used (worst-case ambient, fade margin, steepest grade,
   * crawl speed and distance); absent on results stored before runs recorded them.
   */
  safetySettings?: Record<string, number>;
}

/**
 * Saved scenarios with their last result. Routes and vehicle profiles cannot be deleted while a
 * scenario uses them (restrict), which the API reports as 409.
 */
export const scenarios = pgTable(
  'scenarios',
  {
    id: uuid().primaryKey().defaultRandom(),
    name: text().notNull(),
    routeId: uuid()
      .notNull()
      .references(() => roadRoutes.id, { onDelete: 'restrict' }),
    routeVersion: integer().notNull(),
    routeVersionPinned: boolean().notNull().default(false),
    direction: text({ enum: DIRECTIONS }).notNull(),
    vehicleProfileId: uuid()
      .notNull()
      .references(() => vehicleProfiles.id, { onDelete: 'restrict' }),
    load: jsonb().$type<ScenarioLoad>().notNull(),
    season: jsonb().$type<ScenarioSeason>().notNull(),
    startSoc: doublePrecision().notNull(),
    options: jsonb().$type<ScenarioOptions>().notNull(),
    inService: boolean().notNull().default(false),
    status: text({ enum: RUN_STATUSES }).notNull().default('queued'),
    failureReason: text(),
    engineVersion: text(),
    computedAt: timestamp({ withTimezone: true }),
    /** Exact engine inputs per direction, and what they came from. */
    inputs: jsonb().$type<{ provenance: ScenarioRunProvenance; directions: unknown[]; layover?: unknown }>(),
    summary: jsonb().$type<Summary>(),
    riskCounts: jsonb().$type<Record<'low' | 'elevated' | 'high' | 'critical', number>>(),
    directionResults: jsonb().$type<DirectionResult[]>(),
    /**
     * Schema version of the stored result (summary, riskCounts, directionResults); read only
     * through api/results/stored-result.ts, which upgrades older versions. 1 = before versioning.
     */
    resultVersion: integer().notNull().default(1),
    /** Stable key of scenarios loaded by the demo seed; null otherwise. */
    seedKey: text().unique(),
    createdById: uuid().references(() => users.id, { onDelete: 'set null' }),
    createdByName: text().notNull(),
    ...timestamps,
    ...deletion,
  },
  (table) => [index('scenarios_route_id_idx').on(table.routeId), index('scenarios_vehicle_profile_id_idx').on(table.vehicleProfileId)],
);
export type ScenarioRow = typeof scenarios.$inferSelect;
