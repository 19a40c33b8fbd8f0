import * as z from 'zod';

/**
 * Field limits and defaults the contract, the forms and their messages share: the zod schemas
 * build on these, and the interface states the same range in the person's units
 * (shared/presentation/field-limits.ts), so a form never accepts what the API refuses.
 */

/**
 * Posted speed limits, descent speed caps and a route's default limit, km/h. 5 km/h is about
 * walking pace (the lowest speed the descent advice considers); 130 km/h is the highest general
 * motorway limit in Europe (common practice), far above any mountain transit line.
 */
export const SPEED_LIMIT_KPH = { min: 5, max: 130 } as const;

/** Default speed limit of a new route, km/h (common practice: the urban limit in most of Europe). */
export const DEFAULT_SPEED_LIMIT_KPH = 50;

/** A speed limit or cap in km/h within `SPEED_LIMIT_KPH`. */
export const speedLimitKphSchema = z.number().min(SPEED_LIMIT_KPH.min).max(SPEED_LIMIT_KPH.max);

/**
 * Round trips a route runs per service day, for the annual figures. 500 is a trip about every
 * three minutes around the clock, beyond any single mountain line; 0 leaves the route out of the
 * annual totals.
 */
export const TRIPS_PER_DAY = { min: 0, max: 500, default: 0 } as const;

/** Days a year a route runs (whole days); 360 leaves a few days for closures (common practice). */
export const SERVICE_DAYS_PER_YEAR = { min: 0, max: 366, default: 360 } as const;

/** State of charge as a share of usable battery energy, 0–1; forms show it in percent. */
export const SOC = { min: 0, max: 1 } as const;

/** Start SOC of a run when none is given: a bus leaving the depot after a part charge. */
export const DEFAULT_START_SOC = 0.8;

/** WGS 84 longitude and latitude, degrees (the ranges of the coordinate system itself). */
export const LONGITUDE_DEG = { min: -180, max: 180 } as const;
export const LATITUDE_DEG = { min: -90, max: 90 } as const;

/**
 * Dwell time at a stop, s. Up to an hour: a longer stand is a layover, which a trip plan states
 * on its own. 20 s is the default of a stop placed on the map or read from a timetable without
 * times (from memory: 15–30 s at a busy urban stop).
 */
export const STOP_DWELL_S = { min: 0, max: 3_600, default: 20 } as const;

/** Longest name of a route or of a stop on it, characters. */
export const NAME_MAX_LENGTH = 120;

export const tripsPerDaySchema = z.number().min(TRIPS_PER_DAY.min).max(TRIPS_PER_DAY.max);
export const serviceDaysPerYearSchema = z.number().int().min(SERVICE_DAYS_PER_YEAR.min).max(SERVICE_DAYS_PER_YEAR.max);
/** A state of charge within `SOC`. */
export const socSchema = z.number().min(SOC.min).max(SOC.max);

/**
 * A number field's accepted range in SI. `minExclusive`/`maxExclusive`: the bound itself is
 * refused (an efficiency must be above 0; a share of brake mass must leave some for the front).
 */
export interface NumberRange {
  readonly min: number;
  readonly max: number;
  readonly minExclusive?: boolean;
  readonly maxExclusive?: boolean;
}

/** The zod number schema for a range. */
export function rangeSchema(range: NumberRange): z.ZodNumber {
  const low = range.minExclusive ? z.number().gt(range.min) : z.number().min(range.min);
  return range.maxExclusive ? low.lt(range.max) : low.max(range.max);
}

/**
 * A service day's chargers and SOC settings, SI (power in W, shares 0–1). The contract
 * (shared/domain/service-days.ts) and the service-day editor both read these. A charger from
 * 1 kW (a slow depot socket) to 1 MW (a pantograph at a terminus, common practice); an efficiency
 * from grid to battery of at least 50 % catches a typing error; a charger stopping below 10 % SOC
 * would never help; a reserve above half the battery is not a reserve.
 */
