/**
 * Lays a logged trip onto a route line, so the engine can replay it and its measurements can be
 * set against the model point by point.
 *
 * 1. Distance travelled comes from the logged speed (trapezoidal integral): smooth and monotone,
 *    unlike GPS fixes. The GPS track is filtered (gps-track.ts) and projected onto the route in
 *    both directions; the direction whose projection follows the track best wins.
 * 2. The trip covers the stretch from the first fix's foot point s₀ to the last fix's s₁. The
 *    odometer is scaled to that stretch (scale = (s₁ − s₀) / distance travelled), which corrects a
 *    wheel-speed calibration error of a few per cent; a scale outside 0.85–1.15 means the speed
 *    column or the matched route is wrong, and the trip is refused by the caller.
 * 3. A standstill (speed below `STANDSTILL_SPEED_MPS`) becomes a stop at one point of the replay
 *    line with its dwell time, exactly as a timetabled stop in a planned run.
 * 4. The replay line is the stretch cut into pieces of at most `REPLAY_POINT_SPACING_M`, with a
 *    point at every standstill. Measured time of arrival, dwell, speed, cumulative battery energy,
 *    SOC and brake temperature are taken at each of its points by interpolation in distance and
 *    time.
 * 5. The speed passed to the replay is smoothed over time (Savitzky–Golay, local quadratic over
 *    `SPEED_SMOOTHING_WINDOW_S`): the engine turns every change of speed between two points 10 m
 *    apart into inertia work, and a few hundredths of a m/s of sensor noise would otherwise read
 *    as tens of kilowatts of accelerating and braking.
 */
import { filterGpsTrack, localPlane, percentile, projectTrackOntoLine, toPlane, type PlaneLine } from './gps-track';
import { resampleRoute } from './resample-route';
import { savitzkyGolayOverDistance } from './smoothing';
import { EngineInputError } from './validation';

/** Below this logged speed the vehicle counts as standing, m/s (common practice: wheel-speed sensors read a few tenths of a m/s of noise at rest). */
export const STANDSTILL_SPEED_MPS = 0.3;

/** Time window of the speed smoothing, s (common practice: wheel-speed signals are filtered over a few seconds; 5 s keeps a bus's 1 m/s² accelerations). */
export const SPEED_SMOOTHING_WINDOW_S = 5;

/**
 * Largest distance between points of a replay line, m. Just under the engine's 10 m default
 * spacing, so resampling a replay line at 10 m keeps its points one for one.
 */
export const REPLAY_POINT_SPACING_M = 9.9;

/** Spacing a replay is run at, m (every replay line point is kept). */
export const REPLAY_SPACING_M = 10;

/** Samples of a logged trip in SI units; optional channels are null when not logged, NaN where a row left them empty. */
export interface TripSamples {
  /** Seconds from the first row, strictly increasing. */
  timeS: Float64Array;
  lon: Float64Array;
  lat: Float64Array;
  speedMps: Float64Array;
  elevationM: Float64Array | null;
  batteryPowerW: Float64Array | null;
  soc: Float64Array | null;
  brakeTempC: Float64Array | null;
}

/** How well a trip follows a line in one direction. */
export interface LineMatch {
  direction: 'forward' | 'reverse';
  /** Stretch of the line (in its own direction of travel) the trip covers, m. */
  fromM: number;
  toM: number;
  /** Distance travelled by the logged speed, m. */
  travelledM: number;
  /** (toM − fromM) / travelledM. */
  scale: number;
  /** 95th percentile and largest distance of the filtered fixes from the line, m. */
  p95OffsetM: number;
  maxOffsetM: number;
  /** Index of the fix farthest from the line. */
  maxOffsetIndex: number;
}

/** A trip laid on its replay line: the line's points and the measurements at each. */
export interface AlignedTrip {
  /** Replay line positions [lon, lat]. */
  positions: [number, number][];
  /** Distance along the replay line, m (0 at the trip's start). */
  distanceM: number[];
  /** Elevation from the route's own positions (when they all carry one), m. */
  lineElevationM: number[] | null;
  /** Elevation from the logged `elevation_m` column, m. */
  fileElevationM: number[] | null;
  /** Measured time of arrival at each point, s from the first row. */
  arriveS: number[];
  /** Time stood at each point, s (0 where the vehicle passed without stopping). */
  dwellS: number[];
  /** Measured speed passing each point, m/s (0 where it stood). */
  speedMps: number[];
  /** Cumulative battery energy at arrival, J from the first row; null when no battery channel was logged. */
  energyJ: number[] | null;
  /** Battery energy during the dwell at each point, J. */
  dwellEnergyJ: number[] | null;
  soc: (number | null)[] | null;
  brakeTempC: (number | null)[] | null;
}

