import { sql } from 'drizzle-orm';
import { check, doublePrecision, jsonb, pgTable, text, timestamp, uuid } from 'drizzle-orm/pg-core';
import { DEFAULT_CO2_REFERENCE_VEHICLE, DEFAULT_DAY_COUNTS, type Co2ReferenceVehicle, type DayCounts } from '@shared/domain/board-summary';

/**
 * The money and emission factors of the board summary: a single row (key 'network'), set by an
 * admin with the source of each figure. The shipped row holds illustrative placeholders
 * (migration guard_review_events_and_seed_settings).
 */
export const networkSettings = pgTable(
  'network_settings',
  {
    key: text().primaryKey().default('network'),
    energyTariffPerKWh: doublePrecision().notNull(),
    currency: text().notNull(),
    tariffSource: text().notNull(),
    gridEmissionFactorKgPerKWh: doublePrecision().notNull(),
    emissionFactorSource: text().notNull(),
    /** Safety settings of every analysis (shared/domain/analysis.ts safetySettingsSchema). */
    worstCaseAmbientC: doublePrecision().notNull().default(35),
    fadeMarginK: doublePrecision().notNull().default(50),
    maxRoadGradePercent: doublePrecision().notNull().default(15),
    crawlSpeedKph: doublePrecision().notNull().default(5),
    crawlDistanceM: doublePrecision().notNull().default(200),
    /** Days of each day type per season (shared/domain/board-summary.ts dayCountsSchema). */
    dayCounts: jsonb().$type<DayCounts>().notNull().default(DEFAULT_DAY_COUNTS),
    /** The CO₂ baseline's reference vehicle. */
    co2ReferenceVehicle: jsonb().$type<Co2ReferenceVehicle>().notNull().default(DEFAULT_CO2_REFERENCE_VEHICLE),
    /** Null while the shipped placeholders have not been replaced. */
    updatedById: uuid(),
    updatedByName: text(),
    updatedAt: timestamp({ withTimezone: true }),
  },
  (table) => [check('network_settings_single_row_check', sql`${table.key} = 'network'`)],
);
export type NetworkSettingsRow = typeof networkSettings.$inferSelect;
