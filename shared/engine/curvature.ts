/**
 * Horizontal curvature of a route and the speed a curve allows (engine README §7.1):
 *
 *   R = a·b·c / (4·Area)   circumradius of three consecutive points
 *   v_curve = √(a_lat·R)
 *
 * Curvature 1/R is computed per point in a local plane (WGS 84 radii of curvature) from the
 * points about `CURVATURE_BASELINE_M` before and after it (so densely drawn arcs do not alias),
 * smoothed over distance (from memory: 20–50 m) and R is capped on straights (from memory: 10 km).
 */
import { MAX_CURVE_RADIUS_M } from './constants';
import { metresPerDegree } from './geodesy';
import { movingAverageOverDistance } from './smoothing';
import { assertNonNegative, assertPositive } from './validation';

/** Distance to the neighbours used for the three-point radius, m (common practice). */
export const CURVATURE_BASELINE_M = 10;

/** Circumradius of the triangle (x1,y1), (x2,y2), (x3,y3) in metres; Infinity when collinear. */
export function circumradiusM(x1: number, y1: number, x2: number, y2: number, x3: number, y3: number): number {
  const a = Math.hypot(x2 - x1, y2 - y1);
  const b = Math.hypot(x3 - x2, y3 - y2);
  const c = Math.hypot(x3 - x1, y3 - y1);
  const twiceArea = Math.abs((x2 - x1) * (y3 - y1) - (x3 - x1) * (y2 - y1));
  if (twiceArea === 0) return Number.POSITIVE_INFINITY;
  return (a * b * c) / (2 * twiceArea);
}

/** Highest speed through a curve of radius `radiusM` at lateral acceleration `lateralAccelerationMps2`, m/s. */
export function curveSpeedLimitMps(radiusM: number, lateralAccelerationMps2: number): number {
  assertNonNegative('radiusM', radiusM);
  assertPositive('lateralAccelerationMps2', lateralAccelerationMps2);
  return Math.sqrt(lateralAccelerationMps2 * radiusM);
}

/**
 * Curve radius at every point, m: circumradius of each point with its neighbours, curvature
 * smoothed over `windowM`, radius capped at `maxRadiusM` (ends count as straight).
 */
export function curveRadiiM(
  distanceM: Float64Array,
  lon: Float64Array,
  lat: Float64Array,
  windowM: number,
  maxRadiusM = MAX_CURVE_RADIUS_M,
): Float64Array {
  const n = distanceM.length;
  const curvature = new Float64Array(n);
  let before = 0;
  let after = 0;
  for (let i = 1; i < n - 1; i++) {
    const s = distanceM[i]!;
    while (before + 1 < i && distanceM[before + 1]! <= s - CURVATURE_BASELINE_M) before++;
    if (after <= i) after = i + 1;
    while (after < n - 1 && distanceM[after]! < s + CURVATURE_BASELINE_M) after++;
    const { eastM, northM } = metresPerDegree(lat[i]!);
    const x1 = (lon[before]! - lon[i]!) * eastM;
    const y1 = (lat[before]! - lat[i]!) * northM;
    const x3 = (lon[after]! - lon[i]!) * eastM;
    const y3 = (lat[after]! - lat[i]!) * northM;
    const r = circumradiusM(x1, y1, 0, 0, x3, y3);
    curvature[i] = Number.isFinite(r) && r > 0 ? 1 / r : 0;
  }
  const smoothed = windowM > 0 ? movingAverageOverDistance(distanceM, curvature, windowM) : curvature;
  const radii = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const k = smoothed[i]!;
    radii[i] = k > 1 / maxRadiusM ? 1 / k : maxRadiusM;
  }
  return radii;
}