/** Distance travelled at each sample by the trapezoidal integral of the speed, m. */
export function odometerM(samples: Pick<TripSamples, 'timeS' | 'speedMps'>): Float64Array {
  const n = samples.timeS.length;
  const out = new Float64Array(n);
  for (let i = 1; i < n; i++) {
    out[i] = out[i - 1]! + 0.5 * (samples.speedMps[i - 1]! + samples.speedMps[i]!) * (samples.timeS[i]! - samples.timeS[i - 1]!);
  }
  return out;
}

interface PreparedTrack {
  odometer: Float64Array;
  east: Float64Array;
  north: Float64Array;
  filteredLon: Float64Array;
  filteredLat: Float64Array;
  outliers: number;
  plane: ReturnType<typeof localPlane>;
}

/** Filters the track and puts it in a local plane (shared by matching against many lines). */
export function prepareTrack(samples: TripSamples): PreparedTrack {
  if (samples.timeS.length < 2) throw new EngineInputError('samples', 'a trip needs at least two rows');
  const odometer = odometerM(samples);
  const filtered = filterGpsTrack(samples.lon, samples.lat, odometer);
  const plane = localPlane(filtered.lon[0]!, filtered.lat[0]!);
  const n = filtered.lon.length;
  const east = new Float64Array(n);
  const north = new Float64Array(n);
  for (let i = 0; i < n; i++) [east[i], north[i]] = toPlane(plane, filtered.lon[i]!, filtered.lat[i]!);
  return { odometer, east, north, filteredLon: filtered.lon, filteredLat: filtered.lat, outliers: filtered.outlierIndices.length, plane };
}

interface LineGrid {
  distanceM: Float64Array;
  lon: Float64Array;
  lat: Float64Array;
  elevationM: Float64Array | null;
}

function lineGrid(coordinates: readonly (readonly number[])[], direction: 'forward' | 'reverse'): LineGrid {
  const ordered = direction === 'forward' ? coordinates : [...coordinates].reverse();
  const resampled = resampleRoute(ordered, REPLAY_POINT_SPACING_M);
  return { distanceM: resampled.distanceM, lon: resampled.lon, lat: resampled.lat, elevationM: resampled.elevationM };
}

function planeLine(track: PreparedTrack, grid: LineGrid): PlaneLine {
  const n = grid.distanceM.length;
  const east = new Float64Array(n);
  const north = new Float64Array(n);
  for (let i = 0; i < n; i++) [east[i], north[i]] = toPlane(track.plane, grid.lon[i]!, grid.lat[i]!);
  return { east, north, distanceM: grid.distanceM };
}

/** How well the trip follows `coordinates` (a route line, in its own direction), trying both directions. */
export function matchTrackToLine(track: PreparedTrack, coordinates: readonly (readonly number[])[]): LineMatch {
  let best: LineMatch | null = null;
  const travelledM = track.odometer[track.odometer.length - 1]!;
  for (const direction of ['forward', 'reverse'] as const) {
    const grid = lineGrid(coordinates, direction);
    const projection = projectTrackOntoLine(track.east, track.north, track.odometer, planeLine(track, grid));
    const fromM = projection.alongM[0]!;
    const toM = projection.alongM[projection.alongM.length - 1]!;
    let maxOffsetM = 0;
    let maxOffsetIndex = 0;
    projection.offsetM.forEach((offset, index) => {
      if (offset > maxOffsetM) {
        maxOffsetM = offset;
        maxOffsetIndex = index;
      }
    });
    const match: LineMatch = {
      direction,
      fromM,
      toM,
      travelledM,
      scale: travelledM > 0 ? (toM - fromM) / travelledM : 0,
      p95OffsetM: percentile(projection.offsetM, 0.95),
      maxOffsetM,
      maxOffsetIndex,
    };
    if (!best || rank(match) < rank(best)) best = match;
  }
  return best!;
}

