/**
 * The route line: one set of rules for measuring and cutting a route, used by the route editor
 * (estimates while a planner edits), the API (the stored version) and the engine's round trip, so
 * a stop or a speed-limit stretch gets the same distance along the route everywhere.
 *
 * - Distances along the line are geodesic (Vincenty on WGS 84, `geodesicDistanceM`), the same
 *   distances the engine resamples by.
 * - A point is projected with Turf's nearest point on the line; the position Turf finds is then
 *   measured along its segment with the geodesic distances, so a point at the very end sits
 *   exactly at the line's length.
 * - Every distance this module stores (a stop's `atM`, a clipped or mirrored stretch's ends) is
 *   rounded by one rule, `roundAlongM`: to the millimetre.
 *
 * Positions are GeoJSON order, [lon, lat] or [lon, lat, elevation m]. Pure: no DOM, no Node.
 */
import { distance, lineString, nearestPointOnLine, point } from '@turf/turf';
import { geodesicDistanceM } from '../engine/geodesy';

/** A position on the route: [lon, lat] or [lon, lat, elevation m]. */
export type RoutePosition = readonly number[];

/** Decimals of a metre kept in every stored distance along the route: millimetres. */
export const ALONG_DECIMALS = 3;

/** The one rounding rule for distances along the route (stops, stretch ends): to the millimetre. */
export function roundAlongM(valueM: number): number {
  const factor = 10 ** ALONG_DECIMALS;
  return Math.round(valueM * factor) / factor;
}

/** Cumulative geodesic distance at each vertex, m (0 at the first). */
export function vertexDistancesM(coordinates: readonly RoutePosition[]): number[] {
  const distances = coordinates.length > 0 ? [0] : [];
  for (let i = 1; i < coordinates.length; i++) {
    const a = coordinates[i - 1]!;
    const b = coordinates[i]!;
    distances.push(distances[i - 1]! + geodesicDistanceM(a[0]!, a[1]!, b[0]!, b[1]!));
  }
  return distances;
}

/** Length of the line along the ellipsoid, m (unrounded). */
export function lineLengthM(coordinates: readonly RoutePosition[]): number {
  return vertexDistancesM(coordinates).at(-1) ?? 0;
}

/** The nearest point on the line to a given point. */
export interface LineProjection {
  /** The nearest point on the line, [lon, lat]. */
  at: [number, number];
  /** Its distance along the line, m (unrounded). */
  atM: number;
  /** Distance from the given point to the line, m. */
  offsetM: number;
}

/** Projects `position` onto the line; null when the line has fewer than two vertices. */
export function projectOnLine(coordinates: readonly RoutePosition[], position: RoutePosition): LineProjection | null {
  if (coordinates.length < 2) return null;
  const flat = coordinates.map((vertex) => [vertex[0]!, vertex[1]!]);
  const nearest = nearestPointOnLine(lineString(flat), point([position[0]!, position[1]!]), { units: 'meters' });
  const vertexM = vertexDistancesM(coordinates);
  // Turf measures along the line with the haversine formula; find the segment and the share along
  // it on Turf's own cumulative distances (its segment distance is unreliable at vertices).
  const turfM = [0];
  for (let i = 1; i < flat.length; i++) {
    turfM.push(turfM[i - 1]! + distance(point(flat[i - 1]!), point(flat[i]!), { units: 'meters' }));
  }
  const alongTurfM = nearest.properties.lineDistance;
  let segment = Math.min(Math.max(0, nearest.properties.segmentIndex), flat.length - 2);
  while (segment > 0 && alongTurfM < turfM[segment]!) segment--;
  while (segment < flat.length - 2 && alongTurfM > turfM[segment + 1]!) segment++;
  const turfSegmentM = turfM[segment + 1]! - turfM[segment]!;
  const share = turfSegmentM > 0 ? Math.min(1, Math.max(0, (alongTurfM - turfM[segment]!) / turfSegmentM)) : 0;
  const [lon, lat] = nearest.geometry.coordinates;
  return {
    at: [lon!, lat!],
    atM: vertexM[segment]! + share * (vertexM[segment + 1]! - vertexM[segment]!),
    offsetM: nearest.properties.pointDistance,
  };
}

