/**
 * Auxiliary power of a vehicle from the ambient temperature, its occupancy and its door openings
 * (the service-day path; a scenario keeps its one constant per season).
 *
 * The cabin is held at a heating set point in the cold and a cooling set point in the heat; in
 * between only the base load runs. The thermal load of the cabin, W:
 *
 *   Q = (UA + ṁ_vent·c_p)·(T_set − T_amb) + door losses − passengers' sensible heat
 *
 * with UA the body's heat-loss coefficient, ṁ_vent the fresh-air flow, door losses the air
 * exchanged at each opening, ρ·V_door·c_p·(T_set − T_amb) per opening spread over the trip, and
 * each passenger giving off `PASSENGER_SENSIBLE_HEAT_W`. Heating: a heat pump covers what it can
 * (up to its rated heat output) at COP(T_amb), interpolated in its published test points and not
 * used below its lower limit; a resistive heater (COP 1) takes the rest. Cooling: the load
 * (passengers' heat adding to it) at the cooling EER. Electrical power = base load + heating or
 * cooling power.
 */
import { AIR_DENSITY_CABIN_KG_PER_M3, AIR_SPECIFIC_HEAT_J_PER_KG_K, PASSENGER_SENSIBLE_HEAT_W } from './constants';

/** One point of a heat pump's heating COP against outdoor air temperature. */
export interface CopPoint {
  ambientC: number;
  cop: number;
}

/** Climate settings of a vehicle profile (every field SI). */
export interface ClimateSettings {
  /** Cabin set point while heating, °C. */
  heatingSetpointC: number;
  /** Cabin set point while cooling, °C. */
  coolingSetpointC: number;
  /** Heat-loss coefficient of the body (walls, windows, floor, roof), W/K. */
  bodyUaWPerK: number;
  /** Fresh air taken in by the ventilation, m³/h. */
  freshAirM3PerH: number;
  /** Air exchanged each time the doors open at a stop, m³. */
  doorAirExchangeM3: number;
  /** Ventilation fans, lighting, electronics, compressors: drawn all the time, W. */
  baseLoadW: number;
  /** Rated heat output of the heat pump, W; 0 = no heat pump (resistive heating only). */
  heatPumpHeatW: number;
  /** Heating COP against ambient temperature, ascending in ambientC. */
  heatPumpCop: readonly CopPoint[];
  /** Lowest ambient at which the heat pump runs, °C; below it the resistive back-up heats alone. */
  heatPumpMinAmbientC: number;
  /** Cooling energy efficiency ratio (cooling heat ÷ electrical power). */
  coolingEer: number;
  /** Time the cabin is pre-conditioned before pull-out, s (0 = none). */
  preconditioningS: number;
  /** Heat capacity of the cabin's air and fittings brought to the set point by pre-conditioning, J/K. */
  cabinHeatCapacityJPerK: number;
}

export interface AuxiliaryConditions {
  ambientC: number;
  /** Passengers on board (mean over the trip). */
  passengers: number;
  /** Door openings during the time considered. */
  doorOpenings: number;
  /** Time considered, s. */
  durationS: number;
}

/** Heat pump COP at `ambientC`: linear between the points, held at the end points outside them. */
export function heatPumpCop(points: readonly CopPoint[], ambientC: number): number {
  if (points.length === 0) return 1;
  if (ambientC <= points[0]!.ambientC) return points[0]!.cop;
  for (let i = 1; i < points.length; i++) {
    const a = points[i - 1]!;
    const b = points[i]!;
    if (ambientC <= b.ambientC) return a.cop + ((b.cop - a.cop) * (ambientC - a.ambientC)) / (b.ambientC - a.ambientC);
  }
  return points[points.length - 1]!.cop;
}

/** Breakdown of the auxiliary power, W. */
export interface AuxiliaryBreakdown {
  baseW: number;
  /** Heat the cabin needs (positive) or must lose (negative), W. */
  cabinLoadW: number;
  heatPumpElectricW: number;
  resistiveElectricW: number;
  coolingElectricW: number;
  totalW: number;
}