/** Lower is better: offset, heavily penalised when the stretch does not follow the distance travelled. */
function rank(match: LineMatch): number {
  const scaleMiss = Math.abs(Math.log(Math.max(match.scale, 1e-3)));
  return match.p95OffsetM + 1_000 * scaleMiss;
}

/** Lays the trip on the matched stretch of `coordinates` per the module comment. */
export function alignTrip(
  samples: TripSamples,
  track: PreparedTrack,
  coordinates: readonly (readonly number[])[],
  match: LineMatch,
): AlignedTrip {
  const n = samples.timeS.length;
  const grid = lineGrid(coordinates, match.direction);
  const lengthM = match.toM - match.fromM;
  if (!(lengthM > 1)) throw new EngineInputError('samples', 'the trip does not move along the route');

  // Distance along the stretch of every sample, with standstills held at one distance.
  const along = new Float64Array(n);
  for (let i = 0; i < n; i++) along[i] = Math.min(lengthM, track.odometer[i]! * match.scale);
  const standstills: { first: number; last: number }[] = [];
  for (let i = 0; i < n;) {
    if (samples.speedMps[i]! >= STANDSTILL_SPEED_MPS) {
      i++;
      continue;
    }
    let j = i;
    while (j + 1 < n && samples.speedMps[j + 1]! < STANDSTILL_SPEED_MPS) j++;
    const previous = standstills[standstills.length - 1];
    // A creep of under a metre between two standstills is one stop.
    if (previous && along[i]! - along[previous.last]! < 1) previous.last = j;
    else standstills.push({ first: i, last: j });
    i = j + 1;
  }

  // Replay line: the grid inside the stretch, its two ends, and a point at every standstill.
  const points: { d: number; dwell: boolean }[] = [{ d: 0, dwell: false }];
  for (let k = 0; k < grid.distanceM.length; k++) {
    const d = grid.distanceM[k]! - match.fromM;
    if (d > 0.05 && d < lengthM - 0.05) points.push({ d, dwell: false });
  }
  points.push({ d: lengthM, dwell: false });
  for (const stop of standstills) {
    let d = along[stop.first]!;
    let nearest = 0;
    for (let k = 1; k < points.length; k++) if (Math.abs(points[k]!.d - d) < Math.abs(points[nearest]!.d - d)) nearest = k;
    if (Math.abs(points[nearest]!.d - d) <= 0.5) {
      d = points[nearest]!.d;
      points[nearest]!.dwell = true;
    } else {
      points.push({ d, dwell: true });
      points.sort((a, b) => a.d - b.d);
    }
    for (let i = stop.first; i <= stop.last; i++) along[i] = d;
    for (let i = stop.first - 1; i >= 0 && along[i]! > d; i--) along[i] = d;
  }
  for (let i = 1; i < n; i++) if (along[i]! < along[i - 1]!) along[i] = along[i - 1]!;

  const distanceM = points.map((point) => point.d);
  const positions = distanceM.map(
    (d) =>
      [interpolateSorted(grid.distanceM, grid.lon, d + match.fromM), interpolateSorted(grid.distanceM, grid.lat, d + match.fromM)] as [
        number,
        number,
      ],
  );
  const lineElevationM = grid.elevationM
    ? distanceM.map((d) => interpolateSorted(grid.distanceM, grid.elevationM!, d + match.fromM))
    : null;

  // Measured time of arrival and departure at each point: first and last time at that distance.
  const arriveS: number[] = [];
  const leaveS: number[] = [];
  let j = 0;
  for (const d of distanceM) {
    while (j < n - 1 && along[j]! < d - 1e-9) j++;
    let arrive: number;
    if (j === 0 || along[j]! <= d + 1e-9) arrive = j === 0 ? samples.timeS[0]! : interpolatePair(along, samples.timeS, j - 1, j, d);
    else arrive = interpolatePair(along, samples.timeS, j - 1, j, d);
    let k = j;
    while (k < n - 1 && along[k + 1]! <= d + 1e-9) k++;
    const leave = along[k]! <= d + 1e-9 ? Math.max(arrive, samples.timeS[k]!) : arrive;
    arriveS.push(arrive);
    leaveS.push(leave);
  }
  const dwellS = distanceM.map((_, i) => (points[i]!.dwell ? leaveS[i]! - arriveS[i]! : 0));
  const smoothSpeed = savitzkyGolayOverDistance(samples.timeS, samples.speedMps, SPEED_SMOOTHING_WINDOW_S);
  for (let i = 0; i < n; i++)
    smoothSpeed[i] = samples.speedMps[i]! < STANDSTILL_SPEED_MPS ? samples.speedMps[i]! : Math.max(0, smoothSpeed[i]!);
  const speedMps = arriveS.map((t, i) =>
    points[i]!.dwell && dwellS[i]! > 0 ? 0 : Math.max(0, interpolateSorted(samples.timeS, smoothSpeed, t)),
  );

  let energyJ: number[] | null = null;
  let dwellEnergyJ: number[] | null = null;
  const power = samples.batteryPowerW ? filled(samples.timeS, samples.batteryPowerW) : null;
  if (power) {
    const cumulative = new Float64Array(n);
    for (let i = 1; i < n; i++)
      cumulative[i] = cumulative[i - 1]! + 0.5 * (power[i - 1]! + power[i]!) * (samples.timeS[i]! - samples.timeS[i - 1]!);
    energyJ = arriveS.map((t) => interpolateSorted(samples.timeS, cumulative, t));
    dwellEnergyJ = leaveS.map((t, i) => interpolateSorted(samples.timeS, cumulative, t) - energyJ![i]!);
  }
  const atArrival = (channel: Float64Array | null) => {
    const values = channel ? filled(samples.timeS, channel) : null;
    return values ? arriveS.map((t) => interpolateSorted(samples.timeS, values, t)) : null;
  };
  let fileElevationM: number[] | null = null;
  const elevation = samples.elevationM ? filled(along, samples.elevationM) : null;
  if (elevation) fileElevationM = distanceM.map((d) => interpolateSorted(along, elevation, d));

  return {
    positions,
    distanceM,
    lineElevationM,
    fileElevationM,
    arriveS,
    dwellS,
    speedMps,
    energyJ,
    dwellEnergyJ,
    soc: atArrival(samples.soc),
    brakeTempC: atArrival(samples.brakeTempC),
  };
}

