/**
 * Safety figures rounded toward safety, wherever they are shown (screens, PDFs, e-mails): a
 * speed a vehicle may drive and a state of charge it may start a descent with are rounded DOWN
 * (to the whole km/h or mph, the whole percent), and a temperature the brakes reach is rounded UP
 * (to the whole degree). Rounding to the nearest would print "21 km/h" for 21.6 km/h, a speed the
 * advice does not allow; rounding down prints 21, which it does (common practice for limits).
 */
import { formatNumber, kphToDisplay, unitLabel, toDisplay, type UnitSystem } from './units';

/** Tolerance for floating-point noise before rounding: 35.999999 km/h is 36 km/h, not 35. */
const NOISE = 1e-9;

/** Highest speed advised, in whole display units (km/h or mph), rounded down. */
export function safeSpeedShown(speedKph: number, system: UnitSystem): number {
  return Math.floor(kphToDisplay(speedKph, system) + NOISE);
}

/** "36 km/h" / "22 mph": a speed limit from the advice, rounded down. */
export function formatSafeSpeed(speedKph: number, system: UnitSystem): string {
  return `${formatNumber(safeSpeedShown(speedKph, system))} ${unitLabel('speed', system)}`;
}

/** Highest state of charge advised at the top of a descent, whole percent, rounded down. */
export function socLimitPercent(soc: number): number {
  return Math.floor(soc * 100 + NOISE);
}

/** "87 %": a state-of-charge limit from the advice, rounded down. */
export function formatSocLimit(soc: number): string {
  return `${formatNumber(socLimitPercent(soc))} %`;
}

/** A temperature the brakes reach, in whole display degrees, rounded up. */
export function temperatureReachedShown(temperatureC: number, system: UnitSystem): number {
  return Math.ceil(toDisplay('temperature', temperatureC, system) - NOISE);
}

/** "412 °C" / "774 °F": a brake temperature reached, rounded up. */
export function formatTemperatureReached(temperatureC: number, system: UnitSystem): string {
  return `${formatNumber(temperatureReachedShown(temperatureC, system))} ${unitLabel('temperature', system)}`;
}

/** "350 °C": a temperature the brakes must stay below (the fade threshold), rounded down. */
export function formatTemperatureLimit(temperatureC: number, system: UnitSystem): string {
  return `${formatNumber(Math.floor(toDisplay('temperature', temperatureC, system) + NOISE))} ${unitLabel('temperature', system)}`;
}
