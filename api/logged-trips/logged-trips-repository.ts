import { and, desc, eq, getTableColumns, inArray, isNull, sql } from 'drizzle-orm';
import type { LoggedTrip } from '@shared/domain/logged-trips';
import type { Executor } from '../db/client';
import { isCurrentVersionOfRoute } from '../road-routes/road-routes-repository';
import { calibrations, loggedTrips, roadRoutes, roadRouteVersions, type LoggedTripRow } from '../db/schema/index';

export type NewLoggedTrip = typeof loggedTrips.$inferInsert;

/** Trip columns without the (large) alignment. */
const { alignment: _alignment, ...headColumns } = getTableColumns(loggedTrips);
export type LoggedTripHead = Omit<LoggedTripRow, 'alignment'>;

export async function insertTrip(db: Executor, values: NewLoggedTrip): Promise<LoggedTripRow> {
  const [row] = await db.insert(loggedTrips).values(values).returning();
  return row!;
}

export async function listTrips(db: Executor, vehicleProfileId: string): Promise<LoggedTripHead[]> {
  return db
    .select(headColumns)
    .from(loggedTrips)
    .where(eq(loggedTrips.vehicleProfileId, vehicleProfileId))
    .orderBy(desc(loggedTrips.createdAt), desc(loggedTrips.id));
}

export async function findTrip(db: Executor, id: string): Promise<LoggedTripRow | undefined> {
  const [row] = await db.select().from(loggedTrips).where(eq(loggedTrips.id, id));
  return row;
}

export async function findTripsForProfile(db: Executor, vehicleProfileId: string, ids: string[]): Promise<LoggedTripRow[]> {
  if (ids.length === 0) return [];
  return db
    .select()
    .from(loggedTrips)
    .where(and(eq(loggedTrips.vehicleProfileId, vehicleProfileId), inArray(loggedTrips.id, ids)));
}

export async function deleteTrip(db: Executor, id: string) {
  await db.delete(loggedTrips).where(eq(loggedTrips.id, id));
}

/** Accepted calibrations fitted on a trip (their profile versions name it). */
export async function countAcceptedCalibrationsUsing(db: Executor, id: string): Promise<number> {
  const [row] = await db
    .select({ n: sql<number>`count(*)::int` })
    .from(calibrations)
    .where(and(eq(calibrations.decision, 'accepted'), sql`${calibrations.loggedTrips} @> ${JSON.stringify([{ id }])}::jsonb`));
  return row?.n ?? 0;
}

/** Current versions of the routes (not deleted) passing within `withinM` of both points (candidates for matching). */
export async function routesNear(db: Executor, first: [number, number], last: [number, number], withinM: number) {
  const point = (p: [number, number]) => sql`ST_SetSRID(ST_MakePoint(${p[0]}, ${p[1]}), 4326)::geography`;
  return db
    .select({
      routeId: roadRoutes.id,
      version: roadRouteVersions.version,
      name: roadRouteVersions.name,
      coordinates: roadRouteVersions.coordinates,
    })
    .from(roadRoutes)
    .innerJoin(roadRouteVersions, isCurrentVersionOfRoute)
    .where(
      and(
        isNull(roadRoutes.deletedAt),
        sql`ST_DWithin(${roadRouteVersions.geometry}::geography, ${point(first)}, ${withinM})`,
        sql`ST_DWithin(${roadRouteVersions.geometry}::geography, ${point(last)}, ${withinM})`,
      ),
    );
}

export function toLoggedTrip(row: LoggedTripHead): LoggedTrip {
  return {
    id: row.id,
    vehicleProfileId: row.vehicleProfileId,
    name: row.name,
    fileName: row.fileName,
    startedAt: row.startedAt?.toISOString() ?? null,
    samples: row.samples,
    durationS: row.durationS,
    lengthM: row.lengthM,
    routeId: row.routeId,
    routeVersion: row.routeVersion,
    routeName: row.routeName,
    routeCreated: row.routeCreated,
    direction: row.direction,
    fromM: row.fromM,
    toM: row.toM,
    payloadKg: row.payloadKg,
    payloadSource: row.payloadSource,
    ambientC: row.ambientC,
    elevationSource: row.elevationSource,
    startSoc: row.startSoc,
    channels: row.channels,
    columns: row.columns,
    ignoredColumns: row.ignoredColumns,
    gps: row.gps,
    uploadedBy: row.uploadedByName,
    createdAt: row.createdAt.toISOString(),
  };
}
