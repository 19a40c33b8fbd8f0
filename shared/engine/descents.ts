/**
 * Descents: detection, energy and temperature records, risk level and advice.
 *
 * Detection: segments whose smoothed grade is below `descentGradeThresholdPercent` form runs;
 * runs separated by flats or rises no longer than `descentGapToleranceM` merge; merged runs at
 * least `descentMinLengthM` long (horizontal) with a positive drop are descents (common practice).
 * Grades are reported with the product's sign: negative downhill; `maxGradePercent` is the
 * steepest (most negative) segment grade.
 *
 * Risk (bulk disc/drum temperature of the lumped model; sources of each edge in engine README §4.4
 * and BRAKE_RISK_BANDS_C below, the rest engineering judgement from memory): drum — elevated from 200 °C, high from 260 °C (GSRS 500 °F), critical from
 * 340 °C (≈ 650 °F, top of the resin-odour band); disc — elevated from 300 °C, high from 450 °C,
 * critical from 550 °C (bulk rotor 500–600 °C). The fade threshold for the speed advice is the
 * "high" edge.
 *
 * Advice (both solved with the same step as the full run, over the descent only, starting from
 * the run's SOC and brake temperature at the top):
 * - maxSafeSpeedKph: bisection (to 0.01 km/h) for the highest constant speed whose peak brake
 *   temperature stays at or below the fade threshold, searched between walking pace (5 km/h, from
 *   memory) and the highest posted limit on the descent. `'no-limit-needed'` (null) when the
 *   posted limit is already safe; `'not-holdable'` (null) when walking pace already overheats.
 * - maxTopSoc: bisection (to 10⁻⁴) for the highest SOC at the top at which the battery's SOC
 *   limits divert no braking from regeneration: non-regenerated braking energy (friction +
 *   retarder) no more than with an empty battery plus 0.1 % of the braking energy + 1 Wh, on the
 *   run's own speeds. null when the battery is not the limit — when even an empty battery leaves
 *   more than 2 % of the braking energy to other brakes (regen power or low-speed fade limit it),
 *   or the vehicle has no battery to fill (overhead line, no regeneration).
 * - beyondTypeApprovalReference: the descent's wheel braking energy exceeds the net braking
 *   energy of the UN R13 Type-II reference descent (6 %, 6 km, 30 km/h) for this vehicle
 *   (a heuristic of ours, from memory; engine README §5.1).
 */
import type { AnalysisOptions, BrakeType, Descent, DrivabilityStretch, MaxTopSocReason, RiskLevel, Vehicle } from '../domain/analysis';
import { describeWorstCase, descentAdhesion, descentSensitivity, type SensitivityVariants, type WorstCaseRun } from './descent-safety';
import {
  ISA_SEA_LEVEL_DENSITY_KG_PER_M3,
  JOULES_PER_WH,
  STANDARD_GRAVITY_MPS2,
  TYPE_II_GRADE_PERCENT,
  TYPE_II_LENGTH_M,
  TYPE_II_SPEED_MPS,
} from './constants';
import {
  advanceSegment,
  emptySegmentResult,
  governingBrakeTempC,
  initialVehicleState,
  type RouteModel,
  type VehicleState,
} from './route-simulation';
import type { RouteRun } from './route-run';

/** Walking pace, the lowest speed the speed advice considers, m/s (from memory: about 5 km/h). */
export const WALKING_PACE_MPS = 5 / 3.6;

/**
 * Risk band edges, °C (engine README §4.4): drum high = the GSRS 500 °F limit (Wyoming DOT WY-1901F,
 * 2018); drum critical ≈ 650 °F, top of the resin-odour band (Carlisle Brake & Friction, "Brake
 * temperature signals"); disc edges below the ≈ 700 °C of pad fade (Textar, "Fading"); the rest is
 * engineering judgement, from memory.
 */
