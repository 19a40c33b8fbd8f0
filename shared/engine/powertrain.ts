/**
 * Powertrain, battery and overhead-line model for one segment of constant wheel power
 * (engine README §1.2, §3.1, §3.5).
 *
 * Sign and accounting conventions (the battery energy balance closes on these):
 * - Wheel power P > 0 is traction, P < 0 braking demand B = −P.
 * - Motoring: source power = P / drivetrainEfficiency + auxPowerW.
 * - Braking: regeneration at the wheel is limited by regenPowerW (0 = none), by the motor's
 *   force limit (regen force ≤ maxTractionForceN) and fades out below regenMinSpeedMps: the
 *   machine's limit times v / regenMinSpeedMps, blending to the friction brakes as the vehicle
 *   stops (from memory: fade-out at 3–8 km/h, engine README §3.1; a linear fade is common practice). Regenerated power reaches the battery terminals as
 *   P_regen,wheel·regenEfficiency; the auxiliaries are fed from it first, and only the rest charges
 *   the cells (source power = auxPowerW − P_regen,wheel·regenEfficiency, negative = charging).
 * - Battery vehicles: the net charging power is limited by
 *   maxChargePowerW·f_SOC·f_T, f_SOC = 1 up to socTaperStart, falling linearly to 0 at socCeiling
 *   (from memory, engine README §3.1), f_T the cold derating (coldChargeFactor), and no step may charge
 *   above socCeiling.
 * - Overhead-line vehicles: traction and auxiliaries come from the line; of the regenerated power
 *   left after the auxiliaries the line takes the share lineReceptivity (engine README §3.5). Their
 *   on-board battery (off-wire running) is not modelled: SOC stays at the start value.
 * - The motor's braking envelope is min(regen rating, maxTractionForceN·v)·fade(v), with the
 *   regen rating the peak `regenPowerW` until the peak has been held for `regenPeakHoldS`, then
 *   `regenContinuousPowerW` (the caller passes the rating in force, see route-simulation.ts).
 *   On the road or rail, the driven axles can pass at most μ·(driven-axle load) of braking force
 *   (`adhesionForceN`, adhesion.ts); regeneration and any driveline retarder share that cap.
 * - Braking the electrical path cannot take goes to the endurance brake (endurance-brake.ts): a
 *   braking resistor takes it up to retarderPowerW but only inside what is left of the motor's
 *   envelope; an independent retarder up to its own force–speed curve. The rest goes to the
 *   friction brakes, which act on all axles.
 *
 * regenEnergy counts energy delivered to the battery (or line) terminals, i.e. after
 * regenEfficiency. Battery balance: E_net = Σ traction/η + Σ aux − Σ regen, and
 * SOC_end·capacity = SOC_start·capacity − E_net + E_shortfall (energy the empty battery could not give).
 */
import type { RetarderType, Vehicle } from '../domain/analysis';
import { JOULES_PER_WH } from './constants';
import { independentRetarderPowerW, resolvedRetarderType } from './endurance-brake';

export interface PowertrainParams {
  isOverheadLine: boolean;
  drivetrainEfficiency: number;
  regenEfficiency: number;
  regenPowerW: number;
  maxRegenForceN: number;
  regenMinSpeedMps: number;
  maxChargePowerW: number;
  batteryCapacityJ: number;
  socTaperStart: number;
  socCeiling: number;
  coldChargeFullFromC: number;
  coldChargeShareAtMinus20C: number;
  auxPowerW: number;
  retarderPowerW: number;
  retarderType: RetarderType;
  /** Continuous regeneration rating at the wheel, W (≤ regenPowerW). */
  regenContinuousPowerW: number;
  /** How long the peak rating may be held, s. */
  regenPeakHoldS: number;
  lineReceptivity: number;
}

