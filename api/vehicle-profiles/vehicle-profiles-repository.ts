import { and, asc, desc, eq, isNull, sql } from 'drizzle-orm';
import type { ProfileCalibrationSource, VehicleProfile, VehicleProfileDraft, VehicleProfileVersion } from '@shared/domain/vehicle-profiles';
import type { Executor } from '../db/client';
import { calibrations, loggedTrips, scenarios, vehicleProfiles, vehicleProfileVersions, type VehicleProfileRow } from '../db/schema/index';

/** Who saved something: the person's id (null when the account is gone or for seeded data) and name. */
export interface Author {
  id: string | null;
  name: string;
}

export function listProfiles(db: Executor) {
  return db
    .select()
    .from(vehicleProfiles)
    .where(isNull(vehicleProfiles.deletedAt))
    .orderBy(desc(vehicleProfiles.isPreset), asc(vehicleProfiles.name), asc(vehicleProfiles.id));
}

/** The profile unless it is deleted. */
export async function findProfile(db: Executor, id: string) {
  const [row] = await db
    .select()
    .from(vehicleProfiles)
    .where(and(eq(vehicleProfiles.id, id), isNull(vehicleProfiles.deletedAt)));
  return row;
}

export async function lockProfile(db: Executor, id: string, includeDeleted = false) {
  const [row] = await db
    .select()
    .from(vehicleProfiles)
    .where(and(eq(vehicleProfiles.id, id), includeDeleted ? undefined : isNull(vehicleProfiles.deletedAt)))
    .for('update');
  return row;
}

/** Inserts an authority's profile as version 1 (with its version record). */
export async function insertProfile(db: Executor, draft: VehicleProfileDraft, author: Author, seedKey?: string, id?: string) {
  const [row] = await db
    .insert(vehicleProfiles)
    .values({ ...draft, ...(id ? { id } : {}), isPreset: false, createdById: author.id, seedKey: seedKey ?? null })
    .returning();
  await db.insert(vehicleProfileVersions).values({
    vehicleProfileId: row!.id,
    version: 1,
    content: draft,
    source: 'created',
    createdById: author.id,
    createdByName: author.name,
  });
  return row!;
}

/**
 * Saves `draft` as the profile's next version (the row must be locked by the caller). A profile
 * from before versions were recorded first gets a record of the content it had.
 */
export async function saveProfileVersion(
  db: Executor,
  row: VehicleProfileRow,
  draft: VehicleProfileDraft,
  author: Author,
  calibration: ProfileCalibrationSource | null = null,
) {
  const [existing] = await db
    .select({ id: vehicleProfileVersions.id })
    .from(vehicleProfileVersions)
    .where(and(eq(vehicleProfileVersions.vehicleProfileId, row.id), eq(vehicleProfileVersions.version, row.version)));
  if (!existing) {
    await db.insert(vehicleProfileVersions).values({
      vehicleProfileId: row.id,
      version: row.version,
      content: contentOf(row),
      source: 'before-history',
      createdByName: 'before version history',
      createdAt: row.updatedAt,
    });
  }
  const version = row.version + 1;
  const [updated] = await db
    .update(vehicleProfiles)
    .set({ ...draft, version, calibration, updatedAt: new Date() })
    .where(eq(vehicleProfiles.id, row.id))
    .returning();
  await db.insert(vehicleProfileVersions).values({
    vehicleProfileId: row.id,
    version,
    content: draft,
    source: calibration ? 'calibration' : 'edited',
    calibrationId: calibration?.calibrationId ?? null,
    loggedTrips: calibration?.loggedTrips ?? [],
    createdById: author.id,
    createdByName: author.name,
  });
  return updated!;
}

export async function listVersions(db: Executor, id: string): Promise<VehicleProfileVersion[]> {
  const rows = await db
    .select()
    .from(vehicleProfileVersions)
    .where(eq(vehicleProfileVersions.vehicleProfileId, id))
    .orderBy(desc(vehicleProfileVersions.version));
  return rows.map((row) => ({
    version: row.version,
    source: row.source,
    calibration:
      row.source === 'calibration' && row.calibrationId
        ? {
            calibrationId: row.calibrationId,
            acceptedAt: row.createdAt.toISOString(),
            acceptedBy: row.createdByName,
            loggedTrips: row.loggedTrips,
          }
        : null,
    savedBy: row.createdByName,
    savedAt: row.createdAt.toISOString(),
    content: row.content,
  }));
}

/** The editable content of a profile row. */
export function contentOf(row: VehicleProfileRow): VehicleProfileDraft {
  const profile = toVehicleProfile(row);
  return {
    name: profile.name,
    description: profile.description,
    vehicleClass: profile.vehicleClass,
    vehicle: profile.vehicle,
    loadsKg: profile.loadsKg,
    passengerMassKg: profile.passengerMassKg,
    seasons: profile.seasons,
    climate: profile.climate,
  };
}

/** How many logged trips and calibrations belong to a profile. */
export async function countCalibrationData(db: Executor, id: string): Promise<number> {
  const [trips] = await db
    .select({ n: sql<number>`count(*)::int` })
    .from(loggedTrips)
    .where(eq(loggedTrips.vehicleProfileId, id));
  const [fits] = await db
    .select({ n: sql<number>`count(*)::int` })
    .from(calibrations)
    .where(eq(calibrations.vehicleProfileId, id));
  return (trips?.n ?? 0) + (fits?.n ?? 0);
}

/** Hides the profile (restorable until the purge). */
export async function markProfileDeleted(db: Executor, id: string, by: { id: string | null; name: string }) {
  await db
    .update(vehicleProfiles)
    .set({ deletedAt: new Date(), deletedById: by.id, deletedByName: by.name })
    .where(eq(vehicleProfiles.id, id));
}

export async function markProfileRestored(db: Executor, id: string) {
  await db.update(vehicleProfiles).set({ deletedAt: null, deletedById: null, deletedByName: null }).where(eq(vehicleProfiles.id, id));
}

/** Removes the profile for good (the purge). */
export async function purgeProfile(db: Executor, id: string) {
  await db.delete(vehicleProfiles).where(eq(vehicleProfiles.id, id));
}

/** Scenarios (not deleted) that use the profile. */
export async function countScenariosUsingProfile(db: Executor, id: string): Promise<number> {
  const [row] = await db
    .select({ n: sql<number>`count(*)::int` })
    .from(scenarios)
    .where(and(eq(scenarios.vehicleProfileId, id), isNull(scenarios.deletedAt)));
  return row?.n ?? 0;
}

export function toVehicleProfile(row: VehicleProfileRow): VehicleProfile {
  return {
    id: row.id,
    name: row.name,
    description: row.description,
    vehicleClass: row.vehicleClass,
    vehicle: row.vehicle as VehicleProfile['vehicle'],
    loadsKg: row.loadsKg,
    passengerMassKg: row.passengerMassKg,
    seasons: row.seasons,
    climate: row.climate ?? null,
    isPreset: row.isPreset,
    version: row.version,
    calibration: row.calibration ?? null,
    updatedAt: row.updatedAt.toISOString(),
  };
}
