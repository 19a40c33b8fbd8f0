import { and, asc, desc, eq, ilike, isNull, or, sql, type SQL } from 'drizzle-orm';
import type { LineString } from '@shared/domain/analysis';
import type { RoadRoute, RoadRouteSummary, RouteListQuery } from '@shared/domain/road-routes';
import type { Executor } from '../db/client';
import { roadRoutes, roadRouteVersions, scenarios, type RoadRouteRow, type RoadRouteVersionRow } from '../db/schema/index';
import { flatten } from './route-geometry';

/** Every column of a version except the PostGIS geometry (the positions are in `coordinates`). */
const versionColumns = {
  id: roadRouteVersions.id,
  routeId: roadRouteVersions.routeId,
  version: roadRouteVersions.version,
  name: roadRouteVersions.name,
  description: roadRouteVersions.description,
  mode: roadRouteVersions.mode,
  coordinates: roadRouteVersions.coordinates,
  stops: roadRouteVersions.stops,
  speedLimits: roadRouteVersions.speedLimits,
  defaultSpeedLimitKph: roadRouteVersions.defaultSpeedLimitKph,
  tripsPerDay: roadRouteVersions.tripsPerDay,
  serviceDaysPerYear: roadRouteVersions.serviceDaysPerYear,
  lengthM: roadRouteVersions.lengthM,
  createdById: roadRouteVersions.createdById,
  createdByName: roadRouteVersions.createdByName,
  createdAt: roadRouteVersions.createdAt,
};
export type RouteVersion = Omit<RoadRouteVersionRow, 'geometry'>;

export type NewRouteVersion = Omit<RouteVersion, 'id' | 'createdAt' | 'routeId' | 'version'>;

/** Joins a route (`road_routes`) to the content of its current version (`road_route_versions`). */
export const isCurrentVersionOfRoute = and(
  eq(roadRouteVersions.routeId, roadRoutes.id),
  eq(roadRouteVersions.version, roadRoutes.currentVersion),
)!;

export async function insertRoute(
  db: Executor,
  values: { createdById: string | null; seedKey?: string | null; importSha256?: string | null },
) {
  const [row] = await db
    .insert(roadRoutes)
    .values({
      createdById: values.createdById,
      seedKey: values.seedKey ?? null,
      importSha256: values.importSha256 ?? null,
      currentVersion: 1,
    })
    .returning();
  return row!;
}

/** The route (not deleted) imported from a file with this SHA-256, if any (with its current name). */
export async function findRouteByImportSha256(db: Executor, importSha256: string) {
  const [row] = await db
    .select({ id: roadRoutes.id, name: roadRouteVersions.name })
    .from(roadRoutes)
    .innerJoin(roadRouteVersions, isCurrentVersionOfRoute)
    .where(and(eq(roadRoutes.importSha256, importSha256), isNull(roadRoutes.deletedAt)));
  return row;
}

export async function insertVersion(db: Executor, routeId: string, version: number, values: NewRouteVersion): Promise<RouteVersion> {
  const geometry: LineString = flatten({ type: 'LineString', coordinates: values.coordinates });
  const [row] = await db
    .insert(roadRouteVersions)
    .values({ ...values, routeId, version, geometry })
    .returning(versionColumns);
  return row!;
}

/**
 * Locks the route row for a new version, so two saves cannot both become version n + 1.
 * A deleted route is found only with `includeDeleted` (to restore it).
 */
export async function lockRoute(db: Executor, routeId: string, includeDeleted = false): Promise<RoadRouteRow | undefined> {
  const [row] = await db
    .select()
    .from(roadRoutes)
    .where(and(eq(roadRoutes.id, routeId), includeDeleted ? undefined : isNull(roadRoutes.deletedAt)))
    .for('update');
  return row;
}

export async function setCurrentVersion(db: Executor, routeId: string, version: number) {
  await db.update(roadRoutes).set({ currentVersion: version }).where(eq(roadRoutes.id, routeId));
}

/** The route unless it is deleted. */
export async function findRoute(db: Executor, routeId: string) {
  const [row] = await db
    .select()
    .from(roadRoutes)
    .where(and(eq(roadRoutes.id, routeId), isNull(roadRoutes.deletedAt)));
  return row;
}

export async function findRouteBySeedKey(db: Executor, seedKey: string) {
  const [row] = await db.select().from(roadRoutes).where(eq(roadRoutes.seedKey, seedKey));
  return row;
}

export async function findVersion(db: Executor, routeId: string, version: number): Promise<RouteVersion | undefined> {
  const [row] = await db
    .select(versionColumns)
    .from(roadRouteVersions)
    .where(and(eq(roadRouteVersions.routeId, routeId), eq(roadRouteVersions.version, version)));
  return row;
}

/**
 * What a saved version's elevation profile depends on besides the terrain, read without its
 * positions: the version row's id and row version (PostgreSQL's `xmin`, new with any change of
 * the row). Undefined when the route is deleted or has no such version.
 */
