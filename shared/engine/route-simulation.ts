/**
 * The prepared route (per-segment geometry and air) and the step that moves the vehicle over
 * one segment: road-load forces, the powertrain/battery split, and both brake-temperature
 * estimates. The full run and the descent advice solvers share this step, so the advice is
 * computed with exactly the same models as the reported profile.
 *
 * Segment k runs from point k to point k+1. Its length along the road is
 * ℓ_k = Δs_k·√(1 + G_k²) (Δs_k the horizontal geodesic distance, G_k = tan θ_k from the smoothed
 * profile), so the gradient work m·g·sin θ·ℓ equals m·g·Δz exactly and cancels on a closed loop.
 * Within a segment the acceleration is constant: the aero force uses the mean of v² over the
 * distance, ½·ρ·Cd·A·(v_k² + v_{k+1}²)/2, the inertia work is ½·(1+δ)·m·(v_{k+1}² − v_k²), and
 * Δt = 2ℓ/(v_k + v_{k+1}).
 */
import type { Vehicle } from '../domain/analysis';
import { STANDARD_GRAVITY_MPS2 } from './constants';
import { brakeConvectionWPerM2K, brakeTemperatureStepC } from './brake-thermal';
import { gsrsAdvanceTemperatureC } from './grade-severity-rating';
import { emptyPowerSplit, splitWheelPower, type PowerSplit, type PowertrainParams } from './powertrain';
import { segmentTimeS } from './speed-profile';

export interface RouteModel {
  vehicle: Vehicle;
  massKg: number;
  weightN: number;
  /** (1 + rotatingMassFactor)·m, kg. */
  effectiveMassKg: number;
  dragAreaM2: number;
  powertrain: PowertrainParams;
  /** Number of points. */
  pointCount: number;
  distanceM: Float64Array;
  lon: Float64Array;
  lat: Float64Array;
  /** Smoothed elevation used for grades and energies, m. */
  elevationM: Float64Array;
  /** Per segment (pointCount − 1 entries). */
  slopeLengthM: Float64Array;
  gradePercent: Float64Array;
  sinTheta: Float64Array;
  cosTheta: Float64Array;
  airDensityKgM3: Float64Array;
  ambientC: Float64Array;
  /** Per point. */
  limitMps: Float64Array;
  postedLimitMps: Float64Array;
  dwellS: Float64Array;
}

/** Mutable state carried from segment to segment. */
export interface VehicleState {
  soc: number;
  brakeTempC: number;
  gsrsBrakeTempC: number;
  shortfallJ: number;
}

/** Per-segment results, reused between calls. */
export interface SegmentResult {
  durationS: number;
  meanSpeedMps: number;
  rollingN: number;
  aeroN: number;
  gradeN: number;
  inertiaN: number;
  tractionN: number;
  wheelPowerW: number;
  split: PowerSplit;
}

export function emptySegmentResult(): SegmentResult {
  return {
    durationS: 0,
    meanSpeedMps: 0,
    rollingN: 0,
    aeroN: 0,
    gradeN: 0,
    inertiaN: 0,
    tractionN: 0,
    wheelPowerW: 0,
    split: emptyPowerSplit(),
  };
}

/** Moves the vehicle over segment `k` from speed v1 to v2, updating `state` and writing `out`. */
export function advanceSegment(
  model: RouteModel,
  k: number,
  v1Mps: number,
  v2Mps: number,
  state: VehicleState,
  out: SegmentResult,
  trackBrakes = true,
): void {
  const lengthM = model.slopeLengthM[k]!;
  const durationS = segmentTimeS(lengthM, v1Mps, v2Mps);
  const moving = v1Mps + v2Mps > 0;
  const rollingN = moving ? model.vehicle.rollingResistanceCoefficient * model.weightN * model.cosTheta[k]! : 0;
  const aeroN = 0.25 * model.airDensityKgM3[k]! * model.dragAreaM2 * (v1Mps * v1Mps + v2Mps * v2Mps);
  const gradeN = model.weightN * model.sinTheta[k]!;
  const inertiaN = (0.5 * model.effectiveMassKg * (v2Mps * v2Mps - v1Mps * v1Mps)) / lengthM;
  const tractionN = rollingN + aeroN + gradeN + inertiaN;
  const meanSpeedMps = lengthM / durationS;
  const wheelPowerW = (tractionN * lengthM) / durationS;

  splitWheelPower(model.powertrain, wheelPowerW, meanSpeedMps, state.soc, durationS, out.split, model.ambientC[k]);
  state.soc = out.split.soc;
  state.shortfallJ += out.split.shortfallJ;
  if (trackBrakes) advanceBrakes(model, k, out.split.frictionPowerW, meanSpeedMps, durationS, state);

  out.durationS = durationS;
  out.meanSpeedMps = meanSpeedMps;
  out.rollingN = rollingN;
  out.aeroN = aeroN;
  out.gradeN = gradeN;
  out.inertiaN = inertiaN;
  out.tractionN = tractionN;
  out.wheelPowerW = wheelPowerW;
}

/** Standing still at point `k` for `durationS` (a stop's dwell): auxiliaries only, brakes cool. */
export function dwell(model: RouteModel, k: number, durationS: number, state: VehicleState, out: SegmentResult): void {
  const segment = Math.min(k, model.pointCount - 2);
  splitWheelPower(model.powertrain, 0, 0, state.soc, durationS, out.split, model.ambientC[segment]);
  state.soc = out.split.soc;
  state.shortfallJ += out.split.shortfallJ;
  advanceBrakes(model, segment, 0, 0, durationS, state);
  out.durationS = durationS;
}

function advanceBrakes(
  model: RouteModel,
  k: number,
  frictionPowerW: number,
  speedMps: number,
  durationS: number,
  state: VehicleState,
): void {
  const vehicle = model.vehicle;
  const ambientC = model.ambientC[k]!;
  state.brakeTempC = brakeTemperatureStepC(
    state.brakeTempC,
    ambientC,
    vehicle.brakeHeatShare * frictionPowerW,
    brakeConvectionWPerM2K(speedMps),
    vehicle.brakeCoolingAreaM2,
    vehicle.brakeThermalMassJPerK,
    vehicle.brakeEmissivity,
    durationS,
  );
  state.gsrsBrakeTempC = gsrsAdvanceTemperatureC(state.gsrsBrakeTempC, ambientC, frictionPowerW, speedMps, durationS);
}

/** Weight of a vehicle, N. */
export function weightN(massKg: number): number {
  return massKg * STANDARD_GRAVITY_MPS2;
}
