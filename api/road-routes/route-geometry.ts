/**
 * A saved route's geometry rules: its length, where its stops lie along it and its speed-limit
 * stretches clipped to it, all by the shared route-line rules (shared/geometry/route-line.ts), so
 * the editor's estimates and the stored version agree; plus the engine's speed-limit input and
 * the 2-D line PostGIS stores.
 */
import type { LineString } from '@shared/domain/analysis';
import { STOP_MAX_OFFSET_M, type RouteSpeedLimit, type RouteStop } from '@shared/domain/road-routes';
import {
  clipRanges,
  lineLengthM,
  placeStops as placeStopsOnLine,
  reverseRoute,
  StopOffLineError,
  vertexDistancesM,
} from '@shared/geometry/route-line';

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
 * Engine speed-limit input for a route: its stretches, with the default limit filling the
 * stretches between them (the engine's own fallback outside stretches is the largest limit).
 */
export function engineSpeedLimits(
  limits: readonly RouteSpeedLimit[],
  defaultSpeedLimitKph: number,
  lengthM: number,
): number | { fromM: number; toM: number; speedKph: number }[] {
  if (limits.length === 0) return defaultSpeedLimitKph;
  const sorted = [...limits].sort((a, b) => a.fromM - b.fromM);
  const out: { fromM: number; toM: number; speedKph: number }[] = [];
  let cursorM = 0;
  for (const stretch of sorted) {
    if (stretch.fromM > cursorM) out.push({ fromM: cursorM, toM: stretch.fromM, speedKph: defaultSpeedLimitKph });
    out.push({ fromM: stretch.fromM, toM: stretch.toM, speedKph: stretch.speedKph });
    cursorM = Math.max(cursorM, stretch.toM);
  }
  if (cursorM < lengthM) out.push({ fromM: cursorM, toM: lengthM, speedKph: defaultSpeedLimitKph });
  return out;
}

/** The inbound direction: positions reversed, stops and stretches mirrored (atM → L − atM). */
export function mirrorRoute(route: {
  coordinates: LineString['coordinates'];
  stops: readonly PlacedStop[];
  speedLimits: readonly RouteSpeedLimit[];
  lengthM: number;
}) {
  return reverseRoute(route);
}

/** Positions without elevation, for the PostGIS 2-D column. */
export function flatten(geometry: LineString): LineString {
  return { type: 'LineString', coordinates: geometry.coordinates.map(([lon, lat]) => [lon, lat] as [number, number]) };
}
