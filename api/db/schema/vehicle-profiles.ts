import { boolean, doublePrecision, integer, jsonb, pgTable, text, timestamp, uniqueIndex, uuid } from 'drizzle-orm/pg-core';
import type { VehicleInput } from '@shared/domain/analysis';
import type {
  ClimateSettingsInput,
  LoadCase,
  ProfileCalibrationSource,
  Season,
  VehicleProfileDraft,
} from '@shared/domain/vehicle-profiles';
import { deletion, timestamps } from './columns';
import { users } from './people';

/**
 * Vehicle profiles: the generic class presets (isPreset, seeded at start-up, read-only) and the
 * authority's own profiles. The engine parameters are one jsonb document validated by the
 * shared `vehicleSchema`.
 */
export const vehicleProfiles = pgTable('vehicle_profiles', {
  id: uuid().primaryKey().defaultRandom(),
  name: text().notNull(),
  description: text().notNull().default(''),
  vehicleClass: text().notNull(),
  vehicle: jsonb().$type<VehicleInput>().notNull(),
  loadsKg: jsonb().$type<Record<LoadCase, number>>().notNull(),
  passengerMassKg: doublePrecision().notNull(),
  seasons: jsonb().$type<Record<Season, { ambientC: number; auxPowerW: number }>>().notNull(),
  /** Cabin climate for service-day runs (shared/domain/vehicle-profiles.ts climateSettingsSchema); null for rows saved before it and profiles without one. */
  climate: jsonb().$type<ClimateSettingsInput>(),
  isPreset: boolean().notNull().default(false),
  /** Saved version number; every save and every accepted calibration adds one. */
  version: integer().notNull().default(1),
  /** When the current version is an accepted calibration: its fit and logged trips; null otherwise. */
  calibration: jsonb().$type<ProfileCalibrationSource>(),
  /** Stable key of seeded rows (presets, demo profiles) for idempotent upserts; null otherwise. */
  seedKey: text().unique(),
  createdById: uuid().references(() => users.id, { onDelete: 'set null' }),
  ...timestamps,
  ...deletion,
});
export type VehicleProfileRow = typeof vehicleProfiles.$inferSelect;

/**
 * One saved version of an authority's vehicle profile, never changed once written: what it
 * held, and whether it came from an edit or an accepted calibration (with the logged trips it
 * was fitted on). The profile row holds the current version's content as well.
 */
export const vehicleProfileVersions = pgTable(
  'vehicle_profile_versions',
  {
    id: uuid().primaryKey().defaultRandom(),
    vehicleProfileId: uuid()
      .notNull()
      .references(() => vehicleProfiles.id, { onDelete: 'cascade' }),
    version: integer().notNull(),
    content: jsonb().$type<VehicleProfileDraft>().notNull(),
    source: text({ enum: ['created', 'edited', 'calibration', 'before-history'] }).notNull(),
    calibrationId: uuid(),
    /** Logged trips a calibration version was fitted on. */
    loggedTrips: jsonb().$type<{ id: string; name: string }[]>().notNull().default([]),
    createdById: uuid().references(() => users.id, { onDelete: 'set null' }),
    createdByName: text().notNull(),
    createdAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
  },
  (table) => [uniqueIndex('vehicle_profile_versions_profile_version_key').on(table.vehicleProfileId, table.version)],
);
export type VehicleProfileVersionRow = typeof vehicleProfileVersions.$inferSelect;
