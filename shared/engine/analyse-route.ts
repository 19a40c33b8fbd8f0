/**
 * Route analysis (product design "The calculation", steps 1–9): resample, elevation, grade,
 * speed profile, forces, powertrain and battery, brake heat, descents with advice, summary.
 *
 * Elevation: when every route position carries z it is used; otherwise `sampleElevations` is
 * called once with all resampled points. Points without terrain (null or non-finite) are
 * reported as uncovered stretches. A gap whose covered neighbours are at most `maxGapFillM`
 * apart is filled by linear interpolation between them (and reported with `filled: true`); a
 * longer gap, or one at either end of the route, is refused with an `UncoveredTerrainError`
 * naming the stretches.
 */
import {
  previewRequestSchema,
  type AnalysisOptions,
  type Conditions,
  type PreviewRequestInput,
  type PreviewResponse,
  type Profile,
  type UncoveredStretchReport,
  type Vehicle,
} from '../domain/analysis';
import { airDensityUnchecked } from './atmosphere';
import { curveRadiiM } from './curvature';
import { adhesionCoefficient } from './adhesion';
import { drivabilityStretches, runWorstCase, sensitivityVariants } from './descent-safety';
import { describeDescents } from './descents';
import { PROFILE_SERIES, type ProfileSeriesName } from './profile-series';
import { powertrainParams } from './powertrain';
import { resampleRoute, type ResampledRoute } from './resample-route';
import { runRoute, type RouteRun } from './route-run';
import type { RouteModel } from './route-simulation';
import { movingAverageOverDistance, savitzkyGolayOverDistance } from './smoothing';
import { computeSpeedProfile } from './speed-profile';
import { summariseRun } from './summary';
import { celsiusToKelvin, kphToMps } from './unit-conversions';
import { EngineInputError, MissingElevationError, parseOrThrow, UncoveredTerrainError } from './validation';
import {
  CELSIUS_TO_KELVIN_K,
  ENGINE_VERSION,
  ENGINEERING_CAUTION,
  ISA_LAPSE_RATE_K_PER_M,
  ISA_SEA_LEVEL_TEMPERATURE_K,
  MAX_RESAMPLED_POINTS,
  MAX_ROUTE_LENGTH_M,
  STANDARD_GRAVITY_MPS2,
} from './constants';

/** Terrain lookup: one elevation (m) or null per [lon, lat] point, in order. */
export type ElevationSampler = (points: [number, number][]) => Promise<(number | null)[]>;

export interface AnalyseRouteDependencies {
  sampleElevations?: ElevationSampler;
}

/**
 * A measured speed trace to replay instead of the minimum-time speed profile: speed against
 * distance along the route (non-decreasing distances, interpolated linearly at the resampled
 * points). Standstills are given as the request's stops (their dwell is the time stood there),
 * so a replay moves through exactly the same engine as a planned run: same forces, powertrain,
 * battery and brake models, only the speed at each point comes from the log.
 */
export interface SpeedTrace {
  distanceM: readonly number[];
  speedMps: readonly number[];
}

/** Everything the analysis produced, for callers (and checks) that need more than the response. */
export interface DetailedAnalysis {
  response: PreviewResponse;
  model: RouteModel;
  run: RouteRun;
  vehicle: Vehicle;
  conditions: Conditions;
  options: AnalysisOptions;
}

/** Entry point behind `POST /api/analysis/preview`. */
export async function analyseRoute(request: PreviewRequestInput, dependencies: AnalyseRouteDependencies = {}): Promise<PreviewResponse> {
  return (await analyseRouteDetailed(request, dependencies)).response;
}

