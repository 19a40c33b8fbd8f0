/**
 * One full run along a prepared route on a given speed profile: forces, powers, SOC and brake
 * temperatures at every point, segment energies, and dwell at stops.
 *
 * Per-point vs per-segment convention: speed, time, SOC, elevation and both brake temperatures
 * are values at the point (on arrival, before any dwell there). Forces, powers, grade and air
 * density at index i describe the segment from point i to point i+1; the last point repeats the
 * last segment. Powers are segment means (energy/duration).
 */
import { RUN_SERIES, type RunSeriesName } from './profile-series';
import { advanceSegment, dwell, emptySegmentResult, initialVehicleState, type RouteModel, type VehicleState } from './route-simulation';

/**
 * The run's per-point series of the profile (profile-series.ts, `source: 'run'`), one array each;
 * segment series follow the forward convention (the last point repeats the last segment).
 */
export type RunSeries = { [Name in RunSeriesName]: Float64Array };

export interface RouteRun extends RunSeries {
  /** Brake groups on arrival at each point, °C (internal: the profile shows the whole vehicle's). */
  frontBrakeTempC: Float64Array;
  rearBrakeTempC: Float64Array;
  /** Regeneration overload on arrival at each point, J (route-simulation.ts). */
  regenOverloadJ: Float64Array;
  /** Per segment energies, J (pointCount − 1 entries). */
  segmentDurationS: Float64Array;
  segmentTractionJ: Float64Array;
  segmentBrakingJ: Float64Array;
  segmentRegenJ: Float64Array;
  segmentRetarderJ: Float64Array;
  segmentFrictionJ: Float64Array;
  segmentSourceJ: Float64Array;
  segmentTractionElectricJ: Float64Array;
  /** Totals including dwell. */
  durationS: number;
  auxJ: number;
  sourceJ: number;
  shortfallJ: number;
  startSoc: number;
  endSoc: number;
}

/** Runs the vehicle along `model` at `speedMps` from `startSoc` and `initialBrakeTempC`. */
export function runRoute(model: RouteModel, speedMps: Float64Array, startSoc: number, initialBrakeTempC: number): RouteRun {
  return runRouteFrom(model, speedMps, initialVehicleState(startSoc, initialBrakeTempC));
}

/** Like `runRoute`, from a full starting state (brake groups at their own temperatures). */
export function runRouteFrom(model: RouteModel, speedMps: Float64Array, start: VehicleState): RouteRun {
  const startSoc = start.soc;
  const n = model.pointCount;
  const segments = n - 1;
  const series = Object.fromEntries(RUN_SERIES.map(({ name }) => [name, new Float64Array(n)])) as RunSeries;
  const run: RouteRun = {
    ...series,
    // The speed profile is the run's input, kept as given.
    speedMps,
    frontBrakeTempC: new Float64Array(n),
    rearBrakeTempC: new Float64Array(n),
    regenOverloadJ: new Float64Array(n),
    segmentDurationS: new Float64Array(segments),
    segmentTractionJ: new Float64Array(segments),
    segmentBrakingJ: new Float64Array(segments),
    segmentRegenJ: new Float64Array(segments),
    segmentRetarderJ: new Float64Array(segments),
    segmentFrictionJ: new Float64Array(segments),
    segmentSourceJ: new Float64Array(segments),
    segmentTractionElectricJ: new Float64Array(segments),
    durationS: 0,
    auxJ: 0,
    sourceJ: 0,
    shortfallJ: 0,
    startSoc,
    endSoc: startSoc,
  };
  const state: VehicleState = { ...start };
  const result = emptySegmentResult();
  const auxW = model.powertrain.auxPowerW;
  let timeS = 0;
  let sourceJ = 0;

  for (let i = 0; i < n; i++) {
    run.timeS[i] = timeS;
    run.soc[i] = state.soc;
    run.brakeTempC[i] = state.brakeTempC;
    run.frontBrakeTempC[i] = state.frontBrakeTempC;
    run.rearBrakeTempC[i] = state.rearBrakeTempC;
    run.regenOverloadJ[i] = state.regenOverloadJ;
    run.gsrsBrakeTempC[i] = state.gsrsBrakeTempC;
    const dwellS = model.dwellS[i]!;
    if (dwellS > 0) {
      dwell(model, i, dwellS, state, result);
      timeS += dwellS;
      sourceJ += result.split.sourcePowerW * dwellS;
    }
    if (i === segments) break;

    advanceSegment(model, i, speedMps[i]!, speedMps[i + 1]!, state, result);
    const dt = result.durationS;
    const split = result.split;
    timeS += dt;
    sourceJ += split.sourcePowerW * dt;
    run.rollingN[i] = result.rollingN;
    run.aeroN[i] = result.aeroN;
    run.gradeN[i] = result.gradeN;
    run.inertiaN[i] = result.inertiaN;
    run.tractionN[i] = result.tractionN;
    run.tractionPowerW[i] = result.wheelPowerW;
    run.batteryPowerW[i] = split.sourcePowerW;
    run.regenPowerW[i] = split.regenWheelPowerW;
    run.frictionBrakePowerW[i] = split.frictionPowerW;
    run.segmentDurationS[i] = dt;
    if (result.wheelPowerW >= 0) run.segmentTractionJ[i] = result.wheelPowerW * dt;
    else run.segmentBrakingJ[i] = -result.wheelPowerW * dt;
    run.segmentRegenJ[i] = split.regenElectricPowerW * dt;
    run.segmentRetarderJ[i] = split.retarderPowerW * dt;
    run.segmentFrictionJ[i] = split.frictionPowerW * dt;
    run.segmentSourceJ[i] = split.sourcePowerW * dt;
    run.segmentTractionElectricJ[i] = split.tractionElectricPowerW * dt;
  }
  if (n >= 2) {
    const last = n - 1;
    for (const { name, kind } of RUN_SERIES) if (kind === 'segment') run[name][last] = run[name][last - 1]!;
  }
  run.durationS = timeS;
  run.auxJ = auxW * timeS;
  run.sourceJ = sourceJ;
  run.shortfallJ = state.shortfallJ;
  run.endSoc = state.soc;
  return run;
}