/** A channel with its empty rows filled by interpolation over `at`; null when no row has a value. */
function filled(at: ArrayLike<number>, values: Float64Array): Float64Array | null {
  const known: number[] = [];
  for (let i = 0; i < values.length; i++) if (Number.isFinite(values[i]!)) known.push(i);
  if (known.length === 0) return null;
  const out = new Float64Array(values);
  let p = 0;
  for (let i = 0; i < values.length; i++) {
    if (Number.isFinite(values[i]!)) continue;
    while (p < known.length - 1 && known[p + 1]! < i) p++;
    const a = known[p]!;
    const b = known[Math.min(p + 1, known.length - 1)]!;
    if (i < a || a === b) out[i] = values[i < a ? a : b]!;
    else if (i > b) out[i] = values[b]!;
    else out[i] = interpolatePair(at, values, a, b, at[i]!);
  }
  return out;
}

function interpolatePair(x: ArrayLike<number>, y: ArrayLike<number>, a: number, b: number, at: number): number {
  const x0 = x[a]!;
  const x1 = x[b]!;
  if (x1 <= x0) return y[a]!;
  return y[a]! + ((y[b]! - y[a]!) * (at - x0)) / (x1 - x0);
}

/** Linear interpolation in a non-decreasing `x` (first of equal x values), clamped at the ends. */
export function interpolateSorted(x: ArrayLike<number>, y: ArrayLike<number>, at: number): number {
  const n = x.length;
  if (at <= x[0]!) return y[0]!;
  if (at >= x[n - 1]!) return y[n - 1]!;
  let lo = 0;
  let hi = n - 1;
  while (hi - lo > 1) {
    const mid = (lo + hi) >> 1;
    if (x[mid]! < at) lo = mid;
    else hi = mid;
  }
  return interpolatePair(x, y, lo, hi, at);
}

/** Quality of a match as plain words, e.g. for a refusal. */
export function describeMatch(match: LineMatch): string {
  return `95 % of the filtered fixes lie within ${match.p95OffsetM.toFixed(0)} m of the route (farthest ${match.maxOffsetM.toFixed(0)} m), and the speed integrates to ${(match.travelledM / 1000).toFixed(2)} km against ${((match.toM - match.fromM) / 1000).toFixed(2)} km of route`;
}
