/**
 * Route totals (product design step 9), round trips and annual figures. Energies in Wh.
 * batteryNetEnergyWh = Σ traction/drivetrainEfficiency + auxEnergyWh − regenEnergyWh (energy
 * drawn from the battery or line minus energy put back); kWhPerKm = batteryNetEnergyWh / lengthM.
 */
import type { Summary } from '../domain/analysis';
import { JOULES_PER_WH } from './constants';
import type { RouteModel } from './route-simulation';
import type { RouteRun } from './route-run';
import { ascentDescentM } from './smoothing';
import { assertNonNegative } from './validation';

/** Totals of one run. */
export function summariseRun(model: RouteModel, run: RouteRun, ascentThresholdM: number): Summary {
  const segments = model.pointCount - 1;
  let slopeLengthM = 0;
  let tractionJ = 0;
  let brakingJ = 0;
  let regenJ = 0;
  let frictionJ = 0;
  let retarderJ = 0;
  let tractionLimitedM = 0;
  const vehicle = model.vehicle;
  for (let k = 0; k < segments; k++) {
    slopeLengthM += model.slopeLengthM[k]!;
    tractionJ += run.segmentTractionJ[k]!;
    brakingJ += run.segmentBrakingJ[k]!;
    regenJ += run.segmentRegenJ[k]!;
    frictionJ += run.segmentFrictionJ[k]!;
    retarderJ += run.segmentRetarderJ[k]!;
    const meanSpeed = model.slopeLengthM[k]! / run.segmentDurationS[k]!;
    const envelopeN = Math.min(vehicle.maxTractionForceN, vehicle.tractionPowerW / Math.max(meanSpeed, 1e-9));
    if (run.tractionN[k]! > envelopeN * 1.001) tractionLimitedM += model.distanceM[k + 1]! - model.distanceM[k]!;
  }
  const { ascentM, descentM } = ascentDescentM(model.elevationM, ascentThresholdM);
  const lengthM = model.distanceM[model.pointCount - 1]!;
  let peak = Number.NEGATIVE_INFINITY;
  let gsrsPeak = Number.NEGATIVE_INFINITY;
  for (let i = 0; i < model.pointCount; i++) {
    peak = Math.max(peak, run.brakeTempC[i]!);
    gsrsPeak = Math.max(gsrsPeak, run.gsrsBrakeTempC[i]!);
  }
  const batteryNetEnergyWh = run.sourceJ / JOULES_PER_WH;
  return {
    lengthM,
    slopeLengthM,
    ascentM,
    descentM,
    durationS: run.durationS,
    tractionEnergyWh: tractionJ / JOULES_PER_WH,
    brakingEnergyWh: brakingJ / JOULES_PER_WH,
    regenEnergyWh: regenJ / JOULES_PER_WH,
    frictionBrakeEnergyWh: frictionJ / JOULES_PER_WH,
    retarderEnergyWh: retarderJ / JOULES_PER_WH,
    auxEnergyWh: run.auxJ / JOULES_PER_WH,
    batteryNetEnergyWh,
    kWhPerKm: batteryNetEnergyWh / lengthM,
    peakBrakeTempC: peak,
    gsrsPeakBrakeTempC: gsrsPeak,
    startSoc: run.startSoc,
    endSoc: run.endSoc,
    energyShortfallWh: run.shortfallJ / JOULES_PER_WH,
    tractionLimitedM,
  };
}

/**
 * Round trip: `second` driven after `first`. Lengths, times and energies add; peaks are the
 * larger; startSoc comes from `first` and endSoc from `second`.
 */
export function combineDirections(first: Summary, second: Summary): Summary {
  const lengthM = first.lengthM + second.lengthM;
  const batteryNetEnergyWh = first.batteryNetEnergyWh + second.batteryNetEnergyWh;
  return {
    lengthM,
    slopeLengthM: first.slopeLengthM + second.slopeLengthM,
    ascentM: first.ascentM + second.ascentM,
    descentM: first.descentM + second.descentM,
    durationS: first.durationS + second.durationS,
    tractionEnergyWh: first.tractionEnergyWh + second.tractionEnergyWh,
    brakingEnergyWh: first.brakingEnergyWh + second.brakingEnergyWh,
    regenEnergyWh: first.regenEnergyWh + second.regenEnergyWh,
    frictionBrakeEnergyWh: first.frictionBrakeEnergyWh + second.frictionBrakeEnergyWh,
    retarderEnergyWh: first.retarderEnergyWh + second.retarderEnergyWh,
    auxEnergyWh: first.auxEnergyWh + second.auxEnergyWh,
    batteryNetEnergyWh,
    kWhPerKm: batteryNetEnergyWh / lengthM,
    peakBrakeTempC: Math.max(first.peakBrakeTempC, second.peakBrakeTempC),
    gsrsPeakBrakeTempC: Math.max(first.gsrsPeakBrakeTempC, second.gsrsPeakBrakeTempC),
    startSoc: first.startSoc,
    endSoc: second.endSoc,
    energyShortfallWh: first.energyShortfallWh + second.energyShortfallWh,
    tractionLimitedM: first.tractionLimitedM + second.tractionLimitedM,
  };
}

export interface AnnualTotals {
  tripsPerYear: number;
  lengthKm: number;
  serviceHours: number;
  tractionEnergyKWh: number;
  regenEnergyKWh: number;
  frictionBrakeEnergyKWh: number;
  retarderEnergyKWh: number;
  auxEnergyKWh: number;
  batteryNetEnergyKWh: number;
}

/** Scales one trip's totals to a year: tripsPerDay × serviceDaysPerYear trips. */
export function annualise(trip: Summary, schedule: { tripsPerDay: number; serviceDaysPerYear: number }): AnnualTotals {
  assertNonNegative('tripsPerDay', schedule.tripsPerDay);
  assertNonNegative('serviceDaysPerYear', schedule.serviceDaysPerYear);
  if (schedule.serviceDaysPerYear > 366) throw new RangeError('serviceDaysPerYear: must be ≤ 366');
  const trips = schedule.tripsPerDay * schedule.serviceDaysPerYear;
  return {
    tripsPerYear: trips,
    lengthKm: (trip.lengthM * trips) / 1_000,
    serviceHours: (trip.durationS * trips) / 3_600,
    tractionEnergyKWh: (trip.tractionEnergyWh * trips) / 1_000,
    regenEnergyKWh: (trip.regenEnergyWh * trips) / 1_000,
    frictionBrakeEnergyKWh: (trip.frictionBrakeEnergyWh * trips) / 1_000,
    retarderEnergyKWh: (trip.retarderEnergyWh * trips) / 1_000,
    auxEnergyKWh: (trip.auxEnergyWh * trips) / 1_000,
    batteryNetEnergyKWh: (trip.batteryNetEnergyWh * trips) / 1_000,
  };
}
