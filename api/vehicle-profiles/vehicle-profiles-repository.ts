import { and, asc, desc, eq, isNull, sql } from 'drizzle-orm';
import type { VehicleProfile, VehicleProfileDraft } from '@shared/domain/vehicle-profiles';
import type { Executor } from '../db/client';
import { scenarios, vehicleProfiles, type VehicleProfileRow } from '../db/schema/index';

export function listProfiles(db: Executor) {
  return db.select().from(vehicleProfiles).where(isNull(vehicleProfiles.deletedAt)).orderBy(desc(vehicleProfiles.isPreset), asc(vehicleProfiles.name), asc(vehicleProfiles.id));
}

/** The profile unless it is deleted. */
export async function findProfile(db: Executor, id: string) {
  const [row] = await db.select().from(vehicleProfiles).where(and(eq(vehicleProfiles.id, id), isNull(vehicleProfiles.deletedAt)));
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

export async function insertProfile(db: Executor, draft: VehicleProfileDraft, createdById: string | null, seedKey?: string, id?: string) {
  const [row] = await db
    .insert(vehicleProfiles)
    .values({ ...draft, ...(id ? { id } : {}), isPreset: false, createdById, seedKey: seedKey ?? null })
    .returning();
  return row!;
}

export async function updateProfile(db: Executor, id: string, draft: VehicleProfileDraft) {
  const [row] = await db.update(vehicleProfiles).set({ ...draft, updatedAt: new Date() }).where(eq(vehicleProfiles.id, id)).returning();
  return row!;
}

/** Hides the profile (restorable until the purge). */
export async function markProfileDeleted(db: Executor, id: string, by: { id: string | null; name: string }) {
  await db.update(vehicleProfiles).set({ deletedAt: new Date(), deletedById: by.id, deletedByName: by.name }).where(eq(vehicleProfiles.id, id));
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
    isPreset: row.isPreset,
    updatedAt: row.updatedAt.toISOString(),
  };
}