/** Electrical auxiliary power for the given conditions (module comment). */
export function auxiliaryBreakdown(climate: ClimateSettings, conditions: AuxiliaryConditions): AuxiliaryBreakdown {
  const { ambientC, passengers, doorOpenings, durationS } = conditions;
  const ventWPerK = (climate.freshAirM3PerH / 3_600) * AIR_DENSITY_CABIN_KG_PER_M3 * AIR_SPECIFIC_HEAT_J_PER_KG_K;
  const doorWPerK =
    durationS > 0 ? (doorOpenings * climate.doorAirExchangeM3 * AIR_DENSITY_CABIN_KG_PER_M3 * AIR_SPECIFIC_HEAT_J_PER_KG_K) / durationS : 0;
  const conductanceWPerK = climate.bodyUaWPerK + ventWPerK + doorWPerK;
  const peopleW = Math.max(0, passengers) * PASSENGER_SENSIBLE_HEAT_W;
  let heatPumpElectricW = 0;
  let resistiveElectricW = 0;
  let coolingElectricW = 0;
  let cabinLoadW = 0;
  if (ambientC < climate.heatingSetpointC) {
    cabinLoadW = conductanceWPerK * (climate.heatingSetpointC - ambientC) - peopleW;
    if (cabinLoadW > 0) {
      const pumpUsable = climate.heatPumpHeatW > 0 && ambientC >= climate.heatPumpMinAmbientC;
      const pumpHeatW = pumpUsable ? Math.min(cabinLoadW, climate.heatPumpHeatW) : 0;
      heatPumpElectricW = pumpHeatW > 0 ? pumpHeatW / heatPumpCop(climate.heatPumpCop, ambientC) : 0;
      resistiveElectricW = cabinLoadW - pumpHeatW;
    }
  } else if (ambientC > climate.coolingSetpointC) {
    cabinLoadW = -(conductanceWPerK * (ambientC - climate.coolingSetpointC) + peopleW);
    coolingElectricW = -cabinLoadW / climate.coolingEer;
  }
  const totalW = climate.baseLoadW + heatPumpElectricW + resistiveElectricW + coolingElectricW;
  return { baseW: climate.baseLoadW, cabinLoadW, heatPumpElectricW, resistiveElectricW, coolingElectricW, totalW };
}

/** Mean electrical auxiliary power of a trip or a stand, W. */
export function tripAuxiliaryPowerW(climate: ClimateSettings, conditions: AuxiliaryConditions): number {
  return auxiliaryBreakdown(climate, conditions).totalW;
}

/**
 * Electrical energy to pre-condition the empty cabin before pull-out, J: the cabin's heat
 * capacity brought from ambient to the set point, plus the standing load for the time it takes,
 * both through the same heat pump / resistive / cooling split.
 */
export function preconditioningEnergyJ(climate: ClimateSettings, ambientC: number): number {
  if (climate.preconditioningS <= 0) return 0;
  const standing = auxiliaryBreakdown(climate, { ambientC, passengers: 0, doorOpenings: 0, durationS: climate.preconditioningS });
  let warmUpHeatJ = 0;
  if (ambientC < climate.heatingSetpointC) warmUpHeatJ = climate.cabinHeatCapacityJPerK * (climate.heatingSetpointC - ambientC);
  else if (ambientC > climate.coolingSetpointC) warmUpHeatJ = climate.cabinHeatCapacityJPerK * (ambientC - climate.coolingSetpointC);
  // The warm-up heat goes through the same machines, in the same proportions as the standing load.
  const hvacHeatW = Math.abs(standing.cabinLoadW);
  const hvacElectricW = standing.heatPumpElectricW + standing.resistiveElectricW + standing.coolingElectricW;
  const electricPerHeat = hvacHeatW > 0 ? hvacElectricW / hvacHeatW : 1;
  return standing.totalW * climate.preconditioningS + warmUpHeatJ * electricPerHeat;
}
