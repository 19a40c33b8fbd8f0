/**
 * A saved route's geometry rules: its length, where its stops lie along it and its speed-limit
 * stretches clipped to it, all by the shared route-line rules (shared/geometry/route-line.ts), so
 * the editor's estimates and the stored version agree; plus the engine's speed-limit input and
 * the 2-D line PostGIS stores.
 */
import type { LineString } from '@shared/domain/analysis';
import { STOP_MAX_OFFSET_M, type RouteSpeedLimit, type RouteStop } from '@shared/domain/road-routes';
import { clipRanges, lineLengthM, placeStops as placeStopsOnLine, StopOffLineError, vertexDistancesM } from '@shared/geometry/route-line';

export { lineLengthM, StopOffLineError, vertexDistancesM };

export type PlacedStop = Required<RouteStop>;

/** Places every stop on the line (atM from its lon/lat), sorted along the route; refuses a stop off the line. */
export function placeStops(coordinates: LineString['coordinates'], stops: readonly RouteStop[]): PlacedStop[] {
  return placeStopsOnLine(coordinates, stops, STOP_MAX_OFFSET_M).map((stop) => ({
    name: stop.name,
    lon: stop.lon,
    lat: stop.lat,
    dwellS: stop.dwellS,
    atM: stop.atM,
  }));
}

/** Speed-limit stretches clipped to [0, lengthM]; stretches that start beyond the end are dropped. */
export function clipSpeedLimits(limits: readonly RouteSpeedLimit[], lengthM: number): RouteSpeedLimit[] {
  return clipRanges(limits, lengthM);
}

/**
 * The engine's speed limits along a line and the inbound direction (positions reversed, stops and
 * stretches mirrored) are the trip's own, in the engine (shared/engine/round-trip.ts).
 */
export { reverseTripLine as mirrorRoute, speedLimitProfile as engineSpeedLimits } from '@shared/engine/round-trip';

/** Positions without elevation, for the PostGIS 2-D column. */
export function flatten(geometry: LineString): LineString {
  return { type: 'LineString', coordinates: geometry.coordinates.map(([lon, lat]) => [lon, lat] as [number, number]) };
}
