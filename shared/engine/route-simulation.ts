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
import type { Surface, Vehicle } from '../domain/analysis';
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
  /** Running surface of the run and its adhesion coefficient (adhesion.ts). */
  surface: Surface;
  adhesionMu: number;
}

/** Mutable state carried from segment to segment. */
export interface VehicleState {
  soc: number;
  /** Whole-vehicle brake lump, °C. */
  brakeTempC: number;
  /** Front and rear brake groups, °C (see advanceBrakes). */
  frontBrakeTempC: number;
  rearBrakeTempC: number;
  gsrsBrakeTempC: number;
  shortfallJ: number;
  /**
   * Regenerated energy above the continuous rating not yet given back by running below it, J.
   * While it is under (peak − continuous)·regenPeakHoldS the peak rating applies.
   */
  regenOverloadJ: number;
}

/** A state at rest with every brake at `brakeTempC`. */
export function initialVehicleState(soc: number, brakeTempC: number, axles?: { front: number; rear: number }): VehicleState {
  return {
    soc,
    brakeTempC,
    frontBrakeTempC: axles?.front ?? brakeTempC,
    rearBrakeTempC: axles?.rear ?? brakeTempC,
    gsrsBrakeTempC: brakeTempC,
    shortfallJ: 0,
    regenOverloadJ: 0,
  };
}

/** The temperature that governs risk and advice: the hotter of the lump and the two brake groups, °C. */
export function governingBrakeTempC(state: Pick<VehicleState, 'brakeTempC' | 'frontBrakeTempC' | 'rearBrakeTempC'>): number {
  return Math.max(state.brakeTempC, state.frontBrakeTempC, state.rearBrakeTempC);
}

/** Regeneration rating in force: the peak until it has been held for regenPeakHoldS, then the continuous one, W. */
export function regenRatingW(model: RouteModel, state: VehicleState): number {
  const p = model.powertrain;
  const budgetJ = (p.regenPowerW - p.regenContinuousPowerW) * p.regenPeakHoldS;
  return state.regenOverloadJ < budgetJ ? p.regenPowerW : p.regenContinuousPowerW;
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

  const adhesionForceN = model.adhesionMu * model.vehicle.drivenAxleLoadShare * model.weightN * model.cosTheta[k]!;
  splitWheelPower(
    model.powertrain,
    wheelPowerW,
    meanSpeedMps,
    state.soc,
    durationS,
    out.split,
    model.ambientC[k],
    regenRatingW(model, state),
    adhesionForceN,
  );
  state.soc = out.split.soc;
  state.shortfallJ += out.split.shortfallJ;
  state.regenOverloadJ = Math.max(
    0,
    state.regenOverloadJ + (out.split.regenWheelPowerW - model.powertrain.regenContinuousPowerW) * durationS,
  );
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
  state.regenOverloadJ = Math.max(0, state.regenOverloadJ - model.powertrain.regenContinuousPowerW * durationS);
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
  const heatW = vehicle.brakeHeatShare * frictionPowerW;
  const convection = brakeConvectionWPerM2K(speedMps);
  const area = vehicle.brakeCoolingAreaM2;
  const mass = vehicle.brakeThermalMassJPerK;
  const rearShare = vehicle.rearBrakeShare;
  const rearPart = vehicle.rearBrakeThermalMassShare;
  state.brakeTempC = brakeTemperatureStepC(state.brakeTempC, ambientC, heatW, convection, area, mass, vehicle.brakeEmissivity, durationS);
  // Brake groups: the rear group takes rearBrakeShare of the heat into its share of the thermal
  // mass and cooled surface, the front group the rest.
  state.rearBrakeTempC = brakeTemperatureStepC(
    state.rearBrakeTempC,
    ambientC,
    rearShare * heatW,
    convection,
    rearPart * area,
    rearPart * mass,
    vehicle.brakeEmissivity,
    durationS,
  );
  state.frontBrakeTempC = brakeTemperatureStepC(
    state.frontBrakeTempC,
    ambientC,
    (1 - rearShare) * heatW,
    convection,
    (1 - rearPart) * area,
    (1 - rearPart) * mass,
    vehicle.brakeEmissivity,
    durationS,
  );
  state.gsrsBrakeTempC = gsrsAdvanceTemperatureC(state.gsrsBrakeTempC, ambientC, frictionPowerW, speedMps, durationS);
}

/** Weight of a vehicle, N. */
export function weightN(massKg: number): number {
  return massKg * STANDARD_GRAVITY_MPS2;
}
