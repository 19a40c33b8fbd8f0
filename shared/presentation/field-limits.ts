/**
 * The contract's field limits (shared/domain/limits.ts) as a form shows them: in the person's
 * units, rounded inward so every number the form accepts is one the API accepts, and the sentence
 * its error states.
 */
import { LATITUDE_DEG, LONGITUDE_DEG, SERVICE_DAYS_PER_YEAR, SOC, SPEED_LIMIT_KPH, STOP_DWELL_S, TRIPS_PER_DAY } from '../domain/limits';
import { displayToKph, kphToDisplay, unitLabel, type UnitSystem } from './units';

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

/**
 * A speed limit typed in the displayed unit as the contract stores it: km/h to 0.1 (an mph value
 * converts to a fraction of a km/h that no sign shows).
 */
export function speedLimitKphOf(shownSpeed: number, system: UnitSystem): number {
  return Math.round(displayToKph(shownSpeed, system) * 10) / 10;
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

/** Dwell time at a stop: "0 to 3600 s". */
export const DWELL_RANGE: ShownRange = shownRange(STOP_DWELL_S.min, STOP_DWELL_S.max, 's');

/** A longitude or latitude in WGS 84 degrees: "A latitude is between −90 and 90 degrees." */
export function coordinateRange(axis: 'lon' | 'lat'): ShownRange {
  const { min, max } = axis === 'lon' ? LONGITUDE_DEG : LATITUDE_DEG;
  const span = `${signed(min)} to ${signed(max)}°`;
  const name = axis === 'lon' ? 'A longitude' : 'A latitude';
  return { min, max, span, message: `${name} is between ${signed(min)} and ${signed(max)} degrees.` };
}

/** A whole number with a true minus sign (U+2212), as the interface prints negative figures. */
function signed(value: number): string {
  return value < 0 ? `\u2212${-value}` : String(value);
}