export const BRAKE_RISK_BANDS_C: Record<BrakeType, { elevated: number; high: number; critical: number }> = {
  drum: { elevated: 200, high: 260, critical: 340 },
  disc: { elevated: 300, high: 450, critical: 550 },
};

/** Brake temperature at which fade becomes likely, °C (the "high" band edge). */
export function fadeThresholdC(brakeType: BrakeType): number {
  return BRAKE_RISK_BANDS_C[brakeType].high;
}

/** Risk level of a peak bulk brake temperature. */
export function brakeRiskLevel(peakBrakeTempC: number, brakeType: BrakeType): RiskLevel {
  const bands = BRAKE_RISK_BANDS_C[brakeType];
  if (peakBrakeTempC >= bands.critical) return 'critical';
  if (peakBrakeTempC >= bands.high) return 'high';
  if (peakBrakeTempC >= bands.elevated) return 'elevated';
  return 'low';
}

/** A descent as a range of segments [firstSegment, lastSegment]. */
export interface DescentRange {
  firstSegment: number;
  lastSegment: number;
}

/** Finds the descents of a prepared route. */
export function findDescentRanges(model: RouteModel, options: AnalysisOptions): DescentRange[] {
  const segments = model.pointCount - 1;
  const threshold = options.descentGradeThresholdPercent;
  const runs: DescentRange[] = [];
  let start = -1;
  for (let k = 0; k <= segments; k++) {
    const falling = k < segments && model.gradePercent[k]! < threshold;
    if (falling && start < 0) start = k;
    if (!falling && start >= 0) {
      const previous = runs[runs.length - 1];
      const gapM = previous ? model.distanceM[start]! - model.distanceM[previous.lastSegment + 1]! : Number.POSITIVE_INFINITY;
      if (previous && gapM <= options.descentGapToleranceM) previous.lastSegment = k - 1;
      else runs.push({ firstSegment: start, lastSegment: k - 1 });
      start = -1;
    }
  }
  return runs.filter((range) => {
    const lengthM = model.distanceM[range.lastSegment + 1]! - model.distanceM[range.firstSegment]!;
    const dropM = model.elevationM[range.firstSegment]! - model.elevationM[range.lastSegment + 1]!;
    return lengthM >= options.descentMinLengthM && dropM > 0;
  });
}

/** Outcome of replaying a descent. */
export interface DescentReplay {
  /** Peak of the whole-vehicle brake lump, °C. */
  peakBrakeTempC: number;
  /** Peak of the governing temperature (hotter of the lump and the two brake groups), °C. */
  peakGoverningC: number;
  peakFrontC: number;
  peakRearC: number;
  brakingJ: number;
  nonRegenBrakingJ: number;
}

/** The vehicle's state at point `i` of a run (brake groups, SOC, regeneration overload). */
export function stateAt(run: RouteRun, i: number): VehicleState {
  return {
    soc: run.soc[i]!,
    brakeTempC: run.brakeTempC[i]!,
    frontBrakeTempC: run.frontBrakeTempC[i]!,
    rearBrakeTempC: run.rearBrakeTempC[i]!,
    gsrsBrakeTempC: run.gsrsBrakeTempC[i]!,
    shortfallJ: 0,
    regenOverloadJ: run.regenOverloadJ[i]!,
  };
}

/**
 * Replays segments of `range` from the given SOC and brake temperature, at constant
 * `constantSpeedMps` or (when null) on the run's own speeds. The replay stops early once the
 * governing brake temperature exceeds `stopAboveC` or the non-regenerated braking exceeds
 * `stopAboveNonRegenJ` (the solvers only need to know that a limit was crossed); brake
 * temperatures are not tracked when `trackBrakes` is false. `start` gives the brake groups'
 * and the regeneration overload's starting values (default: every brake at startBrakeTempC).
 */
