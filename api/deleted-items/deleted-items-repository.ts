/** Queries behind the deleted-items list and the purge: what is deleted, by kind, and what a purge removes beside it. */
import { and, desc, eq, isNotNull, lt, sql } from 'drizzle-orm';
import type { AnyPgColumn } from 'drizzle-orm/pg-core';
import type { Executor } from '../db/client';
import { isCurrentVersionOfRoute } from '../road-routes/road-routes-repository';
import {
  roadRoutes,
  roadRouteVersions,
  scenarios,
  serviceDays,
  terrainDependents,
  terrainModels,
  vehicleProfiles,
} from '../db/schema/index';

/** One deleted row: its id, current name and who deleted it when. */
export interface DeletedEntityRow {
  id: string;
  name: string;
  deletedAt: Date | null;
  deletedBy: string | null;
}

/** A deleted scenario, with whether its route or vehicle profile is deleted too (then it cannot be restored alone). */
export interface DeletedScenarioRow extends DeletedEntityRow {
  routeDeleted: boolean;
  profileDeleted: boolean;
}

export interface DeletedRowsByKind {
  routes: DeletedEntityRow[];
  scenarios: DeletedScenarioRow[];
  profiles: DeletedEntityRow[];
  terrain: DeletedEntityRow[];
  serviceDays: DeletedEntityRow[];
}

/** Every deleted row of the restorable tables; with `deletedBefore`, only those deleted before that moment. */
export async function findDeletedRows(db: Executor, deletedBefore?: Date): Promise<DeletedRowsByKind> {
  const deletedCondition = (column: AnyPgColumn) => (deletedBefore ? lt(column, deletedBefore) : isNotNull(column));
  const routes = await db
    .select({ id: roadRoutes.id, name: roadRouteVersions.name, deletedAt: roadRoutes.deletedAt, deletedBy: roadRoutes.deletedByName })
    .from(roadRoutes)
    .innerJoin(roadRouteVersions, isCurrentVersionOfRoute)
    .where(deletedCondition(roadRoutes.deletedAt))
    .orderBy(desc(roadRoutes.deletedAt));
  const scenarioRows = await db
    .select({
      id: scenarios.id,
      name: scenarios.name,
      deletedAt: scenarios.deletedAt,
      deletedBy: scenarios.deletedByName,
      routeDeleted: sql<boolean>`exists (select 1 from ${roadRoutes} r where r.id = ${scenarios.routeId} and r.deleted_at is not null)`,
      profileDeleted: sql<boolean>`exists (select 1 from ${vehicleProfiles} p where p.id = ${scenarios.vehicleProfileId} and p.deleted_at is not null)`,
    })
    .from(scenarios)
    .where(deletedCondition(scenarios.deletedAt));
  const profiles = await db
    .select({
      id: vehicleProfiles.id,
      name: vehicleProfiles.name,
      deletedAt: vehicleProfiles.deletedAt,
      deletedBy: vehicleProfiles.deletedByName,
    })
    .from(vehicleProfiles)
    .where(deletedCondition(vehicleProfiles.deletedAt));
  const terrain = await db
    .select({ id: terrainModels.id, name: terrainModels.name, deletedAt: terrainModels.deletedAt, deletedBy: terrainModels.deletedByName })
    .from(terrainModels)
    .where(deletedCondition(terrainModels.deletedAt));
  const days = await db
    .select({ id: serviceDays.id, name: serviceDays.name, deletedAt: serviceDays.deletedAt, deletedBy: serviceDays.deletedByName })
    .from(serviceDays)
    .where(deletedCondition(serviceDays.deletedAt));
  return { routes, scenarios: scenarioRows, profiles, terrain, serviceDays: days };
}

/** Forgets that a scenario was computed on terrain (before the scenario is removed for good). */
export async function deleteScenarioTerrainDependents(db: Executor, scenarioId: string): Promise<void> {
  await db.delete(terrainDependents).where(and(eq(terrainDependents.kind, 'scenario'), eq(terrainDependents.dependentId, scenarioId)));
}