/** Powertrain parameters of a parsed vehicle. */
export function powertrainParams(vehicle: Vehicle): PowertrainParams {
  return {
    isOverheadLine: vehicle.powerSource === 'overhead-line',
    drivetrainEfficiency: vehicle.drivetrainEfficiency,
    regenEfficiency: vehicle.regenEfficiency,
    regenPowerW: vehicle.regenPowerW,
    maxRegenForceN: vehicle.maxTractionForceN,
    regenMinSpeedMps: vehicle.regenMinSpeedMps,
    maxChargePowerW: vehicle.maxChargePowerW,
    batteryCapacityJ: vehicle.batteryCapacityWh * JOULES_PER_WH,
    socTaperStart: vehicle.socTaperStart,
    socCeiling: vehicle.socCeiling,
    coldChargeFullFromC: vehicle.coldChargeFullFromC,
    coldChargeShareAtMinus20C: vehicle.coldChargeShareAtMinus20C,
    auxPowerW: vehicle.auxPowerW,
    retarderPowerW: vehicle.retarderPowerW,
    retarderType: resolvedRetarderType(vehicle),
    regenContinuousPowerW: Math.min(vehicle.regenPowerW, vehicle.regenContinuousPowerW ?? vehicle.regenPowerW),
    regenPeakHoldS: vehicle.regenPeakHoldS,
    lineReceptivity: vehicle.lineReceptivity,
  };
}

/** Result of one step; reused between calls to keep hot loops allocation-free. */
export interface PowerSplit {
  /** Power drawn from the battery or line, W (negative while charging). */
  sourcePowerW: number;
  /** Electrical power drawn for traction, W. */
  tractionElectricPowerW: number;
  /** Braking power taken by regeneration at the wheel, W. */
  regenWheelPowerW: number;
  /** Regenerated power delivered to the battery or line terminals, W. */
  regenElectricPowerW: number;
  retarderPowerW: number;
  frictionPowerW: number;
  /** SOC after the step. */
  soc: number;
  /** Energy the battery could not deliver in this step because it was empty, J. */
  shortfallJ: number;
}

export function emptyPowerSplit(): PowerSplit {
  return {
    sourcePowerW: 0,
    tractionElectricPowerW: 0,
    regenWheelPowerW: 0,
    regenElectricPowerW: 0,
    retarderPowerW: 0,
    frictionPowerW: 0,
    soc: 0,
    shortfallJ: 0,
  };
}

/** Share of the charge-power limit available at `soc` (linear taper, from memory, engine README §3.1). */
export function chargeTaperFactor(soc: number, taperStart: number, ceiling: number): number {
  if (soc >= ceiling) return 0;
  if (soc <= taperStart) return 1;
  return (ceiling - soc) / (ceiling - taperStart);
}

/**
 * Share of the charge-power limit available at ambient `ambientC`: 1 from `fullFromC` up,
 * falling linearly to `shareAtMinus20C` at −20 °C and staying there below (from memory: packs
 * without heating limit charging below about 0–10 °C, engine README §3.1; the maker's data decides).
 */
export function coldChargeFactor(ambientC: number, fullFromC: number, shareAtMinus20C: number): number {
  if (shareAtMinus20C >= 1 || ambientC >= fullFromC) return 1;
  if (ambientC <= COLD_CHARGE_FLOOR_C || fullFromC <= COLD_CHARGE_FLOOR_C) return shareAtMinus20C;
  return shareAtMinus20C + ((1 - shareAtMinus20C) * (ambientC - COLD_CHARGE_FLOOR_C)) / (fullFromC - COLD_CHARGE_FLOOR_C);
}

/** Temperature at which the cold charge derating reaches its floor, °C. */
const COLD_CHARGE_FLOOR_C = -20;

/**
 * Splits wheel power `wheelPowerW` held for `durationS` at mean speed `speedMps` between the
 * battery/line, the retarder and the friction brakes, and integrates the SOC. Writes into `out`.
 * `ambientC`, when given, derates the battery's charge power in the cold (coldChargeFactor).
 */