/** The position `atM` metres along the line, clamped to its ends; null for an empty line. */
export function pointAlongLine(coordinates: readonly RoutePosition[], atM: number): [number, number] | null {
  if (coordinates.length === 0) return null;
  let remainingM = Math.max(0, atM);
  for (let i = 1; i < coordinates.length; i++) {
    const a = coordinates[i - 1]!;
    const b = coordinates[i]!;
    const segmentM = geodesicDistanceM(a[0]!, a[1]!, b[0]!, b[1]!);
    if (remainingM <= segmentM) {
      const t = segmentM === 0 ? 0 : remainingM / segmentM;
      return [a[0]! + t * (b[0]! - a[0]!), a[1]! + t * (b[1]! - a[1]!)];
    }
    remainingM -= segmentM;
  }
  const last = coordinates[coordinates.length - 1]!;
  return [last[0]!, last[1]!];
}

/** The part of the line between two distances along it (how a speed-limit stretch is drawn). */
export function sliceLine(coordinates: readonly RoutePosition[], fromM: number, toM: number): [number, number][] {
  if (coordinates.length < 2 || toM <= fromM) return [];
  const inside: [number, number][] = [pointAlongLine(coordinates, fromM)!];
  const vertexM = vertexDistancesM(coordinates);
  for (let i = 1; i < coordinates.length; i++) {
    if (vertexM[i]! > fromM && vertexM[i]! < toM) inside.push([coordinates[i]![0]!, coordinates[i]![1]!]);
  }
  inside.push(pointAlongLine(coordinates, toM)!);
  return inside;
}

/** A stretch of the route between two distances along it (a speed limit, a restriction…). */
export interface AlongRange {
  fromM: number;
  toM: number;
}

/**
 * Ranges clipped to a line of `lengthM` metres: an end past the line's end becomes the length
 * (rounded by `roundAlongM`), a range starting at or beyond the end, or left empty, is dropped, and
 * the rest are sorted by where they start.
 */
export function clipRanges<T extends AlongRange>(ranges: readonly T[], lengthM: number): T[] {
  const endM = roundAlongM(lengthM);
  return ranges
    .filter((range) => range.fromM < lengthM)
    .map((range) => ({ ...range, toM: Math.min(range.toM, endM) }))
    .filter((range) => range.toM > range.fromM)
    .sort((a, b) => a.fromM - b.fromM);
}

/** A stop to place: where it was put, with anything else it carries. */
export interface StopPosition {
  name: string;
  lon: number;
  lat: number;
}

/** Raised when a stop lies farther from the line than allowed; `index` is its place in the list. */
export class StopOffLineError extends RangeError {
  constructor(
    readonly index: number,
    readonly stopName: string,
    readonly offsetM: number,
    readonly maxOffsetM: number,
  ) {
    super(
      `stops.${index}: stop "${stopName}" lies ${offsetM.toFixed(0)} m from the route line; ` +
        `a stop must be within ${maxOffsetM} m of it`,
    );
    this.name = 'StopOffLineError';
  }
}

/**
 * Places each stop on the line: `atM` is the distance along the line of the nearest point (rounded
 * by `roundAlongM`), and the stops come back sorted along the route. The stop keeps its own
 * position. A stop farther than `maxOffsetM` from the line throws `StopOffLineError`.
 */
export function placeStops<S extends StopPosition>(
  coordinates: readonly RoutePosition[],
  stops: readonly S[],
  maxOffsetM = Number.POSITIVE_INFINITY,
): (S & { atM: number })[] {
  const placed = stops.map((stop, index) => {
    const projection = projectOnLine(coordinates, [stop.lon, stop.lat]);
    if (!projection) throw new RangeError('A stop needs a route of at least two vertices');
    if (projection.offsetM > maxOffsetM) throw new StopOffLineError(index, stop.name, projection.offsetM, maxOffsetM);
    return { ...stop, atM: roundAlongM(projection.atM) };
  });
  return placed.sort((a, b) => a.atM - b.atM);
}

/**
 * The same route driven the other way: positions reversed, stops and ranges mirrored
 * (atM → L − atM, rounded by `roundAlongM`) and sorted along the new direction.
 */
export function reverseRoute<P extends RoutePosition, S extends { atM: number }, R extends AlongRange>(route: {
  coordinates: readonly P[];
  stops: readonly S[];
  speedLimits: readonly R[];
  lengthM: number;
}) {
  const L = route.lengthM;
  return {
    coordinates: [...route.coordinates].reverse(),
    stops: route.stops.map((stop) => ({ ...stop, atM: roundAlongM(Math.max(0, L - stop.atM)) })).sort((a, b) => a.atM - b.atM),
    speedLimits: route.speedLimits
      .map((range) => ({ ...range, fromM: roundAlongM(Math.max(0, L - range.toM)), toM: roundAlongM(L - range.fromM) }))
      .sort((a, b) => a.fromM - b.fromM),
    lengthM: L,
  };
}
