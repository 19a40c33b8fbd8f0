import { boolean, doublePrecision, jsonb, pgTable, text, uuid } from 'drizzle-orm/pg-core';
import type { VehicleInput } from '@shared/domain/analysis';
import type { LoadCase, Season } from '@shared/domain/vehicle-profiles';
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
  isPreset: boolean().notNull().default(false),
  /** Stable key of seeded rows (presets, demo profiles) for idempotent upserts; null otherwise. */
  seedKey: text().unique(),
  createdById: uuid().references(() => users.id, { onDelete: 'set null' }),
  ...timestamps,
  ...deletion,
});
export type VehicleProfileRow = typeof vehicleProfiles.$inferSelect;