export async function findVersionIdentity(db: Executor, routeId: string, version: number) {
  const [row] = await db
    .select({ id: roadRouteVersions.id, rowVersion: sql<string>`${roadRouteVersions}.xmin::text` })
    .from(roadRouteVersions)
    .innerJoin(roadRoutes, eq(roadRoutes.id, roadRouteVersions.routeId))
    .where(and(eq(roadRouteVersions.routeId, routeId), eq(roadRouteVersions.version, version), isNull(roadRoutes.deletedAt)));
  return row && ([row.id, row.rowVersion] as const);
}

export function listVersions(db: Executor, routeId: string) {
  return db
    .select({
      version: roadRouteVersions.version,
      versionId: roadRouteVersions.id,
      lengthM: roadRouteVersions.lengthM,
      createdBy: roadRouteVersions.createdByName,
      createdAt: roadRouteVersions.createdAt,
    })
    .from(roadRouteVersions)
    .where(eq(roadRouteVersions.routeId, routeId))
    .orderBy(desc(roadRouteVersions.version));
}

/** Hides the route (restorable until the purge). */
export async function markRouteDeleted(db: Executor, routeId: string, by: { id: string | null; name: string }) {
  await db.update(roadRoutes).set({ deletedAt: new Date(), deletedById: by.id, deletedByName: by.name }).where(eq(roadRoutes.id, routeId));
}

export async function markRouteRestored(db: Executor, routeId: string) {
  await db.update(roadRoutes).set({ deletedAt: null, deletedById: null, deletedByName: null }).where(eq(roadRoutes.id, routeId));
}

/** Removes the route with its versions for good (the purge). */
export async function purgeRoute(db: Executor, routeId: string) {
  await db.delete(roadRoutes).where(eq(roadRoutes.id, routeId));
}

/** Scenarios (not deleted) that use the route. */
export async function countScenariosUsingRoute(db: Executor, routeId: string): Promise<number> {
  const [row] = await db
    .select({ n: sql<number>`count(*)::int` })
    .from(scenarios)
    .where(and(eq(scenarios.routeId, routeId), isNull(scenarios.deletedAt)));
  return row?.n ?? 0;
}

const scenarioCount = sql<number>`(select count(*)::int from ${scenarios} where ${scenarios.routeId} = ${roadRoutes.id} and ${scenarios.deletedAt} is null)`;

/** Current versions of the routes matching the query, with the total count before paging. */
export async function listRoutes(db: Executor, query: RouteListQuery): Promise<{ items: RoadRouteSummary[]; total: number }> {
  const conditions: SQL[] = [];
  if (query.q) {
    const pattern = `%${query.q.replace(/[\\%_]/g, (c) => `\\${c}`)}%`;
    conditions.push(or(ilike(roadRouteVersions.name, pattern), ilike(roadRouteVersions.description, pattern))!);
  }
  const where = and(eq(roadRouteVersions.version, roadRoutes.currentVersion), isNull(roadRoutes.deletedAt), ...conditions);
  const sortColumn = {
    name: roadRouteVersions.name,
    updatedAt: roadRoutes.updatedAt,
    lengthM: roadRouteVersions.lengthM,
    tripsPerDay: roadRouteVersions.tripsPerDay,
  }[query.sort];
  const direction = query.order === 'desc' ? desc : asc;
  const base = db
    .select({
      id: roadRoutes.id,
      name: roadRouteVersions.name,
      mode: roadRouteVersions.mode,
      version: roadRouteVersions.version,
      lengthM: roadRouteVersions.lengthM,
      stopCount: sql<number>`jsonb_array_length(${roadRouteVersions.stops})`,
      tripsPerDay: roadRouteVersions.tripsPerDay,
      scenarioCount,
      updatedAt: roadRoutes.updatedAt,
    })
    .from(roadRoutes)
    .innerJoin(roadRouteVersions, eq(roadRouteVersions.routeId, roadRoutes.id))
    .where(where)
    .orderBy(direction(sortColumn), asc(roadRoutes.id))
    .$dynamic();
  const rows = query.page ? await base.limit(query.pageSize).offset((query.page - 1) * query.pageSize) : await base;
  // Unpaged, the rows are all of them: counting them again would cost a second query per request.
  const total = query.page ? await countRoutes(db, where) : rows.length;
  return { items: rows.map((row) => ({ ...row, updatedAt: row.updatedAt.toISOString() })), total };
}

async function countRoutes(db: Executor, where: SQL | undefined): Promise<number> {
  const [count] = await db
    .select({ n: sql<number>`count(*)::int` })
    .from(roadRoutes)
    .innerJoin(roadRouteVersions, eq(roadRouteVersions.routeId, roadRoutes.id))
    .where(where);
  return count?.n ?? 0;
}

/** The API shape of one version of a route. */
export function toRoadRoute(version: RouteVersion, updatedAt: Date = version.createdAt): RoadRoute {
  return {
    id: version.routeId,
    version: version.version,
    versionId: version.id,
    name: version.name,
    description: version.description,
    mode: version.mode,
    geometry: { type: 'LineString', coordinates: version.coordinates },
    stops: version.stops,
    speedLimits: version.speedLimits,
    defaultSpeedLimitKph: version.defaultSpeedLimitKph,
    tripsPerDay: version.tripsPerDay,
    serviceDaysPerYear: version.serviceDaysPerYear,
    lengthM: version.lengthM,
    createdBy: version.createdByName,
    updatedAt: updatedAt.toISOString(),
  };
}
