/**
 * One full run along a prepared route on a given speed profile: forces, powers, SOC and brake
 * temperatures at every point, segment energies, and dwell at stops.
 *
 * Per-point vs per-segment convention: speed, time, SOC, elevation and both brake temperatures
 * are values at the point (on arrival, before any dwell there). Forces, powers, grade and air
 * density at index i describe the segment from point i to point i+1; the last point repeats the
 * last segment. Powers are segment means (energy/duration).
 */
import { advanceSegment, dwell, emptySegmentResult, initialVehicleState, type RouteModel, type VehicleState } from './route-simulation';

export interface RouteRun {
  speedMps: Float64Array;
  timeS: Float64Array;
  soc: Float64Array;
  brakeTempC: Float64Array;
  frontBrakeTempC: Float64Array;
  rearBrakeTempC: Float64Array;
  gsrsBrakeTempC: Float64Array;
  /** Regeneration overload on arrival at each point, J (route-simulation.ts). */
  regenOverloadJ: Float64Array;
  /** Per segment, forward convention (last point repeats the last segment). */
  rollingN: Float64Array;
  aeroN: Float64Array;
  gradeN: Float64Array;
  inertiaN: Float64Array;
  tractionN: Float64Array;
  tractionPowerW: Float64Array;
  batteryPowerW: Float64Array;
  regenPowerW: Float64Array;
  frictionBrakePowerW: Float64Array;
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
  const run: RouteRun = {
    speedMps,
    timeS: new Float64Array(n),
    soc: new Float64Array(n),
    brakeTempC: new Float64Array(n),
    frontBrakeTempC: new Float64Array(n),
    rearBrakeTempC: new Float64Array(n),
    gsrsBrakeTempC: new Float64Array(n),
    regenOverloadJ: new Float64Array(n),
    rollingN: new Float64Array(n),
    aeroN: new Float64Array(n),
    gradeN: new Float64Array(n),
    inertiaN: new Float64Array(n),
    tractionN: new Float64Array(n),
    tractionPowerW: new Float64Array(n),
    batteryPowerW: new Float64Array(n),
    regenPowerW: new Float64Array(n),
    frictionBrakePowerW: new Float64Array(n),
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
    run.rollingN[last] = run.rollingN[last - 1]!;
    run.aeroN[last] = run.aeroN[last - 1]!;
    run.gradeN[last] = run.gradeN[last - 1]!;
    run.inertiaN[last] = run.inertiaN[last - 1]!;
    run.tractionN[last] = run.tractionN[last - 1]!;
    run.tractionPowerW[last] = run.tractionPowerW[last - 1]!;
    run.batteryPowerW[last] = run.batteryPowerW[last - 1]!;
    run.regenPowerW[last] = run.regenPowerW[last - 1]!;
    run.frictionBrakePowerW[last] = run.frictionBrakePowerW[last - 1]!;
  }
  run.durationS = timeS;
  run.auxJ = auxW * timeS;
  run.sourceJ = sourceJ;
  run.shortfallJ = state.shortfallJ;
  run.endSoc = state.soc;
  return run;
}
