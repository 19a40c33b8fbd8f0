/**
 * Smoothing of a profile over distance (never over sample index), engine README §6.3.
 *
 * Window: centred on each point with half-width min(W/2, s, L − s), so it shrinks symmetrically
 * at the route's ends. Both end values are therefore kept as given and a straight ramp passes
 * through unchanged, which keeps the route's net elevation change (and gradient energy) intact.
 *
 * - `movingAverageOverDistance`: the mean of the piecewise-linear profile over the window
 *   (exact integral, so it works on unevenly spaced points), O(n) with two pointers.
 * - `savitzkyGolayOverDistance`: local least-squares quadratic fitted to the points in the window
 *   and evaluated at the centre — the Savitzky–Golay filter (Savitzky & Golay, Anal. Chem. 36,
 *   1964), which it equals on evenly spaced points, generalised to uneven spacing.
 */
import { assertNonNegative } from './validation';

/** Moving average of `values` over a distance window `windowM` (0: a copy). */
export function movingAverageOverDistance(distanceM: Float64Array, values: Float64Array, windowM: number): Float64Array {
  assertNonNegative('options.smoothingWindowM', windowM);
  const n = distanceM.length;
  const out = new Float64Array(values);
  if (windowM <= 0 || n < 3) return out;

  // Cumulative trapezoidal integral at the nodes.
  const integral = new Float64Array(n);
  for (let i = 1; i < n; i++) {
    integral[i] = integral[i - 1]! + 0.5 * (values[i - 1]! + values[i]!) * (distanceM[i]! - distanceM[i - 1]!);
  }
  const totalM = distanceM[n - 1]!;
  const half = windowM / 2;
  let lower = 0; // segment index containing the window's lower edge
  let upper = 0;
  for (let i = 0; i < n; i++) {
    const s = distanceM[i]!;
    const h = Math.min(half, s, totalM - s);
    if (h <= 1e-9) continue;
    const a = s - h;
    const b = s + h;
    while (lower < n - 2 && distanceM[lower + 1]! <= a) lower++;
    while (upper < n - 2 && distanceM[upper + 1]! < b) upper++;
    out[i] = (integralAt(distanceM, values, integral, upper, b) - integralAt(distanceM, values, integral, lower, a)) / (2 * h);
  }
  return out;
}

function integralAt(distanceM: Float64Array, values: Float64Array, integral: Float64Array, segment: number, x: number): number {
  const s0 = distanceM[segment]!;
  const s1 = distanceM[segment + 1]!;
  const v0 = values[segment]!;
  const v1 = values[segment + 1]!;
  const dx = x - s0;
  const slope = s1 > s0 ? (v1 - v0) / (s1 - s0) : 0;
  return integral[segment]! + dx * (v0 + 0.5 * slope * dx);
}

/** Savitzky–Golay (local quadratic) smoothing over a distance window `windowM` (0: a copy). */
export function savitzkyGolayOverDistance(distanceM: Float64Array, values: Float64Array, windowM: number): Float64Array {
  assertNonNegative('options.smoothingWindowM', windowM);
  const n = distanceM.length;
  const out = new Float64Array(values);
  if (windowM <= 0 || n < 3) return out;
  const totalM = distanceM[n - 1]!;
  const half = windowM / 2;
  let first = 0;
  let last = 0;
  for (let i = 0; i < n; i++) {
    const s = distanceM[i]!;
    const h = Math.min(half, s, totalM - s);
    if (h <= 1e-9) continue;
    while (distanceM[first]! < s - h - 1e-9) first++;
    if (last < i) last = i;
    while (last < n - 1 && distanceM[last + 1]! <= s + h + 1e-9) last++;
    // Normal equations of z ≈ c0 + c1·x + c2·x² with x = (s_j − s)/h; value at centre is c0.
    let s0 = 0,
      s1 = 0,
      s2 = 0,
      s3 = 0,
      s4 = 0,
      t0 = 0,
      t1 = 0,
      t2 = 0;
    for (let j = first; j <= last; j++) {
      const x = (distanceM[j]! - s) / h;
      const x2 = x * x;
      const z = values[j]!;
      s0 += 1;
      s1 += x;
      s2 += x2;
      s3 += x2 * x;
      s4 += x2 * x2;
      t0 += z;
      t1 += z * x;
      t2 += z * x2;
    }
    if (last - first < 2) continue;
    // Solve the 3×3 symmetric system by Cramer's rule.
    const det = s0 * (s2 * s4 - s3 * s3) - s1 * (s1 * s4 - s3 * s2) + s2 * (s1 * s3 - s2 * s2);
    if (Math.abs(det) < 1e-12) continue;
    const c0 = (t0 * (s2 * s4 - s3 * s3) - s1 * (t1 * s4 - s3 * t2) + s2 * (t1 * s3 - s2 * t2)) / det;
    out[i] = c0;
  }
  return out;
}

/**
 * Total ascent and descent with a hysteresis threshold: a change counts only once the profile
 * has moved `thresholdM` from the last counted level (common practice; engine README §6.2). The
 * remainder at the end is added, so ascent − descent equals the net elevation change exactly.
 */
export function ascentDescentM(elevationM: Float64Array, thresholdM: number): { ascentM: number; descentM: number } {
  assertNonNegative('options.ascentThresholdM', thresholdM);
  let ascentM = 0;
  let descentM = 0;
  const n = elevationM.length;
  if (n === 0) return { ascentM, descentM };
  let reference = elevationM[0]!;
  for (let i = 1; i < n; i++) {
    const z = elevationM[i]!;
    if (z - reference >= thresholdM && z > reference) {
      ascentM += z - reference;
      reference = z;
    } else if (reference - z >= thresholdM && z < reference) {
      descentM += reference - z;
      reference = z;
    }
  }
  const rest = elevationM[n - 1]! - reference;
  if (rest > 0) ascentM += rest;
  else descentM -= rest;
  return { ascentM, descentM };
}