/** Like `analyseRoute`, returning the prepared model and the run as well. */
export async function analyseRouteDetailed(
  request: PreviewRequestInput,
  dependencies: AnalyseRouteDependencies = {},
  speedTrace?: SpeedTrace,
): Promise<DetailedAnalysis> {
  const parsed = parseOrThrow(previewRequestSchema, request);
  const resampled = resampleRoute(parsed.route.coordinates, parsed.options.spacingM, {
    maxLengthM: MAX_ROUTE_LENGTH_M,
    maxPoints: MAX_RESAMPLED_POINTS,
  });
  let elevationM = resampled.elevationM;
  let uncovered: UncoveredStretchReport[] | undefined;
  if (!elevationM) {
    const sampler = dependencies.sampleElevations;
    if (!sampler) {
      throw new MissingElevationError();
    }
    const points: [number, number][] = [];
    for (let i = 0; i < resampled.lon.length; i++) points.push([resampled.lon[i]!, resampled.lat[i]!]);
    const sampled = await sampler(points);
    if (sampled.length !== points.length) {
      throw new EngineInputError('route.coordinates', `the elevation source answered ${sampled.length} values for ${points.length} points`);
    }
    const filled = fillElevationGaps(resampled.distanceM, sampled, parsed.options.maxGapFillM);
    elevationM = filled.elevationM;
    uncovered = filled.stretches;
  }
  return analyseResampledRoute(parsed.vehicle, parsed.conditions, parsed.options, resampled, elevationM, uncovered, speedTrace);
}

/**
 * Fills terrain gaps per the module comment; returns elevations and every uncovered stretch.
 * Throws `UncoveredTerrainError` when a gap cannot be filled.
 */
export function fillElevationGaps(
  distanceM: Float64Array,
  sampled: readonly (number | null)[],
  maxGapFillM: number,
): { elevationM: Float64Array; stretches: UncoveredStretchReport[] } {
  const n = distanceM.length;
  const elevationM = new Float64Array(n);
  const stretches: UncoveredStretchReport[] = [];
  const refused: { fromM: number; toM: number }[] = [];
  let i = 0;
  while (i < n) {
    const value = sampled[i];
    if (typeof value === 'number' && Number.isFinite(value)) {
      elevationM[i] = value;
      i++;
      continue;
    }
    let j = i;
    while (j + 1 < n && !isCovered(sampled[j + 1])) j++;
    const fromM = distanceM[i]!;
    const toM = distanceM[j]!;
    const before = i - 1;
    const after = j + 1;
    const canFill = before >= 0 && after < n && distanceM[after]! - distanceM[before]! <= maxGapFillM;
    if (canFill) {
      const z0 = sampled[before] as number;
      const z1 = sampled[after] as number;
      const s0 = distanceM[before]!;
      const span = distanceM[after]! - s0;
      for (let k = i; k <= j; k++) elevationM[k] = z0 + ((z1 - z0) * (distanceM[k]! - s0)) / span;
    } else {
      refused.push({ fromM, toM });
    }
    stretches.push({ fromM, toM, filled: canFill });
    i = j + 1;
  }
  if (refused.length > 0) throw new UncoveredTerrainError(stretches, refused, maxGapFillM);
  return { elevationM, stretches };
}

function isCovered(value: number | null | undefined): boolean {
  return typeof value === 'number' && Number.isFinite(value);
}