export const SERVICE_DAY_LIMITS = {
  chargerPowerW: { min: 1_000, max: 1_000_000 },
  chargerEfficiency: { min: 0.5, max: 1 },
  chargerTargetSoc: { min: 0.1, max: 1 },
  reserveSoc: { min: 0, max: 0.5 },
  startSoc: { min: 0, max: 1 },
} as const satisfies Record<string, NumberRange>;

const SHARE = { min: 0, max: 1 } as const;
const POWER_W = { min: 0, max: 5_000_000 } as const;

/**
 * Vehicle parameters, SI. The contract (shared/domain/analysis.ts, vehicle-profiles.ts) and the
 * vehicle-profile form both read these, so the form's hints and messages state exactly what the
 * API accepts. The upper bounds are far beyond any road or rail vehicle in transit service (a
 * 200 t curb mass covers a long tram set); they catch typing errors, not engineering limits.
 */
export const VEHICLE_LIMITS = {
  /** 100 kg: less is a typing error (a mass typed in tonnes as kilograms, say). */
  curbMassKg: { min: 100, max: 200_000 },
  payloadKg: { min: 0, max: 100_000 },
  permissibleGrossMassKg: { min: 0, max: 300_000, minExclusive: true },
  passengerMassKg: { min: 40, max: 120 },
  rotatingMassFactor: { min: 0, max: 1 },
  frontalAreaM2: { min: 0, max: 30, minExclusive: true },
  dragCoefficient: { min: 0, max: 3 },
  rollingResistanceCoefficient: { min: 0, max: 0.1 },
  tractionPowerW: { ...POWER_W, minExclusive: true },
  regenPowerW: POWER_W,
  regenContinuousPowerW: POWER_W,
  regenPeakHoldS: { min: 0, max: 3_600 },
  maxTractionForceN: { min: 0, max: 1_000_000, minExclusive: true },
  efficiency: { min: 0, max: 1, minExclusive: true },
  share: SHARE,
  batteryCapacityWh: POWER_W,
  maxChargePowerW: POWER_W,
  regenMinSpeedMps: { min: 0, max: 10 },
  coldChargeFullFromC: { min: -20, max: 40 },
  /** Usable capacity or charge power left at the battery's end of life, as a share of the new battery's. */
  endOfLifeFraction: { min: 0.3, max: 1 },
  ambientC: { min: -60, max: 60 },
  auxPowerW: { min: 0, max: 500_000 },
  brakeThermalMassJPerK: { min: 0, max: 100_000_000, minExclusive: true },
  brakeCoolingAreaM2: { min: 0, max: 100, minExclusive: true },
  rearBrakeThermalMassShare: { min: 0, max: 1, minExclusive: true, maxExclusive: true },
  retarderPowerW: POWER_W,
} as const satisfies Record<string, NumberRange>;

/**
 * Cabin climate of a vehicle profile (heating, cooling, ventilation for service-day runs), SI
 * apart from °C. Bounds again catch typing errors: a set point outside 5–30 °C heats no cabin,
 * and no bus heat pump reaches a COP of 8.
 */
export const CLIMATE_LIMITS = {
  heatingSetpointC: { min: 5, max: 30 },
  coolingSetpointC: { min: 15, max: 35 },
  bodyUaWPerK: { min: 0, max: 5_000 },
  freshAirM3PerH: { min: 0, max: 10_000 },
  doorAirExchangeM3: { min: 0, max: 100 },
  baseLoadW: { min: 0, max: 100_000 },
  heatPumpHeatW: { min: 0, max: 200_000 },
  copAmbientC: { min: -40, max: 40 },
  cop: { min: 1, max: 8 },
  heatPumpMinAmbientC: { min: -40, max: 20 },
  coolingEer: { min: 0.5, max: 8 },
  preconditioningS: { min: 0, max: 7_200 },
  cabinHeatCapacityJPerK: { min: 0, max: 10_000_000 },
} as const satisfies Record<string, NumberRange>;

/** Test points of a heat pump's COP curve a profile may state. */
export const COP_POINTS = { min: 1, max: 20 } as const;