export function replayDescent(
  model: RouteModel,
  run: RouteRun,
  range: DescentRange,
  constantSpeedMps: number | null,
  startSoc: number,
  startBrakeTempC: number,
  limits: { stopAboveC?: number; stopAboveNonRegenJ?: number; trackBrakes?: boolean; start?: VehicleState } = {},
): DescentReplay {
  const stopAboveC = limits.stopAboveC ?? Number.POSITIVE_INFINITY;
  const stopAboveNonRegenJ = limits.stopAboveNonRegenJ ?? Number.POSITIVE_INFINITY;
  const trackBrakes = limits.trackBrakes ?? true;
  const state: VehicleState = limits.start
    ? { ...limits.start, soc: startSoc, brakeTempC: startBrakeTempC, shortfallJ: 0 }
    : initialVehicleState(startSoc, startBrakeTempC);
  const result = emptySegmentResult();
  let peak = state.brakeTempC;
  let peakFront = state.frontBrakeTempC;
  let peakRear = state.rearBrakeTempC;
  let peakGoverning = governingBrakeTempC(state);
  let brakingJ = 0;
  let nonRegenBrakingJ = 0;
  for (let k = range.firstSegment; k <= range.lastSegment; k++) {
    const v1 = constantSpeedMps ?? run.speedMps[k]!;
    const v2 = constantSpeedMps ?? run.speedMps[k + 1]!;
    advanceSegment(model, k, v1, v2, state, result, trackBrakes);
    if (state.brakeTempC > peak) peak = state.brakeTempC;
    if (state.frontBrakeTempC > peakFront) peakFront = state.frontBrakeTempC;
    if (state.rearBrakeTempC > peakRear) peakRear = state.rearBrakeTempC;
    const governing = governingBrakeTempC(state);
    if (governing > peakGoverning) peakGoverning = governing;
    if (result.wheelPowerW < 0) {
      brakingJ -= result.wheelPowerW * result.durationS;
      nonRegenBrakingJ += (result.split.frictionPowerW + result.split.retarderPowerW) * result.durationS;
    }
    if (peakGoverning > stopAboveC || nonRegenBrakingJ > stopAboveNonRegenJ) break;
  }
  return { peakBrakeTempC: peak, peakGoverningC: peakGoverning, peakFrontC: peakFront, peakRearC: peakRear, brakingJ, nonRegenBrakingJ };
}

/** Net braking energy of the UN R13 Type-II reference descent for `vehicle`, J (engine README §5.1). */
export function typeIiReferenceBrakingJ(vehicle: Vehicle): number {
  const massKg = vehicle.curbMassKg + vehicle.payloadKg;
  const g = TYPE_II_GRADE_PERCENT / 100;
  const secant = Math.sqrt(1 + g * g);
  const weightN = massKg * STANDARD_GRAVITY_MPS2;
  const gravityN = (weightN * g) / secant;
  const rollingN = (vehicle.rollingResistanceCoefficient * weightN) / secant;
  const aeroN = 0.5 * ISA_SEA_LEVEL_DENSITY_KG_PER_M3 * vehicle.dragCoefficient * vehicle.frontalAreaM2 * TYPE_II_SPEED_MPS ** 2;
  return Math.max(0, (gravityN - rollingN - aeroN) * TYPE_II_LENGTH_M);
}

/** Rounds a speed advice down to the whole km/h (floating-point noise forgiven). */
export function speedDownToWholeKph(speedKph: number): number {
  return Math.floor(speedKph + 1e-9);
}

/** Rounds an SOC advice down to the whole percent (floating-point noise forgiven). */
export function socDownToWholePercent(soc: number): number {
  return Math.floor(soc * 100 + 1e-9) / 100;
}

/**
 * Highest safe constant speed over a descent, with its meaning: the governing brake temperature
 * stays at or below `limitC` (the fade threshold minus the margin), rounded down to the whole km/h.
 * `start` is the state at the top (default: the run's own).
 */
