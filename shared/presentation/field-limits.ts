/**
 * The contract's field limits (shared/domain/limits.ts) as a form shows them: in the person's
 * units, rounded inward so every number the form accepts is one the API accepts, and the sentence
 * its error states.
 */
import { SPEED_LIMIT_KPH } from '../domain/limits';
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
