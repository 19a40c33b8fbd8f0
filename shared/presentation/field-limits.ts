/**
 * The contract's field limits (shared/domain/limits.ts) as a form shows them: in the person's
 * units, rounded inward so every number the form accepts is one the API accepts, and the sentence
 * its error states.
 */
import { SERVICE_DAYS_PER_YEAR, SOC, SPEED_LIMIT_KPH, TRIPS_PER_DAY } from '../domain/limits';
import { kphToDisplay, unitLabel, type UnitSystem } from './units';

export interface ShownRange {
  min: number;
  max: number;
  /** "5 to 130 km/h" */
  span: string;
  /** "Between 5 and 130 km/h." */
  message: string;
}

/** The speed-limit range in whole displayed units: 5–130 km/h, or 4–80 mph. */
export function speedLimitRange(system: UnitSystem): ShownRange {
  const min = Math.ceil(kphToDisplay(SPEED_LIMIT_KPH.min, system) - 1e-9);
  const max = Math.floor(kphToDisplay(SPEED_LIMIT_KPH.max, system) + 1e-9);
  const unit = unitLabel('speed', system);
  return { min, max, span: `${min} to ${max} ${unit}`, message: `Between ${min} and ${max} ${unit}.` };
}

/** Whether a speed in km/h lies within the contract's speed-limit range. */
export function isSpeedLimitKphAllowed(speedKph: number): boolean {
  return speedKph >= SPEED_LIMIT_KPH.min && speedKph <= SPEED_LIMIT_KPH.max;
}

function shownRange(min: number, max: number, unit: string): ShownRange {
  const suffix = unit ? ` ${unit}` : '';
  return { min, max, span: `${min} to ${max}${suffix}`, message: `Between ${min} and ${max}${suffix}.` };
}

/** Round trips per service day: "0 to 500". */
export const TRIPS_PER_DAY_RANGE: ShownRange = shownRange(TRIPS_PER_DAY.min, TRIPS_PER_DAY.max, '');

/** Service days a year: "0 to 366". */
export const SERVICE_DAYS_RANGE: ShownRange = shownRange(SERVICE_DAYS_PER_YEAR.min, SERVICE_DAYS_PER_YEAR.max, '');

/** A state of charge as forms show it: "0 to 100 %". */
export const SOC_PERCENT_RANGE: ShownRange = shownRange(SOC.min * 100, SOC.max * 100, '%');