export function solveMaxSafeSpeed(
  model: RouteModel,
  run: RouteRun,
  range: DescentRange,
  limitC: number = fadeThresholdC(model.vehicle.brakeType),
  start: VehicleState = stateAt(run, range.firstSegment),
): { maxSafeSpeedKph: number | null; speedAdvice: Descent['speedAdvice'] } {
  const peakAt = (v: number) =>
    replayDescent(model, run, range, v, start.soc, start.brakeTempC, { stopAboveC: limitC, start }).peakGoverningC;
  let ceiling = WALKING_PACE_MPS;
  for (let i = range.firstSegment; i <= range.lastSegment + 1; i++) ceiling = Math.max(ceiling, model.postedLimitMps[i]!);
  if (peakAt(ceiling) <= limitC) return { maxSafeSpeedKph: null, speedAdvice: 'no-limit-needed' };
  if (peakAt(WALKING_PACE_MPS) > limitC) return { maxSafeSpeedKph: null, speedAdvice: 'not-holdable' };
  // The answer is shown in whole km/h rounded down, so search the whole km/h directly: the
  // highest whole speed whose peak stays within the limit (peak temperature rises with speed).
  let lo = Math.ceil(WALKING_PACE_MPS * 3.6 - 1e-9);
  let hi = speedDownToWholeKph(ceiling * 3.6) + 1;
  while (hi - lo > 1) {
    const mid = (lo + hi) >> 1;
    if (peakAt(mid / 3.6) <= limitC) lo = mid;
    else hi = mid;
  }
  return { maxSafeSpeedKph: lo, speedAdvice: 'limit' };
}

/**
 * Highest SOC at the top (rounded down to the whole percent) at which the governing brake
 * temperature stays at or below `limitC` on the run's own speeds with regeneration working; null
 * with the reason when no SOC does or SOC plays no part.
 */
export function solveMaxTopSoc(
  model: RouteModel,
  run: RouteRun,
  range: DescentRange,
  limitC: number = fadeThresholdC(model.vehicle.brakeType),
): { maxTopSoc: number | null; reason: MaxTopSocReason | null } {
  const params = model.powertrain;
  if (params.isOverheadLine || params.batteryCapacityJ <= 0) return { maxTopSoc: null, reason: 'no-battery' };
  if (params.regenPowerW <= 0) return { maxTopSoc: null, reason: 'no-regeneration' };
  const start = stateAt(run, range.firstSegment);
  const peakAt = (soc: number) =>
    replayDescent(model, run, range, null, soc, start.brakeTempC, { stopAboveC: limitC, start }).peakGoverningC;
  if (peakAt(0) > limitC) return { maxTopSoc: null, reason: 'no-soc-keeps-brakes-cool' };
  const top = socDownToWholePercent(params.socCeiling);
  if (peakAt(top) <= limitC) return { maxTopSoc: top, reason: null };
  // Whole percent, rounded down: the highest whole percent whose peak stays within the limit.
  let lo = 0;
  let hi = Math.round(top * 100);
  while (hi - lo > 1) {
    const mid = (lo + hi) >> 1;
    if (peakAt(mid / 100) <= limitC) lo = mid;
    else hi = mid;
  }
  return { maxTopSoc: lo / 100, reason: null };
}

/** What the descent records need besides the nominal model and run. */
export interface DescentSafetyInputs {
  /** The worst credible case: its model and its whole-route run on the same speeds. */
  worst?: WorstCaseRun;
  /** Stretches of the route that are not drivable as drawn. */
  drivability?: DrivabilityStretch[];
  /** Sensitivity variants of the nominal model. */
  sensitivity?: SensitivityVariants;
}