/** Prepares the per-segment route model (grades, air, limits, stops). */
export function prepareRouteModel(
  vehicle: Vehicle,
  conditions: Conditions,
  options: AnalysisOptions,
  resampled: ResampledRoute,
  rawElevationM: Float64Array,
): RouteModel {
  const n = resampled.distanceM.length;
  const { distanceM } = resampled;
  for (let i = 0; i < n; i++) {
    const z = rawElevationM[i]!;
    if (!Number.isFinite(z) || z < -1_000 || z > 11_000) {
      throw new EngineInputError('route.coordinates', `elevation ${z} m at ${distanceM[i]!.toFixed(0)} m is outside [−1000, 11000] m`);
    }
  }
  const smooth = options.smoothingMethod === 'savitzky-golay' ? savitzkyGolayOverDistance : movingAverageOverDistance;
  const elevationM = smooth(distanceM, rawElevationM, options.smoothingWindowM);

  const segments = n - 1;
  const slopeLengthM = new Float64Array(segments);
  const gradePercent = new Float64Array(segments);
  const sinTheta = new Float64Array(segments);
  const cosTheta = new Float64Array(segments);
  const airDensity = new Float64Array(segments);
  const ambientC = new Float64Array(segments);
  const ambientK = conditions.ambientC === undefined ? undefined : celsiusToKelvin(conditions.ambientC);
  for (let k = 0; k < segments; k++) {
    const ds = distanceM[k + 1]! - distanceM[k]!;
    const dz = elevationM[k + 1]! - elevationM[k]!;
    const g = dz / ds;
    const secant = Math.sqrt(1 + g * g);
    slopeLengthM[k] = ds * secant;
    gradePercent[k] = 100 * g;
    sinTheta[k] = g / secant;
    cosTheta[k] = 1 / secant;
    const altitudeM = 0.5 * (elevationM[k]! + elevationM[k + 1]!);
    airDensity[k] = airDensityUnchecked(altitudeM, ambientK);
    ambientC[k] = conditions.ambientC ?? ISA_SEA_LEVEL_TEMPERATURE_K - ISA_LAPSE_RATE_K_PER_M * altitudeM - CELSIUS_TO_KELVIN_K;
  }

  const lengthM = distanceM[n - 1]!;
  const postedLimitMps = postedLimits(distanceM, options, lengthM);
  const limitMps = new Float64Array(postedLimitMps);
  const radii = curveRadiiM(distanceM, resampled.lon, resampled.lat, options.curvatureWindowM);
  const cap = options.descentSpeedCapKph === undefined ? Number.POSITIVE_INFINITY : kphToMps(options.descentSpeedCapKph);
  for (let i = 0; i < n; i++) {
    const curveMps = Math.sqrt(options.lateralAccelerationMps2 * radii[i]!);
    let limit = Math.min(limitMps[i]!, curveMps);
    const gradeBefore = i > 0 ? gradePercent[i - 1]! : Number.POSITIVE_INFINITY;
    const gradeAfter = i < segments ? gradePercent[i]! : Number.POSITIVE_INFINITY;
    if (Math.min(gradeBefore, gradeAfter) < options.descentGradeThresholdPercent) limit = Math.min(limit, cap);
    limitMps[i] = limit;
  }
  const dwellS = new Float64Array(n);
  options.stops.forEach((stop, index) => {
    if (stop.atM > lengthM + 1e-6) {
      throw new EngineInputError(`options.stops.${index}.atM`, `${stop.atM} m lies beyond the route's ${lengthM.toFixed(1)} m`);
    }
    const i = nearestIndex(distanceM, stop.atM);
    dwellS[i] = dwellS[i]! + stop.dwellS;
    limitMps[i] = 0;
  });
  if (options.startAtRest) limitMps[0] = 0;
  if (options.endAtRest) limitMps[n - 1] = 0;

  return {
    ...vehicleTerms(vehicle),
    pointCount: n,
    distanceM,
    lon: resampled.lon,
    lat: resampled.lat,
    elevationM,
    slopeLengthM,
    gradePercent,
    sinTheta,
    cosTheta,
    airDensityKgM3: airDensity,
    ambientC,
    limitMps,
    postedLimitMps,
    dwellS,
    surface: conditions.surface,
    adhesionMu: adhesionCoefficient(vehicle.runningGear, conditions.surface),
  };
}

/** The parts of a route model that depend on the vehicle alone. */
function vehicleTerms(vehicle: Vehicle) {
  const massKg = vehicle.curbMassKg + vehicle.payloadKg;
  return {
    vehicle,
    massKg,
    weightN: massKg * STANDARD_GRAVITY_MPS2,
    effectiveMassKg: (1 + vehicle.rotatingMassFactor) * massKg,
    dragAreaM2: vehicle.dragCoefficient * vehicle.frontalAreaM2,
    powertrain: powertrainParams(vehicle),
  };
}

