/**
 * Resampling of a route by geodesic distance. Each stretch between two original vertices is cut
 * into ⌈length/Δs⌉ equal pieces, so every original vertex is kept, no piece is longer than Δs
 * and no sliver pieces appear next to vertices. New points lie on the geodesic between the two
 * vertices (Vincenty direct). When every input position carries an elevation, it is
 * interpolated linearly by distance; otherwise elevations come from the terrain later.
 * Consecutive vertices closer than 1 mm are merged.
 */
import { geodesicDirect, geodesicInverse } from './geodesy';
import { assertInRange, EngineInputError, RouteTooLargeError } from './validation';

const DUPLICATE_TOLERANCE_M = 1e-3;

export interface ResampledRoute {
  /** Horizontal geodesic distance from the start, m. */
  distanceM: Float64Array;
  lon: Float64Array;
  lat: Float64Array;
  /** Elevations from the input positions, or null when they carry none. */
  elevationM: Float64Array | null;
  /** Index into `distanceM` of each kept original vertex. */
  vertexIndex: number[];
}

/** Bounds on the size of a resampled route; checked before any point is built. */
export interface ResampleLimits {
  maxLengthM: number;
  maxPoints: number;
}

/**
 * Resamples `coordinates` ([lon, lat] or [lon, lat, z] positions) at spacing ≤ `spacingM`.
 * With `limits`, a route longer than `maxLengthM` or needing more than `maxPoints` points throws a
 * `RouteTooLargeError` after measuring the legs and before allocating anything per point.
 */
export function resampleRoute(coordinates: readonly (readonly number[])[], spacingM: number, limits?: ResampleLimits): ResampledRoute {
  assertInRange('options.spacingM', spacingM, 1e-3, 1e4);
  const hasElevation = coordinates.length > 0 && coordinates.every((position) => position.length >= 3);

  // Validate, and drop consecutive duplicates.
  const lons: number[] = [];
  const lats: number[] = [];
  const zs: number[] = [];
  const legLengths: number[] = [];
  const legAzimuths: number[] = [];
  coordinates.forEach((position, index) => {
    const lon = position[0];
    const lat = position[1];
    if (lon === undefined || lat === undefined) {
      throw new EngineInputError(`route.coordinates.${index}`, 'a position needs longitude and latitude');
    }
    assertInRange(`route.coordinates.${index}.0`, lon, -180, 180);
    assertInRange(`route.coordinates.${index}.1`, lat, -90, 90);
    const z = hasElevation ? (position[2] ?? Number.NaN) : 0;
    if (hasElevation) assertInRange(`route.coordinates.${index}.2`, z, -1_000, 11_000);
    const lastLon = lons[lons.length - 1];
    const lastLat = lats[lats.length - 1];
    if (lastLon !== undefined && lastLat !== undefined) {
      const { distanceM, azimuthRad } = geodesicInverse(lastLon, lastLat, lon, lat);
      if (distanceM < DUPLICATE_TOLERANCE_M) return;
      legLengths.push(distanceM);
      legAzimuths.push(azimuthRad);
    }
    lons.push(lon);
    lats.push(lat);
    zs.push(z);
  });
  if (lons.length < 2) {
    throw new EngineInputError('route.coordinates', 'needs at least two distinct points');
  }

  let count = 1;
  const pieces = legLengths.map((length) => {
    const n = Math.max(1, Math.ceil(length / spacingM - 1e-9));
    count += n;
    return n;
  });
  if (limits) {
    const totalM = legLengths.reduce((sum, length) => sum + length, 0);
    if (totalM > limits.maxLengthM || count > limits.maxPoints) {
      throw new RouteTooLargeError(totalM, count, spacingM, limits.maxLengthM, limits.maxPoints);
    }
  }

  const distanceM = new Float64Array(count);
  const lon = new Float64Array(count);
  const lat = new Float64Array(count);
  const elevationM = hasElevation ? new Float64Array(count) : null;
  const vertexIndex: number[] = [0];
  const point: [number, number] = [0, 0];
  lon[0] = lons[0] ?? 0;
  lat[0] = lats[0] ?? 0;
  if (elevationM) elevationM[0] = zs[0] ?? 0;
  let k = 1;
  let travelledM = 0;
  for (let leg = 0; leg < legLengths.length; leg++) {
    const length = legLengths[leg] ?? 0;
    const azimuth = legAzimuths[leg] ?? 0;
    const n = pieces[leg] ?? 1;
    const lon1 = lons[leg] ?? 0;
    const lat1 = lats[leg] ?? 0;
    const z1 = zs[leg] ?? 0;
    const z2 = zs[leg + 1] ?? 0;
    for (let j = 1; j <= n; j++) {
      const fraction = j / n;
      if (j === n) {
        // Keep the original vertex exactly.
        lon[k] = lons[leg + 1] ?? 0;
        lat[k] = lats[leg + 1] ?? 0;
      } else {
        geodesicDirect(lon1, lat1, azimuth, length * fraction, point);
        lon[k] = point[0];
        lat[k] = point[1];
      }
      distanceM[k] = travelledM + length * fraction;
      if (elevationM) elevationM[k] = z1 + (z2 - z1) * fraction;
      k++;
    }
    travelledM += length;
    distanceM[k - 1] = travelledM;
    vertexIndex.push(k - 1);
  }
  return { distanceM, lon, lat, elevationM, vertexIndex };
}
