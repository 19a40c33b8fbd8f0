/**
 * A service day's blocks from a GTFS feed: the trips of one service_id grouped by block_id, in
 * time order, each trip on the route the GTFS route import created for its GTFS route (found by
 * the "(GTFS route …, shape …)" the import writes into the route's description). The imported
 * route follows the GTFS route's most used shape: trips whose direction_id is that shape's run
 * `outbound`, the others `inbound`. A GTFS route that was never imported maps to the one route
 * whose name is exactly the name the import would give it (routes.txt "short – long" name, or
 * either alone), so a feed written from routes drawn in the app finds them; there, direction_id 0
 * is `outbound`. Two routes of that name are ambiguous and answered 422, as is no route at all. Pull-out is 15 minutes before the first departure and pull-in
 * 15 minutes after the last arrival (an assumption to edit on screen: GTFS has no depot times).
 * The answer is blocks to put in a service day; nothing is saved.
 */
import { and, eq, isNull, like } from 'drizzle-orm';
import type { Block } from '@shared/domain/service-days';
import type { Executor } from '../db/client';
import { roadRoutes, roadRouteVersions } from '../db/schema/index';
import { BadRequestError, UnprocessableError } from '../http/http-error';
import { gtfsBlockTrips } from '../road-routes/gtfs-import';
import * as profiles from '../vehicle-profiles/vehicle-profiles-repository';

const DEPOT_MARGIN_S = 15 * 60;
const MAX_TRIPS_PER_BLOCK = 60;

export async function blocksFromGtfs(
  db: Executor,
  file: { originalname: string; buffer: Buffer },
  options: { serviceId: string; vehicleProfileId: string; depotChargerKey?: string | undefined },
): Promise<{ blocks: Block[]; tripsWithoutBlock: number }> {
  if (!(await profiles.findProfile(db, options.vehicleProfileId))) {
    throw new BadRequestError(`vehicleProfileId: no vehicle profile ${options.vehicleProfileId}`, { field: 'vehicleProfileId' });
  }
  const { trips, withoutBlock, routeNames } = await gtfsBlockTrips(file.originalname || 'feed.zip', file.buffer, options.serviceId);
  if (trips.length === 0) {
    throw new UnprocessableError(`no trip of service "${options.serviceId}" has a block_id in trips.txt`, 'no_blocks', {
      field: 'serviceId',
      tripsWithoutBlock: withoutBlock,
    });
  }
  const routes = new Map<string, { id: string; shapeId: string }>();
  for (const gtfsRouteId of new Set(trips.map((trip) => trip.routeId))) {
    const [row] = await db
      .select({ id: roadRoutes.id, description: roadRouteVersions.description })
      .from(roadRoutes)
      .innerJoin(
        roadRouteVersions,
        and(eq(roadRouteVersions.routeId, roadRoutes.id), eq(roadRouteVersions.version, roadRoutes.currentVersion)),
      )
      .where(
        and(
          isNull(roadRoutes.deletedAt),
          like(roadRouteVersions.description, `%(GTFS route ${gtfsRouteId.replace(/[%_\\]/g, '\\$&')}, shape %`),
        ),
      );
    if (!row) {
      const trip = trips.find((candidate) => candidate.routeId === gtfsRouteId)!;
      const where = { file: 'trips.txt', line: trip.line, blockId: trip.blockId, tripId: trip.tripId, routeId: gtfsRouteId };
      const name = routeNames.get(gtfsRouteId);
      const named = name
        ? await db
            .select({ id: roadRoutes.id })
            .from(roadRoutes)
            .innerJoin(
              roadRouteVersions,
              and(eq(roadRouteVersions.routeId, roadRoutes.id), eq(roadRouteVersions.version, roadRoutes.currentVersion)),
            )
            .where(and(isNull(roadRoutes.deletedAt), eq(roadRouteVersions.name, name)))
            .limit(2)
        : [];
      if (named.length === 1) {
        routes.set(gtfsRouteId, { id: named[0]!.id, shapeId: '' });
        continue;
      }
      if (named.length > 1) {
        throw new UnprocessableError(
          `trips.txt line ${trip.line}: GTFS route "${gtfsRouteId}" (block "${trip.blockId}", trip "${trip.tripId}") is named "${name}", and more than one route has that name; rename one or import the feed's routes (POST /api/routes/import-gtfs)`,
          'route_ambiguous',
          { ...where, name },
        );
      }
      throw new UnprocessableError(
        `trips.txt line ${trip.line}: GTFS route "${gtfsRouteId}" (block "${trip.blockId}", trip "${trip.tripId}") has no imported route${name ? ` and no route is named "${name}"` : ''}; import the feed's routes first (POST /api/routes/import-gtfs)`,
        'route_not_imported',
        where,
      );
    }
    const shapeId = /\(GTFS route .*, shape (.*)\)$/.exec(row.description)?.[1] ?? '';
    routes.set(gtfsRouteId, { id: row.id, shapeId });
  }
  // The direction_id of the trips on each imported route's own shape.
  const outboundDirection = new Map<string, string>();
  for (const trip of trips) {
    if (routes.get(trip.routeId)!.shapeId === trip.shapeId && !outboundDirection.has(trip.routeId))
      outboundDirection.set(trip.routeId, trip.directionId);
  }
  const byBlock = new Map<string, typeof trips>();
  for (const trip of trips) {
    const list = byBlock.get(trip.blockId) ?? [];
    list.push(trip);
    byBlock.set(trip.blockId, list);
  }
  const blocks: Block[] = [];
  for (const [blockId, list] of [...byBlock.entries()].sort((a, b) => a[0].localeCompare(b[0]))) {
    list.sort((a, b) => a.departureS - b.departureS);
    if (list.length > MAX_TRIPS_PER_BLOCK) {
      throw new UnprocessableError(
        `block "${blockId}" has ${list.length} trips; a block may have at most ${MAX_TRIPS_PER_BLOCK}`,
        'block_too_long',
        { blockId },
      );
    }
    blocks.push({
      blockId: blockId.slice(0, 120),
      vehicleProfileId: options.vehicleProfileId,
      ...(options.depotChargerKey ? { depotChargerKey: options.depotChargerKey } : {}),
      pullOutS: Math.max(0, list[0]!.departureS - DEPOT_MARGIN_S),
      pullInS: Math.min(36 * 3600, Math.max(...list.map((trip) => trip.arrivalS)) + DEPOT_MARGIN_S),
      startSoc: 0.95,
      trips: list.map((trip) => ({
        routeId: routes.get(trip.routeId)!.id,
        direction: (outboundDirection.get(trip.routeId) ?? '0') === trip.directionId ? ('outbound' as const) : ('inbound' as const),
        departureS: trip.departureS,
        load: { kind: 'case' as const, case: 'seated' as const },
        gtfsTripId: trip.tripId.slice(0, 200),
      })),
    });
  }
  return { blocks, tripsWithoutBlock: withoutBlock };
}