/**
 * The same prepared route for another vehicle (geometry, grades, air and limits kept). Lets a
 * caller that runs one route many times with changed vehicle parameters (the calibration fit)
 * skip the resampling and smoothing; the vehicle is taken as already parsed.
 */
export function withVehicle(model: RouteModel, vehicle: Vehicle): RouteModel {
  return { ...model, ...vehicleTerms(vehicle) };
}

/** Speed at every point of `model` from a measured trace (linear in distance, clamped at the ends). */
export function traceSpeedAtPoints(model: RouteModel, trace: SpeedTrace): Float64Array {
  const { distanceM, speedMps } = trace;
  if (distanceM.length === 0 || distanceM.length !== speedMps.length) {
    throw new EngineInputError(
      'speedTrace',
      `needs equal, non-empty distance and speed arrays (got ${distanceM.length} and ${speedMps.length})`,
    );
  }
  const out = new Float64Array(model.pointCount);
  let j = 0;
  for (let i = 0; i < model.pointCount; i++) {
    const s = model.distanceM[i]!;
    while (j < distanceM.length - 2 && distanceM[j + 1]! < s) j++;
    const s0 = distanceM[j]!;
    const s1 = distanceM[Math.min(j + 1, distanceM.length - 1)]!;
    const v0 = speedMps[j]!;
    const v1 = speedMps[Math.min(j + 1, speedMps.length - 1)]!;
    let v: number;
    if (s <= s0 || s1 <= s0) v = s <= s0 ? v0 : v1;
    else if (s >= s1) v = v1;
    else v = v0 + ((v1 - v0) * (s - s0)) / (s1 - s0);
    if (!Number.isFinite(v) || v < 0) throw new EngineInputError(`speedTrace.speedMps.${j}`, `must be a finite speed ≥ 0, got ${v}`);
    out[i] = v;
  }
  // Standstills (the stops' dwell points) are at rest.
  for (let i = 0; i < model.pointCount; i++) if (model.dwellS[i]! > 0) out[i] = 0;
  return out;
}

function postedLimits(distanceM: Float64Array, options: AnalysisOptions, lengthM: number): Float64Array {
  const n = distanceM.length;
  const limits = new Float64Array(n);
  const setting = options.speedLimitKph;
  if (typeof setting === 'number') {
    limits.fill(kphToMps(setting));
    return limits;
  }
  let fallback = 0;
  setting.forEach((stretch, index) => {
    if (stretch.fromM >= lengthM) {
      throw new EngineInputError(
        `options.speedLimitKph.${index}.fromM`,
        `${stretch.fromM} m lies beyond the route's ${lengthM.toFixed(1)} m`,
      );
    }
    fallback = Math.max(fallback, stretch.speedKph);
  });
  limits.fill(kphToMps(fallback));
  const inside = new Uint8Array(n);
  for (const stretch of setting) {
    const limit = kphToMps(stretch.speedKph);
    for (let i = 0; i < n; i++) {
      const s = distanceM[i]!;
      if (s < stretch.fromM || s > stretch.toM) continue;
      limits[i] = inside[i] ? Math.min(limits[i]!, limit) : limit;
      inside[i] = 1;
    }
  }
  return limits;
}

function nearestIndex(distanceM: Float64Array, atM: number): number {
  let lo = 0;
  let hi = distanceM.length - 1;
  while (hi - lo > 1) {
    const mid = (lo + hi) >> 1;
    if (distanceM[mid]! <= atM) lo = mid;
    else hi = mid;
  }
  return atM - distanceM[lo]! <= distanceM[hi]! - atM ? lo : hi;
}

