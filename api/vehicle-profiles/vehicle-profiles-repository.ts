import { asc, desc, eq, sql } from 'drizzle-orm';
import type { VehicleProfile, VehicleProfileDraft } from '@shared/domain/vehicle-profiles';
import type { Executor } from '../db/client';
import { scenarios, vehicleProfiles, type VehicleProfileRow } from '../db/schema/index';

export function listProfiles(db: Executor) {
  return db.select().from(vehicleProfiles).orderBy(desc(vehicleProfiles.isPreset), asc(vehicleProfiles.name), asc(vehicleProfiles.id));
}

export async function findProfile(db: Executor, id: string) {
  const [row] = await db.select().from(vehicleProfiles).where(eq(vehicleProfiles.id, id));
  return row;
}

export async function lockProfile(db: Executor, id: string) {
  const [row] = await db.select().from(vehicleProfiles).where(eq(vehicleProfiles.id, id)).for('update');
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

export async function deleteProfile(db: Executor, id: string) {
  await db.delete(vehicleProfiles).where(eq(vehicleProfiles.id, id));
}

export async function countScenariosUsingProfile(db: Executor, id: string): Promise<number> {
  const [row] = await db.select({ n: sql<number>`count(*)::int` }).from(scenarios).where(eq(scenarios.vehicleProfileId, id));
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
