/**
 * Geometry rules of a saved route: its length, where its stops lie along it, its speed-limit
 * stretches clipped to it, and the inbound direction (the outbound line driven backwards).
 *
 * Lengths use the engine's geodesy (Vincenty on WGS 84), so `atM` and `lengthM` agree with the
 * distances the engine resamples. Stops are projected with Turf's nearest point on the line; the
 * position Turf finds on a segment is then measured along that segment with the engine's
 * distances, so a stop at the very end sits exactly at `lengthM`.
 */
import { distance, lineString, nearestPointOnLine, point } from '@turf/turf';
import type { LineString } from '@shared/domain/analysis';
import { STOP_MAX_OFFSET_M, type RouteSpeedLimit, type RouteStop } from '@shared/domain/road-routes';
import { geodesicDistanceM } from '@shared/engine/geodesy';

export type PlacedStop = Required<RouteStop>;

/** Cumulative geodesic distance at each vertex, m. */
export function vertexDistancesM(coordinates: LineString['coordinates']): number[] {
  const distances = [0];
  for (let i = 1; i < coordinates.length; i++) {
    const [lon1, lat1] = coordinates[i - 1]!;
    const [lon2, lat2] = coordinates[i]!;
    distances.push(distances[i - 1]! + geodesicDistanceM(lon1, lat1, lon2, lat2));
  }
  return distances;
}

export function lineLengthM(coordinates: LineString['coordinates']): number {
  return vertexDistancesM(coordinates).at(-1) ?? 0;
}

/** Raised when a stop lies too far from the line; `index` is the stop's place in the list. */
export class StopOffLineError extends RangeError {
  constructor(
    readonly index: number,
    readonly stopName: string,
    readonly offsetM: number,
  ) {
    super(
      `stops.${index}: stop "${stopName}" lies ${offsetM.toFixed(0)} m from the route line; ` +
        `a stop must be within ${STOP_MAX_OFFSET_M} m of it`,
    );
    this.name = 'StopOffLineError';
  }
}

/** Places every stop on the line (atM from its lon/lat), sorted along the route. */
export function placeStops(coordinates: LineString['coordinates'], stops: readonly RouteStop[]): PlacedStop[] {
  if (stops.length === 0) return [];
  const line = lineString(coordinates.map(([lon, lat]) => [lon, lat]));
  const vertexM = vertexDistancesM(coordinates);
  const turfM = [0];
  for (let i = 1; i < coordinates.length; i++) {
    const [lonA, latA] = coordinates[i - 1]!;
    const [lonB, latB] = coordinates[i]!;
    turfM.push(turfM[i - 1]! + distance(point([lonA, latA]), point([lonB, latB]), { units: 'meters' }));
  }
  const placed = stops.map((stop, index) => {
    const nearest = nearestPointOnLine(line, point([stop.lon, stop.lat]), { units: 'meters' });
    const offsetM = nearest.properties.pointDistance;
    if (offsetM > STOP_MAX_OFFSET_M) throw new StopOffLineError(index, stop.name, offsetM);
    // Turf measures along the line with the haversine formula; find the segment and the share
    // along it on Turf's own cumulative distances (its segmentDistance is unreliable at vertices).
    const alongTurfM = nearest.properties.lineDistance;
    let segment = Math.min(Math.max(0, nearest.properties.segmentIndex), coordinates.length - 2);
    while (segment > 0 && alongTurfM < turfM[segment]!) segment--;
    while (segment < coordinates.length - 2 && alongTurfM > turfM[segment + 1]!) segment++;
    const turfSegmentM = turfM[segment + 1]! - turfM[segment]!;
    const share = turfSegmentM > 0 ? Math.min(1, Math.max(0, (alongTurfM - turfM[segment]!) / turfSegmentM)) : 0;
    const atM = vertexM[segment]! + share * (vertexM[segment + 1]! - vertexM[segment]!);
    return { name: stop.name, lon: stop.lon, lat: stop.lat, dwellS: stop.dwellS, atM: round3(atM) };
  });
  return placed.sort((a, b) => a.atM - b.atM);
}

/** Speed-limit stretches clipped to [0, lengthM]; stretches that start beyond the end are dropped. */
export function clipSpeedLimits(limits: readonly RouteSpeedLimit[], lengthM: number): RouteSpeedLimit[] {
  return limits
    .filter((stretch) => stretch.fromM < lengthM)
    .map((stretch) => ({ ...stretch, toM: Math.min(stretch.toM, round3(lengthM)) }))
    .filter((stretch) => stretch.toM > stretch.fromM)
    .sort((a, b) => a.fromM - b.fromM);
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

function round3(value: number): number {
  return Math.round(value * 1000) / 1000;
}
