/**
 * A logged GPS track against the road: noise filtering and projection onto a route line.
 *
 * Positions are handled in a local plane (east/north metres from a reference point, scaled with
 * the WGS 84 radii of curvature at that point), which is accurate to well under a metre over the
 * few tens of kilometres a logged trip covers.
 *
 * Noise filter (`filterGpsTrack`), in two named steps:
 * 1. Outlier rejection by implied speed: a fix farther from the last kept fix than the vehicle
 *    can have moved (its logged speed over the interval, plus `GPS_OUTLIER_ALLOWANCE_M`) is
 *    dropped and replaced by interpolation between its kept neighbours.
 * 2. Savitzky–Golay smoothing (local quadratic least squares; Savitzky & Golay, Anal. Chem. 36,
 *    1964) of east and north over the distance travelled (the integral of the logged speed),
 *    with a `GPS_SMOOTHING_WINDOW_M` window. Smoothing over distance, not time, keeps standstills
 *    from smearing into the road ahead: fixes taken while the vehicle stood still share one
 *    distance and become their mean position.
 */
import { metresPerDegree } from './geodesy';
import { savitzkyGolayOverDistance } from './smoothing';

/**
 * Distance window of the Savitzky–Golay position filter, m. Common practice: consumer and
 * fleet GNSS receivers scatter by 2–5 m; a 40 m window removes that while keeping bends of a
 * 20 m radius (the tightest hairpins a bus takes) within a metre or two.
 */
export const GPS_SMOOTHING_WINDOW_M = 40;

/** Slack added to the distance a vehicle can have moved before a fix counts as an outlier, m (common practice: a few times the receiver's scatter). */
export const GPS_OUTLIER_ALLOWANCE_M = 30;

/** A local east/north plane around a reference point. */
export interface LocalPlane {
  lon0: number;
  lat0: number;
  eastMPerDeg: number;
  northMPerDeg: number;
}

export function localPlane(lon0: number, lat0: number): LocalPlane {
  const { eastM, northM } = metresPerDegree(lat0);
  return { lon0, lat0, eastMPerDeg: eastM, northMPerDeg: northM };
}

export function toPlane(plane: LocalPlane, lon: number, lat: number): [number, number] {
  return [(lon - plane.lon0) * plane.eastMPerDeg, (lat - plane.lat0) * plane.northMPerDeg];
}

export function fromPlane(plane: LocalPlane, east: number, north: number): [number, number] {
  return [plane.lon0 + east / plane.eastMPerDeg, plane.lat0 + north / plane.northMPerDeg];
}

export interface FilteredTrack {
  lon: Float64Array;
  lat: Float64Array;
  /** Indices of fixes dropped as outliers (replaced by interpolation). */
  outlierIndices: number[];
}

/**
 * Filters a track per the module comment. `odometerM` is the distance travelled at each fix
 * (non-decreasing), integrated from the logged speed.
 */
export function filterGpsTrack(
  lon: Float64Array,
  lat: Float64Array,
  odometerM: Float64Array,
  windowM = GPS_SMOOTHING_WINDOW_M,
): FilteredTrack {
  const n = lon.length;
  const plane = localPlane(lon[0]!, lat[0]!);
  const east = new Float64Array(n);
  const north = new Float64Array(n);
  for (let i = 0; i < n; i++) [east[i], north[i]] = toPlane(plane, lon[i]!, lat[i]!);

  // 1. Outlier rejection by implied speed.
  const kept = new Uint8Array(n).fill(1);
  const outlierIndices: number[] = [];
  let last = 0;
  for (let i = 1; i < n; i++) {
    const movedM = Math.abs(odometerM[i]! - odometerM[last]!);
    const maxM = movedM + GPS_OUTLIER_ALLOWANCE_M;
    const jumpM = Math.hypot(east[i]! - east[last]!, north[i]! - north[last]!);
    if (jumpM > maxM) {
      kept[i] = 0;
      outlierIndices.push(i);
    } else {
      last = i;
    }
  }
  interpolateDropped(east, odometerM, kept);
  interpolateDropped(north, odometerM, kept);

  // 2. Savitzky–Golay over distance travelled, one value per distinct odometer reading.
  const distinct: number[] = [];
  const groupOf = new Int32Array(n);
  for (let i = 0; i < n; i++) {
    if (distinct.length === 0 || odometerM[i]! > distinct[distinct.length - 1]! + 1e-6) distinct.push(odometerM[i]!);
    groupOf[i] = distinct.length - 1;
  }
  const m = distinct.length;
  const sumE = new Float64Array(m);
  const sumN = new Float64Array(m);
  const count = new Float64Array(m);
  for (let i = 0; i < n; i++) {
    const g = groupOf[i]!;
    sumE[g] = sumE[g]! + east[i]!;
    sumN[g] = sumN[g]! + north[i]!;
    count[g] = count[g]! + 1;
  }
  for (let g = 0; g < m; g++) {
    sumE[g] = sumE[g]! / count[g]!;
    sumN[g] = sumN[g]! / count[g]!;
  }
  const distance = Float64Array.from(distinct);
  const smoothE = savitzkyGolayOverDistance(distance, sumE, windowM);
  const smoothN = savitzkyGolayOverDistance(distance, sumN, windowM);
  const outLon = new Float64Array(n);
  const outLat = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const g = groupOf[i]!;
    [outLon[i], outLat[i]] = fromPlane(plane, smoothE[g]!, smoothN[g]!);
  }
  return { lon: outLon, lat: outLat, outlierIndices };
}