/** Runs the analysis on an already resampled route with known elevations. */
export function analyseResampledRoute(
  vehicle: Vehicle,
  conditions: Conditions,
  options: AnalysisOptions,
  resampled: ResampledRoute,
  rawElevationM: Float64Array,
  uncovered?: UncoveredStretchReport[],
  speedTrace?: SpeedTrace,
): DetailedAnalysis {
  const model = prepareRouteModel(vehicle, conditions, options, resampled, rawElevationM);
  const speedMps = speedTrace ? traceSpeedAtPoints(model, speedTrace) : minimumTimeSpeeds(model, vehicle, options);
  const initialBrakeTempC = conditions.initialBrakeTempC ?? model.ambientC[0]!;
  const run = runRoute(model, speedMps, conditions.startSoc, initialBrakeTempC);
  const summary = summariseRun(model, run, options.ascentThresholdM);
  const drivability = drivabilityStretches(model, run, options);
  const descents = describeDescents(model, run, options, {
    worst: runWorstCase(model, run, conditions, options.safety),
    drivability,
    sensitivity: sensitivityVariants(model),
  });
  const response: PreviewResponse = {
    summary,
    profile: profileOf(model, run),
    descents,
    drivability: { drivable: drivability.length === 0, stretches: drivability },
    caution: ENGINEERING_CAUTION,
    engineVersion: ENGINE_VERSION,
  };
  if (uncovered) response.uncoveredStretches = uncovered;
  return { response, model, run, vehicle, conditions, options };
}

/**
 * The answer's per-point profile, one array per series of the table (profile-series.ts): run
 * series as the run holds them, model series from the prepared route, where a segment series
 * (one value per segment) repeats its last segment at the last point.
 */
function profileOf(model: RouteModel, run: RouteRun): Profile {
  const n = model.pointCount;
  const profile: Partial<Record<ProfileSeriesName, number[]>> = {};
  for (const { name, kind, source } of PROFILE_SERIES) {
    if (source === 'run') {
      profile[name] = Array.from(run[name]);
    } else if (kind === 'segment') {
      const values = model[name];
      const out = new Array<number>(n);
      for (let i = 0; i < n; i++) out[i] = values[Math.min(i, n - 2)]!;
      profile[name] = out;
    } else {
      profile[name] = Array.from(model[name]);
    }
  }
  return profile as Profile;
}

/** The minimum-time speed profile (forward–backward pass) of a prepared route. */
export function minimumTimeSpeeds(model: RouteModel, vehicle: Vehicle, options: AnalysisOptions): Float64Array {
  const segments = model.pointCount - 1;
  let deceleration: number | Float64Array = options.decelerationMps2;
  if (options.slopeAwareDeceleration) {
    // Felt deceleration d + g·sin θ on descents held to the comfort limit (engine README §7.2).
    const perSegment = new Float64Array(segments);
    for (let k = 0; k < segments; k++) {
      const downhill = Math.max(0, -model.sinTheta[k]!);
      perSegment[k] = Math.max(0.1 * options.decelerationMps2, options.decelerationMps2 - STANDARD_GRAVITY_MPS2 * downhill);
    }
    deceleration = perSegment;
  }
  return computeSpeedProfile({
    segmentLengthM: model.slopeLengthM,
    limitMps: model.limitMps,
    accelerationMps2: options.accelerationMps2,
    decelerationMps2: deceleration,
    traction: {
      massKg: model.massKg,
      rotatingMassFactor: vehicle.rotatingMassFactor,
      rollingResistanceCoefficient: vehicle.rollingResistanceCoefficient,
      dragAreaM2: model.dragAreaM2,
      maxTractionForceN: vehicle.maxTractionForceN,
      tractionPowerW: vehicle.tractionPowerW,
      airDensityKgM3: model.airDensityKgM3,
      sinTheta: model.sinTheta,
      cosTheta: model.cosTheta,
    },
  });
}
