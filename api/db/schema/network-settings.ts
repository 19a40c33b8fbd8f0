import { sql } from 'drizzle-orm';
import { check, doublePrecision, pgTable, text, timestamp, uuid } from 'drizzle-orm/pg-core';

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
    /** Null while the shipped placeholders have not been replaced. */
    updatedById: uuid(),
    updatedByName: text(),
    updatedAt: timestamp({ withTimezone: true }),
  },
  (table) => [check('network_settings_single_row_check', sql`${table.key} = 'network'`)],
);
export type NetworkSettingsRow = typeof networkSettings.$inferSelect;