function interpolateDropped(values: Float64Array, at: Float64Array, kept: Uint8Array): void {
  const n = values.length;
  let previous = -1;
  for (let i = 0; i < n; i++) {
    if (!kept[i]) continue;
    if (previous >= 0 && i - previous > 1) {
      const span = at[i]! - at[previous]!;
      for (let j = previous + 1; j < i; j++) {
        const f = span > 0 ? (at[j]! - at[previous]!) / span : 0;
        values[j] = values[previous]! + f * (values[i]! - values[previous]!);
      }
    } else if (previous < 0 && i > 0) {
      for (let j = 0; j < i; j++) values[j] = values[i]!;
    }
    previous = i;
  }
  for (let j = previous + 1; j < n; j++) values[j] = values[previous]!;
}

/** A polyline in the local plane with the distance along it at each vertex (m). */
export interface PlaneLine {
  east: Float64Array;
  north: Float64Array;
  distanceM: Float64Array;
}

export interface TrackProjection {
  /** Distance along the line of each fix's foot point, m. */
  alongM: Float64Array;
  /** Distance of each fix from the line, m. */
  offsetM: Float64Array;
}

/**
 * Projects a track onto a line, moving forward along the line with the vehicle: each fix is
 * matched to the nearest point of the line within a window from a little behind the previous
 * match to as far ahead as the vehicle has travelled since (times 1.5, plus 100 m). A route that
 * passes the same place twice (an out-and-back line, hairpins stacked above each other) is thus
 * followed in order instead of jumping to the other pass. The first fix is matched to the
 * nearest point of the whole line.
 */
export function projectTrackOntoLine(east: Float64Array, north: Float64Array, odometerM: Float64Array, line: PlaneLine): TrackProjection {
  const n = east.length;
  const segments = line.east.length - 1;
  const alongM = new Float64Array(n);
  const offsetM = new Float64Array(n);
  let current = 0;
  let currentAlong = 0;
  for (let i = 0; i < n; i++) {
    let from = 0;
    let to = segments - 1;
    if (i > 0) {
      const ahead = 1.5 * Math.max(0, odometerM[i]! - odometerM[i - 1]!) + 100;
      from = current;
      while (from > 0 && line.distanceM[from]! > currentAlong - 30) from--;
      to = current;
      while (to < segments - 1 && line.distanceM[to]! < currentAlong + ahead) to++;
    }
    let best = Number.POSITIVE_INFINITY;
    let bestAlong = currentAlong;
    let bestSegment = current;
    for (let k = from; k <= to; k++) {
      const ax = line.east[k]!;
      const ay = line.north[k]!;
      const dx = line.east[k + 1]! - ax;
      const dy = line.north[k + 1]! - ay;
      const lengthSq = dx * dx + dy * dy;
      let t = lengthSq > 0 ? ((east[i]! - ax) * dx + (north[i]! - ay) * dy) / lengthSq : 0;
      t = Math.min(1, Math.max(0, t));
      const d = Math.hypot(east[i]! - (ax + t * dx), north[i]! - (ay + t * dy));
      if (d < best) {
        best = d;
        bestSegment = k;
        bestAlong = line.distanceM[k]! + t * (line.distanceM[k + 1]! - line.distanceM[k]!);
      }
    }
    current = bestSegment;
    currentAlong = bestAlong;
    alongM[i] = bestAlong;
    offsetM[i] = best;
  }
  return { alongM, offsetM };
}

/** The value below which `share` of `values` lie (nearest rank). */
export function percentile(values: ArrayLike<number>, share: number): number {
  const sorted = Array.from(values).sort((a, b) => a - b);
  if (sorted.length === 0) return Number.NaN;
  const rank = Math.min(sorted.length - 1, Math.max(0, Math.ceil(share * sorted.length) - 1));
  return sorted[rank]!;
}