export function splitWheelPower(
  params: PowertrainParams,
  wheelPowerW: number,
  speedMps: number,
  soc: number,
  durationS: number,
  out: PowerSplit,
  ambientC?: number,
  regenRatingW: number = params.regenPowerW,
  adhesionForceN: number = Number.POSITIVE_INFINITY,
): void {
  const aux = params.auxPowerW;
  out.regenWheelPowerW = 0;
  out.regenElectricPowerW = 0;
  out.retarderPowerW = 0;
  out.frictionPowerW = 0;
  out.tractionElectricPowerW = 0;
  out.shortfallJ = 0;

  if (wheelPowerW >= 0) {
    out.tractionElectricPowerW = wheelPowerW / params.drivetrainEfficiency;
    out.sourcePowerW = out.tractionElectricPowerW + aux;
  } else {
    const demandW = -wheelPowerW;
    let regenWheelW = 0;
    const fade = regenSpeedFactor(speedMps, params.regenMinSpeedMps);
    // The motor's braking envelope (regeneration and a braking resistor share it), and what the
    // driven axles can pass on this surface (regeneration and any driveline retarder share it).
    const motorW = params.regenPowerW > 0 ? Math.min(regenRatingW, params.maxRegenForceN * speedMps) * fade : 0;
    const adhesionW = adhesionForceN * Math.max(0, speedMps);
    const electricLimitW = Math.min(motorW, adhesionW);
    if (electricLimitW > 0) {
      regenWheelW = Math.min(demandW, electricLimitW);
      const eta = params.regenEfficiency;
      if (params.isOverheadLine) {
        // Auxiliaries first, then the line's receptive share of the rest (engine README §3.5).
        const electricW = regenWheelW * eta;
        const auxCoveredW = Math.min(aux, electricW);
        const acceptedW = auxCoveredW + params.lineReceptivity * (electricW - auxCoveredW);
        regenWheelW = acceptedW / eta;
      } else {
        const coldFactor =
          ambientC === undefined ? 1 : coldChargeFactor(ambientC, params.coldChargeFullFromC, params.coldChargeShareAtMinus20C);
        const taperedW = params.maxChargePowerW * chargeTaperFactor(soc, params.socTaperStart, params.socCeiling) * coldFactor;
        const headroomW = durationS > 0 ? (Math.max(0, params.socCeiling - soc) * params.batteryCapacityJ) / durationS : taperedW;
        const acceptW = Math.min(taperedW, headroomW) + aux;
        regenWheelW = Math.min(regenWheelW, acceptW / eta);
      }
    }
    const restW = Math.max(0, demandW - regenWheelW);
    let retarderLimitW = 0;
    if (params.retarderType === 'braking-resistor') retarderLimitW = Math.min(params.retarderPowerW, electricLimitW - regenWheelW);
    else if (params.retarderType !== 'none') {
      retarderLimitW = Math.min(independentRetarderPowerW(params.retarderType, params.retarderPowerW, speedMps), adhesionW - regenWheelW);
    }
    const retarderW = Math.max(0, Math.min(restW, retarderLimitW));
    out.regenWheelPowerW = regenWheelW;
    out.regenElectricPowerW = regenWheelW * params.regenEfficiency;
    out.retarderPowerW = retarderW;
    out.frictionPowerW = restW - retarderW;
    out.sourcePowerW = aux - out.regenElectricPowerW;
  }

  if (params.isOverheadLine || params.batteryCapacityJ <= 0) {
    out.soc = soc;
    return;
  }
  let next = soc - (out.sourcePowerW * durationS) / params.batteryCapacityJ;
  if (next < 0) {
    out.shortfallJ = -next * params.batteryCapacityJ;
    next = 0;
  }
  out.soc = Math.min(1, next);
}

/**
 * Share of the machine's regeneration limit available at `speedMps`: 1 from regenMinSpeedMps up,
 * falling linearly to 0 at standstill (1 throughout when no fade speed is set).
 */
export function regenSpeedFactor(speedMps: number, regenMinSpeedMps: number): number {
  if (!(speedMps > 0)) return 0;
  if (!(regenMinSpeedMps > 0) || speedMps >= regenMinSpeedMps) return 1;
  return speedMps / regenMinSpeedMps;
}