/** Full descent records for a run. */
export function describeDescents(model: RouteModel, run: RouteRun, options: AnalysisOptions, safety: DescentSafetyInputs = {}): Descent[] {
  const referenceJ = typeIiReferenceBrakingJ(model.vehicle);
  const fadeC = fadeThresholdC(model.vehicle.brakeType);
  const marginK = options.safety.fadeMarginK;
  const limitC = fadeC - marginK;
  return findDescentRanges(model, options).map((range) => {
    const first = range.firstSegment;
    const endPoint = range.lastSegment + 1;
    let brakingJ = 0;
    let regenJ = 0;
    let frictionJ = 0;
    let retarderJ = 0;
    let steepest = 0;
    for (let k = first; k < endPoint; k++) {
      brakingJ += run.segmentBrakingJ[k]!;
      regenJ += run.segmentRegenJ[k]!;
      frictionJ += run.segmentFrictionJ[k]!;
      retarderJ += run.segmentRetarderJ[k]!;
      steepest = Math.min(steepest, model.gradePercent[k]!);
    }
    let peak = Number.NEGATIVE_INFINITY;
    let gsrsPeak = Number.NEGATIVE_INFINITY;
    let frontPeak = Number.NEGATIVE_INFINITY;
    let rearPeak = Number.NEGATIVE_INFINITY;
    for (let i = first; i <= endPoint; i++) {
      peak = Math.max(peak, run.brakeTempC[i]!);
      gsrsPeak = Math.max(gsrsPeak, run.gsrsBrakeTempC[i]!);
      frontPeak = Math.max(frontPeak, run.frontBrakeTempC[i]!);
      rearPeak = Math.max(rearPeak, run.rearBrakeTempC[i]!);
    }
    const nominalGoverningC = Math.max(peak, frontPeak, rearPeak);
    const startM = model.distanceM[first]!;
    const endM = model.distanceM[endPoint]!;
    const dropM = model.elevationM[first]! - model.elevationM[endPoint]!;
    const lengthM = endM - startM;
    const stretches = (safety.drivability ?? []).filter((stretch) => stretch.toM > startM && stretch.fromM < endM);
    const drivable = stretches.length === 0;
    const advice = drivable
      ? solveMaxSafeSpeed(model, run, range, limitC)
      : { maxSafeSpeedKph: null, speedAdvice: 'not-drivable' as const };
    const soc = drivable ? solveMaxTopSoc(model, run, range, limitC) : { maxTopSoc: null, reason: 'not-drivable' as const };
    const nominalRisk = brakeRiskLevel(nominalGoverningC, model.vehicle.brakeType);
    const worstCase = safety.worst ? describeWorstCase(safety.worst, range, nominalGoverningC, limitC, drivable) : undefined;
    const sensitivity = safety.sensitivity ? descentSensitivity(model, run, range, safety.sensitivity) : undefined;
    const descent: Descent = {
      startM,
      endM,
      lengthM,
      dropM,
      meanGradePercent: (-100 * dropM) / lengthM,
      maxGradePercent: steepest,
      gravityEnergyWh: (model.weightN * dropM) / JOULES_PER_WH,
      brakingEnergyWh: brakingJ / JOULES_PER_WH,
      regenEnergyWh: regenJ / JOULES_PER_WH,
      frictionBrakeEnergyWh: frictionJ / JOULES_PER_WH,
      retarderEnergyWh: retarderJ / JOULES_PER_WH,
      peakBrakeTempC: peak,
      gsrsPeakBrakeTempC: gsrsPeak,
      risk: worstCase ? worstCase.risk : nominalRisk,
      nominalRisk,
      fadeThresholdC: fadeC,
      fadeMarginK: marginK,
      peakBrakeTempByAxleC: { front: frontPeak, rear: rearPeak },
      maxSafeSpeedKph: advice.maxSafeSpeedKph,
      speedAdvice: advice.speedAdvice,
      maxTopSoc: soc.maxTopSoc,
      maxTopSocReason: soc.reason,
      socAtTop: run.soc[first]!,
      beyondTypeApprovalReference: brakingJ > referenceJ,
      drivability: { drivable, stretches },
      adhesion: descentAdhesion(model, run, range, options.decelerationMps2),
    };
    if (worstCase) descent.worstCase = worstCase;
    if (sensitivity) {
      descent.sensitivity = sensitivity.entries;
      descent.sensitivityDominantInput = sensitivity.dominant;
    }
    return descent;
  });
}
